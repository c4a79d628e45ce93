/**
 * Library import preview: CSV (papaparse) and JSON (zod-validated). Plain functions with no store, so
 * a Web Worker can run them (features/library/import.worker.ts); `library-io.ts` applies a preview.
 *
 * An import is two steps. `previewLibraryImport` parses and checks every row and returns a preview
 * with a per-row error report; it never throws and changes nothing. Only `applyLibraryImport`, called
 * when the user confirms a preview with no errors, touches the library (adds new stock codes,
 * updates existing ones in place, keeping their ids so recipes stay linked; undoable).
 *
 * CSV columns (header row required, any order, unknown columns ignored; temperatures in °C,
 * viscosities in mm²/s, density in kg/L, decimal point "." — or "," when the delimiter is ";"; a
 * first line "sep=<delimiter>", as spreadsheets write it, names the delimiter):
 * see `CSV_COLUMNS`.
 */
import Papa from 'papaparse';
import type { Component, ComponentCategory, PriceBasis, Availability } from '../core/formulation/model';
import { CATEGORY_LABEL, COMPONENT_CATEGORIES } from '../core/formulation/model';
import { componentSchema, describeIssues, z } from './schemas';
import { checkComponent, type CheckField } from './checks';
import { COLLECTION_LIMITS } from './field-rules';
import { OLDER_SCHEMA_STOCK_DEFAULTS, blankComponent } from './stock-defaults';
import { restoreCsvText } from './csv';

export const CSV_COLUMNS = [
  'code',
  'name',
  'category',
  'kv40_mm2s',
  'kv100_mm2s',
  'density15_kg_per_l',
  'aniline_point_c',
  'pour_point_c',
  'flash_point_c',
  'sulfur_pct',
  'saturates_pct',
  'price',
  'price_basis',
  'currency',
  'availability',
  'oxidation_rating',
  'shear_loss_pct',
  'kv40_shear_loss_pct',
  'kv40_lot_spread_pct',
  'source',
  'source_date',
  'notes',
] as const;
export type CsvColumn = (typeof CSV_COLUMNS)[number];
/** Columns holding numbers (read with the file's decimal mark). */
const NUMBER_COLUMNS: readonly CsvColumn[] = [
  'kv40_mm2s', 'kv100_mm2s', 'density15_kg_per_l', 'aniline_point_c', 'pour_point_c', 'flash_point_c', 'sulfur_pct',
  'saturates_pct', 'price', 'oxidation_rating', 'shear_loss_pct', 'kv40_shear_loss_pct', 'kv40_lot_spread_pct',
];
const REQUIRED: readonly CsvColumn[] = ['code', 'category', 'kv40_mm2s', 'kv100_mm2s', 'density15_kg_per_l', 'price'];

/** Largest file accepted (characters); one limit with backups and storage (field-rules.ts). */
export const MAX_IMPORT_CHARS = COLLECTION_LIMITS.importFileChars;
/** Most rows accepted in one import: a whole library (field-rules.ts). */
export const MAX_IMPORT_ROWS = COLLECTION_LIMITS.importRows;

/** One field an update would change: its label, the stored value and the imported one, as shown. */
export interface FieldChange {
  field: string;
  from: string;
  to: string;
}

export interface ImportRow {
  /** Line number in the file (CSV: the header is line 1) or item number (JSON, from 1). */
  line: number;
  code: string;
  name: string;
  /** add a new stock, update a stored one, 'unchanged' (a stored stock the row leaves as it is), or skip (errors). */
  action: 'add' | 'update' | 'unchanged' | 'skip';
  component: Component | null;
  /** For an update: every field that would change, stored → imported (empty otherwise). */
  changes: FieldChange[];
  errors: string[];
  warnings: string[];
}

export interface ImportPreview {
  format: 'csv' | 'json';
  /** Problems with the file as a whole (no header, not JSON, too large …). */
  fileErrors: string[];
  /** Notes on the file as a whole that do not stop the import (columns that are not read …). */
  fileWarnings: string[];
  rows: ImportRow[];
  /** True when there is at least one row and no error anywhere. */
  valid: boolean;
  adds: number;
  updates: number;
  /** Rows matching a stored stock that would not change it. */
  unchanged: number;
}

const clip = (s: string, n = 60) => (s.length > n ? `${s.slice(0, n)}…` : s);

