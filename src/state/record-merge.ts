/**
 * Per-record merge of saved work across browser tabs (issue 10 item 4): a store's persisted data is
 * cut into records (a stock, a recipe, one recipe's targets or blend sheet, one setting …), each with
 * a version stamp written when it was last committed. When two tabs save, records changed in only one
 * tab are kept from that tab; a record changed in both takes the later commit; deletions are records
 * too (tombstones), so a deletion is neither lost nor undone by an older copy. No committed edit is
 * lost: every record of the result is the newest commit of that record.
 *
 * Plain functions, no storage: `persistence.ts` runs them inside one IndexedDB transaction.
 */

/**
 * How a store's persisted data divides into records:
 * - `lists`: array fields whose items have an id (field → the id's property), e.g. components by `id`;
 * - `maps`: object fields whose entries are records (targets by recipe id, settings by field name);
 * - `local`: fields that belong to one tab and are never merged (the active recipe);
 * - `parts`: object fields cut into one record per property, the properties named here being maps
 *   cut into one record per entry (the line plan: its period, unit and tank limit, each grade's
 *   demand, each stock's supply and least use), so two tabs editing different entries keep both;
 * - `deep`: object fields whose entries are cut into one record per value, down through nested
 *   objects (a recipe's QC entries: each lot's each measured value, each field of the heel and of the
 *   correction), so two tabs typing different fields of one entry keep both; arrays, plain values and
 *   empty objects are values; keys are `field/id/part/…`, each part URI-encoded;
 * - every other top-level field is one record of its own.
 */
export interface RecordLayout {
  lists?: Record<string, string>;
  maps?: readonly string[];
  local?: readonly string[];
  parts?: Record<string, readonly string[]>;
  deep?: readonly string[];
  /**
   * Whether a record's value is no entry at all (a blank QC field: null, empty, or the field's
   * default). A record a tab creates holding such a value (the blank fields a first entry brings with
   * it) is not stamped (persistence.ts `commit`): an entry of the same record made in another tab wins
   * over it whichever was committed later, so two tabs making first entries at once keep both.
   * A value changed to blank (a field cleared) is an entry like any other.
   */
  blank?: (key: string, value: unknown) => boolean;
  /** The record in the user's words for a message ("stock BW-190"); default: the key. */
  label?: (key: string, value: unknown) => string;
}

/** A version stamp: commit time (ms, 13 digits), tab and a counter; later stamps sort later as strings. */
export type Stamp = string;

/** Records in order (Map order = list order), with the stamp of each present and each deleted record. */
export interface RecordSet {
  records: Map<string, unknown>;
  /** Stamp of each present record ('' when never stamped, e.g. data written before stamps). */
  stamps: Record<string, Stamp>;
  /** Stamp of each deleted record (tombstones). */
  gone: Record<string, Stamp>;
}

const SEP = '/';
const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * The records of persisted data, in order: `field/id` for list items and map entries,
 * `field/property` and `field/map/id` for parts, `field` for the rest.
 */
export function splitRecords(data: unknown, layout: RecordLayout): Map<string, unknown> {
  const out = new Map<string, unknown>();
  if (!isObject(data)) return out;
  const lists = layout.lists ?? {};
  const maps = new Set(layout.maps ?? []);
  const local = new Set(layout.local ?? []);
  const parts = layout.parts ?? {};
  const deep = new Set(layout.deep ?? []);
  for (const [field, value] of Object.entries(data)) {
    if (local.has(field)) continue;
    if (deep.has(field) && isObject(value)) {
      for (const [k, v] of Object.entries(value)) leaves(`${field}${SEP}${encodeURIComponent(k)}`, v, out);
    } else if (field in parts && isObject(value)) {
      const subMaps = parts[field]!;
      for (const [prop, v] of Object.entries(value)) {
        if (subMaps.includes(prop) && isObject(v)) for (const [k, x] of Object.entries(v)) out.set(`${field}${SEP}${prop}${SEP}${k}`, x);
        else out.set(`${field}${SEP}${prop}`, v);
      }
    } else if (field in lists && Array.isArray(value)) {
      const idKey = lists[field]!;
      for (const item of value) {
        const id = isObject(item) ? item[idKey] : undefined;
        out.set(`${field}${SEP}${String(id)}`, item);
      }
    } else if (maps.has(field) && isObject(value)) {
      for (const [k, v] of Object.entries(value)) out.set(`${field}${SEP}${k}`, v);
    } else out.set(field, value);
  }
  return out;
}

