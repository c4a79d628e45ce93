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
import { describeStoredIssues, storedIssueLines } from './schemas';

export type StoreKey = 'library' | 'recipes' | 'settings';
export const STORE_KEYS: readonly StoreKey[] = ['library', 'recipes', 'settings'];

export const STORE_LABEL: Record<StoreKey, string> = {
  library: 'component library',
  recipes: 'recipes',
  settings: 'settings',
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
  stores: { library: initialStoreStatus(), recipes: initialStoreStatus(), settings: initialStoreStatus() },
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

export interface StoreSpec<D> {
  key: StoreKey;
  /** Current schema version of this store's persisted data. */
  version: number;
  /** zod schema of the persisted data at `version`. */
  schema: z.ZodType<D>;
  /** `migrations[n]` converts data at version n into version n + 1. */
  migrations: Record<number, (data: unknown) => unknown>;
}

export type LoadResult<D> =
  | { kind: 'empty' }
  | { kind: 'ok'; data: D; migratedFrom: number | null }
  /** `issues`: every refused field, one line each naming the record and the field (integrity check). */
  | { kind: 'problem'; problem: Omit<StorageProblem, 'keptAs'>; issues?: string[] };

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Interpret a raw stored value `{ state, version }`: migrate older versions, refuse newer ones,
 * validate the result. Never throws.
 */
export function interpretStored<D>(spec: StoreSpec<D>, raw: unknown): LoadResult<D> {
  const what = STORE_LABEL[spec.key];
  if (raw === undefined || raw === null) return { kind: 'empty' };
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
  const parsed = spec.schema.safeParse(data);
  if (!parsed.success) {
    return {
      kind: 'problem',
      problem: { kind: 'corrupt', message: `The saved ${what} failed its integrity check: ${describeStoredIssues(parsed.error, data)}.` },
      issues: storedIssueLines(parsed.error, data),
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

const channelName = 'blendbench-saved-work';
const tabId = Math.random().toString(36).slice(2);
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

interface WriteQueue {
  writing: boolean;
  pending: StorageValue<unknown> | null;
  idle: Promise<void>;
  resolveIdle: (() => void) | null;
}
const queues = new Map<StoreKey, WriteQueue>();
/** The newest value of each store whose last save failed; retried once another save succeeds. */
const failedWrites = new Map<StoreKey, StorageValue<unknown>>();

async function drain(key: StoreKey, q: WriteQueue): Promise<void> {
  while (q.pending) {
    const value = q.pending;
    q.pending = null;
    try {
      await idbSet(key, value, savedWorkDb());
      patchStatus(key, { saveError: null, lastSavedAt: new Date().toISOString() });
      broadcast(key);
      failedWrites.delete(key);
      // Storage works again: retry the other stores' failed saves (a failing retry does not retry again).
      for (const [other, v] of [...failedWrites]) {
        const busy = queues.get(other);
        if (busy?.writing || busy?.pending) continue; // a newer value is on its way
        failedWrites.delete(other);
        enqueueWrite(other, v);
      }
    } catch (e) {
      failedWrites.set(key, value);
      patchStatus(key, {
        saveError:
          `Saving the ${STORE_LABEL[key]} failed: ${describeSaveError(e)}. ` +
          'The last saved copy is kept; your latest changes exist only in this tab. Export a backup now.',
      });
    }
  }
  q.writing = false;
  q.resolveIdle?.();
  q.resolveIdle = null;
}

function enqueueWrite(key: StoreKey, value: StorageValue<unknown>): void {
  let q = queues.get(key);
  if (!q) {
    q = { writing: false, pending: null, idle: Promise.resolve(), resolveIdle: null };
    queues.set(key, q);
  }
  q.pending = value;
  if (!q.writing) {
    q.writing = true;
    const queue = q;
    q.idle = new Promise((r) => (queue.resolveIdle = r));
    void drain(key, q);
  }
}

/** Resolves when every queued save has finished (successfully or not). */
export async function whenSaved(): Promise<void> {
  await Promise.all([...queues.values()].map((q) => q.idle));
}

// ---------------------------------------------------------------------------------------------
// The adapter

/**
 * A PersistStorage for zustand's persist middleware. `getItem` returns data already migrated to
 * `spec.version` and validated (so persist's own `migrate` never runs), or null when there is
 * nothing usable (the status then says why). `setItem` never throws: failures go to the status.
 */
export function idbPersistStorage<D>(spec: StoreSpec<D>): PersistStorage<D> {
  return {
    async getItem(): Promise<StorageValue<D> | null> {
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
      const result = interpretStored(spec, raw);
      if (result.kind === 'empty') {
        patchStatus(spec.key, { phase: 'ready', origin: 'fresh', problem: null, savingPaused: false });
        return null;
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
      let upgraded: StoreStatus['upgraded'] = null;
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
        if (keptAs) enqueueWrite(spec.key, { state: result.data, version: spec.version });
      }
      patchStatus(spec.key, {
        phase: 'ready',
        origin: result.migratedFrom === null ? 'stored' : 'migrated',
        problem: null,
        savingPaused: false,
        upgraded,
      });
      return { state: result.data, version: spec.version };
    },
    setItem(_name: string, value: StorageValue<D>): void {
      const status = useStorageStatus.getState().stores[spec.key];
      if (status.savingPaused || status.phase !== 'ready') return;
      enqueueWrite(spec.key, value);
    },
    removeItem(): void {
      /* never called by Blendbench: stored work is only replaced, never deleted */
    },
  };
}

/**
 * After the user has seen the problem: resume saving this store, so the state now in memory
 * (demo or fresh) replaces the unusable stored copy. The raw copy stays under `keptCopyKey(key)`.
 */
export function resumeSaving(key: StoreKey, currentData: unknown, version: number): void {
  patchStatus(key, { savingPaused: false, problem: null, origin: 'fresh' });
  enqueueWrite(key, { state: currentData, version });
}

/** The raw copy kept after a problem (for download), or undefined. */
export async function readKeptCopy(key: StoreKey): Promise<unknown> {
  return idbGet(keptCopyKey(key), savedWorkDb());
}

/** Write the current state now (e.g. first start, so the demo is saved). */
export function saveNow(key: StoreKey, data: unknown, version: number): void {
  const status = useStorageStatus.getState().stores[key];
  if (status.savingPaused) return;
  enqueueWrite(key, { state: data, version });
}

/** Ask the browser to keep our storage (not evict it under pressure) and record the answer. */
export async function requestPersistentStorage(): Promise<PersistentStorageState> {
  let result: PersistentStorageState = 'unsupported';
  try {
    if (typeof navigator !== 'undefined' && navigator.storage?.persist) {
      const already = navigator.storage.persisted ? await navigator.storage.persisted() : false;
      result = already || (await navigator.storage.persist()) ? 'granted' : 'refused';
    }
  } catch {
    result = 'refused';
  }
  useStorageStatus.setState({ persistent: result });
  return result;
}

export function noteEdit(): void {
  useStorageStatus.setState((s) => ({ editsSinceBackup: s.editsSinceBackup + 1 }));
}

export function noteBackupTaken(): void {
  useStorageStatus.setState({ editsSinceBackup: 0 });
}
