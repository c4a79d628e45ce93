import { memo, useCallback, useLayoutEffect, useRef, useState, useSyncExternalStore } from 'react';
import { useFormat } from '../../components/format';
import { RelayText, type Relay } from '../../components/relay';
import { APPLIES_AS_TYPED } from '../../state/leave-guard';

/** Where a cell reads its share (0–1): the current value, and a way to hear of a new one. */
export type ShareSource = Pick<Relay<number>, 'get' | 'subscribe'>;

const NOT_READ = () => 0;

export interface FractionInputProps {
  /** Accessible label, e.g. "Mass % of BW-240". */
  label: string;
  /** The share 0–1, as it follows the recipe. */
  share: ShareSource;
  /** Called on every keystroke that gives a valid percentage (live recomputation). */
  onEdit: (fraction: number) => void;
  disabled?: boolean;
}

/**
 * A percentage cell that recomputes the blend while the user types. Enter and Tab end the edit
 * alike: a valid entry stays applied and is shown as stored; a refused one stays in the cell with
 * its message (the last valid value is what the recipe holds). Escape puts back the share the line
 * had when the edit began.
 *
 * Until it is focused the cell is plain text in a box drawn like the field (a focusable textbox
 * with the same label); focusing it — Tab, Shift-Tab or a click — puts the field in its place with
 * the share selected, and leaving it (with an accepted entry) makes it text again. So an edit of
 * one line does not rewrite the value, name and type of every other line's field, and a change of
 * its number is laid out inside its own fixed box. The text cell writes its number itself as the
 * share changes (no React render); the field, while shown, follows the share through React.
 */
export const FractionInput = memo(function FractionInput({ label, share, onEdit, disabled }: FractionInputProps) {
  const fmt = useFormat();
  const show = useCallback((v: number) => fmt.plain(Number((v * 100).toFixed(2)), 2), [fmt]);
  // The text as typed, kept only while the user is typing (dirty); otherwise the cell shows the
  // stored share, so an edit of another line repaints it in the same render.
  const [text, setText] = useState('');
  const [dirty, setDirty] = useState(false);
  const [error, setError] = useState('');
  /** The share when the current edit began (what Escape restores). */
  const start = useRef<number | null>(null);
  /** True while the field is shown (from the cell's focus until the field is left with an accepted entry). */
  const [editing, setEditing] = useState(false);
  const value = useSyncExternalStore(share.subscribe, editing ? share.get : NOT_READ, editing ? share.get : NOT_READ);
  const field = useRef<HTMLInputElement>(null);
  // The field takes the focus the text cell had, with its text selected (typing replaces it).
  useLayoutEffect(() => {
    if (editing && field.current && document.activeElement !== field.current) {
      field.current.focus();
      field.current.select();
    }
  }, [editing]);
  const finish = () => {
    if (error) return false;
    setDirty(false);
    start.current = null;
    return true;
  };
  if (!editing) {
    return (
      <span
        className="pct-input pct-cell"
        role="textbox"
        aria-label={label}
        aria-disabled={disabled ? true : undefined}
        tabIndex={disabled ? undefined : 0}
        onFocus={disabled ? undefined : () => setEditing(true)}
      >
        <RelayText relay={share} select={show} />
      </span>
    );
  }
  return (
    <>
      <input
        ref={field}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        className={`pct-input${error ? ' invalid' : ''}`}
        aria-label={label}
        aria-invalid={error ? true : undefined}
        {...{ [APPLIES_AS_TYPED]: '' }}
        title={error || undefined}
        size={7}
        disabled={disabled}
        value={dirty ? text : show(value)}
        onBlur={() => {
          if (finish()) setEditing(false);
        }}
        onKeyDown={(e) => {
          if (e.key === 'Enter') {
            if (!finish()) e.preventDefault();
          } else if (e.key === 'Escape') {
            if (start.current !== null && start.current !== value) onEdit(start.current);
            setError('');
            setDirty(false);
            start.current = null;
          } else if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
            e.preventDefault();
            if (start.current === null) start.current = value;
            const step = (e.shiftKey ? 1 : 0.1) * (e.key === 'ArrowUp' ? 1 : -1);
            const next = Math.min(100, Math.max(0, value * 100 + step));
            onEdit(next / 100);
            setError('');
            setDirty(false);
          }
        }}
        onChange={(e) => {
          const t = e.target.value;
          if (start.current === null) start.current = value;
          setText(t);
          setDirty(true);
          const r = fmt.parseEntry(t);
          if (r.error !== undefined) return setError(`${label}: ${r.error}`);
          if (r.value === null) return setError(`${label}: type a share from 0 to 100 %, or remove the line`);
          if (r.value < 0 || r.value > 100) return setError(`${label}: a share runs from 0 to 100 %`);
          setError('');
          onEdit(r.value / 100);
        }}
      />
      {error ? (
        <span className="field-msg field-error pct-msg" role="alert">
          {error}
        </span>
      ) : null}
    </>
  );
});
