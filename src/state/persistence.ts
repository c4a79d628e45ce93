/**
 * Saved work: an IndexedDB storage adapter (idb-keyval) for zustand's persist middleware, with a
 * schema version, migrations, zod validation of what is read back, and loud failure reporting.
 *
 * Rules this module keeps (a saved library is weeks of a blender's work):
 * - Stored data are validated before use. Unreadable or newer-schema data are never used and never
 *   overwritten silently: a raw copy is kept under a separate key, saving of that store is paused,
 *   and `useStorageStatus` carries a plain message the shell shows until the user decides.
 * - Older schemas are migrated step by step (`migrations[n]` turns version n into n + 1), then
 *   validated; the migrated copy is written back only after validation.
 * - A failed save (quota exceeded, storage unavailable) is recorded and shown; the previous stored
 *   copy stays intact because an IndexedDB write either commits whole or not at all.
 * - Writes are coalesced per store: while one write is in flight, only the newest state waits.
 */
import { createStore as createIdbStore, get as idbGet, set as idbSet, type UseStore } from 'idb-keyval';
import { create } from 'zustand';
import type { PersistStorage, StorageValue } from 'zustand/middleware';
import type { z } from 'zod';
import {
  joinRecords,
  mergeRecords,
  pruneGone,
  splitRecords,
  stampMaker,
  type RecordLayout,
  type RecordSet,
  type Stamp,
} from './record-merge';
import { applyCopy, pendingCopy, readLeaveCopy, writeLeaveCopies, writeLeaveCopy, type LeaveCopy } from './leave-copy';

export type StoreKey = 'library' | 'recipes' | 'settings' | 'workspace';
export const STORE_KEYS: readonly StoreKey[] = ['library', 'recipes', 'settings', 'workspace'];

export const STORE_LABEL: Record<StoreKey, string> = {
  library: 'component library',
  recipes: 'recipes',
  settings: 'settings',
  workspace: 'designer draft and explorer session',
};

/** Why a stored copy was not used. */
export interface StorageProblem {
  kind: 'newer-schema' | 'corrupt' | 'unreadable';
  /** Plain-language message for the user. */
  message: string;
  /** Key under which the untouched raw copy is kept (null if even that copy could not be written). */
  keptAs: string | null;
}

export interface StoreStatus {
  /** 'loading' until the stored copy has been read (or found missing / unusable). */
  phase: 'loading' | 'ready';
  /** Where the state in memory came from. */
  origin: 'stored' | 'migrated' | 'fresh' | 'problem' | null;
  problem: StorageProblem | null;
  /** True while saving is paused because the stored copy could not be used (see `problem`). */
  savingPaused: boolean;
  /** Last failed save, in plain words; null once a later save succeeds. */
  saveError: string | null;
  /** ISO time of the last successful save. */
  lastSavedAt: string | null;
  /** Set when the stored copy was written by an older schema and upgraded on loading. */
  upgraded: { from: number; to: number; keptAs: string | null } | null;
}

export type PersistentStorageState = 'unknown' | 'granted' | 'refused' | 'unsupported';

export interface StorageStatusState {
  stores: Record<StoreKey, StoreStatus>;
  /** Result of `navigator.storage.persist()`. */
  persistent: PersistentStorageState;
  /** Edits to library or recipes since the last export-all backup (this session). */
  editsSinceBackup: number;
  /** Message about a change made in another tab, or null. */
  externalChange: string | null;
}

const initialStoreStatus = (): StoreStatus => ({
  phase: 'loading',
  origin: null,
  problem: null,
  savingPaused: false,
  saveError: null,
  lastSavedAt: null,
  upgraded: null,
});

/** Status of saved work, for the shell's banners. Not persisted. */
export const useStorageStatus = create<StorageStatusState>()(() => ({
  stores: {
    library: initialStoreStatus(),
    recipes: initialStoreStatus(),
    settings: initialStoreStatus(),
    workspace: initialStoreStatus(),
  },
  persistent: 'unknown',
  editsSinceBackup: 0,
  externalChange: null,
}));

function patchStatus(key: StoreKey, patch: Partial<StoreStatus>): void {
  useStorageStatus.setState((s) => ({ stores: { ...s.stores, [key]: { ...s.stores[key], ...patch } } }));
}

// ---------------------------------------------------------------------------------------------
// IndexedDB handle

const DB_NAME = 'blendbench';
const OBJECT_STORE = 'saved-work';
let idb: UseStore | null = null;

/** The idb-keyval store holding Blendbench's saved work (database `blendbench`). */
export function savedWorkDb(): UseStore {
  idb ??= createIdbStore(DB_NAME, OBJECT_STORE);
  return idb;
}

/** Tests only: forget the cached database handle (e.g. after replacing the IndexedDB factory). */
export function resetSavedWorkDbForTests(): void {
  idb = null;
}