/** Every value under `prefix`, one record each (a non-empty object is followed down; anything else is a value). */
function leaves(prefix: string, v: unknown, out: Map<string, unknown>): void {
  if (isObject(v) && Object.keys(v).length > 0) {
    for (const [k, x] of Object.entries(v)) leaves(`${prefix}${SEP}${encodeURIComponent(k)}`, x, out);
  } else out.set(prefix, v);
}

/** Put a deep record's value at its path in `root` (new objects on the way; an empty object never hides entries). */
function placeDeep(root: Record<string, unknown>, path: readonly string[], value: unknown): void {
  let obj = root;
  for (const p of path.slice(0, -1)) {
    if (!isObject(obj[p])) obj[p] = {};
    obj = obj[p] as Record<string, unknown>;
  }
  const last = path[path.length - 1]!;
  if (isObject(value) && Object.keys(value).length === 0) {
    if (!isObject(obj[last])) obj[last] = {}; // a fresh object: entries placed later must not change the record
  } else obj[last] = value;
}

/** Persisted data from records (inverse of splitRecords); tab-local fields are taken from `local`. */
export function joinRecords(records: Map<string, unknown>, layout: RecordLayout, local: unknown): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const lists = layout.lists ?? {};
  const maps = new Set(layout.maps ?? []);
  const parts = layout.parts ?? {};
  const deep = new Set(layout.deep ?? []);
  for (const field of Object.keys(lists)) out[field] = [];
  for (const field of maps) out[field] = {};
  for (const field of deep) out[field] = {};
  for (const [key, value] of records) {
    const cut = key.indexOf(SEP);
    const field = cut < 0 ? key : key.slice(0, cut);
    if (cut >= 0 && deep.has(field)) {
      placeDeep(out[field] as Record<string, unknown>, key.slice(cut + 1).split(SEP).map(decodeURIComponent), value);
    } else if (cut >= 0 && field in parts) {
      // A part's maps exist (empty) as soon as any of its records does.
      const subMaps = parts[field]!;
      if (!isObject(out[field])) out[field] = Object.fromEntries(subMaps.map((m) => [m, {}]));
      const obj = out[field] as Record<string, unknown>;
      const rest = key.slice(cut + 1);
      const cut2 = rest.indexOf(SEP);
      const prop = cut2 < 0 ? rest : rest.slice(0, cut2);
      if (cut2 >= 0 && subMaps.includes(prop)) {
        if (!isObject(obj[prop])) obj[prop] = {};
        (obj[prop] as Record<string, unknown>)[rest.slice(cut2 + 1)] = value;
      } else obj[rest] = value;
    } else if (cut >= 0 && field in lists) (out[field] as unknown[]).push(value);
    else if (cut >= 0 && maps.has(field)) (out[field] as Record<string, unknown>)[key.slice(cut + 1)] = value;
    else out[key] = value;
  }
  if (isObject(local)) for (const field of layout.local ?? []) if (field in local) out[field] = local[field];
  return out;
}

/** The stamp a side holds for a record (present or deleted), '' when it has never seen it. */
const stampOf = (s: Pick<RecordSet, 'stamps' | 'gone'>, key: string): Stamp => s.stamps[key] ?? s.gone[key] ?? '';

export interface MergeResult extends RecordSet {
  /** Records the result takes from `theirs` that differ from `mine` (changed elsewhere). */
  fromTheirs: string[];
  /** Records both sides changed where `theirs` won (the later commit): `mine`'s edit was replaced. */
  replacedMine: string[];
  /** True when the result differs from `theirs` (so it must be written). */
  differsFromTheirs: boolean;
}

/**
 * Three-way merge per record. `base` holds the stamps both sides last agreed on; a side "changed" a
 * record when its stamp differs from the base's (for the stored side: is later than the base's, as an
 * older stamp is a stale copy, not a commit). Changed on one side → that side; on both → the later
 * stamp (the later commit); on neither → `mine` (the same content; keeps object identity).
 * Order: `theirs`'s order, with records only `mine` has inserted after their predecessor in `mine`.
 */
