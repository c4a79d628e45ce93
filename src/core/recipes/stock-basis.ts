/**
 * The stock data a recipe was saved with, and what has changed in the library since.
 *
 * A recipe's predictions depend on its stocks' measured viscosities (or the effective values of a
 * calibration), densities and aniline, pour and flash points. When any of them changes after the
 * recipe was saved — a new datasheet, a calibration from a trial blend — the same fractions predict
 * a different blend. Recording a snapshot with the recipe lets every screen say so instead of
 * silently showing new numbers under an old approval.
 *
 * Exact comparison: the snapshot holds the values as entered, so "unchanged" means identical inputs
 * (no tolerance: a re-typed value that differs in the last digit is a change the user made).
 */
import { CATEGORY_LABEL, type Component, type ComponentCategory, type RecipeLine, type StockBasis, type StockSnapshot } from '../formulation/model';
import { notEnteredFields } from '../formulation/entered-values';

/**
 * The snapshot of one stock: the inputs predictions depend on.
 *
 * @param c - the stock as it is in the library now
 * @returns its snapshot (copies; later edits of `c` do not reach it)
 */
export function stockSnapshot(c: Component): StockSnapshot {
  return {
    componentId: c.id,
    code: c.code,
    category: c.category,
    viscosityPoints: c.viscosityPoints.map((p) => ({ tempC: p.tempC, kv: p.kv })),
    calibratedKv40: c.calibration?.effectiveKv40 ?? null,
    calibratedKv100: c.calibration?.effectiveKv100 ?? null,
    density15: c.density15,
    anilinePoint: c.anilinePoint,
    pourPoint: c.pourPoint,
    flashPoint: c.flashPoint,
    ...(notEnteredFields(c).length ? { notEntered: notEnteredFields(c) } : {}),
  };
}

/** A snapshot's ν at `tempC`, or null when not given (no point there, or a value not yet entered). */
function kvAt(s: StockSnapshot, tempC: number): number | null {
  const pending = notEnteredFields(s);
  if ((tempC === 40 && pending.includes('kv40')) || (tempC === 100 && pending.includes('kv100'))) return null;
  return s.viscosityPoints.find((p) => p.tempC === tempC)?.kv ?? null;
}

/**
 * Records the stock data of every component a recipe names (each once, in line order); ids not in
 * the library are left out (the recipe's own checks report them).
 *
 * @param components - the library
 * @param lines - the recipe's lines
 * @param recordedAt - ISO date-time of recording (the caller's clock; the core has none)
 * @returns the stock basis to store with the recipe
 * @example recordStockBasis(lib, recipe.lines, '2026-01-05T10:00:00.000Z').stocks.length // → 3
 */
export function recordStockBasis(components: readonly Component[], lines: readonly RecipeLine[], recordedAt: string): StockBasis {
  const byId = new Map(components.map((c) => [c.id, c]));
  const seen = new Set<string>();
  const stocks: StockSnapshot[] = [];
  for (const l of lines) {
    if (seen.has(l.componentId)) continue;
    seen.add(l.componentId);
    const c = byId.get(l.componentId);
    if (c) stocks.push(stockSnapshot(c));
  }
  return { recordedAt, stocks };
}

/** One property of a stock that differs from the recipe's snapshot. */
export interface StockFieldChange {
  /** What changed, in words: "ν at 40 °C", "calibrated ν40", "density at 15 °C", "flash point" … */
  property: string;
  /** Unit of the values: 'mm²/s', 'kg/L' or '°C'. */
  unit: 'mm²/s' | 'kg/L' | '°C';
  /** Value in the snapshot and in the library now; null → not given. */
  from: number | null;
  to: number | null;
}

