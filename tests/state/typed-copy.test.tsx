// @vitest-environment jsdom
// s24 item 1b: text typed in a field but not committed (no Enter, Tab or leaving the field) is kept
// across a reload as typed text — copied into the tab's sessionStorage as the page is hidden, put back
// into the same field after the reload, focused and marked, and never saved until the blender commits it
// (a half-typed "32" on the way to "320" must not be stored). A "reload" is a fresh render of the same
// fields with the modules installed again over the same sessionStorage; no timing. Values are invented
// (common practice (no source)).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render } from '@testing-library/react';
import { NumberField, TextField } from '../../src/components/fields';
import { FractionInput } from '../../src/features/designer/FractionInput';
import { installLeaveWarning } from '../../src/state/leave-guard';
import { installTypedCopy, readTypedCopy, RESTORED_ATTR, TYPED_COPY_KEY, useTypedNote, writeTypedCopy } from '../../src/state/typed-copy';

const commits: Array<[string, unknown]> = [];

/** Two Stocks-like rows (ν40 in each, drawn as text until edited) and a visible-label name field. */
function Fields() {
  return (
    <div>
      <TextField label="Recipe name" value="Trial A" onCommit={(v) => commits.push(['name', v])} />
      <table>
        <tbody>
          {['s1', 's2'].map((id) => (
            <tr key={id} data-row-key={id}>
              <td>
                <NumberField label="ν40" hideLabel textUntilEdited value={id === 's1' ? 220 : 460} onCommit={(v) => commits.push([id, v])} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <TextField label="Search" value="" onCommit={() => {}} className="filter" />
    </div>
  );
}

let stops: Array<() => void> = [];
/** Start a page: the modules installed, the fields drawn. */
function startPage() {
  stops = [installLeaveWarning(window), installTypedCopy(window)];
  return render(<Fields />);
}
function leavePage(view: ReturnType<typeof render>) {
  window.dispatchEvent(new Event('pagehide'));
  for (const stop of stops) stop();
  view.unmount();
  cleanup();
}
const cell = (view: ReturnType<typeof render>, row: string) =>
  view.container.querySelector<HTMLElement>(`tr[data-row-key="${row}"] input, tr[data-row-key="${row}"] [role="textbox"]`)!;

beforeEach(() => {
  sessionStorage.clear();
  commits.length = 0;
  useTypedNote.setState({ note: null });
  window.location.hash = '#/library';
});
afterEach(() => {
  for (const stop of stops) stop();
  stops = [];
  cleanup();
});

describe('typed text kept across a reload, never saved by it (s24 item 1b)', () => {
  it('a Stocks cell typed into and not committed: back in the same row’s field after the reload, focused, marked, not saved until Enter', async () => {
    let view = startPage();
    fireEvent.click(cell(view, 's2')); // the text cell opens as a field, focused
    const field = cell(view, 's2') as HTMLInputElement;
    expect(document.activeElement).toBe(field);
    fireEvent.input(field, { target: { value: '32' } }); // on the way to 320
    leavePage(view);
    expect(commits).toEqual([]); // nothing saved as the page left
    expect(readTypedCopy()).toEqual({ screen: '#/library', name: 'ν40', row: 's2', nth: 0, text: '32' });

    view = startPage();
    // Put back as the field is drawn (the page's changes are watched: a microtask after the render).
    await act(async () => {});
    expect(cell(view, 's2').tagName).toBe('INPUT');
    const back = cell(view, 's2') as HTMLInputElement;
    expect(back.value).toBe('32');
    expect(document.activeElement).toBe(back);
    expect(back.hasAttribute(RESTORED_ATTR)).toBe(true);
    expect(cell(view, 's1').tagName).not.toBe('INPUT'); // the other row untouched
    expect(useTypedNote.getState().note).toEqual({ state: 'back', name: 'ν40', text: '32' });
    expect(commits).toEqual([]); // put back, not saved
    expect(sessionStorage.getItem(TYPED_COPY_KEY)).toBeNull();
    // The blender finishes typing and commits: saved with the usual checks, the mark and notice gone.
    fireEvent.input(back, { target: { value: '320' } });
    fireEvent.keyDown(back, { key: 'Enter' });
    expect(commits).toEqual([['s2', 320]]);
    await act(async () => {});
    expect(back.hasAttribute(RESTORED_ATTR)).toBe(false);
    expect(useTypedNote.getState().note).toBeNull();
  });

  it('a field with a visible label; Escape drops the text put back (the stored value stays)', async () => {
    let view = startPage();
    const name = view.getByLabelText('Recipe name') as HTMLInputElement;
    name.focus();
    fireEvent.input(name, { target: { value: 'Trial A, half-ty' } });
    leavePage(view);
    view = startPage();
    const back = view.getByLabelText('Recipe name') as HTMLInputElement;
    await act(async () => {});
    expect(back.value).toBe('Trial A, half-ty');
    expect(document.activeElement).toBe(back);
    fireEvent.keyDown(back, { key: 'Escape' });
    expect(back.value).toBe('Trial A');
    expect(commits).toEqual([]);
  });

  it('nothing is copied for a field committed before the page left, a filter, or text typed on another screen', async () => {
    let view = startPage();
    const name = view.getByLabelText('Recipe name') as HTMLInputElement;
    name.focus();
    fireEvent.input(name, { target: { value: 'Trial B' } });
    fireEvent.keyDown(name, { key: 'Enter' });
    expect(commits).toEqual([['name', 'Trial B']]);
    leavePage(view);
    expect(readTypedCopy()).toBeNull();

    view = startPage();
    const search = view.getByLabelText('Search') as HTMLInputElement;
    search.closest('span')!.setAttribute('data-no-leave-warning', '');
    search.focus();
    fireEvent.input(search, { target: { value: 'BW' } });
    leavePage(view);
    expect(readTypedCopy()).toBeNull();

    // A copy from another screen (the address changed before this start) is not put into a field of this one.
    writeTypedCopy({ screen: '#/designer', name: 'Recipe name', row: null, nth: 0, text: 'From the designer' });
    view = startPage();
    await act(async () => {});
    expect((view.getByLabelText('Recipe name') as HTMLInputElement).value).toBe('Trial A');
    expect(useTypedNote.getState().note).toEqual({ state: 'missing', name: 'Recipe name', text: 'From the designer' });
  });

  it('a field not drawn yet is waited for; the blender acting first gets the text in the notice instead', async () => {
    writeTypedCopy({ screen: '#/library', name: 'ν40', row: 's9', nth: 0, text: '68' });
    stops = [installLeaveWarning(window), installTypedCopy(window)];
    const view = render(<Fields />);
    // Not drawn (a row scrolled out, or a stock deleted meanwhile): nothing put anywhere yet, the copy
    // still kept if the page is left again now.
    window.dispatchEvent(new Event('pagehide'));
    expect(readTypedCopy()?.text).toBe('68');
    fireEvent.pointerDown(view.container);
    expect(useTypedNote.getState().note).toEqual({ state: 'missing', name: 'ν40', text: '68' });
    expect(commits).toEqual([]);
  });

  it('a field drawn after the start (a screen loaded later) is found when it appears', async () => {
    window.location.hash = '#/designer';
    let view = startPage();
    const name = view.getByLabelText('Recipe name') as HTMLInputElement;
    name.focus();
    fireEvent.input(name, { target: { value: 'Trial C' } });
    leavePage(view);
    stops = [installLeaveWarning(window), installTypedCopy(window)];
    view = render(<p>Opening saved work…</p>);
    view.rerender(<Fields />);
    await act(async () => {});
    expect((view.getByLabelText('Recipe name') as HTMLInputElement).value).toBe('Trial C');
    expect(commits).toEqual([]);
  });

  it('a designer share cell, which applies each valid keystroke to the draft: valid text is not copied (it is saved), refused text is', () => {
    let share = 0.4;
    const edits: number[] = [];
    const source = { get: () => share, subscribe: () => () => {} };
    const page = () => {
      stops = [installLeaveWarning(window), installTypedCopy(window)];
      return render(<FractionInput label="Mass % of BW-240" share={source} onEdit={(f) => { share = f; edits.push(f); }} />);
    };
    let view = page();
    act(() => view.getByLabelText('Mass % of BW-240').focus()); // the text cell becomes the field
    let field = view.getByLabelText('Mass % of BW-240') as HTMLInputElement;
    fireEvent.input(field, { target: { value: '32' } });
    expect(edits).toEqual([0.32]); // applied as typed
    leavePage(view);
    expect(readTypedCopy()).toBeNull();

    view = page();
    act(() => view.getByLabelText('Mass % of BW-240').focus());
    field = view.getByLabelText('Mass % of BW-240') as HTMLInputElement;
    fireEvent.input(field, { target: { value: '3x' } });
    expect(field.getAttribute('aria-invalid')).toBe('true');
    expect(edits).toEqual([0.32]); // refused: the draft keeps 32 %
    leavePage(view);
    expect(readTypedCopy()).toMatchObject({ name: 'Mass % of BW-240', text: '3x' });
  });
});