/** Key of the raw copy kept when stored data could not be used. */
export const keptCopyKey = (key: StoreKey): string => `${key}.unusable-copy`;
/** Key of the copy kept, untouched, before an older schema is upgraded. */
export const preUpgradeCopyKey = (key: StoreKey, fromVersion: number): string => `${key}.schema-${fromVersion}-copy`;

// ---------------------------------------------------------------------------------------------
// Reading: version check, migrations, validation (pure, testable)

/** The zod schemas module (./schemas.ts), loaded only when stored data or an import is read. */
export type SchemasModule = typeof import('./schemas');

let schemasModule: SchemasModule | null = null;
let schemasLoading: Promise<SchemasModule> | null = null;

/**
 * Load zod and the schemas of the stored data (once). The opening screen of a first visit needs
 * neither: they are fetched only when there is stored data to check (or a file to import).
 */
export function loadSchemas(): Promise<SchemasModule> {
  return (schemasLoading ??= import('./schemas').then((m) => (schemasModule = m)));
}

export interface StoreSpec<D> {
  key: StoreKey;
  /** Current schema version of this store's persisted data. */
  version: number;
  /** The zod schema of the persisted data at `version`, picked from the schemas module. */
  schema: (schemas: SchemasModule) => z.ZodType<D>;
  /** `migrations[n]` converts data at version n into version n + 1. */
  migrations: Record<number, (data: unknown) => unknown>;
  /** How the data divide into records for the per-record merge across tabs (default: one record per field). */
  layout?: RecordLayout;
  /** Merge saves made by other tabs into this tab (default true; false for a tab's own scratch pad). */
  crossTab?: boolean;
  /** Records merged in from another tab are not announced (they are not on this tab's screen). */
  quiet?: boolean;
  /**
   * Written with one blind put of this tab's copy as the page is hidden or left (default: the stores
   * not merged across tabs). A merged store's blind put holds every other tab's record as last heard of.
   */
  leaveWrite?: boolean;
}

export type LoadResult<D> =
  | { kind: 'empty' }
  | { kind: 'ok'; data: D; migratedFrom: number | null }
  /** `issues`: every refused field, one line each naming the record and the field (integrity check). */
  | { kind: 'problem'; problem: Omit<StorageProblem, 'keptAs'>; issues?: string[] };

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Interpret a raw stored value `{ state, version }`: migrate older versions, refuse newer ones,
 * validate the result. Never throws, except when called before the schemas are loaded (pass them,
 * or await {@link loadSchemas} first).
 */
export function interpretStored<D>(spec: StoreSpec<D>, raw: unknown, schemas: SchemasModule | null = schemasModule): LoadResult<D> {
  const what = STORE_LABEL[spec.key];
  if (raw === undefined || raw === null) return { kind: 'empty' };
  if (!schemas) throw new Error('interpretStored: the schemas are not loaded yet (await loadSchemas())');
  if (!isRecord(raw) || !('state' in raw) || typeof raw.version !== 'number' || !Number.isInteger(raw.version)) {
    return {
      kind: 'problem',
      problem: { kind: 'corrupt', message: `The saved ${what} is not in a form Blendbench recognises (no schema version).` },
    };
  }
  const storedVersion = raw.version;
  if (storedVersion > spec.version) {
    return {
      kind: 'problem',
      problem: {
        kind: 'newer-schema',
        message:
          `The saved ${what} was written by a newer version of Blendbench (schema ${storedVersion}; ` +
          `this version reads up to schema ${spec.version}). Open it with the newer version, or export it from there.`,
      },
    };
  }
  let data: unknown = raw.state;
  try {
    for (let v = storedVersion; v < spec.version; v++) {
      const step = spec.migrations[v];
      if (!step) throw new Error(`no migration from schema ${v} to ${v + 1}`);
      data = step(data);
    }
  } catch (e) {
    return {
      kind: 'problem',
      problem: { kind: 'corrupt', message: `The saved ${what} (schema ${storedVersion}) could not be upgraded: ${(e as Error).message}.` },
    };
  }
  const parsed = spec.schema(schemas).safeParse(data);
  if (!parsed.success) {
    return {
      kind: 'problem',
      problem: { kind: 'corrupt', message: `The saved ${what} failed its integrity check: ${schemas.describeStoredIssues(parsed.error, data)}.` },
      issues: schemas.storedIssueLines(parsed.error, data),
    };
  }
  return { kind: 'ok', data: parsed.data, migratedFrom: storedVersion < spec.version ? storedVersion : null };
}

// ---------------------------------------------------------------------------------------------
// Writing

