/**
 * The browser's leave-page warning while typed text is not saved (s21 item 3).
 *
 * What a blender types is saved when the field commits it (Enter, Tab, leaving the field); a reload or
 * a closed tab before that would drop the text without a word. Saving it as the page leaves is not an
 * option: a half-typed value ("32" on the way to "320") must never be stored. So, as the page is about
 * to be left, the browser is asked to warn ("Leave site? Changes you made may not be saved") when:
 * - the focused field holds text typed since it was focused or last committed (Enter, Escape and
 *   leaving the field end that: the field then has committed it, or refused it — see below);
 * - a field shows a refused entry (`aria-invalid`): its typed text is on screen, not saved;
 * - a screen says it holds unsaved work of its own (`holdLeave`, e.g. specification limits typed on
 *   the Recipes screen but not yet saved).
 * Nothing is saved as the page leaves here: what was committed is saved already (or written by the
 * deferred writers in persistence.ts); the focused field's typed text is copied, never saved, and put
 * back into its field after a reload (typed-copy.ts). Fields marked `data-no-leave-warning` (filters, searches) and
 * non-text controls (which commit at once) are not counted; nor is a field marked `data-applies-as-typed`
 * (the designer's shares, which apply each valid keystroke to the draft) while its text is accepted.
 */

/**
 * Marks a field that applies every valid keystroke to what is saved (the designer's share cells): its
 * typed text counts as unsaved only while it is refused (`aria-invalid`).
 */
export const APPLIES_AS_TYPED = 'data-applies-as-typed';

/** Screens' own unsaved work: each check says whether its screen holds some now. */
const holds = new Set<() => boolean>();

/** Ask for the leave-page warning while `unsaved()` is true; returns a function that stops asking. */
export function holdLeave(unsaved: () => boolean): () => void {
  holds.add(unsaved);
  return () => holds.delete(unsaved);
}

/** A control whose typed text is committed later (not a checkbox, radio, select or button). */
function isTextEntry(el: Element | null): el is HTMLElement {
  if (!el || (el as HTMLElement).closest?.('[data-no-leave-warning]')) return false;
  if (el instanceof HTMLTextAreaElement) return !el.readOnly && !el.disabled;
  if (el instanceof HTMLInputElement) {
    if (el.readOnly || el.disabled) return false;
    return ['text', 'number', 'email', 'tel', 'url', 'password', ''].includes(el.type);
  }
  return (el as HTMLElement).isContentEditable === true;
}

/** The field typed into since it was focused or last committed (null: none). */
let typedInto: HTMLElement | null = null;

/** The focused field typed into since it was focused or last committed, or null (typed-copy.ts keeps its text). */
export function typedField(doc: Document = document): HTMLElement | null {
  if (!typedInto || !typedInto.isConnected || doc.activeElement !== typedInto) return null;
  // A field that applies each valid keystroke (the designer's shares) holds nothing unsaved unless its
  // text is refused; the refused text is what the recipe does not hold.
  if (typedInto.closest(`[${APPLIES_AS_TYPED}]`) && typedInto.getAttribute('aria-invalid') !== 'true') return null;
  return typedInto;
}

/** True when leaving the page now would drop typed text that is not saved. */
export function unsavedTyping(doc: Document = document): boolean {
  if (typedField(doc)) return true;
  for (const el of doc.querySelectorAll('[aria-invalid="true"]')) if (isTextEntry(el)) return true;
  for (const unsaved of holds) if (unsaved()) return true;
  return false;
}

/**
 * Follow typing in `win`'s document and ask for the browser's leave-page warning while typed text is
 * not saved. Returns a function that stops.
 */
export function installLeaveWarning(win: Window = window): () => void {
  const doc = win.document;
  const onInput = (e: Event) => {
    if (isTextEntry(e.target as Element)) typedInto = e.target as HTMLElement;
  };
  // Enter commits (or refuses, leaving the field marked invalid), Escape puts the saved value back.
  const onKey = (e: KeyboardEvent) => {
    if ((e.key === 'Enter' || e.key === 'Escape') && e.target === typedInto) typedInto = null;
  };
  const onFocusOut = (e: FocusEvent) => {
    if (e.target === typedInto) typedInto = null;
  };
  const onBeforeUnload = (e: BeforeUnloadEvent) => {
    if (!unsavedTyping(doc)) return;
    e.preventDefault();
    e.returnValue = ''; // older browsers ask for the warning this way
  };
  doc.addEventListener('input', onInput, true);
  doc.addEventListener('keydown', onKey, true);
  doc.addEventListener('focusout', onFocusOut, true);
  win.addEventListener('beforeunload', onBeforeUnload);
  return () => {
    doc.removeEventListener('input', onInput, true);
    doc.removeEventListener('keydown', onKey, true);
    doc.removeEventListener('focusout', onFocusOut, true);
    win.removeEventListener('beforeunload', onBeforeUnload);
    typedInto = null;
  };
}