/** A stock of the recipe whose data differ from the snapshot, or that left the library. */
export interface StockChange {
  componentId: string;
  /** Stock code now (or as recorded, when the stock was deleted). */
  code: string;
  /** 'changed': data differ (or the code); 'deleted': the stock is no longer in the library. */
  kind: 'changed' | 'deleted';
  /**
   * The stock code as recorded, when the library's code differs ('changed' only): the sheet prints
   * the code now, and the plant charges by code, so a renamed stock is said rather than printed silently.
   */
  codeWas?: string;
  /**
   * The category as recorded, when the library's differs ('changed' only): the category sets the
   * sheet's charging order (the additive package last), so a recategorised stock is said.
   */
  categoryWas?: ComponentCategory;
  /** The category now, beside `categoryWas`. */
  category?: ComponentCategory;
  /** The differing properties ('changed' only), in a fixed order. */
  fields: StockFieldChange[];
}

/**
 * Compares a recipe's recorded stock data with the library now.
 *
 * @param basis - the recipe's stock basis (null → nothing recorded → no changes can be told)
 * @param components - the library now
 * @returns one entry per stock whose data or code differ or that was deleted, in snapshot order; empty
 *   when nothing changed
 * @example stockBasisChanges(recipe.stockBasis, lib) // → [{ code: 'BW-510', kind: 'changed', fields: [{ property: 'calibrated ν40', from: null, to: 7200, … }] }]
 */
export function stockBasisChanges(basis: StockBasis | null, components: readonly Component[]): StockChange[] {
  if (!basis) return [];
  const byId = new Map(components.map((c) => [c.id, c]));
  const out: StockChange[] = [];
  for (const snap of basis.stocks) {
    const c = byId.get(snap.componentId);
    if (!c) {
      out.push({ componentId: snap.componentId, code: snap.code, kind: 'deleted', fields: [] });
      continue;
    }
    const now = stockSnapshot(c);
    const fields: StockFieldChange[] = [];
    const temps = [...new Set([...snap.viscosityPoints, ...now.viscosityPoints].map((p) => p.tempC))].sort((a, b) => a - b);
    for (const t of temps) {
      // A value not yet entered is compared as not given: its placeholder is never shown as the recorded value.
      const from = kvAt(snap, t);
      const to = kvAt(now, t);
      if (from !== to) fields.push({ property: `ν at ${t} °C`, unit: 'mm²/s', from, to });
    }
    const compare = (property: string, unit: StockFieldChange['unit'], from: number | null, to: number | null) => {
      if (from !== to) fields.push({ property, unit, from, to });
    };
    compare('calibrated ν40', 'mm²/s', snap.calibratedKv40, now.calibratedKv40);
    compare('calibrated ν100', 'mm²/s', snap.calibratedKv100, now.calibratedKv100);
    const density = (x: StockSnapshot) => (notEnteredFields(x).includes('density15') ? null : x.density15);
    compare('density at 15 °C', 'kg/L', density(snap), density(now));
    compare('aniline point', '°C', snap.anilinePoint, now.anilinePoint);
    compare('pour point', '°C', snap.pourPoint, now.pourPoint);
    compare('flash point', '°C', snap.flashPoint, now.flashPoint);
    const codeWas = snap.code !== c.code ? { codeWas: snap.code } : {};
    const categoryWas = snap.category !== undefined && snap.category !== c.category ? { categoryWas: snap.category, category: c.category } : {};
    if (fields.length > 0 || 'codeWas' in codeWas || 'categoryWas' in categoryWas) {
      out.push({ componentId: c.id, code: c.code, kind: 'changed', fields, ...codeWas, ...categoryWas });
    }
  }
  return out;
}

/**
 * A changed stock's new code and category in words, before its data changes: what the plant
 * charges by and what sets the charging order.
 *
 * @param c - one 'changed' entry of {@link stockBasisChanges}
 * @returns e.g. ['stock code BW-160 → BW-169', 'category Group I → Additive package']; empty when
 *   neither changed
 */
export function identityChangeWords(c: StockChange): string[] {
  const out: string[] = [];
  if (c.codeWas !== undefined) out.push(`stock code ${c.codeWas} → ${c.code}`);
  if (c.categoryWas !== undefined && c.category !== undefined) {
    out.push(`category ${CATEGORY_LABEL[c.categoryWas]} → ${CATEGORY_LABEL[c.category]}`);
  }
  return out;
}