function describeSaveError(e: unknown): string {
  const name = (e as { name?: string } | null)?.name ?? '';
  if (name === 'QuotaExceededError' || /quota/i.test(String((e as Error)?.message ?? e))) {
    return 'the browser has no more storage space for this site (quota exceeded)';
  }
  if (name === 'InvalidStateError' || name === 'UnknownError') return 'the browser storage is unavailable';
  return String((e as Error)?.message ?? e);
}

// ---------------------------------------------------------------------------------------------
// Records, stamps and tabs (issue 10 item 4)
//
// Each store's data is cut into records (record-merge.ts). Every record committed in this tab gets a
// stamp (commit time, tab, counter) when zustand hands the new state to `setItem`. A save is one
// IndexedDB read-write transaction: read the stored copy, merge it per record with this tab's records
// (a record changed only here → ours; changed only elsewhere → theirs; changed in both → the later
// commit), write the result if it differs from what is stored, then take the other tab's records into
// this tab (telling the user which) and tell the other tabs. Two tabs saving at once are serialised by
// IndexedDB, so no committed edit is lost.

const channelName = 'blendbench-saved-work';
const tabId = Array.from({ length: 10 }, () => Math.floor(Math.random() * 36).toString(36)).join('');
const nextStamp = stampMaker(tabId, () => Date.now());
let channel: BroadcastChannel | null = null;
function broadcast(key: StoreKey): void {
  try {
    if (typeof BroadcastChannel === 'undefined') return;
    channel ??= new BroadcastChannel(channelName);
    channel.postMessage({ key, tab: tabId });
  } catch {
    /* another tab simply will not be told */
  }
}

/** Listen for saves made by other tabs; returns an unsubscribe function. */
export function onSavedInOtherTab(cb: (key: StoreKey) => void): () => void {
  if (typeof BroadcastChannel === 'undefined') return () => {};
  const ch = new BroadcastChannel(channelName);
  ch.onmessage = (ev: MessageEvent) => {
    const d = ev.data as { key?: StoreKey; tab?: string } | null;
    if (d && d.tab !== tabId && d.key && STORE_KEYS.includes(d.key)) cb(d.key);
  };
  return () => ch.close();
}

/** How a store puts records merged from another tab into memory (set by the app at start). */
export type Applier = (data: unknown) => void;
const appliers = new Map<StoreKey, Applier>();
/** Register how merged data from another tab enters a store (its setState, clearing undo history). */
export function registerApplier(key: StoreKey, apply: Applier): () => void {
  appliers.set(key, apply);
  return () => appliers.delete(key);
}

interface SyncState {
  spec: StoreSpec<unknown>;
  layout: RecordLayout;
  /** This tab's records (by identity, as in memory) and their stamps. */
  mine: RecordSet;
  /** Stamps both this tab and storage agreed on at the last save or load. */
  base: Pick<RecordSet, 'stamps' | 'gone'>;
  /** The newest persisted state handed to setItem (holds the tab-local fields). */
  latest: unknown;
  /** The tab-local fields (RecordLayout.local) as stored at the last load or write, JSON; null before either. */
  savedLocal: string | null;
  /** True while records from another tab are being put into memory (not new commits). */
  applying: boolean;
  /** The next save replaces the stored copy outright (after an unusable copy was set aside). */
  force: boolean;
  /** Whether saves of other tabs are merged into this tab (false: this tab's copy only, e.g. a scratch pad). */
  crossTab: boolean;
  /** Written with a blind put as the page leaves (see StoreSpec.leaveWrite). */
  leaveWrite: boolean;
  /** A leave copy of this store's unsaved commits is in the tab's sessionStorage (leave-copy.ts). */
  copyKept: boolean;
  /** Records created blank in this tab (not stamped, see RecordLayout.blank) and not saved yet. */
  blankNew: Set<string>;
}
const syncs = new Map<StoreKey, SyncState>();
const emptySet = (): RecordSet => ({ records: new Map(), stamps: {}, gone: {} });

function syncOf<D>(spec: StoreSpec<D>): SyncState {
  let st = syncs.get(spec.key);
  if (!st) {
    st = {
      spec: spec as StoreSpec<unknown>,
      layout: spec.layout ?? {},
      mine: emptySet(),
      base: { stamps: {}, gone: {} },
      latest: null,
      savedLocal: null,
      applying: false,
      force: false,
      crossTab: spec.crossTab ?? true,
      leaveWrite: spec.leaveWrite ?? spec.crossTab === false,
      copyKept: false,
      blankNew: new Set(),
    };
    syncs.set(spec.key, st);
  }
  return st;
}

