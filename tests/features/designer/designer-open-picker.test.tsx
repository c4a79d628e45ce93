// @vitest-environment jsdom
// Session 22 item 2: the designer's "Open" picker, chosen while this tab's draft holds unsaved edits,
// asks first ("Discard the unsaved edits to …?") instead of dropping them: the blender keeps them as a
// kept draft (offered again by name and time, as a closed tab's draft is), discards them, or cancels.
// Each "tab" is a fresh instance of the app's modules over one IndexedDB (fake-indexeddb), as in
// designer-tabs.test.tsx (tests/helpers/designer-tabs.tsx). Shares and names are invented (common practice (no source)).
import 'fake-indexeddb/auto';
import { describe, expect, it } from 'vitest';
import { fireEvent, within } from '@testing-library/react';
import { designerTabHooks, editDraft as edit, openDesignerTab as openTab, settleDesignerTabs as settle, type DesignerTab as Tab } from '../../helpers/designer-tabs';

/** Choose `value` in the Open picker ('' = a new blank recipe) and press its Open button. */
function pick(t: Tab, value: string) {
  fireEvent.change(t.view.getByLabelText('Open', { selector: 'select' }), { target: { value } });
  fireEvent.click(t.view.getByRole('button', { name: 'Open' }));
}

const question = (t: Tab) => t.view.queryByRole('alertdialog', { name: /^Discard the unsaved edits/ });

designerTabHooks();

describe('the Open picker with unsaved edits (s22 item 2)', () => {
  it('asks before another recipe replaces the unsaved edits; Cancel keeps them as they are', async () => {
    const a = await openTab();
    edit(a, 'Trial with edits', -0.05);
    const lines = a.designer.getState().lines;
    pick(a, 'demo-vg460');
    const q = question(a);
    expect(q).not.toBeNull();
    expect(q!.textContent).toMatch(/Discard the unsaved edits to “Trial with edits”\?/);
    expect(q!.textContent).toMatch(/Opening “Gear oil VG 460/);
    // Nothing is replaced while the question stands.
    expect(a.designer.getState()).toMatchObject({ name: 'Trial with edits', dirty: true, lines });
    fireEvent.click(within(q!).getByRole('button', { name: 'Cancel' }));
    expect(question(a)).toBeNull();
    expect((a.view.getByLabelText('Open', { selector: 'select' }) as HTMLSelectElement).value).toBe(a.designer.getState().sourceRecipeId);
    expect(a.designer.getState()).toMatchObject({ name: 'Trial with edits', dirty: true, lines });
  });

  it('Escape or Cancel gives the focus back to the Open picker, so the keyboard goes on from there (s25 walk)', async () => {
    // Before: the question closed and the focus fell to the page's start.
    const a = await openTab();
    edit(a, 'Trial with edits', -0.05);
    const picker = a.view.getByLabelText('Open', { selector: 'select' });
    pick(a, 'demo-vg460');
    fireEvent.keyDown(question(a)!, { key: 'Escape' });
    expect(question(a)).toBeNull();
    expect(document.activeElement).toBe(picker);
    pick(a, 'demo-vg460');
    fireEvent.click(within(question(a)!).getByRole('button', { name: 'Cancel' }));
    expect(document.activeElement).toBe(picker);
  });

  it('“Keep my edits as a draft” opens the other recipe and offers the edits by name, kept across a reload', async () => {
    const a = await openTab();
    edit(a, 'Trial with edits', -0.05);
    const lines = a.designer.getState().lines;
    pick(a, 'demo-vg460');
    fireEvent.click(within(question(a)!).getByRole('button', { name: /^Keep my edits as a draft/ }));
    expect(a.designer.getState().sourceRecipeId).toBe('demo-vg460');
    expect(a.designer.getState().dirty).toBe(false);
    expect(a.view.getByText(/Your unsaved edits to “Trial with edits” are kept as a draft/)).toBeTruthy();
    await settle();
    // Kept under a key of its own (not this tab's, whose draft is now the opened recipe).
    const kept = Object.entries(a.state.useWorkspaceStore.getState().drafts);
    expect(kept).toHaveLength(1);
    expect(kept[0]![0]).not.toBe(a.state.ownDraftKey());
    expect(kept[0]![1]).toMatchObject({ name: 'Trial with edits', dirty: true, lines });
    const list = await a.view.findByTestId('kept-drafts', {}, { timeout: 5000 });
    expect(list.textContent).toMatch(/Open the draft kept at \d\d:\d\d — \d+ stocks, VG \d+, “Trial with edits”/);

    // Still there after a reload of the tab; opening it brings the edits back.
    const key = a.state.ownDraftKey();
    await a.close();
    const a2 = await openTab(key);
    expect(a2.designer.getState().dirty).toBe(false); // a saved recipe, not the kept draft picked silently
    const list2 = await a2.view.findByTestId('kept-drafts', {}, { timeout: 5000 });
    fireEvent.click(within(list2).getByRole('button', { name: /^Open the draft kept/ }));
    expect(a2.designer.getState()).toMatchObject({ name: 'Trial with edits', dirty: true, lines });
  });

  it('“Discard my edits” opens the other recipe (or a blank one) and keeps nothing', async () => {
    const a = await openTab();
    edit(a, 'Trial to throw away', -0.05);
    pick(a, '');
    const q = question(a)!;
    expect(q.textContent).toMatch(/Opening a new blank recipe/);
    fireEvent.click(within(q).getByRole('button', { name: /^Discard my edits/ }));
    expect(question(a)).toBeNull();
    expect(a.designer.getState()).toMatchObject({ sourceRecipeId: null, dirty: false, name: '' });
    await settle();
    expect(a.state.useWorkspaceStore.getState().drafts).toEqual({});
  });

  it('with nothing unsaved the Open picker opens at once, without a question', async () => {
    const a = await openTab();
    pick(a, 'demo-vg460');
    expect(question(a)).toBeNull();
    expect(a.designer.getState().sourceRecipeId).toBe('demo-vg460');
  });
});
