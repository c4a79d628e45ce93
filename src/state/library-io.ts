/**
 * Library import and export: CSV (papaparse) and JSON (zod-validated).
 *
 * An import is two steps. `previewLibraryImport` parses and checks every row and returns a preview
 * with a per-row error report; it never throws and changes nothing. Only `applyLibraryImport`, called
 * when the user confirms a preview with no errors, touches the library (adds new stock codes,
 * updates existing ones in place, keeping their ids so recipes stay linked; undoable).
 *
 * CSV columns (header row required, any order, unknown columns ignored; temperatures in °C,
 * viscosities in mm²/s, density in kg/L, decimal point "." — or "," when the delimiter is ";"):
 * see `CSV_COLUMNS`.
 */
import Papa from 'papaparse';
import type { Component, ComponentCategory, PriceBasis, Availability } from '../core/formulation/model';
import { CATEGORY_LABEL, COMPONENT_CATEGORIES } from '../core/formulation/model';
import { componentSchema, describeIssues, z } from './schemas';
import { checkComponent } from './checks';
import { COLLECTION_LIMITS } from './field-rules';
import { blankComponent } from './library';
import { useLibraryStore } from './library';
import { restoreCsvText, writeCsv, type CsvCell } from './csv';

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
  'kv40_lot_spread_pct',
  'source',
  'source_date',
  'notes',
] as const;
type CsvColumn = (typeof CSV_COLUMNS)[number];
const REQUIRED: readonly CsvColumn[] = ['code', 'category', 'kv40_mm2s', 'kv100_mm2s', 'density15_kg_per_l', 'price'];

/** Largest file accepted (characters); one limit with backups and storage (field-rules.ts). */
export const MAX_IMPORT_CHARS = COLLECTION_LIMITS.importFileChars;
/** Most rows accepted in one import: a whole library (field-rules.ts). */
export const MAX_IMPORT_ROWS = COLLECTION_LIMITS.importRows;

export interface ImportRow {
  /** Line number in the file (CSV: the header is line 1) or item number (JSON, from 1). */
  line: number;
  code: string;
  name: string;
  action: 'add' | 'update' | 'skip';
  component: Component | null;
  errors: string[];
  warnings: string[];
}

export interface ImportPreview {
  format: 'csv' | 'json';
  /** Problems with the file as a whole (no header, not JSON, too large …). */
  fileErrors: string[];
  rows: ImportRow[];
  /** True when there is at least one row and no error anywhere. */
  valid: boolean;
  adds: number;
  updates: number;
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
  'per-litre': 'per-litre', 'per-liter': 'per-litre', l: 'per-litre', litre: 'per-litre', liter: 'per-litre', '/l': 'per-litre', 'per litre': 'per-litre',
  'per-tonne': 'per-tonne', t: 'per-tonne', tonne: 'per-tonne', '/t': 'per-tonne', 'per tonne': 'per-tonne', 'per-ton': 'per-tonne',
};

const AVAILABILITY: readonly Availability[] = ['available', 'limited', 'withdrawn'];

/** Parse one CSV cell as a number; '' → null. `comma` allows a decimal comma. */
function cellNumber(raw: string | undefined, comma: boolean): number | null | 'bad' {
  const t = (raw ?? '').trim().replace(/^−/, '-');
  if (t === '') return null;
  const s = comma ? t.replace(',', '.') : t;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s)) return 'bad';
  const v = Number(s);
  return Number.isFinite(v) ? v : 'bad';
}

/** Finish a row: schema + entry checks + duplicate and action against the library. */
function finishRow(
  line: number,
  candidate: Component,
  preErrors: string[],
  existing: readonly Component[],
  seen: Map<string, number>,
  keepExtras = false,
): ImportRow {
  const errors = [...preErrors];
  const warnings: string[] = [];
  const key = candidate.code.trim().toLowerCase();
  const match = existing.find((c) => c.code.trim().toLowerCase() === key);
  let comp: Component = match ? { ...candidate, id: match.id } : candidate;
  if (match && keepExtras) {
    // A CSV row carries ν40/ν100 only: keep the stock's other measured points and its calibration.
    const extra = match.viscosityPoints.filter((p) => p.tempC !== 40 && p.tempC !== 100);
    comp = { ...comp, viscosityPoints: [...comp.viscosityPoints, ...extra], calibration: match.calibration };
  }
  if (key) {
    const first = seen.get(key);
    if (first !== undefined) errors.push(`code ${clip(candidate.code, 40)} also appears on line ${first}`);
    else seen.set(key, line);
  }
  if (errors.length === 0) {
    // The entry checks first (the same specific messages as the library screen), then the schema.
    const checks = checkComponent(comp, []);
    for (const e of checks.errors) errors.push(`${e.field}: ${e.message}`);
    for (const w of checks.warnings) warnings.push(`${w.field}: ${w.message}`);
    if (errors.length === 0) {
      const parsed = componentSchema.safeParse(comp);
      if (!parsed.success) errors.push(describeIssues(parsed.error));
    }
  }
  return {
    line,
    code: clip(candidate.code, 40),
    name: clip(candidate.name, 80),
    action: errors.length ? 'skip' : match ? 'update' : 'add',
    component: errors.length ? null : comp,
    errors,
    warnings,
  };
}

