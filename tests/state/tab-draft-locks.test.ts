// s23 item 3: with Web Locks each tab holds a lock named after its draft key, so which drafts open
// tabs hold is the browser's answer — certain for a busy tab that answers no question — and a kept
// draft is opened only if its lock is taken first. A deterministic in-memory lock manager stands in for
// the browser's (navigator.locks: exclusive locks, `ifAvailable` requests, `query`); no timing.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { memoryLocks } from '../helpers/memory-locks';

type TabDraft = typeof import('../../src/state/tab-draft');

/** A fresh instance of the module: another tab (or the same tab after a reload). */
async function tab(): Promise<TabDraft> {
  vi.resetModules();
  return import('../../src/state/tab-draft');
}

let locks: ReturnType<typeof memoryLocks>;
/** A lock let go is free once its holder's promise has settled (a few microtasks, as in the browser). */
const letGo = (key: string) => vi.waitFor(() => expect(locks.held.has(`blendbench-draft:${key}`)).toBe(false));
beforeEach(() => {
  locks = memoryLocks();
  vi.stubGlobal('navigator', { locks });
});
afterEach(() => {
  vi.unstubAllGlobals();
});

describe('draft keys held with Web Locks (s23 item 3)', () => {
  it('a busy tab that answers no question still holds its draft: not listed as kept, and its claim is refused', async () => {
    const busy = await tab(); // it never answers on the BroadcastChannel
    const key = busy.ownDraftKey();
    await busy.leaveSharedKey();
    expect(locks.held).toEqual(new Set([`blendbench-draft:${key}`]));
    const other = await tab();
    await other.leaveSharedKey();
    const mine = other.ownDraftKey();
    expect(await other.draftKeysLocked()).toEqual(new Set([key, mine]));
    expect(await other.claimDraftKey(key)).toBe(false);
    expect(other.ownDraftKey()).toBe(mine);
    // The busy tab opens another draft: its old key is free, and the first claim of it wins.
    busy.adoptDraftKey('tab-elsewhere');
    await letGo(key);
    expect(await other.draftKeysLocked()).toEqual(new Set(['tab-elsewhere', mine]));
    expect(await other.claimDraftKey(key)).toBe(true);
    other.adoptDraftKey(key);
    expect(await busy.claimDraftKey(key)).toBe(false);
    await letGo(mine);
    expect(await other.draftKeysLocked()).toEqual(new Set(['tab-elsewhere', key])); // the other's old key let go
  });

  it('a duplicated tab (its sessionStorage a copy, key and all) takes a key of its own without waiting for answers', async () => {
    const first = await tab();
    const shared = first.ownDraftKey();
    await first.leaveSharedKey();
    const dup = await tab();
    dup.adoptDraftKey(shared);
    await dup.leaveSharedKey();
    expect(dup.ownDraftKey()).not.toBe(shared);
    expect(first.ownDraftKey()).toBe(shared);
    expect(await dup.draftKeysLocked()).toEqual(new Set([shared, dup.ownDraftKey()]));
  });

  it('a reload keeps the tab’s key: the page gone lets go of its lock', async () => {
    const before = await tab();
    const key = before.ownDraftKey();
    await before.leaveSharedKey();
    before.answerDraftQuestions()(); // the page is gone: its locks are let go
    await letGo(key);
    const after = await tab();
    after.adoptDraftKey(key); // the tab's sessionStorage still holds its key
    await after.leaveSharedKey();
    expect(after.ownDraftKey()).toBe(key);
  });
});