/** Record this tab's new state: every record whose object changed (or is new, or gone) gets a stamp. */
function commit(st: SyncState, state: unknown): void {
  st.latest = state;
  const next = splitRecords(state, st.layout);
  if (st.applying) {
    st.mine.records = next;
    return;
  }
  const { records, stamps, gone } = st.mine;
  const blank = st.layout.blank;
  for (const [k, v] of next) {
    if (!records.has(k) || records.get(k) !== v) {
      // Created blank (never here before, not even deleted): no entry, so no stamp (RecordLayout.blank).
      if (blank && !records.has(k) && !(k in gone) && !(k in stamps) && blank(k, v)) {
        st.blankNew.add(k);
        continue;
      }
      stamps[k] = nextStamp();
      delete gone[k];
    }
  }
  for (const k of records.keys()) {
    if (!next.has(k)) {
      gone[k] = nextStamp();
      delete stamps[k];
    }
  }
  st.mine.records = next;
}

const asStamps = (v: unknown): Record<string, Stamp> => {
  const out: Record<string, Stamp> = {};
  if (isRecord(v)) for (const [k, s] of Object.entries(v)) if (typeof s === 'string') out[k] = s;
  return out;
};

interface Queue {
  running: boolean;
  again: boolean;
  idle: Promise<void>;
  resolveIdle: (() => void) | null;
}
const queues = new Map<StoreKey, Queue>();

// The save queue's state, on the page's root element for tests and tools (s23 item 2): a test waits for
// `data-save-commits` to count its edit (the edit reached the stores' storage, where a save would be
// asked for) and `data-save-state` to read "idle" (no save under way) instead of sleeping. Attributes,
// not store state: nothing re-renders.
let commitsHandled = 0;
function markSaves(): void {
  if (typeof document === 'undefined' || !document.documentElement) return;
  const root = document.documentElement;
  root.dataset.saveState = [...queues.values()].some((q) => q.running) ? 'saving' : 'idle';
  root.dataset.saveCommits = String(commitsHandled);
}
/** Stores whose last save failed; retried once another save succeeds. */
const failedSaves = new Set<StoreKey>();

type SyncOutcome =
  | { kind: 'newer'; version: number }
  | { kind: 'saved'; merged: RecordSet & { fromTheirs: string[]; replacedMine: string[] }; wrote: boolean; snapshot: RecordSet; local: string };

/** The tab-local fields of a persisted state (e.g. the active recipe), as JSON, to tell when they changed. */
function localOf(layout: RecordLayout, state: unknown): string {
  const fields = layout.local ?? [];
  return JSON.stringify(fields.map((f) => (isRecord(state) ? state[f] : undefined) ?? null));
}

/** One save: read, merge and (if needed) write in a single IndexedDB transaction. */
function saveOnce(key: StoreKey, st: SyncState): Promise<SyncOutcome> {
  const snapshot: RecordSet = { records: new Map(st.mine.records), stamps: { ...st.mine.stamps }, gone: { ...st.mine.gone } };
  const local = st.latest;
  const force = st.force;
  const version = st.spec.version;
  return savedWorkDb()('readwrite', (store) => {
    return new Promise<SyncOutcome>((resolve, reject) => {
      let outcome: SyncOutcome | null = null;
      const tx = store.transaction;
      tx.oncomplete = () => (outcome ? resolve(outcome) : reject(new Error('the save did not finish')));
      tx.onabort = () => reject(tx.error ?? new Error('the save was aborted'));
      const req = store.get(key);
      req.onsuccess = () => {
        try {
          const raw: unknown = req.result;
          const storedVersion = isRecord(raw) && typeof raw.version === 'number' ? raw.version : null;
          if (!force && storedVersion !== null && storedVersion > version) {
            outcome = { kind: 'newer', version: storedVersion };
            return;
          }
          const theirsUsable = !force && st.crossTab && isRecord(raw) && storedVersion === version && 'state' in raw;
          const theirs: RecordSet = theirsUsable
            ? { records: splitRecords(raw.state, st.layout), stamps: asStamps(raw.stamps), gone: asStamps(raw.gone) }
            : emptySet();
          const merged = theirsUsable
            ? mergeRecords(st.base, snapshot, theirs)
            : { ...snapshot, fromTheirs: [], replacedMine: [], differsFromTheirs: true };
          // A change of this tab's local fields alone (another recipe made active) is written too, so a
          // reload opens what the tab last worked on; a tab that only heard of another tab's save writes
          // nothing for them (its local fields have not changed since it last wrote or read them).
          const localNow = localOf(st.layout, local);
          const wrote = merged.differsFromTheirs || (st.savedLocal !== null && localNow !== st.savedLocal);
          if (wrote) {
            const value = {
              state: joinRecords(merged.records, st.layout, local),
              version,
              stamps: merged.stamps,
              gone: pruneGone(merged.gone, Date.now()),
            };
            store.put(value, key);
          }
          outcome = { kind: 'saved', merged, wrote, snapshot, local: localNow };
        } catch (e) {
          tx.abort();
          reject(e);
        }
      };
    });
  });
}