function summarise(format: 'csv' | 'json', fileErrors: string[], rows: ImportRow[]): ImportPreview {
  const valid = fileErrors.length === 0 && rows.length > 0 && rows.every((r) => r.errors.length === 0);
  return {
    format,
    fileErrors,
    rows,
    valid,
    adds: rows.filter((r) => r.action === 'add').length,
    updates: rows.filter((r) => r.action === 'update').length,
  };
}

/** Preview a CSV import. Never throws; changes nothing. */
export function previewCsv(text: string, existing: readonly Component[]): ImportPreview {
  try {
    if (text.length > MAX_IMPORT_CHARS) return summarise('csv', [`The file is larger than ${MAX_IMPORT_CHARS / 1e6} MB.`], []);
    // Delimiter from the header line: papaparse's own guess re-parses the text once per candidate
    // and takes tens of seconds on a hostile file of millions of quote characters.
    const head = /^[^\r\n]*/.exec(text.slice(0, 10_000))![0];
    const count = (d: string) => head.split(d).length;
    const delimiter = [';', '\t', '|'].reduce((best, d) => (count(d) > count(best) ? d : best), ',');
    const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy', delimiter });
    const data = parsed.data.filter((r): r is string[] => Array.isArray(r));
    const fileErrors: string[] = [];
    if (data.length === 0) return summarise('csv', ['The file is empty.'], []);
    const header = data[0]!.map((h) => normaliseHeader(String(h ?? '')));
    const index = new Map<string, number>();
    header.forEach((h, i) => {
      if (!index.has(h)) index.set(h, i);
    });
    const missing = REQUIRED.filter((c) => !index.has(c));
    if (missing.length) {
      fileErrors.push(
        `Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}. The first row must name the columns (${CSV_COLUMNS.join(', ')}).`,
      );
      return summarise('csv', fileErrors, []);
    }
    const body = data.slice(1);
    if (body.length > MAX_IMPORT_ROWS) return summarise('csv', [`The file has ${body.length} rows; at most ${MAX_IMPORT_ROWS} can be imported at once.`], []);
    if (body.length === 0) return summarise('csv', ['The file has a header but no rows.'], []);
    const comma = parsed.meta.delimiter !== ',';
    const seen = new Map<string, number>();
    const rows = body.map((cells, i) => {
      const line = i + 2;
      const get = (c: CsvColumn): string => {
        const at = index.get(c);
        // Undo the formula-injection guard of our own export ('=x → =x).
        return at === undefined ? '' : restoreCsvText(String(cells[at] ?? ''));
      };
      const errors: string[] = [];
      const num = (c: CsvColumn, label: string): number | null => {
        const v = cellNumber(get(c), comma);
        if (v === 'bad') {
          errors.push(`${label}: “${clip(get(c), 30)}” is not a number`);
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
      const basisRaw = get('price_basis').trim().toLowerCase();
      const basis = basisRaw === '' ? 'per-kg' : BASIS_ALIASES[basisRaw];
      if (!basis) errors.push(`price_basis: “${clip(get('price_basis'), 20)}” is not per-kg, per-litre or per-tonne`);
      const availRaw = get('availability').trim().toLowerCase();
      const availability = (availRaw === '' ? 'available' : availRaw) as Availability;
      if (!AVAILABILITY.includes(availability)) errors.push(`availability: “${clip(get('availability'), 20)}” is not available, limited or withdrawn`);
      const candidate = blankComponent({
        code: get('code').trim(),
        name: get('name').trim(),
        category: category ?? 'group-ii',
        viscosityPoints: [
          { tempC: 40, kv: kv40 ?? 1 },
          { tempC: 100, kv: kv100 ?? 0.5 },
        ],
        density15: density ?? 0.86,
        anilinePoint: num('aniline_point_c', 'aniline point'),
        pourPoint: num('pour_point_c', 'pour point'),
        flashPoint: num('flash_point_c', 'flash point'),
        sulfurPct: num('sulfur_pct', 'sulfur'),
        saturatesPct: num('saturates_pct', 'saturates'),
        price: { amount: price ?? 0, basis: basis ?? 'per-kg', currency: get('currency').trim() || 'EUR' },
        availability: AVAILABILITY.includes(availability) ? availability : 'available',
        oxidationRating: num('oxidation_rating', 'oxidation rating'),
        shearLossPct: num('shear_loss_pct', 'shear loss'),
        kv40LotSpreadPct: num('kv40_lot_spread_pct', 'lot spread of ν40'),
        source: get('source').trim(),
        sourceDate: get('source_date').trim(),
        notes: get('notes'),
      });
      if (!candidate.code) errors.push('code: a stock code is required');
      return finishRow(line, candidate, errors, existing, seen, true);
    });
    for (const e of parsed.errors.slice(0, 5)) {
      if (e.code === 'UndetectableDelimiter') continue;
      const row = e.row === undefined ? undefined : rows[e.row - 1];
      if (row) {
        row.errors.push(`CSV: ${e.message}`);
        row.action = 'skip';
        row.component = null;
      } else fileErrors.push(`CSV: ${e.message}`);
    }
    return summarise('csv', fileErrors, rows);
  } catch (e) {
    return summarise('csv', [`The file could not be read: ${(e as Error)?.message ?? String(e)}`], []);
  }
}

const jsonFileSchema = z.union([
  z.object({ format: z.literal('blendbench-library'), components: z.array(z.unknown()) }),
  z.array(z.unknown()),
]);

/** Preview a JSON import: a Blendbench library export, or a bare array of components. Never throws. */
export function previewJson(text: string, existing: readonly Component[]): ImportPreview {
  try {
    if (text.length > MAX_IMPORT_CHARS) return summarise('json', [`The file is larger than ${MAX_IMPORT_CHARS / 1e6} MB.`], []);
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      return summarise('json', [`The file is not valid JSON: ${(e as Error).message}`], []);
    }
    const env = jsonFileSchema.safeParse(json);
    if (!env.success) {
      return summarise('json', ['Expected a Blendbench library file ({"format": "blendbench-library", "components": […]}) or a list of components.'], []);
    }
    const items = Array.isArray(env.data) ? env.data : env.data.components;
    if (items.length === 0) return summarise('json', ['The file holds no components.'], []);
    if (items.length > MAX_IMPORT_ROWS) return summarise('json', [`The file has ${items.length} components; at most ${MAX_IMPORT_ROWS} at once.`], []);
    const seen = new Map<string, number>();
    const rows = items.map((item, i) => {
      const line = i + 1;
      const rec = (typeof item === 'object' && item !== null && !Array.isArray(item) ? item : {}) as Record<string, unknown>;
      const code = typeof rec.code === 'string' ? rec.code.trim() : '';
      const name = typeof rec.name === 'string' ? rec.name : '';
      // Imported ids are not trusted: a fresh id, unless the code matches a stock already here.
      // Files written before schema 3 have no lot spread: the category default applies.
      const parsed = componentSchema.safeParse({ kv40LotSpreadPct: null, ...rec, id: 'import' });
      if (!parsed.success) {
        return {
          line,
          code: clip(code, 40),
          name: clip(name, 80),
          action: 'skip' as const,
          component: null,
          errors: [typeof item !== 'object' || item === null ? 'not a component object' : describeIssues(parsed.error)],
          warnings: [],
        };
      }
      const candidate = { ...parsed.data, code: parsed.data.code.trim(), id: blankComponent().id };
      return finishRow(line, candidate, [], existing, seen);
    });
    return summarise('json', [], rows);
  } catch (e) {
    return summarise('json', [`The file could not be read: ${(e as Error)?.message ?? String(e)}`], []);
  }
}

/** Preview by file name (".json" → JSON, anything else → CSV). */
export function previewLibraryImport(fileName: string, text: string, existing: readonly Component[]): ImportPreview {
  return /\.json$/i.test(fileName.trim()) ? previewJson(text, existing) : previewCsv(text, existing);
}

/** Apply a confirmed, valid preview to the library (one undo step). Refuses an invalid preview. */
export function applyLibraryImport(preview: ImportPreview): boolean {
  if (!preview.valid) return false;
  const comps = preview.rows.map((r) => r.component).filter((c): c is Component => c !== null);
  useLibraryStore.getState().upsertByCode(comps);
  return true;
}

// ---------------------------------------------------------------------------------------------
// Export

export function libraryToCsv(components: readonly Component[]): string {
  const rows = components.map((c) => {
    const at = (t: number) => c.viscosityPoints.find((p) => p.tempC === t)?.kv;
    const record: Record<CsvColumn, CsvCell> = {
      code: c.code,
      name: c.name,
      category: c.category,
      kv40_mm2s: at(40),
      kv100_mm2s: at(100),
      density15_kg_per_l: c.density15,
      aniline_point_c: c.anilinePoint,
      pour_point_c: c.pourPoint,
      flash_point_c: c.flashPoint,
      sulfur_pct: c.sulfurPct,
      saturates_pct: c.saturatesPct,
      price: c.price.amount,
      price_basis: c.price.basis,
      currency: c.price.currency,
      availability: c.availability,
      oxidation_rating: c.oxidationRating,
      shear_loss_pct: c.shearLossPct,
      kv40_lot_spread_pct: c.kv40LotSpreadPct,
      source: c.source,
      source_date: c.sourceDate,
      notes: c.notes,
    };
    return CSV_COLUMNS.map((k) => record[k]);
  });
  return writeCsv(CSV_COLUMNS, rows);
}

export function libraryToJson(components: readonly Component[], exportedAt = new Date().toISOString()): string {
  return JSON.stringify({ format: 'blendbench-library', exportedAt, components }, null, 1);
}