function normaliseHeader(h: string): string {
  return h
    .trim()
    .toLowerCase()
    .replace(/[\s\-/]+/g, '_')
    .replace(/[^a-z0-9_]/g, '');
}

const CATEGORY_ALIASES: Record<string, ComponentCategory> = (() => {
  const m: Record<string, ComponentCategory> = {};
  for (const c of COMPONENT_CATEGORIES) {
    m[c] = c;
    m[CATEGORY_LABEL[c].toLowerCase()] = c;
  }
  Object.assign(m, {
    i: 'group-i', ii: 'group-ii', iii: 'group-iii', iv: 'group-iv', v: 'group-v',
    '1': 'group-i', '2': 'group-ii', '3': 'group-iii', '4': 'group-iv', '5': 'group-v',
    'group 1': 'group-i', 'group 2': 'group-ii', 'group 3': 'group-iii', 'group 4': 'group-iv', 'group 5': 'group-v',
    'group iv': 'group-iv', pao: 'group-iv', additive: 'additive-package', 'additive package': 'additive-package',
  } satisfies Record<string, ComponentCategory>);
  return m;
})();

const BASIS_ALIASES: Record<string, PriceBasis> = {
  'per-kg': 'per-kg', kg: 'per-kg', '/kg': 'per-kg', 'per kg': 'per-kg',
  'per-litre': 'per-litre', 'per-liter': 'per-litre', l: 'per-litre', litre: 'per-litre', liter: 'per-litre', '/l': 'per-litre', 'per litre': 'per-litre', 'per litre at 15 °c': 'per-litre',
  'per-tonne': 'per-tonne', t: 'per-tonne', tonne: 'per-tonne', '/t': 'per-tonne', 'per tonne': 'per-tonne', 'per-ton': 'per-tonne',
};

const AVAILABILITY: readonly Availability[] = ['available', 'limited', 'withdrawn'];

/**
 * A number whose one mark could be a decimal mark or a thousands mark ("1.250", "12,500"): 1–3 digits
 * not all zero, the mark, exactly three digits.
 */
const GROUP_OR_DECIMAL = /^[-+]?(?!0+[.,])\d{1,3}([.,])\d{3}$/;
/** A number written with a decimal mark that cannot be a thousands mark ("0,87", "11.25", "1,5"). */
const PLAIN_DECIMAL = /^[-+]?\d*([.,])\d+(?:[eE][-+]?\d+)?$/;

/**
 * The decimal mark a file's number cells show where they cannot mean anything else: "," or ".",
 * 'both' when the file uses each, null when no cell tells.
 */
function decimalMarkOf(cells: Iterable<string>): ',' | '.' | 'both' | null {
  let comma = false;
  let dot = false;
  for (const raw of cells) {
    const t = raw.trim().replace(/^−/, '-');
    if (GROUP_OR_DECIMAL.test(t)) continue;
    const m = PLAIN_DECIMAL.exec(t);
    if (m?.[1] === ',') comma = true;
    else if (m?.[1] === '.') dot = true;
    if (comma && dot) return 'both';
  }
  return comma ? ',' : dot ? '.' : null;
}

/**
 * Parse one CSV cell as a number; '' → null. `comma` allows a decimal comma (a file not separated by
 * commas). There, a cell such as "1.250" or "1,250" could be 1.25 or 1250: it is read only when its
 * mark is the decimal mark the file's other numbers use (`fileMark`), else refused, never guessed.
 */
function cellNumber(raw: string | undefined, comma: boolean, fileMark: ',' | '.' | 'both' | null = null): number | null | 'bad' | { could: [number, number] } {
  const t = (raw ?? '').trim().replace(/^−/, '-');
  if (t === '') return null;
  if (comma) {
    const g = GROUP_OR_DECIMAL.exec(t);
    if (g && g[1] !== fileMark) {
      const [a, b] = t.split(g[1]!);
      return { could: [Number(`${a}.${b}`), Number(`${a}${b}`)] };
    }
  }
  const s = comma ? t.replace(',', '.') : t;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s)) return 'bad';
  const v = Number(s);
  return Number.isFinite(v) ? v : 'bad';
}

