/**
 * Which designer draft belongs to this tab (s21 item 1). Each tab keeps its unsaved draft in the
 * workspace store under a key of its own, held in the tab's sessionStorage: a reload of the tab keeps
 * the key (and so finds its draft), a new tab gets a new one. The tabs open now answer a question on a
 * BroadcastChannel ("which drafts are yours?"), so a tab offers only the drafts no open tab holds, and
 * a duplicated tab (whose sessionStorage is a copy, key and all) takes a key of its own.
 *
 * Where the browser has Web Locks (s23 item 3), each tab also holds a lock named after its draft key
 * for as long as the key is its own. The browser answers for a busy tab: the drafts open tabs hold are
 * the locks held (no wait for answers), a kept draft is opened only if its lock is taken here first (a
 * claim no other tab can make at the same time), and a duplicated tab finds its copied key's lock held
 * and takes a new key. Without Web Locks the tabs' answers on the BroadcastChannel decide, as before.
 */

const SESSION_KEY = 'blendbench.draft-key';
const CHANNEL = 'blendbench-drafts';

/** A new draft key, not any tab's (also the key of a draft set aside: see `newDraftKey`). */
const newKey = (): string => `tab-${Date.now().toString(36)}-${Array.from({ length: 6 }, () => Math.floor(Math.random() * 36).toString(36)).join('')}`;

let own: string | null = null;

function session(): Storage | null {
  try {
    return typeof sessionStorage === 'undefined' ? null : sessionStorage;
  } catch {
    return null; // storage refused (privacy settings): the key lives as long as the page
  }
}

/** This tab's draft key (the same across reloads of the tab). */
export function ownDraftKey(): string {
  if (own) return own;
  const store = session();
  let key: string | null = null;
  try {
    key = store?.getItem(SESSION_KEY) ?? null;
  } catch {
    key = null;
  }
  own = key ?? newKey();
  if (!key) rememberKey(own);
  return own;
}

function rememberKey(key: string): void {
  try {
    session()?.setItem(SESSION_KEY, key);
  } catch {
    /* the key lives as long as the page */
  }
}

/**
 * A key for a draft kept apart from this tab's (s22 item 2: a draft set aside when another recipe is
 * opened over its unsaved edits). No tab answers to it, so every tab offers it as a kept draft.
 */
export function newDraftKey(): string {
  return newKey();
}

/** Make `key` this tab's draft key (the blender opened the draft kept under it). */
export function adoptDraftKey(key: string): void {
  const before = own;
  own = key;
  rememberKey(key);
  if (before !== null && before !== key) releaseLock(before);
  if (lockManager() && !heldLocks.has(key)) void holdLock(key);
}

// ---------------------------------------------------------------------------------------------
// Web Locks: one lock per draft key, held by the tab whose key it is.

const LOCK_PREFIX = 'blendbench-draft:';
type Locks = Pick<LockManager, 'request' | 'query'>;
/** The locks this tab holds: draft key → release. */
const heldLocks = new Map<string, () => void>();

function lockManager(): Locks | null {
  try {
    return typeof navigator !== 'undefined' && navigator.locks ? navigator.locks : null;
  } catch {
    return null;
  }
}

/** Take the lock of `key` for this tab if no other tab holds it; true when this tab holds it now. */
function holdLock(key: string): Promise<boolean> {
  const locks = lockManager();
  if (!locks) return Promise.resolve(true);
  if (heldLocks.has(key)) return Promise.resolve(true);
  return new Promise<boolean>((resolve) => {
    locks
      .request(LOCK_PREFIX + key, { ifAvailable: true }, (lock) => {
        if (!lock) {
          resolve(false);
          return undefined;
        }
        resolve(true);
        // Held until released here (the key is no longer this tab's) or the page is gone.
        return new Promise<void>((release) => heldLocks.set(key, release));
      })
      .catch(() => resolve(false));
  });
}

function releaseLock(key: string): void {
  heldLocks.get(key)?.();
  heldLocks.delete(key);
}

/**
 * Take the kept draft of `key` for this tab before it is opened here: true when no open tab holds it
 * (this tab now holds its lock; `adoptDraftKey` then makes it the tab's key), false when another tab
 * does. Without Web Locks `true` at once (the list offered only drafts no tab answered for).
 */
export function claimDraftKey(key: string): Promise<boolean> | true {
  return lockManager() ? holdLock(key) : true;
}

/**
 * Let go of a kept draft's key claimed here (`claimDraftKey`) but not opened: the draft vanished in the
 * meantime (saved or discarded in another tab). This tab's own key is never let go here; without Web
 * Locks nothing is held.
 */
export function releaseDraftClaim(key: string): void {
  if (key !== own) releaseLock(key);
}

