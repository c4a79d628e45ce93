/**
 * Text typed in a field and not yet committed, kept across a reload (s24 item 1b).
 *
 * A field commits what is typed on Enter, Tab or leaving it; a reload before that drops the text (the
 * browser's leave-page warning, leave-guard.ts, asks first, but a reload may come anyway). Committing the
 * text as the page leaves is no answer: "32" on the way to "320" is valid and would be saved silently.
 * So the typed text is kept, never saved:
 * - as the page is hidden or left, the raw text of the field typed into (focused, typed since it was
 *   focused or last committed) is copied into the tab's sessionStorage with the field's address: the
 *   screen (the page's address), the field's accessible name, the table row it stands in
 *   (`data-row-key`) and which of the fields of that name and row it is;
 * - at the tab's next start, once that field is drawn, the text is put back into it as typed text —
 *   uncommitted, focused, caret at its end, the field marked (`data-typed-restored`) and a notice
 *   saying it is not saved. The field then behaves as if the blender had just typed it: Enter, Tab or
 *   leaving the field commits it with the usual checks (a refused entry stays refused), Escape drops it.
 * - If the blender acts (a key, a click) or opens another screen before the field is drawn (a row
 *   scrolled out of the table, a stock deleted meanwhile), the text is not put anywhere: the notice gives
 *   it, so it can be typed again.
 * Fields marked `data-no-leave-warning` (filters, searches) are not kept, nor a field that applies each valid
 * keystroke (`data-applies-as-typed`, the designer's shares) while its text is accepted: that text is saved.
 */
import { create } from 'zustand';
import { typedField } from './leave-guard';

/** Where a field stands, as a reload draws it again. */
export interface FieldAddress {
  /** The page's address (location.hash) when the text was typed: the screen. */
  screen: string;
  /** The field's accessible name (aria-label, else its label's text). */
  name: string;
  /** The `data-row-key` of the table row it stands in, or null. */
  row: string | null;
  /** Which of the fields with this name and row it is, in the page's order (0: the first). */
  nth: number;
}

/** The text typed in a field and not committed when the page was left. */
export interface TypedCopy extends FieldAddress {
  text: string;
}

/** What the notice says of typed text kept across the reload. */
export interface TypedNote {
  /** 'back': in its field again, not saved; 'missing': its field was not drawn, the text is only here. */
  state: 'back' | 'missing';
  name: string;
  text: string;
}

/** The notice's state (not persisted). */
export const useTypedNote = create<{ note: TypedNote | null }>(() => ({ note: null }));

/** Close the notice. */
export function dismissTypedNote(): void {
  useTypedNote.setState({ note: null });
}

export const TYPED_COPY_KEY = 'blendbench.typed';
export const RESTORED_ATTR = 'data-typed-restored';

function session(): Storage | null {
  try {
    return typeof sessionStorage === 'undefined' ? null : sessionStorage;
  } catch {
    return null;
  }
}

/** Fields and the text cells that stand for them until edited (see fields.tsx `textUntilEdited`). */
const CANDIDATES = 'input, textarea, [role="textbox"]';

/** A field's accessible name: aria-label, else the text of its first label. */
function nameOf(el: Element): string {
  const aria = el.getAttribute('aria-label');
  if (aria) return aria.trim();
  const labels = (el as HTMLInputElement).labels;
  return labels && labels.length > 0 ? (labels[0]!.textContent ?? '').trim() : '';
}

const rowOf = (el: Element): string | null => el.closest('[data-row-key]')?.getAttribute('data-row-key') ?? null;

function candidates(doc: Document, name: string, row: string | null): HTMLElement[] {
  return [...doc.querySelectorAll<HTMLElement>(CANDIDATES)].filter(
    (el) => !el.closest('[data-no-leave-warning]') && nameOf(el) === name && rowOf(el) === row,
  );
}

/** The address of a field on the page now (null: it has no accessible name to find it by). */
export function fieldAddress(el: HTMLElement, doc: Document = el.ownerDocument): FieldAddress | null {
  const name = nameOf(el);
  if (!name) return null;
  const row = rowOf(el);
  const nth = candidates(doc, name, row).indexOf(el);
  return { screen: doc.defaultView?.location.hash ?? '', name, row, nth: Math.max(0, nth) };
}

/** Keep (null: remove) the typed-text copy; never throws (a full or refused store keeps nothing). */
export function writeTypedCopy(copy: TypedCopy | null): void {
  const s = session();
  if (!s) return;
  try {
    if (copy === null) s.removeItem(TYPED_COPY_KEY);
    else s.setItem(TYPED_COPY_KEY, JSON.stringify(copy));
  } catch {
    /* not kept: the leave-page warning asked first */
  }
}

/** The typed-text copy, or null (none, or not in the form written here). */
export function readTypedCopy(): TypedCopy | null {
  let v: unknown;
  try {
    const text = session()?.getItem(TYPED_COPY_KEY) ?? null;
    if (text === null) return null;
    v = JSON.parse(text);
  } catch {
    return null;
  }
  if (typeof v !== 'object' || v === null) return null;
  const c = v as Record<string, unknown>;
  const ok =
    typeof c.screen === 'string' &&
    typeof c.name === 'string' &&
    (c.row === null || typeof c.row === 'string') &&
    typeof c.nth === 'number' &&
    Number.isInteger(c.nth) &&
    c.nth >= 0 &&
    typeof c.text === 'string';
  return ok ? { screen: c.screen as string, name: c.name as string, row: c.row as string | null, nth: c.nth as number, text: c.text as string } : null;
}