/** A checked field as a row's messages name it (the labels the CSV reader's own messages use), never its internal key. */
const FIELD_IN_WORDS: Record<CheckField, string> = {
  code: 'code',
  name: 'name',
  kv40: 'ν40',
  kv100: 'ν100',
  viscosityPoints: 'viscosities',
  density15: 'density',
  anilinePoint: 'aniline point',
  pourPoint: 'pour point',
  flashPoint: 'flash point',
  sulfurPct: 'sulfur',
  saturatesPct: 'saturates',
  price: 'price',
  oxidationRating: 'oxidation rating',
  shearLossPct: 'ν100 shear loss',
  shearLoss40Pct: 'ν40 shear loss',
  kv40LotSpreadPct: 'lot spread of ν40',
  category: 'category',
};

/** Stored stocks by normalised code (trimmed, lower case), for matching import rows. */
function byCode(existing: readonly Component[]): Map<string, Component> {
  const m = new Map<string, Component>();
  for (const c of existing) {
    const k = c.code.trim().toLowerCase();
    if (!m.has(k)) m.set(k, c);
  }
  return m;
}

const shown = (v: string | number | null | undefined): string =>
  v === null || v === undefined || v === '' ? '(blank)' : typeof v === 'number' ? String(v) : v;

/**
 * Every field of a stock that differs between the stored and the imported version, with both values
 * as the user knows them (labels as on the Stocks screen; °C, mm²/s, kg/L as stored).
 */
export function stockChanges(from: Component, to: Component): FieldChange[] {
  const out: FieldChange[] = [];
  const cmp = (field: string, a: string | number | null | undefined, b: string | number | null | undefined) => {
    if ((a ?? null) !== (b ?? null)) out.push({ field, from: shown(a), to: shown(b) });
  };
  const kvAt = (c: Component, t: number) => c.viscosityPoints.find((p) => p.tempC === t)?.kv ?? null;
  cmp('code', from.code, to.code);
  cmp('name', from.name, to.name);
  cmp('category', CATEGORY_LABEL[from.category], CATEGORY_LABEL[to.category]);
  cmp('ν40 [mm²/s]', kvAt(from, 40), kvAt(to, 40));
  cmp('ν100 [mm²/s]', kvAt(from, 100), kvAt(to, 100));
  const others = (c: Component) =>
    c.viscosityPoints
      .filter((p) => p.tempC !== 40 && p.tempC !== 100)
      .map((p) => `${p.kv} mm²/s at ${p.tempC} °C`)
      .join(', ');
  cmp('other viscosity points', others(from), others(to));
  cmp('density at 15 °C [kg/L]', from.density15, to.density15);
  cmp('aniline point [°C]', from.anilinePoint, to.anilinePoint);
  cmp('pour point [°C]', from.pourPoint, to.pourPoint);
  cmp('flash point [°C]', from.flashPoint, to.flashPoint);
  cmp('sulfur [mass %]', from.sulfurPct, to.sulfurPct);
  cmp('saturates [mass %]', from.saturatesPct, to.saturatesPct);
  cmp('price', from.price.amount, to.price.amount);
  cmp('price basis', from.price.basis, to.price.basis);
  cmp('currency', from.price.currency, to.price.currency);
  cmp('availability', from.availability, to.availability);
  cmp('oxidation rating', from.oxidationRating, to.oxidationRating);
  cmp('ν100 shear loss [%]', from.shearLossPct, to.shearLossPct);
  cmp('ν40 shear loss [%]', from.shearLoss40Pct ?? null, to.shearLoss40Pct ?? null);
  cmp('lot spread of ν40 [%]', from.kv40LotSpreadPct, to.kv40LotSpreadPct);
  const cal = (c: Component) => (c.calibration ? `calibrated ${c.calibration.calibratedOn} (${c.calibration.trial.labReference || 'no lab reference'})` : null);
  if (JSON.stringify(from.calibration) !== JSON.stringify(to.calibration)) out.push({ field: 'calibration', from: shown(cal(from)), to: shown(cal(to)) });
  cmp('source', from.source, to.source);
  cmp('source date', from.sourceDate, to.sourceDate);
  cmp('notes', from.notes, to.notes);
  return out;
}