/** The draft keys whose locks open tabs hold (this tab's too), or null without Web Locks. */
export async function draftKeysLocked(): Promise<Set<string> | null> {
  const locks = lockManager();
  if (!locks) return null;
  try {
    const { held } = await locks.query();
    return new Set((held ?? []).flatMap((l) => (l.name?.startsWith(LOCK_PREFIX) ? [l.name.slice(LOCK_PREFIX.length)] : [])));
  } catch {
    return null;
  }
}

type Message = { kind: 'who'; ask: string } | { kind: 'mine'; ask: string; key: string };

let channel: BroadcastChannel | null = null;
/** Open questions of this tab: the question's id → what to do with each answer (a key another tab holds). */
const waiting = new Map<string, (key: string) => void>();

function openChannel(): BroadcastChannel | null {
  if (channel) return channel;
  if (typeof BroadcastChannel === 'undefined') return null;
  try {
    channel = new BroadcastChannel(CHANNEL);
  } catch {
    return null;
  }
  channel.onmessage = (ev: MessageEvent) => {
    const m = ev.data as Message | null;
    if (!m || typeof m !== 'object') return;
    if (m.kind === 'who') channel?.postMessage({ kind: 'mine', ask: m.ask, key: ownDraftKey() } satisfies Message);
    else if (m.kind === 'mine') waiting.get(m.ask)?.(m.key);
  };
  return channel;
}

/** Answer the other tabs' question from now on; returns a function that stops answering (and lets go of this tab's locks). */
export function answerDraftQuestions(): () => void {
  openChannel();
  return () => {
    channel?.close();
    channel = null;
    waiting.clear();
    for (const key of [...heldLocks.keys()]) releaseLock(key);
  };
}

/** How long a tab waits for the other tabs' answers [ms] (a tab answers within a task or two). */
export const ANSWER_WAIT_MS = 150;

/**
 * How long a duplicated tab keeps listening for a late answer carrying its own key [ms]. On a loaded
 * machine another tab may answer after ANSWER_WAIT_MS; the answer still counts (the key is changed
 * when it arrives), so a slow answer never leaves two tabs writing one draft.
 */
const LATE_ANSWER_MS = 30_000;

/** Post a question to the open tabs; `onKey` is told each key an open tab holds, until `stop()`. */
function ask(onKey: (key: string) => void): { stop: () => void } | null {
  const ch = openChannel();
  if (!ch) return null;
  const id = newKey();
  waiting.set(id, onKey);
  ch.postMessage({ kind: 'who', ask: id } satisfies Message);
  return { stop: () => waiting.delete(id) };
}

/**
 * Ask the other open tabs for their draft keys: `onKey` hears each key answered, however late it comes
 * (s22: on a loaded machine an open tab may answer after ANSWER_WAIT_MS, and its answer must still
 * count, e.g. to take its draft off another tab's list of kept drafts). Returns a function that stops
 * listening.
 */
export function askOpenTabs(onKey: (key: string) => void): () => void {
  const q = ask(onKey);
  return q ? q.stop : () => {};
}

/** The draft keys of the other tabs open now (those that answer within ANSWER_WAIT_MS). */
export function draftKeysOfOpenTabs(waitMs = ANSWER_WAIT_MS): Promise<Set<string>> {
  const keys = new Set<string>();
  const q = ask((key) => keys.add(key));
  if (!q) return Promise.resolve(keys);
  return new Promise((resolve) =>
    setTimeout(() => {
      q.stop();
      resolve(keys);
    }, waitMs),
  );
}

/**
 * A duplicated tab starts with a copy of the other tab's sessionStorage, key and all: when another
 * open tab answers with this tab's key, this tab takes a new one (the draft it restored is written
 * under the new key from its next change; the other tab's draft stays the other tab's). The promise
 * settles after ANSWER_WAIT_MS; an answer arriving later (up to LATE_ANSWER_MS) still changes the key.
 */
export async function leaveSharedKey(waitMs = ANSWER_WAIT_MS, lateMs = LATE_ANSWER_MS): Promise<void> {
  const mine = ownDraftKey();
  if (lockManager()) {
    // The browser says whether another tab holds this key (a duplicated tab's copy): no answer to wait for.
    if (!(await holdLock(mine)) && own === mine) adoptDraftKey(newKey());
    return;
  }
  const q = ask((key) => {
    if (key === mine && own === mine) adoptDraftKey(newKey());
  });
  if (!q) return Promise.resolve();
  setTimeout(() => q.stop(), Math.max(waitMs, lateMs));
  return new Promise((resolve) => setTimeout(resolve, waitMs));
}

/** Tests only: forget this module's key (as a new tab would not know it). */
export function forgetDraftKeyForTests(): void {
  own = null;
}