const MAX_NAMED = 4;
function nameRecords(st: SyncState, keys: readonly string[], values: Map<string, unknown>): string {
  const label = st.layout.label ?? ((k: string) => k);
  const names = keys.slice(0, MAX_NAMED).map((k) => label(k, values.get(k)));
  return keys.length > MAX_NAMED ? `${names.join(', ')} and ${keys.length - MAX_NAMED} more` : names.join(', ');
}

/** Put records saved by another tab into memory, keeping this tab's commits made meanwhile, and say which. */
function takeFromOtherTab(key: StoreKey, st: SyncState, snapshot: RecordSet, merged: RecordSet & { replacedMine: string[] }): void {
  // Commits made in this tab while the save ran are newer than the snapshot: they stay.
  const now = mergeRecords({ stamps: snapshot.stamps, gone: snapshot.gone }, st.mine, merged);
  if (now.fromTheirs.length === 0) return;
  const apply = appliers.get(key);
  if (!apply) return;
  st.mine = { records: now.records, stamps: now.stamps, gone: now.gone };
  st.applying = true;
  try {
    apply(joinRecords(now.records, st.layout, st.latest));
  } finally {
    st.applying = false;
  }
  if (st.spec.quiet) return;
  // Only records whose value this tab sees change are named (two tabs may commit the same value, e.g.
  // the blank QC fields both write as a recipe's first QC entry is made).
  const differs = (k: string) =>
    now.records.has(k) !== snapshot.records.has(k) || JSON.stringify(now.records.get(k)) !== JSON.stringify(snapshot.records.get(k));
  const replaced = merged.replacedMine.filter((k) => now.fromTheirs.includes(k) && differs(k));
  const changed = now.fromTheirs.filter((k) => !merged.replacedMine.includes(k) && differs(k));
  if (replaced.length === 0 && changed.length === 0) return;
  const values = new Map([...now.records, ...snapshot.records]);
  const parts: string[] = [];
  if (changed.length) {
    parts.push(
      changed.length === 1
        ? `${capitalise(nameRecords(st, changed, values))} was changed in another Blendbench tab; this tab now shows that version`
        : `Records changed in another Blendbench tab: ${nameRecords(st, changed, values)}; this tab now shows those versions`,
    );
  }
  if (replaced.length) {
    parts.push(
      `Your edit of ${nameRecords(st, replaced, values)} was replaced by a later edit of the same record in another Blendbench tab (the later commit wins)`,
    );
  }
  useStorageStatus.setState({ externalChange: `${parts.join('. ')} (undo history cleared).` });
}

const capitalise = (t: string) => t.charAt(0).toUpperCase() + t.slice(1);

async function drain(key: StoreKey, q: Queue): Promise<void> {
  while (q.again) {
    q.again = false;
    const st = syncs.get(key);
    const status = useStorageStatus.getState().stores[key];
    if (!st || status.savingPaused || status.phase !== 'ready') continue;
    try {
      const outcome = await saveOnce(key, st);
      if (outcome.kind === 'newer') {
        patchStatus(key, {
          savingPaused: true,
          problem: {
            kind: 'newer-schema',
            message:
              `The saved ${STORE_LABEL[key]} was written by a newer version of Blendbench in another tab (schema ${outcome.version}; ` +
              `this version reads up to schema ${st.spec.version}). This tab stops saving it; use the newer version.`,
            keptAs: null,
          },
        });
        continue;
      }
      st.force = false;
      st.base = { stamps: outcome.merged.stamps, gone: outcome.merged.gone };
      if (outcome.wrote) st.savedLocal = outcome.local;
      for (const k of st.blankNew) if (outcome.snapshot.records.has(k)) st.blankNew.delete(k);
      // Only hidden, not gone: once everything committed here is saved, the leave copy has done its part.
      if (st.copyKept && unsavedOf(st) === null) st.copyKept = !writeLeaveCopy(key, null);
      patchStatus(key, { saveError: null, lastSavedAt: new Date().toISOString() });
      if (outcome.wrote) broadcast(key);
      takeFromOtherTab(key, st, outcome.snapshot, outcome.merged);
      failedSaves.delete(key);
      // Storage works again: retry the other stores' failed saves.
      for (const other of [...failedSaves]) {
        failedSaves.delete(other);
        requestSave(other);
      }
    } catch (e) {
      failedSaves.add(key);
      patchStatus(key, {
        saveError:
          `Saving the ${STORE_LABEL[key]} failed: ${describeSaveError(e)}. ` +
          'The last saved copy is kept; your latest changes exist only in this tab. Export a backup now.',
      });
    }
  }
  q.running = false;
  q.resolveIdle?.();
  q.resolveIdle = null;
  markSaves();
}