/** Finish a row: entry checks + schema + duplicate, and what it would do to the library (with the changes). */
function finishRow(
  line: number,
  candidate: Component,
  preErrors: string[],
  existing: Map<string, Component>,
  seen: Map<string, number>,
): ImportRow {
  const errors = [...preErrors];
  const warnings: string[] = [];
  const key = candidate.code.trim().toLowerCase();
  const match = existing.get(key);
  const comp: Component = match ? { ...candidate, id: match.id } : candidate;
  if (key) {
    const first = seen.get(key);
    if (first !== undefined) errors.push(`code ${clip(candidate.code, 40)} also appears on line ${first}`);
    else seen.set(key, line);
  }
  if (errors.length === 0) {
    // The entry checks first (the same specific messages as the library screen), then the schema.
    const checks = checkComponent(comp, []);
    for (const e of checks.errors) errors.push(`${FIELD_IN_WORDS[e.field]}: ${e.message}`);
    for (const w of checks.warnings) warnings.push(`${FIELD_IN_WORDS[w.field]}: ${w.message}`);
    if (errors.length === 0) {
      const parsed = componentSchema.safeParse(comp);
      if (!parsed.success) errors.push(describeIssues(parsed.error));
    }
  }
  const changes = !errors.length && match ? stockChanges(match, comp) : [];
  return {
    line,
    code: clip(candidate.code, 40),
    name: clip(candidate.name, 80),
    action: errors.length ? 'skip' : !match ? 'add' : changes.length ? 'update' : 'unchanged',
    component: errors.length ? null : comp,
    changes,
    errors,
    warnings,
  };
}

function summarise(format: 'csv' | 'json', fileErrors: string[], rows: ImportRow[], fileWarnings: string[] = []): ImportPreview {
  const valid = fileErrors.length === 0 && rows.length > 0 && rows.every((r) => r.errors.length === 0);
  const count = (a: ImportRow['action']) => rows.reduce((n, r) => n + (r.action === a ? 1 : 0), 0);
  return { format, fileErrors, fileWarnings, rows, valid, adds: count('add'), updates: count('update'), unchanged: count('unchanged') };
}

/**
 * An import preview built in steps, so a large file (a whole library of 20,000 stocks) can be checked
 * in a Web Worker or in slices with progress and a cancel, rather than freezing the page. The file is
 * parsed when the previewer is made; `step` checks further rows; `result` is complete once `done`
 * equals `total`. A file refused as a whole has `total` 0 and its result at once.
 */
export interface ImportPreviewer {
  /** Rows (CSV) or items (JSON) to check. */
  readonly total: number;
  /** Rows checked so far. */
  readonly done: number;
  /** Check up to `budget` further rows; returns the number checked so far. */
  step(budget: number): number;
  /** The preview of the rows checked so far (complete once done = total). */
  result(): ImportPreview;
}

/** A previewer whose result is already known (a file refused as a whole). */
function settled(preview: ImportPreview): ImportPreviewer {
  return { total: 0, done: 0, step: () => 0, result: () => preview };
}

/** A previewer over `items`, one row each; `finish` turns the rows into the preview (once complete). */
function rowByRow<T>(
  format: 'csv' | 'json',
  items: readonly T[],
  makeRow: (item: T, i: number) => ImportRow,
  finish: (rows: ImportRow[]) => ImportPreview,
  fileWarnings: string[] = [],
): ImportPreviewer {
  const rows: ImportRow[] = [];
  let final: ImportPreview | null = null;
  return {
    total: items.length,
    get done() {
      return final ? items.length : rows.length;
    },
    step(budget) {
      if (final) return items.length;
      const end = Math.min(items.length, rows.length + Math.max(1, budget));
      try {
        for (let i = rows.length; i < end; i++) rows.push(makeRow(items[i]!, i));
      } catch (e) {
        // Never throws: a row that cannot even be built refuses the file (nothing more to check).
        final = summarise(format, [`The file could not be read: ${(e as Error)?.message ?? String(e)}`], []);
        return items.length;
      }
      return rows.length;
    },
    result() {
      if (final) return final;
      if (rows.length < items.length) return summarise(format, [], rows.slice(), fileWarnings);
      final = finish(rows);
      return final;
    },
  };
}

/** Run a previewer to the end in one go. */
function runToEnd(p: ImportPreviewer): ImportPreview {
  while (p.done < p.total) p.step(p.total);
  return p.result();
}

