// @vitest-environment jsdom
// Session 21 item 1: the kept designer draft belongs to the tab, not the browser. Two tabs editing
// drafts each get their own back on their own reload (before, the tab that wrote last was the one a
// reload of either restored); a tab opened fresh while other drafts are kept offers them by name and
// time instead of picking one; a saved or discarded draft is removed. Each "tab" is a fresh instance
// of the app's modules over one IndexedDB (fake-indexeddb), with its own sessionStorage draft key.
// Shares and names are invented (common practice (no source)).
import 'fake-indexeddb/auto';
import { describe, expect, it, vi } from 'vitest';
import { act, fireEvent, within } from '@testing-library/react';
import { designerTabHooks, editDraft as edit, openDesignerTab as openTab, settleDesignerTabs as settle } from '../../helpers/designer-tabs';

designerTabHooks();

describe('designer drafts in two tabs (s21 item 1)', () => {
  it('each tab gets its own unsaved draft back on its own reload, whichever wrote last', async () => {
    const a = await openTab();
    const b = await openTab();
    expect(a.key).not.toBe(b.key);
    edit(a, 'Draft of tab A', -0.05);
    await settle();
    edit(b, 'Draft of tab B', 0.04);
    await settle();
    edit(a, 'Draft of tab A, later', -0.06); // tab A writes last
    await settle();
    const aLines = a.designer.getState().lines;
    const bLines = b.designer.getState().lines;

    const bKey = b.key;
    await b.close();
    const b2 = await openTab(bKey); // tab B reloads
    expect(b2.key).toBe(bKey);
    expect(b2.designer.getState().name).toBe('Draft of tab B');
    expect(b2.designer.getState().lines).toEqual(bLines);
    expect(b2.designer.getState().dirty).toBe(true);

    const aKey = a.key;
    await a.close();
    const a2 = await openTab(aKey); // tab A reloads
    expect(a2.designer.getState().name).toBe('Draft of tab A, later');
    expect(a2.designer.getState().lines).toEqual(aLines);
    // Both drafts are kept, each under its tab's key.
    expect(Object.keys(a2.state.useWorkspaceStore.getState().drafts).sort()).toEqual([aKey, bKey].sort());
  });

  /** Hold back the open tabs' answers to "which drafts are yours?" by `ms`, as by a busy tab. */
  function answersLate(ms: number): void {
    const post = BroadcastChannel.prototype.postMessage;
    vi.spyOn(BroadcastChannel.prototype, 'postMessage').mockImplementation(function (this: BroadcastChannel, message: unknown) {
      if ((message as { kind?: string } | null)?.kind !== 'mine') return post.call(this, message);
      setTimeout(() => {
        try {
          post.call(this, message);
        } catch {
          /* the channel was closed meanwhile */
        }
      }, ms);
    });
  }

  for (const late of [false, true]) {
    it(`a tab opened fresh offers the drafts no open tab holds, by name and time, and picks none silently${late ? ' (the open tab answering late, s22)' : ''}`, async () => {
      const a = await openTab();
      edit(a, 'Closed tab’s trial', -0.05);
      const b = await openTab();
      edit(b, 'Open tab’s trial', 0.03);
      await settle();
      await a.close(); // tab A is closed with its edits unsaved; tab B stays open
      if (late) answersLate(600); // tab B answers well past the first wait (DRAFT_ANSWER_WAIT_MS, 150 ms)
      const c = await openTab();
      expect(c.designer.getState().dirty).toBe(false); // the active recipe, not another tab's draft
      expect(c.designer.getState().name).not.toMatch(/trial/);
      const list = await c.view.findByTestId('kept-drafts', {}, { timeout: 5000 });
      // The open tab's draft is that tab's: not offered (once it has answered, however late).
      await vi.waitFor(() => expect(within(list).getAllByRole('listitem')).toHaveLength(1), { timeout: 5000 });
      const items = within(list).getAllByRole('listitem');
      expect(items[0]!.textContent).toMatch(/Open the draft kept at \d\d:\d\d — \d+ stocks, VG 320, “Closed tab’s trial”/);
      fireEvent.click(within(items[0]!).getByRole('button', { name: /^Open the draft kept/ }));
      expect(c.designer.getState().name).toBe('Closed tab’s trial');
      expect(c.designer.getState().dirty).toBe(true);
      expect(c.view.getByText(/Opened the draft kept at/)).toBeTruthy();
      expect(c.state.ownDraftKey()).toBe(a.key); // it is this tab's draft now
    });
  }

  it('a saved draft is removed; a discarded one only after a second click', async () => {
    const a = await openTab();
    edit(a, 'Saved trial', -0.05);
    await settle();
    expect(Object.keys(a.state.useWorkspaceStore.getState().drafts)).toEqual([a.key]);
    act(() => a.designer.getState().markSaved(a.designer.getState().sourceRecipeId!));
    await settle();
    expect(a.state.useWorkspaceStore.getState().drafts).toEqual({});

    edit(a, 'Unwanted trial', -0.04);
    await settle();
    await a.close();
    const b = await openTab();
    const list = await b.view.findByTestId('kept-drafts', {}, { timeout: 5000 });
    fireEvent.click(within(list).getByRole('button', { name: /^Discard the draft kept/ }));
    expect(Object.keys(b.state.useWorkspaceStore.getState().drafts)).toHaveLength(1); // not yet
    fireEvent.click(within(list).getByRole('button', { name: 'Discard it' }));
    await settle();
    expect(b.state.useWorkspaceStore.getState().drafts).toEqual({});
    expect(b.view.queryByTestId('kept-drafts')).toBeNull();
  });

  it('a draft kept longer than OLD_DRAFT_DAYS is pointed out for discarding, never deleted', async () => {
    const a = await openTab();
    edit(a, 'Old trial', -0.05);
    await settle();
    const kept = a.state.useWorkspaceStore.getState().drafts[a.key]!;
    const old = new Date(Date.now() - (a.state.OLD_DRAFT_DAYS + 3) * 86_400_000).toISOString();
    act(() => a.state.useWorkspaceStore.getState().keepDraft(a.key, { ...kept, keptAt: old }));
    const aKey = a.key;
    await a.close();
    const b = await openTab();
    const note = await b.view.findByTestId('kept-draft-old', {}, { timeout: 5000 });
    expect(note.textContent).toMatch(new RegExp(`kept ${b.state.OLD_DRAFT_DAYS + 3} days ago: discard it if it is no longer needed`));
    expect(Object.keys(b.state.useWorkspaceStore.getState().drafts)).toEqual([aKey]);
  });

  it('a duplicated tab (its sessionStorage a copy, key and all) takes a key of its own: its edits never replace the first tab’s draft', async () => {
    const a = await openTab();
    edit(a, 'First tab’s trial', -0.05);
    await settle();
    const b = await openTab(a.key); // the duplicate starts with the first tab's key and its draft
    expect(b.designer.getState().name).toBe('First tab’s trial');
    // The first tab answers the duplicate's question (however late, on a loaded machine): a key of its own.
    await vi.waitFor(() => expect(b.state.ownDraftKey()).not.toBe(a.key), { timeout: 10_000 });
    edit(b, 'Duplicate’s trial', 0.02);
    await settle();
    const drafts = a.state.useWorkspaceStore.getState().drafts;
    expect(drafts[a.key]!.name).toBe('First tab’s trial');
    expect(drafts[b.state.ownDraftKey()]!.name).toBe('Duplicate’s trial');
  });
});
