// @vitest-environment jsdom
// Session 21 item 3: a reload while a value is typed but not committed would drop the typed text
// without a word. The browser's leave-page warning is asked for while typed text is not saved: the
// focused field typed into, a refused entry on screen, or a screen's own unsaved work. Nothing typed
// is ever saved as the page leaves (a half-typed value must not be stored).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { holdLeave, installLeaveWarning, unsavedTyping } from '../../src/state/leave-guard';

let stop: () => void = () => {};
beforeEach(() => {
  document.body.innerHTML = `
    <input id="share" type="text" value="75.5">
    <input id="filter" type="text" data-no-leave-warning>
    <input id="pct" type="text" value="40" data-applies-as-typed>
    <input id="ok" type="checkbox">
    <textarea id="notes"></textarea>`;
  stop = installLeaveWarning(window);
});
afterEach(() => stop());

const el = (id: string) => document.getElementById(id) as HTMLInputElement;
function type(id: string, text: string) {
  const f = el(id);
  f.focus();
  f.value = text;
  f.dispatchEvent(new Event('input', { bubbles: true }));
}
/** Whether leaving the page now asks the browser for its warning. */
function leaveAsks(): boolean {
  const e = new Event('beforeunload', { cancelable: true }) as BeforeUnloadEvent;
  window.dispatchEvent(e);
  return e.defaultPrevented;
}

describe('leave-page warning while typed text is not saved', () => {
  it('asks while the focused field holds typed text, and no longer once Enter, Escape or leaving the field ends it', () => {
    expect(leaveAsks()).toBe(false);
    type('share', '32'); // on the way to 320
    expect(unsavedTyping()).toBe(true);
    expect(leaveAsks()).toBe(true);
    el('share').dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true }));
    expect(leaveAsks()).toBe(false);
    type('share', '33');
    el('share').dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape', bubbles: true }));
    expect(leaveAsks()).toBe(false);
    type('notes', 'half a sentence');
    expect(leaveAsks()).toBe(true);
    el('notes').blur();
    expect(leaveAsks()).toBe(false);
  });

  it('asks while a refused entry is on screen, even after the field was left', () => {
    type('share', 'abc');
    el('share').setAttribute('aria-invalid', 'true'); // as a field shows a refused entry
    el('share').blur();
    expect(leaveAsks()).toBe(true);
    el('share').removeAttribute('aria-invalid');
    expect(leaveAsks()).toBe(false);
  });

  it('asks while a screen holds unsaved work of its own; not for filters or controls that commit at once', () => {
    let unsaved = true;
    const release = holdLeave(() => unsaved);
    expect(leaveAsks()).toBe(true);
    unsaved = false;
    expect(leaveAsks()).toBe(false);
    unsaved = true;
    release();
    expect(leaveAsks()).toBe(false);
    type('filter', 'BW');
    expect(leaveAsks()).toBe(false);
    el('ok').focus();
    el('ok').dispatchEvent(new Event('input', { bubbles: true }));
    expect(leaveAsks()).toBe(false);
  });

  it('a field that applies each valid keystroke (the designer’s shares) asks only while its text is refused', () => {
    type('pct', '32'); // applied to the draft as typed: nothing unsaved
    expect(unsavedTyping()).toBe(false);
    expect(leaveAsks()).toBe(false);
    type('pct', '3x');
    el('pct').setAttribute('aria-invalid', 'true'); // as the cell shows a refused entry
    expect(unsavedTyping()).toBe(true);
    expect(leaveAsks()).toBe(true);
  });
});