/** A CSV import checked row by row (see ImportPreviewer). Never throws; changes nothing. */
/** How the preview writes numbers of its own (the user's settings). */
export interface ImportPreviewOptions {
  /**
   * The decimal separator of the settings: the notation of a "could mean 1.25 or 1250" refusal when the
   * file's other numbers do not tell which mark it uses (default ".").
   */
  decimalSeparator?: '.' | ',';
  /**
   * The base currency of the settings: the currency of a new stock whose row gives none (default "EUR").
   * A stored stock updated without a currency keeps its own.
   */
  baseCurrency?: string;
}

/**
 * The two readings of a cell whose one mark could group thousands or mark decimals, written as the
 * blender will recognise them: the decimal reading with the file's own decimal mark (or, when the
 * file does not tell, the settings'), the whole-number reading without a thousands mark; "−" for minus.
 */
function couldMeanText(could: readonly [number, number], mark: ',' | '.'): [string, string] {
  const say = (v: number) => `${v < 0 ? '−' : ''}${String(Math.abs(v)).replace('.', mark)}`;
  return [say(could[0]), say(could[1])];
}

export function csvPreviewer(text: string, existing: readonly Component[], opts: ImportPreviewOptions = {}): ImportPreviewer {
  try {
    if (text.length > MAX_IMPORT_CHARS) return settled(summarise('csv', [`The file is larger than ${MAX_IMPORT_CHARS / 1e6} MB.`], []));
    // Delimiter from the header line: papaparse's own guess re-parses the text once per candidate
    // and takes tens of seconds on a hostile file of millions of quote characters.
    // A spreadsheet's "sep=;" first line names the delimiter: it is used, and the header is line 2.
    const unmarked = text.replace(/^\uFEFF/, '');
    const sep = /^sep=([,;\t|])[ \t]*(?:\r\n|\n|\r|$)/i.exec(unmarked);
    const body0 = sep ? unmarked.slice(sep[0].length) : unmarked;
    const lineOffset = sep ? 1 : 0;
    const head = /^[^\r\n]*/.exec(body0.slice(0, 10_000))![0];
    const count = (d: string) => head.split(d).length;
    const delimiter = sep ? sep[1]! : [';', '\t', '|'].reduce((best, d) => (count(d) > count(best) ? d : best), ',');
    const parsed = Papa.parse<string[]>(body0, { skipEmptyLines: 'greedy', delimiter });
    const data = parsed.data.filter((r): r is string[] => Array.isArray(r));
    const fileErrors: string[] = [];
    if (data.length === 0) return settled(summarise('csv', ['The file is empty.'], []));
    const header = data[0]!.map((h) => normaliseHeader(String(h ?? '')));
    const index = new Map<string, number>();
    const known = new Set<string>(CSV_COLUMNS);
    const twice: string[] = [];
    const unread: string[] = [];
    header.forEach((h, i) => {
      if (!index.has(h)) index.set(h, i);
      // A known column named twice: which one holds the values is not for us to guess.
      else if (known.has(h)) twice.push(`${h} (columns ${index.get(h)! + 1} and ${i + 1})`);
      if (h !== '' && !known.has(h)) unread.push(clip(String(data[0]![i] ?? '').trim(), 30));
    });
    if (twice.length) {
      return settled(summarise('csv', [`The column${twice.length > 1 ? 's' : ''} ${twice.join(', ')} ${twice.length > 1 ? 'are' : 'is'} named twice: keep one of each and choose the file again.`], []));
    }
    // A column that is not read (e.g. a flash point in °F, a viscosity in another unit) is said, not
    // dropped unseen: its values are not imported.
    const fileWarnings = unread.length
      ? [
          `${unread.length === 1 ? 'The column' : `${unread.length} columns`} ${unread.map((u) => `“${u}”`).join(', ')} ${unread.length === 1 ? 'is' : 'are'} not among the columns Blendbench reads and ${unread.length === 1 ? 'is' : 'are'} not imported (the columns read: ${CSV_COLUMNS.join(', ')}).`,
        ]
      : [];
    const missing = REQUIRED.filter((c) => !index.has(c));
    if (missing.length) {
      // Columns seen but not read (units in a name, "kv40 [mm²/s]") are named: they may be the missing ones.
      const seen = unread.length
        ? ` The file’s column${unread.length > 1 ? 's' : ''} ${unread.map((u) => `“${u}”`).join(', ')} ${unread.length > 1 ? 'are' : 'is'} not read; if one holds a missing column, give it that column’s name (values in its units).`
        : '';
      fileErrors.push(
        `Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}.${seen} The first row must name the columns (${CSV_COLUMNS.join(', ')}).`,
      );
      return settled(summarise('csv', fileErrors, []));
    }
    const body = data.slice(1);
    if (body.length > MAX_IMPORT_ROWS) return settled(summarise('csv', [`The file has ${body.length} rows; at most ${MAX_IMPORT_ROWS} can be imported at once.`], []));
    if (body.length === 0) return settled(summarise('csv', ['The file has a header but no rows.'], []));
    const comma = parsed.meta.delimiter !== ',';
    // The decimal mark the file's number cells show where they cannot mean anything else.
    const numberAt = NUMBER_COLUMNS.map((c) => index.get(c)).filter((i): i is number => i !== undefined);
    const fileMark = comma
      ? decimalMarkOf(
          (function* () {
            for (const r of body) for (const i of numberAt) yield String(r[i] ?? '');
          })(),
        )
      : '.';
    const seen = new Map<string, number>();
    const stored = byCode(existing);
    const has = (c: CsvColumn) => index.has(c);
    const makeRow = (cells: string[], i: number): ImportRow => {
      const line = i + 2 + lineOffset;
      const get = (c: CsvColumn): string => {
        const at = index.get(c);
        // Undo the formula-injection guard of our own export ('=x → =x).
        return at === undefined ? '' : restoreCsvText(String(cells[at] ?? ''));
      };
      const errors: string[] = [];
      const num = (c: CsvColumn, label: string): number | null => {
        const v = cellNumber(get(c), comma, fileMark);
        if (v === 'bad') {
          // A comma in a comma-separated file's number (a quoted "30,5" from a comma-decimal spreadsheet) is
          // said for what it is, with the number as the file must write it.
          const t = get(c).trim();
          const why =
            !comma && /^[-+−]?\d*,\d+$/.test(t)
              ? `: in a comma-separated file the decimal mark is a point and numbers carry no thousands mark (“${t.replace(',', '.')}” if the comma is the decimal mark)`
              : '';
          errors.push(`${label}: “${clip(get(c), 30)}” is not a number${why}`);
          return null;
        }
        if (typeof v === 'object' && v !== null) {
          const told = fileMark === ',' || fileMark === '.';
          const uses = told ? `this file’s other numbers use “${fileMark}” as the decimal mark` : 'the file’s other numbers do not tell which mark is the decimal mark';
          // Both readings in the file's notation (or the settings' when the file does not tell).
          const [asDecimal, asWhole] = couldMeanText(v.could, told ? fileMark : (opts.decimalSeparator ?? '.'));
          errors.push(`${label}: “${clip(get(c).trim(), 30)}” could mean ${asDecimal} or ${asWhole} (${uses}). Write it without a thousands mark, with the file’s decimal mark`);
          return null;
        }
        return v;
      };
      // More filled cells than the header has columns: a stray quote or separator has shifted or
      // swallowed cells (possibly whole lines), so nothing in the row can be trusted.
      const extra = cells.slice(header.length).filter((c) => String(c ?? '').trim() !== '');
      if (extra.length > 0) {
        errors.push(
          `the row has ${header.length + extra.length} filled cells but the header names ${header.length} columns — check for an unclosed quote or a stray separator (“${clip(String(extra[0]), 30)}”)`,
        );
      }
      const kv40 = num('kv40_mm2s', 'ν40');
      const kv100 = num('kv100_mm2s', 'ν100');
      const density = num('density15_kg_per_l', 'density');
      const price = num('price', 'price');
      if (kv40 === null && !errors.some((e) => e.startsWith('ν40'))) errors.push('ν40: a value is required');
      if (kv100 === null && !errors.some((e) => e.startsWith('ν100'))) errors.push('ν100: a value is required');
      if (density === null && !errors.some((e) => e.startsWith('density'))) errors.push('density: a value is required');
      if (price === null && !errors.some((e) => e.startsWith('price'))) errors.push('price: a value is required');
      const catRaw = get('category').trim().toLowerCase();
      const category = CATEGORY_ALIASES[catRaw];
      if (!category) errors.push(`category: “${clip(get('category'), 30)}” is not one of ${COMPONENT_CATEGORIES.join(', ')}`);
      // An update starts from the stored stock: a column the file does not have keeps the stored value
      // (issue 10 item 3). A present column sets the value; an empty cell clears an optional number or
      // text, but leaves the price basis, currency and availability as stored (they cannot be blank).
      const code = get('code').trim();
      const match = stored.get(code.toLowerCase());
      const base = match ?? blankComponent({ sourceDate: '', price: { amount: 0, basis: 'per-kg', currency: opts.baseCurrency?.trim() || 'EUR' } });
      const basisRaw = get('price_basis').trim().toLowerCase();
      const basis = basisRaw === '' ? base.price.basis : BASIS_ALIASES[basisRaw];
      if (!basis) errors.push(`price_basis: “${clip(get('price_basis'), 20)}” is not per-kg, per-litre or per-tonne`);
      const availRaw = get('availability').trim().toLowerCase();
      const availability = (availRaw === '' ? base.availability : availRaw) as Availability;
      if (!AVAILABILITY.includes(availability)) errors.push(`availability: “${clip(get('availability'), 20)}” is not available, limited or withdrawn`);
      const opt = (c: CsvColumn, label: string, kept: number | null) => (has(c) ? num(c, label) : kept);
      const text = (c: CsvColumn, kept: string, trim = true) => (has(c) ? (trim ? get(c).trim() : get(c)) : kept);
      // A CSV row carries ν40/ν100 only: keep the stock's other measured points and its calibration.
      const otherPoints = match ? match.viscosityPoints.filter((p) => p.tempC !== 40 && p.tempC !== 100) : [];
      const candidate: Component = {
        ...base,
        code,
        name: text('name', base.name),
        category: category ?? 'group-ii',
        viscosityPoints: [{ tempC: 40, kv: kv40 ?? 1 }, { tempC: 100, kv: kv100 ?? 0.5 }, ...otherPoints],
        density15: density ?? 0.86,
        anilinePoint: opt('aniline_point_c', 'aniline point', base.anilinePoint),
        pourPoint: opt('pour_point_c', 'pour point', base.pourPoint),
        flashPoint: opt('flash_point_c', 'flash point', base.flashPoint),
        sulfurPct: opt('sulfur_pct', 'sulfur', base.sulfurPct),
        saturatesPct: opt('saturates_pct', 'saturates', base.saturatesPct),
        price: { amount: price ?? 0, basis: basis ?? base.price.basis, currency: get('currency').trim() || base.price.currency },
        availability: AVAILABILITY.includes(availability) ? availability : base.availability,
        oxidationRating: opt('oxidation_rating', 'oxidation rating', base.oxidationRating),
        shearLossPct: opt('shear_loss_pct', 'ν100 shear loss', base.shearLossPct),
        kv40LotSpreadPct: opt('kv40_lot_spread_pct', 'lot spread of ν40', base.kv40LotSpreadPct),
        calibration: match?.calibration ?? null,
        source: text('source', base.source),
        sourceDate: text('source_date', base.sourceDate),
        notes: text('notes', base.notes, false),
      };
      // The ν40 shear loss is an optional field of the model: a blank cell for a stock that never had one
      // leaves it absent (so a CSV round trip changes nothing); otherwise the cell sets or clears it.
      const loss40 = opt('kv40_shear_loss_pct', 'ν40 shear loss', base.shearLoss40Pct ?? null);
      if (loss40 !== null || base.shearLoss40Pct !== undefined) candidate.shearLoss40Pct = loss40;
      // A CSV row carries ν40, ν100 and density (all required): the stock is complete, also when it
      // updates one whose values were not yet entered.
      delete candidate.notEntered;
      if (!candidate.code) errors.push('code: a stock code is required');
      return finishRow(line, candidate, errors, stored, seen);
    };
    return rowByRow('csv', body, makeRow, (rows) => {
      for (const e of parsed.errors.slice(0, 5)) {
        if (e.code === 'UndetectableDelimiter') continue;
        const row = e.row === undefined ? undefined : rows[e.row - 1];
        if (row) {
          row.errors.push(`CSV: ${e.message}`);
          row.action = 'skip';
          row.component = null;
          row.changes = [];
        } else fileErrors.push(`CSV: ${e.message}`);
      }
      return summarise('csv', fileErrors, rows, fileWarnings);
    }, fileWarnings);
  } catch (e) {
    return settled(summarise('csv', [`The file could not be read: ${(e as Error)?.message ?? String(e)}`], []));
  }
}

