// Conditions for unit tests of saved work, instead of fixed sleeps (s23 item 2).
import { vi } from 'vitest';
import { get as idbGet, createStore } from 'idb-keyval';
import { splitRecords } from '../../src/state/record-merge';
import { LIBRARY_SPEC } from '../../src/state/library';
import { RECIPES_SPEC } from '../../src/state/recipes';
import { SETTINGS_SPEC } from '../../src/state/settings';
import { WORKSPACE_SPEC } from '../../src/state/workspace';

type StateModule = typeof import('../../src/state');
type PersistenceModule = typeof import('../../src/state/persistence');
export interface SettlingTab {
  state: StateModule;
  persistence: PersistenceModule;
}

/** The next task (timers of 0 ms run in order): lets a message or a queued save arrive; no time is guessed. */
const nextTask = () => new Promise<void>((r) => setTimeout(r, 0));

/** Resolve once Date.now() is past `t` (a commit made after it carries a later stamp). */
export async function clockPast(t: number = Date.now()): Promise<void> {
  while (Date.now() <= t) await nextTask();
}

const SPECS = { library: LIBRARY_SPEC, recipes: RECIPES_SPEC, settings: SETTINGS_SPEC, workspace: WORKSPACE_SPEC } as const;
const STORES = Object.keys(SPECS) as Array<keyof typeof SPECS>;

/** JSON with every object's keys sorted (two copies of one state may list a map's entries in another order). */
const canonical = (v: unknown): string =>
  JSON.stringify(v, (_k, x: unknown) =>
    x && typeof x === 'object' && !Array.isArray(x) ? Object.fromEntries(Object.entries(x).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) : x,
  );

/**
 * The records of a store's data that are shared between tabs, as canonical JSON: not the tab's own fields
 * (the active recipe; the explorer's session, never taken from another tab) and not the blank records a
 * first QC entry brings with it (no entries: another tab does not take them, RecordLayout.blank).
 */
function shared(key: keyof typeof SPECS, data: unknown): string {
  const layout = SPECS[key].layout ?? {};
  const out: Array<[string, unknown]> = [];
  for (const [k, v] of splitRecords(data, layout)) {
    if (k === 'explorer' || layout.blank?.(k, v)) continue;
    out.push([k, v]);
  }
  return canonical(out.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
}

/**
 * Wait until every tab has nothing left to save and every tab holds what is stored (each has heard of
 * the others' saves and merged them). Throws after `maxTasks` tasks without agreement.
 */
export async function settleTabs(tabs: readonly SettlingTab[], maxTasks = 5_000): Promise<void> {
  const db = createStore('blendbench', 'saved-work');
  const agree = async () => {
    await Promise.all(tabs.map((t) => t.persistence.whenSaved()));
    const stored = await Promise.all(STORES.map((k) => idbGet(k, db)));
    return tabs.every((t) => STORES.every((k, j) => stored[j] === undefined || shared(k, (stored[j] as { state?: unknown }).state) === shared(k, t.state.persistedData(k))));
  };
  for (let i = 0; i < maxTasks; i++) {
    // Agreement that still holds a task later (no message left to answer, no save it would start).
    if ((await agree()) && (await nextTask(), await agree())) return;
    await nextTask();
  }
  const stored = await Promise.all(STORES.map((k) => idbGet(k, db)));
  const differ = tabs.flatMap((t, i) =>
    STORES.filter((k, j) => stored[j] !== undefined && shared(k, (stored[j] as { state?: unknown }).state) !== shared(k, t.state.persistedData(k))).map(
      (k) => `tab ${i}: ${k}`,
    ),
  );
  throw new Error(`settleTabs (${differ.join(', ')}): the tabs did not agree with what is stored within ${maxTasks} tasks`);
}

let started: StateModule | null = null;

/**
 * A fresh instance of the state modules over the same IndexedDB and sessionStorage — a start, or a
 * reload of the tab — started (the previous instance stops listening first).
 */
export async function restartTab(): Promise<SettlingTab> {
  started?.resetStartForTests();
  vi.resetModules();
  const state = await import('../../src/state');
  const persistence = await import('../../src/state/persistence');
  started = state;
  await state.startSavedWork({ requestPersistence: false });
  return { state, persistence };
}

/** Stop the last instance started by `restartTab` (afterEach). */
export function stopTab(): void {
  started?.resetStartForTests();
  started = null;
}
