/**
 * The notice of text typed before a reload and not saved (state/typed-copy.ts): put back into its
 * field, uncommitted, or — its field not drawn — given here to be typed again.
 */
import { Notice } from '../components/notices';
import { dismissTypedNote, useTypedNote } from '../state';

export function TypedCopyNotice() {
  const note = useTypedNote((s) => s.note);
  if (!note) return null;
  const dismiss = (
    <button type="button" onClick={dismissTypedNote}>
      Dismiss
    </button>
  );
  if (note.state === 'back') {
    return (
      <Notice tone="info" title="Typed text put back — not saved yet" actions={dismiss}>
        <p className="small" data-testid="typed-note">
          “{note.text}” in {note.name}, typed before the page was reloaded, is back in its field (marked) and is not saved. Press Enter or
          leave the field to save it with the usual checks; Escape drops it.
        </p>
      </Notice>
    );
  }
  return (
    <Notice tone="warning" title="Typed text not saved" actions={dismiss}>
      <p className="small" data-testid="typed-note">
        “{note.text}” was typed in {note.name} before the page was reloaded and was not saved; its field is not on the screen now. Type it
        again where it belongs if it is wanted.
      </p>
    </Notice>
  );
}