export function mergeRecords(base: Pick<RecordSet, 'stamps' | 'gone'>, mine: RecordSet, theirs: RecordSet): MergeResult {
  const keys = new Set<string>([
    ...mine.records.keys(),
    ...Object.keys(mine.gone),
    ...theirs.records.keys(),
    ...Object.keys(theirs.gone),
  ]);
  const pick = new Map<string, 'mine' | 'theirs'>();
  const fromTheirs: string[] = [];
  const replacedMine: string[] = [];
  let differsFromTheirs = false;
  for (const k of keys) {
    const b = stampOf(base, k);
    const m = stampOf(mine, k);
    const t = stampOf(theirs, k);
    const mineChanged = m !== b;
    // A stored stamp older than the one both sides agreed on (or a record gone without a tombstone) is
    // a stale copy written over a newer one (a tab's blind put as it leaves, made before it heard of a
    // save): not a change. A commit elsewhere always carries a later stamp.
    const theirsChanged = t !== b && (b === '' || t > b);
    let side: 'mine' | 'theirs';
    if (mineChanged && theirsChanged) {
      side = m >= t ? 'mine' : 'theirs';
      if (side === 'theirs' && m !== t) replacedMine.push(k);
    } else if (theirsChanged) side = 'theirs';
    else if (mineChanged) side = 'mine';
    else side = mine.records.has(k) || k in mine.gone ? 'mine' : 'theirs';
    pick.set(k, side);
    const chosen = side === 'mine' ? m : t;
    if (side === 'theirs' && t !== m) fromTheirs.push(k);
    if (chosen !== t || (side === 'mine' && mine.records.has(k) !== theirs.records.has(k))) differsFromTheirs = true;
  }
  // Present records in order: theirs's order, then mine's own records after their predecessor in mine.
  const present = (k: string) => (pick.get(k) === 'mine' ? mine.records.has(k) : theirs.records.has(k));
  const order: string[] = [...theirs.records.keys()].filter(present);
  const placed = new Set(order);
  let prev: string | null = null;
  for (const k of mine.records.keys()) {
    if (!present(k)) continue;
    if (!placed.has(k)) {
      const at = prev === null ? 0 : order.indexOf(prev) + 1;
      order.splice(at, 0, k);
      placed.add(k);
    }
    prev = k;
  }
  if (!differsFromTheirs) {
    // Same records and stamps: only the order can differ.
    const theirOrder = [...theirs.records.keys()];
    differsFromTheirs = theirOrder.length !== order.length || theirOrder.some((k, i) => order[i] !== k);
  }
  const records = new Map<string, unknown>();
  const stamps: Record<string, Stamp> = {};
  const gone: Record<string, Stamp> = {};
  for (const k of order) {
    const side = pick.get(k)!;
    records.set(k, side === 'mine' ? mine.records.get(k) : theirs.records.get(k));
    stamps[k] = stampOf(side === 'mine' ? mine : theirs, k);
  }
  for (const k of keys) {
    if (records.has(k)) continue;
    const s = stampOf(pick.get(k) === 'mine' ? mine : theirs, k);
    if (s) gone[k] = s;
  }
  return { records, stamps, gone, fromTheirs, replacedMine, differsFromTheirs };
}

/** Tombstones older than this are forgotten (a tab asleep longer may bring a deleted record back; never an edit lost). */
export const TOMBSTONE_DAYS = 60;

/** Drop tombstones older than TOMBSTONE_DAYS before `nowMs`. */
export function pruneGone(gone: Record<string, Stamp>, nowMs: number): Record<string, Stamp> {
  const cutoff = nowMs - TOMBSTONE_DAYS * 86_400_000;
  const out: Record<string, Stamp> = {};
  for (const [k, s] of Object.entries(gone)) if (Number(s.slice(0, 13)) >= cutoff) out[k] = s;
  return out;
}

/** A stamp maker for one tab: `<13-digit ms>.<tab>.<6-digit counter>`, strictly increasing in this tab. */
export function stampMaker(tab: string, clock: () => number): () => Stamp {
  let last = 0;
  let n = 0;
  return () => {
    const t = Math.max(clock(), last);
    n = t === last ? n + 1 : 0;
    last = t;
    return `${String(t).padStart(13, '0')}.${tab}.${String(n).padStart(6, '0')}`;
  };
}
