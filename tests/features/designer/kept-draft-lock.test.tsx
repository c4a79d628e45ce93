// @vitest-environment jsdom
// s24 item 3: a kept draft is opened only once this tab has taken its Web Lock (claimDraftKey). When
// the draft vanished while the claim was pending (saved or discarded in another tab), nothing is opened
// — and the lock taken for it must be let go, or no tab could ever claim that key again and the browser
// would count it as an open tab's draft for as long as this page lives. A deterministic in-memory lock
// manager stands in for the browser's, with a gate that holds a claim until the test lets it through;
// no timing. Names and shares are invented (common practice (no source)).
import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { act, fireEvent, within } from '@testing-library/react';
import { designerTabHooks, editDraft as edit, openDesignerTab as openTab, settleDesignerTabs as settle } from '../../helpers/designer-tabs';
import { memoryLocks } from '../../helpers/memory-locks';

designerTabHooks();
let locks: ReturnType<typeof memoryLocks>;
beforeEach(() => {
  locks = memoryLocks();
  Object.defineProperty(navigator, 'locks', { value: locks, configurable: true });
});
afterEach(() => {
  delete (navigator as { locks?: unknown }).locks;
});

describe('a kept draft that vanished while this tab claimed it (s24 item 3)', () => {
  it('is not opened, and its lock is let go (this tab keeps its own)', async () => {
    const a = await openTab();
    edit(a, 'Trial saved elsewhere', -0.05);
    await settle();
    const key = a.key;
    await a.close(); // closed with its edits unsaved: its draft is kept, its lock let go
    await vi.waitFor(() => expect(locks.held.has(`blendbench-draft:${key}`)).toBe(false));

    const b = await openTab();
    const list = await b.view.findByTestId('kept-drafts', {}, { timeout: 5000 });
    const letThrough = locks.gate(`blendbench-draft:${key}`);
    fireEvent.click(within(list).getByRole('button', { name: /^Open the draft kept/ }));
    // Meanwhile another tab saved or discarded the draft: it is no longer kept.
    act(() => b.state.useWorkspaceStore.getState().keepDraft(key, null));
    await act(async () => letThrough());
    await vi.waitFor(() => expect(locks.held.has(`blendbench-draft:${key}`)).toBe(false));
    expect(b.designer.getState().name).not.toBe('Trial saved elsewhere');
    expect(b.state.ownDraftKey()).not.toBe(key);
    expect(locks.held.has(`blendbench-draft:${b.state.ownDraftKey()}`)).toBe(true); // its own key stays held
  });
});