/** Save this store (merging with what other tabs saved); coalesced while a save is running. */
function requestSave(key: StoreKey): void {
  let q = queues.get(key);
  if (!q) {
    q = { running: false, again: false, idle: Promise.resolve(), resolveIdle: null };
    queues.set(key, q);
  }
  q.again = true;
  if (holdTabOnlySaves && syncs.get(key)?.leaveWrite) return;
  if (!q.running) {
    q.running = true;
    const queue = q;
    q.idle = new Promise((r) => (queue.resolveIdle = r));
    markSaves();
    void drain(key, q);
  }
}

/** Another tab saved `key`: merge its records into this tab (and save this tab's own pending ones). */
export function mergeFromOtherTab(key: StoreKey): void {
  const st = syncs.get(key);
  if (st?.crossTab) requestSave(key);
}

// Deferred writes: a store updated after the frame rather than on the input's path (the designer's
// draft) registers how to write what it holds back. It is written at once when the page is hidden or
// left (pagehide, visibilitychange → hidden), before the app shows another screen, and before
// `whenSaved` waits, so no edit is lost to a reload, a closed tab or a switch of screen.
const deferredWrites = new Set<() => void>();
let pageListeners = false;

/** Write what is pending as the page is hidden or left (once per page; the stores and deferred writers call it). */
function listenForLeaving(): void {
  if (pageListeners || typeof window === 'undefined' || typeof document === 'undefined') return;
  pageListeners = true;
  window.addEventListener('pagehide', () => flushDeferredWrites(true));
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'hidden') flushDeferredWrites(true);
  });
}

/** Register a deferred writer's flush (it writes its pending state now, if any); returns an unregister function. */
export function registerDeferredWrite(flush: () => void): () => void {
  deferredWrites.add(flush);
  listenForLeaving();
  return () => deferredWrites.delete(flush);
}

/**
 * Write every deferred writer's pending state now (synchronously into its store, whose save starts at
 * once). `leaving` (the page is hidden or left): a store written as the page leaves (`leaveWrite`: the
 * stores kept for this tab only, and the tabs' drafts) that is ready (not upgraded and still unsaved) is
 * also written with one blind put issued in this task, as a save's read-then-write would not finish
 * once the page is gone.
 */
export function flushDeferredWrites(leaving = false): void {
  if (!leaving) {
    for (const flush of [...deferredWrites]) flush();
    return;
  }
  // The blind puts' transactions must come first: a save's read-then-write transaction queued before
  // them on the same object store would hold them back until the page is gone (and both would abort).
  holdTabOnlySaves = true;
  try {
    for (const flush of [...deferredWrites]) flush();
  } finally {
    holdTabOnlySaves = false;
  }
  for (const [key, st] of syncs) {
    if (!st.leaveWrite) continue;
    writeLeaving(key, st);
    // Only hidden, not gone (another tab in front): the usual save follows.
    setTimeout(() => requestSave(key), 0);
  }
  // Neither the blind puts nor the saves under way are sure to finish before a reload: every store's
  // unsaved commits are also copied, synchronously, into the tab's sessionStorage (leave-copy.ts). The
  // IndexedDB writes are issued first: a copy too large for sessionStorage is simply not kept.
  keepLeaveCopies();
}

/** The records committed in this tab since its last finished save (and changed tab-local fields), or null. */
function unsavedOf(st: SyncState): ReturnType<typeof pendingCopy> {
  const fields = st.layout.local ?? [];
  const localNow = fields.length > 0 ? localOf(st.layout, st.latest) : null;
  const local =
    localNow !== null && localNow !== st.savedLocal && isRecord(st.latest)
      ? Object.fromEntries(fields.map((f) => [f, (st.latest as Record<string, unknown>)[f] ?? null]))
      : null;
  return pendingCopy(st.mine, st.base, st.spec.version, local, st.blankNew);
}

/**
 * Copy every store's unsaved commits into the tab's sessionStorage (or remove a copy nothing needs now),
 * the smallest copies first (writeLeaveCopies). Never throws: the page's leaving must not be held up.
 */
function keepLeaveCopies(): void {
  const copies: Array<[StoreKey, LeaveCopy | null]> = [];
  for (const [key, st] of syncs) {
    try {
      const status = useStorageStatus.getState().stores[key];
      if (status.phase !== 'ready' || status.savingPaused || st.latest === null) continue;
      const copy = unsavedOf(st);
      if (copy === null && !st.copyKept) continue;
      copies.push([key, copy]);
    } catch {
      /* this store's copy is not kept; the others' still are */
    }
  }
  if (copies.length === 0) return;
  const kept = writeLeaveCopies(copies);
  for (const [key, copy] of copies) syncs.get(key)!.copyKept = copy !== null && kept.has(key);
}
/** While true, a leave-written store's save is not started (flushDeferredWrites writes it with a blind put). */
let holdTabOnlySaves = false;