const isEntry = (el: Element | null | undefined): el is HTMLInputElement | HTMLTextAreaElement =>
  el instanceof HTMLInputElement || el instanceof HTMLTextAreaElement;

/** Put `text` into a field as if typed (React's onChange hears it), focused, caret at the end. */
function typeInto(el: HTMLInputElement | HTMLTextAreaElement, text: string): void {
  if (el.ownerDocument.activeElement !== el) el.focus();
  const proto = el instanceof HTMLTextAreaElement ? HTMLTextAreaElement.prototype : HTMLInputElement.prototype;
  Object.getOwnPropertyDescriptor(proto, 'value')?.set?.call(el, text);
  el.dispatchEvent(new Event('input', { bubbles: true }));
  try {
    el.setSelectionRange(el.value.length, el.value.length);
  } catch {
    /* a field without a caret */
  }
}

/**
 * Keep typed text across reloads in `win` (see the module's note): copy it as the page is hidden or
 * left, and put back what the previous page of this tab copied once its field is drawn. Returns a
 * function that stops.
 */
export function installTypedCopy(win: Window = window): () => void {
  const doc = win.document;
  /** Copied by the previous page and not put back yet (written again if this page is left before). */
  let pending = readTypedCopy();
  writeTypedCopy(null);
  let observer: MutationObserver | null = null;
  let opened: Element | null = null;
  let restored: HTMLElement | null = null;

  const keep = () => {
    const el = typedField(doc);
    const address = el && isEntry(el) && !el.closest('[data-no-leave-warning]') ? fieldAddress(el, doc) : null;
    if (el && address && isEntry(el)) writeTypedCopy({ ...address, text: el.value });
    else writeTypedCopy(pending);
  };
  const onPageHide = () => keep();
  const onVisibility = () => {
    if (doc.visibilityState === 'hidden') keep();
  };
  win.addEventListener('pagehide', onPageHide);
  doc.addEventListener('visibilitychange', onVisibility);

  const unmark = () => {
    restored?.removeAttribute(RESTORED_ATTR);
    restored = null;
    if (useTypedNote.getState().note?.state === 'back') dismissTypedNote();
  };
  // The restored text is committed (Enter, leaving the field) or dropped (Escape): no longer "put back".
  const onKey = (e: KeyboardEvent) => {
    if (restored && e.target === restored && (e.key === 'Enter' || e.key === 'Escape')) queueMicrotask(unmark);
  };
  const onFocusOut = (e: FocusEvent) => {
    if (restored && e.target === restored) unmark();
  };
  doc.addEventListener('keydown', onKey, true);
  doc.addEventListener('focusout', onFocusOut, true);

  const stopWaiting = () => {
    observer?.disconnect();
    observer = null;
    doc.removeEventListener('keydown', onUserFirst, true);
    doc.removeEventListener('pointerdown', onUserFirst, true);
    win.removeEventListener('hashchange', onUserFirst);
  };
  /** The blender acted before the field was drawn: the text is not put anywhere now, the notice gives it. */
  function onUserFirst(): void {
    if (!pending) return;
    useTypedNote.setState({ note: { state: 'missing', name: pending.name, text: pending.text } });
    pending = null;
    stopWaiting();
  }
  /** Look for the pending copy's field; open a field drawn as text, then type the text into it. */
  const tryPutBack = () => {
    const copy = pending;
    if (!copy) return stopWaiting();
    const el = candidates(doc, copy.name, copy.row)[copy.nth];
    if (!el) return;
    if (!isEntry(el)) {
      // Drawn as text until edited: a click draws the field (focused); a cell that opens on focus opens so.
      if (opened === el) return;
      opened = el;
      el.focus();
      if (doc.activeElement === el) el.click();
      const now = candidates(doc, copy.name, copy.row)[copy.nth];
      if (!isEntry(now)) return; // drawn in a later render: the observer comes back
      return putBack(now, copy);
    }
    putBack(el, copy);
  };
  const putBack = (el: HTMLInputElement | HTMLTextAreaElement, copy: TypedCopy) => {
    pending = null;
    stopWaiting();
    typeInto(el, copy.text);
    el.setAttribute(RESTORED_ATTR, '');
    restored = el;
    useTypedNote.setState({ note: { state: 'back', name: copy.name, text: copy.text } });
  };

  if (pending && pending.screen !== (win.location.hash ?? '')) onUserFirst();
  if (pending) {
    doc.addEventListener('keydown', onUserFirst, true);
    doc.addEventListener('pointerdown', onUserFirst, true);
    win.addEventListener('hashchange', onUserFirst);
    if (typeof MutationObserver !== 'undefined') {
      observer = new MutationObserver(tryPutBack);
      observer.observe(doc.body ?? doc.documentElement, { childList: true, subtree: true });
    }
    tryPutBack();
  }

  return () => {
    stopWaiting();
    win.removeEventListener('pagehide', onPageHide);
    doc.removeEventListener('visibilitychange', onVisibility);
    doc.removeEventListener('keydown', onKey, true);
    doc.removeEventListener('focusout', onFocusOut, true);
    restored = null;
  };
}