/** Preview a CSV import in one go. Never throws; changes nothing. */
export function previewCsv(text: string, existing: readonly Component[], opts: ImportPreviewOptions = {}): ImportPreview {
  return runToEnd(csvPreviewer(text, existing, opts));
}

const jsonFileSchema = z.union([
  z.object({ format: z.literal('blendbench-library'), components: z.array(z.unknown()) }),
  z.array(z.unknown()),
]);

/** A JSON import (a Blendbench library export, or a bare array of components), item by item. Never throws. */
export function jsonPreviewer(text: string, existing: readonly Component[]): ImportPreviewer {
  try {
    if (text.length > MAX_IMPORT_CHARS) return settled(summarise('json', [`The file is larger than ${MAX_IMPORT_CHARS / 1e6} MB.`], []));
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      return settled(summarise('json', [`The file is not valid JSON: ${(e as Error).message}`], []));
    }
    const env = jsonFileSchema.safeParse(json);
    if (!env.success && typeof json === 'object' && json !== null && (json as Record<string, unknown>).format === 'blendbench-backup') {
      // A Settings backup chosen here: said for what it is, and where it is restored.
      return settled(
        summarise('json', ['The file is a backup of everything (library, recipes and settings), not a stock library: restore it on Settings → Import a backup, or export the stocks on Stocks → Export JSON.'], []),
      );
    }
    if (!env.success) {
      return settled(summarise('json', ['Expected a Blendbench library file ({"format": "blendbench-library", "components": […]}) or a list of components.'], []));
    }
    const items = Array.isArray(env.data) ? env.data : env.data.components;
    if (items.length === 0) return settled(summarise('json', ['The file holds no components.'], []));
    if (items.length > MAX_IMPORT_ROWS) return settled(summarise('json', [`The file has ${items.length} components; at most ${MAX_IMPORT_ROWS} at once.`], []));
    const seen = new Map<string, number>();
    const stored = byCode(existing);
    const makeRow = (item: unknown, i: number): ImportRow => {
      const line = i + 1;
      const rec = (typeof item === 'object' && item !== null && !Array.isArray(item) ? item : {}) as Record<string, unknown>;
      const code = typeof rec.code === 'string' ? rec.code.trim() : '';
      const name = typeof rec.name === 'string' ? rec.name : '';
      // Imported ids are not trusted: a fresh id, unless the code matches a stock already here.
      // A file written by an older schema lacks fields added since: they take the values the library's
      // own migrations give them (blank scoring fields and texts; the category's lot spread).
      const parsed = componentSchema.safeParse({ ...OLDER_SCHEMA_STOCK_DEFAULTS, ...rec, id: 'import' });
      if (!parsed.success) {
        return {
          line,
          code: clip(code, 40),
          name: clip(name, 80),
          action: 'skip',
          component: null,
          changes: [],
          errors: [typeof item !== 'object' || item === null ? 'not a component object' : describeIssues(parsed.error)],
          warnings: [],
        };
      }
      const candidate = { ...parsed.data, code: parsed.data.code.trim(), id: blankComponent().id };
      return finishRow(line, candidate, [], stored, seen);
    };
    return rowByRow('json', items, makeRow, (rows) => summarise('json', [], rows));
  } catch (e) {
    return settled(summarise('json', [`The file could not be read: ${(e as Error)?.message ?? String(e)}`], []));
  }
}

/** Preview a JSON import in one go. Never throws; changes nothing. */
export function previewJson(text: string, existing: readonly Component[]): ImportPreview {
  return runToEnd(jsonPreviewer(text, existing));
}

/** A previewer chosen by file name (".json" → JSON, anything else → CSV). */
export function libraryImportPreviewer(fileName: string, text: string, existing: readonly Component[], opts: ImportPreviewOptions = {}): ImportPreviewer {
  return /\.json$/i.test(fileName.trim()) ? jsonPreviewer(text, existing) : csvPreviewer(text, existing, opts);
}

/** Preview by file name (".json" → JSON, anything else → CSV), in one go. */
export function previewLibraryImport(fileName: string, text: string, existing: readonly Component[], opts: ImportPreviewOptions = {}): ImportPreview {
  return runToEnd(libraryImportPreviewer(fileName, text, existing, opts));
}