/**
 * One blind put of this tab's copy of a store (no merge: a tab-only store holds no other tab's records;
 * a merged one holds every other tab's records as this tab last heard of them, and a record changed
 * since in another tab is written again by that tab's next save, as it is newer than what they agreed on).
 */
function writeLeaving(key: StoreKey, st: SyncState): void {
  const status = useStorageStatus.getState().stores[key];
  if (status.phase !== 'ready' || status.savingPaused || st.latest === null) return;
  // A copy upgraded from an older schema is first written back by its own save, after the original is
  // kept; until then no blind put. Otherwise a store read as it is may be written although it has not
  // saved in this page yet (an edit right after a reload is kept).
  if (status.lastSavedAt === null && status.upgraded !== null) return;
  const value = {
    state: joinRecords(st.mine.records, st.layout, st.latest),
    version: st.spec.version,
    stamps: { ...st.mine.stamps },
    gone: pruneGone(st.mine.gone, Date.now()),
  };
  void savedWorkDb()('readwrite', (store) => {
    store.put(value, key);
    store.transaction.commit?.(); // committed now, not when the (leaving) page's task ends
    return Promise.resolve();
  }).catch(() => {
    /* the page is leaving: the save queued by the flush is the fallback */
  });
}

/** Resolves when every queued save has finished (successfully or not); pending deferred writes are written first. */
export async function whenSaved(): Promise<void> {
  flushDeferredWrites();
  await Promise.all([...queues.values()].map((q) => q.idle));
}

// ---------------------------------------------------------------------------------------------
// The adapter

/**
 * A PersistStorage for zustand's persist middleware. `getItem` returns data already migrated to
 * `spec.version` and validated (so persist's own `migrate` never runs), or null when there is
 * nothing usable (the status then says why). `setItem` stamps the records this tab changed and
 * saves them (merged per record with other tabs); it never throws: failures go to the status.
 */
export function idbPersistStorage<D>(spec: StoreSpec<D>): PersistStorage<D> {
  return {
    async getItem(): Promise<StorageValue<D> | null> {
      const st = syncOf(spec);
      listenForLeaving();
      let raw: unknown;
      try {
        raw = await idbGet(spec.key, savedWorkDb());
      } catch (e) {
        patchStatus(spec.key, {
          phase: 'ready',
          origin: 'problem',
          savingPaused: true,
          problem: {
            kind: 'unreadable',
            message: `The saved ${STORE_LABEL[spec.key]} could not be read: ${describeSaveError(e)}.`,
            keptAs: null,
          },
        });
        return null;
      }
      // zod and the schemas are fetched only when there is something stored to check.
      const result = raw === undefined || raw === null ? ({ kind: 'empty' } as const) : interpretStored(spec, raw, await loadSchemas());
      if (result.kind === 'empty') {
        // Nothing stored: a first start (or one whose first save was cut off by a reload). A leave copy
        // of the tab's whole data (written before its first save finished) is that data: it is taken and
        // saved; any other copy has nothing to be laid over and is dropped.
        const copy = readLeaveCopy(spec.key);
        const restored = copy?.whole && copy.version === spec.version ? (await loadSchemas(), takeLeaveCopy(spec, st, {} as D)) : null;
        if (restored === null) writeLeaveCopy(spec.key, null);
        patchStatus(spec.key, { phase: 'ready', origin: 'fresh', problem: null, savingPaused: false });
        if (restored === null) return null;
        requestSave(spec.key);
        return { state: restored, version: spec.version };
      }
      if (result.kind === 'problem') {
        let keptAs: string | null = keptCopyKey(spec.key);
        try {
          await idbSet(keptAs, { keptAt: new Date().toISOString(), reason: result.problem.message, raw }, savedWorkDb());
        } catch {
          keptAs = null;
        }
        patchStatus(spec.key, {
          phase: 'ready',
          origin: 'problem',
          savingPaused: true,
          problem: { ...result.problem, keptAs },
        });
        return null;
      }
      // This tab starts from the stored records and their stamps (none in copies written before stamps).
      const stored = result.migratedFrom === null && isRecord(raw) ? raw : null;
      st.latest = result.data;
      st.savedLocal = localOf(st.layout, result.data);
      st.mine = {
        records: splitRecords(result.data, st.layout),
        stamps: stored ? asStamps(stored.stamps) : {},
        gone: stored ? asStamps(stored.gone) : {},
      };
      st.base = { stamps: { ...st.mine.stamps }, gone: { ...st.mine.gone } };
      let data = result.data;
      const restored = takeLeaveCopy(spec, st, data);
      if (restored !== null) data = restored;
      let upgraded: StoreStatus['upgraded'] = null;
      let writeBack = false;
      if (result.migratedFrom !== null) {
        // Keep the original before the upgraded copy replaces it; if that copy cannot be written,
        // leave the original in place (the upgrade simply runs again at the next start).
        let keptAs: string | null = preUpgradeCopyKey(spec.key, result.migratedFrom);
        try {
          await idbSet(keptAs, { keptAt: new Date().toISOString(), reason: `copy before the upgrade from schema ${result.migratedFrom}`, raw }, savedWorkDb());
        } catch {
          keptAs = null;
        }
        upgraded = { from: result.migratedFrom, to: spec.version, keptAs };
        writeBack = keptAs !== null;
      }
      patchStatus(spec.key, {
        phase: 'ready',
        origin: result.migratedFrom === null ? 'stored' : 'migrated',
        problem: null,
        savingPaused: false,
        upgraded,
      });
      if (writeBack || restored !== null) requestSave(spec.key);
      return { state: data, version: spec.version };
    },
    setItem(_name: string, value: StorageValue<D>): void {
      const st = syncOf(spec);
      const status = useStorageStatus.getState().stores[spec.key];
      if (status.phase !== 'ready') return;
      commit(st, value.state);
      commitsHandled++;
      if (status.savingPaused || st.applying) return markSaves();
      requestSave(spec.key);
      markSaves();
    },
    removeItem(): void {
      /* never called by Blendbench: stored work is only replaced, never deleted */
    },
  };
}

