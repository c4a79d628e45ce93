/**
 * The tab's unsaved commits, kept synchronously as the page is hidden or left (s23 item 1).
 *
 * A store's save is an IndexedDB read-then-write (persistence.ts `saveOnce`), and the blind put of a
 * leave-written store is issued as the page leaves: either may not finish when a reload comes at once,
 * so an edit committed just before it (a designer share, a Stocks cell, a QC entry, a line-plan input)
 * could be lost. As the page is hidden (pagehide, visibilitychange → hidden) every store's records
 * committed in this tab since its last finished save are copied, with their stamps, into the tab's
 * sessionStorage — a synchronous write that the reload cannot cut short. At the next start of the tab
 * each record of the copy whose stamp is later than the one IndexedDB holds for it is taken, the result
 * written through by the store's usual save, and the copy removed.
 *
 * sessionStorage belongs to the tab. A duplicated tab starts with a copy of it, leave copy included:
 * the stamps decide there too — a record the first tab has saved since (or changed again) is not taken,
 * and one it has not saved yet is the same commit, stamp and all, so taking it changes nothing. The
 * draft key (tab-draft.ts) is not part of the copy; the duplicated tab still takes a key of its own.
 *
 * Plain functions over record sets; reading and writing sessionStorage never throws.
 */
import type { RecordSet, Stamp } from './record-merge';

/** One record committed in this tab and not yet saved: its value (or `gone`), stamp and predecessor. */
export interface CopiedRecord {
  key: string;
  stamp: Stamp;
  /** The record's value (absent when the record was deleted). */
  value?: unknown;
  /** True when the record was deleted. */
  gone?: true;
  /** The record before it in the tab's order (null: the first), so a new record returns to its place. */
  after: string | null;
}

/** What a tab had committed but not saved as its page was hidden. */
export interface LeaveCopy {
  /** The store's schema version the records are written in. */
  version: number;
  records: CopiedRecord[];
  /** The tab-local fields (RecordLayout.local), when changed since they were last written. */
  local?: Record<string, unknown>;
  /**
   * Every record the tab held is in the copy (none saved yet: a first start before its first save
   * finished). Only such a copy is taken where IndexedDB holds nothing for the store: laid over the
   * store's starting state it would be the tab's whole data; a partial one would not.
   */
  whole?: true;
}

/** sessionStorage key of a store's leave copy. */
export const leaveCopyKey = (store: string): string => `blendbench.unsaved.${store}`;

const stampOf = (s: Pick<RecordSet, 'stamps' | 'gone'>, key: string): Stamp => s.stamps[key] ?? s.gone[key] ?? '';

/**
 * The records of `mine` committed since `base` (the stamps this tab and storage last agreed on), in
 * the tab's order, deletions last; null when there are none and no changed local fields. `blankNew`:
 * records created blank here and not saved yet (no stamp: RecordLayout.blank), copied with stamp ''
 * (the blank fields a first QC entry brings with it, without which the entry is not whole). The copy
 * is marked `whole` when it holds every record of `mine` (see LeaveCopy.whole).
 */
export function pendingCopy(
  mine: RecordSet,
  base: Pick<RecordSet, 'stamps' | 'gone'>,
  version: number,
  local: Record<string, unknown> | null,
  blankNew: ReadonlySet<string> = new Set(),
): LeaveCopy | null {
  const records: CopiedRecord[] = [];
  let prev: string | null = null;
  let committed = false;
  let whole = true;
  for (const [key, value] of mine.records) {
    const stamp = mine.stamps[key] ?? '';
    if (stamp !== '' && stamp !== stampOf(base, key)) {
      records.push({ key, stamp, value, after: prev });
      committed = true;
    } else if (stamp === '' && blankNew.has(key)) records.push({ key, stamp, value, after: prev });
    else whole = false;
    prev = key;
  }
  for (const [key, stamp] of Object.entries(mine.gone)) {
    if (stamp !== stampOf(base, key)) {
      records.push({ key, stamp, gone: true, after: null });
      committed = true;
    }
  }
  if (!committed && local === null) return null;
  const copy: LeaveCopy = local === null ? { version, records } : { version, records, local };
  if (whole && committed) copy.whole = true;
  return copy;
}

/**
 * `stored` with each record of `copy` whose stamp is later than the stored one's (present or deleted)
 * put in: a new record after its predecessor (or at the end), a deleted one removed with its
 * tombstone; a blank record (stamp '') only where `stored` has no such record at all. `taken` names the
 * records put in; `stored` itself is not changed.
 */
