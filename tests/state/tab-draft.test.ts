// A duplicated tab's draft key (src/state/tab-draft.ts): the other tab's answer counts even when it
// comes after the first wait, as it does on a loaded machine (found when a full test run at load 12
// left a duplicated tab on the first tab's key).
import { afterEach, describe, expect, it, vi } from 'vitest';

type TabDraft = typeof import('../../src/state/tab-draft');

async function freshTab(): Promise<TabDraft> {
  vi.resetModules();
  return import('../../src/state/tab-draft');
}

const open: Array<() => void> = [];
afterEach(() => {
  for (const close of open.splice(0)) close();
});

describe('a duplicated tab takes a draft key of its own', () => {
  it('when the first tab answers at once', async () => {
    const first = await freshTab();
    open.push(first.answerDraftQuestions());
    const shared = first.ownDraftKey();
    const dup = await freshTab();
    dup.adoptDraftKey(shared); // its sessionStorage is a copy, key and all
    open.push(dup.answerDraftQuestions());
    await dup.leaveSharedKey();
    await vi.waitFor(() => expect(dup.ownDraftKey()).not.toBe(shared), { timeout: 10_000 });
    expect(first.ownDraftKey()).toBe(shared);
  });

  it('when the answer comes after the wait is over (a late answer still changes the key)', async () => {
    const dup = await freshTab();
    dup.adoptDraftKey('tab-shared-key');
    open.push(dup.answerDraftQuestions());
    // The "first tab": answers the question only after the duplicate has stopped waiting.
    const other = new BroadcastChannel('blendbench-drafts');
    open.push(() => other.close());
    other.onmessage = (ev: MessageEvent) => {
      const m = ev.data as { kind: string; ask: string };
      if (m.kind === 'who') setTimeout(() => other.postMessage({ kind: 'mine', ask: m.ask, key: 'tab-shared-key' }), 100);
    };
    await dup.leaveSharedKey(10, 10_000);
    expect(dup.ownDraftKey()).toBe('tab-shared-key'); // no answer yet
    await vi.waitFor(() => expect(dup.ownDraftKey()).not.toBe('tab-shared-key'), { timeout: 10_000 });
  });

  it('an answer with another key leaves this tab’s key alone', async () => {
    const dup = await freshTab();
    dup.adoptDraftKey('tab-mine');
    open.push(dup.answerDraftQuestions());
    const other = new BroadcastChannel('blendbench-drafts');
    open.push(() => other.close());
    let answered = false;
    other.onmessage = (ev: MessageEvent) => {
      const m = ev.data as { kind: string; ask: string };
      if (m.kind === 'who') {
        other.postMessage({ kind: 'mine', ask: m.ask, key: 'tab-someone-else' });
        answered = true;
      }
    };
    await dup.leaveSharedKey(10, 10_000);
    await vi.waitFor(() => expect(answered).toBe(true), { timeout: 10_000 });
    // The answer has been read once a later answer of the same tab is: one sender's messages arrive in
    // the order sent, and the other tab answers this second question after the first.
    await new Promise<void>((heard) => open.push(dup.askOpenTabs(() => heard())));
    expect(dup.ownDraftKey()).toBe('tab-mine');
  });
});

describe('the draft keys of the open tabs, heard however late (s22)', () => {
  it('askOpenTabs hears every open tab, the one answering at once and the one answering after the wait', async () => {
    const a = await freshTab();
    open.push(a.answerDraftQuestions());
    const asker = await freshTab();
    open.push(asker.answerDraftQuestions());
    // A second open tab, answering only well after the first wait (ANSWER_WAIT_MS) is over.
    const late = new BroadcastChannel('blendbench-drafts');
    open.push(() => late.close());
    late.onmessage = (ev: MessageEvent) => {
      const m = ev.data as { kind: string; ask: string };
      if (m.kind === 'who') setTimeout(() => late.postMessage({ kind: 'mine', ask: m.ask, key: 'tab-busy' }), 4 * asker.ANSWER_WAIT_MS);
    };
    const heard = new Set<string>();
    const stop = asker.askOpenTabs((k) => heard.add(k));
    open.push(stop);
    await vi.waitFor(() => expect([...heard].sort()).toEqual([a.ownDraftKey(), 'tab-busy'].sort()), { timeout: 10_000 });
  });
});