/**
 * At a start: the records of this tab's leave copy (leave-copy.ts) committed later than what IndexedDB
 * holds, put into `stored` (the stored data just read into `st`); null when none is taken. The copy is
 * removed once read; the records taken count as this tab's unsaved commits, so the store's next save
 * writes them through (and a page left again at once copies them again). A result the store's schema
 * refuses is not used.
 */
function takeLeaveCopy<D>(spec: StoreSpec<D>, st: SyncState, stored: D): D | null {
  const copy = readLeaveCopy(spec.key);
  if (copy === null) return null;
  writeLeaveCopy(spec.key, null);
  if (copy.version !== spec.version || !schemasModule) return null;
  const { set, taken } = applyCopy(st.mine, copy);
  const local = copy.local && isRecord(stored) ? { ...stored, ...copy.local } : stored;
  if (taken.length === 0 && local === stored) return null;
  const parsed = spec.schema(schemasModule).safeParse(joinRecords(set.records, st.layout, local));
  if (!parsed.success) return null;
  const data = parsed.data;
  st.latest = data;
  st.mine = { records: splitRecords(data, st.layout), stamps: set.stamps, gone: set.gone };
  // Blank records taken (a first QC entry's blank fields) are copied again if the page leaves again at once.
  for (const k of taken) if (!(k in set.stamps) && !(k in set.gone)) st.blankNew.add(k);
  return data;
}

/**
 * After the user has seen the problem: resume saving this store, so the state now in memory
 * (demo or fresh) replaces the unusable stored copy. The raw copy stays under `keptCopyKey(key)`.
 */
export function resumeSaving(key: StoreKey, currentData: unknown, _version: number): void {
  patchStatus(key, { savingPaused: false, problem: null, origin: 'fresh' });
  const st = syncs.get(key);
  if (!st) return;
  commit(st, currentData);
  st.force = true;
  requestSave(key);
}

/** The raw copy kept after a problem (for download), or undefined. */
export async function readKeptCopy(key: StoreKey): Promise<unknown> {
  return idbGet(keptCopyKey(key), savedWorkDb());
}

/** Write the current state now (e.g. first start, so the demo is saved). */
export function saveNow(key: StoreKey, data: unknown, _version: number): void {
  const status = useStorageStatus.getState().stores[key];
  const st = syncs.get(key);
  if (status.savingPaused || !st) return;
  commit(st, data);
  requestSave(key);
}

/** Ask the browser to keep our storage (not evict it under pressure) and record the answer. */
let persistRequests = 0;
export async function requestPersistentStorage(): Promise<PersistentStorageState> {
  // The latest request's answer is the state (a slow first answer must not overwrite a later one).
  const mine = ++persistRequests;
  let result: PersistentStorageState = 'unsupported';
  try {
    if (typeof navigator !== 'undefined' && navigator.storage?.persist) {
      const already = navigator.storage.persisted ? await navigator.storage.persisted() : false;
      result = already || (await navigator.storage.persist()) ? 'granted' : 'refused';
    }
  } catch {
    result = 'refused';
  }
  if (mine === persistRequests) useStorageStatus.setState({ persistent: result });
  return result;
}

export function noteEdit(): void {
  useStorageStatus.setState((s) => ({ editsSinceBackup: s.editsSinceBackup + 1 }));
}

export function noteBackupTaken(): void {
  useStorageStatus.setState({ editsSinceBackup: 0 });
}