export function applyCopy(stored: RecordSet, copy: LeaveCopy): { set: RecordSet; taken: string[] } {
  const taken: string[] = [];
  const order = [...stored.records.keys()];
  const values = new Map(stored.records);
  const stamps = { ...stored.stamps };
  const gone = { ...stored.gone };
  for (const r of copy.records) {
    const newer = r.stamp === '' ? !stored.records.has(r.key) && !(r.key in stored.gone) : r.stamp > stampOf(stored, r.key);
    if (!newer) continue;
    taken.push(r.key);
    if (r.gone) {
      values.delete(r.key);
      delete stamps[r.key];
      gone[r.key] = r.stamp;
      const at = order.indexOf(r.key);
      if (at >= 0) order.splice(at, 1);
      continue;
    }
    if (!values.has(r.key)) {
      const prev = r.after === null ? -1 : order.indexOf(r.after);
      order.splice(r.after === null ? 0 : prev < 0 ? order.length : prev + 1, 0, r.key);
    }
    values.set(r.key, r.value);
    if (r.stamp !== '') stamps[r.key] = r.stamp;
    delete gone[r.key];
  }
  const records = new Map<string, unknown>();
  for (const k of order) records.set(k, values.get(k));
  return { set: { records, stamps, gone }, taken };
}

function session(): Storage | null {
  try {
    return typeof sessionStorage === 'undefined' ? null : sessionStorage;
  } catch {
    return null; // storage refused (privacy settings): no leave copy
  }
}

/** Keep (or, with null, remove) a store's leave copy; false when it could not be written (e.g. full). */
export function writeLeaveCopy(store: string, copy: LeaveCopy | string | null): boolean {
  const s = session();
  if (!s) return false;
  try {
    if (copy === null) s.removeItem(leaveCopyKey(store));
    else s.setItem(leaveCopyKey(store), typeof copy === 'string' ? copy : JSON.stringify(copy));
    return true;
  } catch {
    // Too large for sessionStorage: the IndexedDB writes issued as the page leaves are all there is.
    try {
      s.removeItem(leaveCopyKey(store));
    } catch {
      /* nothing kept */
    }
    return false;
  }
}

/**
 * Keep several stores' leave copies at once (null: remove that store's), the smallest first: sessionStorage
 * holds a few megabytes for the whole site, so a copy too large for what is left (a large library's
 * edits) takes no room from the others (a designer draft, a setting). Never throws; returns the stores
 * whose copy is kept now. A copy that cannot be written is not kept at all (no older copy of that store
 * stays behind to be taken at the next start).
 */
export function writeLeaveCopies(copies: ReadonlyArray<readonly [store: string, copy: LeaveCopy | null]>): Set<string> {
  const kept = new Set<string>();
  const texts: Array<[string, string | null]> = [];
  for (const [store, copy] of copies) {
    let text: string | null = null;
    try {
      text = copy === null ? null : JSON.stringify(copy);
    } catch {
      text = ''; // too large even to write out as text: not kept
    }
    texts.push([store, text]);
  }
  // Removals first (they free room), then the copies from the smallest up.
  texts.sort(([, a], [, b]) => (a === null ? -1 : b === null ? 1 : a.length - b.length));
  for (const [store, text] of texts) {
    if (text === null || text === '') writeLeaveCopy(store, null);
    else if (writeLeaveCopy(store, text)) kept.add(store);
  }
  return kept;
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A store's leave copy, or null (none, or not in the form written here). */
export function readLeaveCopy(store: string): LeaveCopy | null {
  let text: string | null = null;
  try {
    text = session()?.getItem(leaveCopyKey(store)) ?? null;
  } catch {
    return null;
  }
  if (text === null) return null;
  let v: unknown;
  try {
    v = JSON.parse(text);
  } catch {
    return null;
  }
  if (!isRecord(v) || typeof v.version !== 'number' || !Array.isArray(v.records)) return null;
  const ok = v.records.every(
    (r: unknown) =>
      isRecord(r) && typeof r.key === 'string' && typeof r.stamp === 'string' && (r.after === null || typeof r.after === 'string'),
  );
  if (!ok || (v.local !== undefined && !isRecord(v.local)) || (v.whole !== undefined && v.whole !== true)) return null;
  return v as unknown as LeaveCopy;
}
