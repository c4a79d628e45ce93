/**
 * The plant's blend sheet: what to charge, in what order, how much of each, and what the laboratory
 * must confirm before release.
 *
 * Pure functions from a recipe, its components and a batch size (kg, or litres at 15 °C) to the
 * sheet's rows and totals, the default blending instructions, the QC release targets and the CSV rows
 * of the component table. Nothing here formats for a screen or a printer beyond fixing the displayed
 * precision: the print view (`src/features/blend-sheet`) lays the numbers out.
 *
 * Displayed quantities are rounded by the largest-remainder method, so that each column of the
 * component table sums exactly to the displayed batch total (common practice (no source): an operator
 * who adds up the kg column must find the batch size, not the batch size ± 0.1).
 */

import { notEnteredFields } from '../formulation/entered-values';
import type { Component, ComponentCategory, Recipe, ReleaseSpecification } from '../formulation/model';
import { BLANK_SPECIFICATION, CATEGORY_LABEL } from '../formulation/model';
import { BlendbenchInputError, assertFinite } from '../errors';
import { batchQuantities, pricePerKg, type BatchSize } from '../formulation/cost';
import { gradeBand } from '../viscosity/iso-grades';
import { blendDensityAtTemperature } from '../blending/density-temperature';
import { cToF } from '../units';
import { decimalsOf } from '../words/display';
import { verdictDigits } from '../words/verdict-digits';
import type { BlendProperties } from '../formulation/blend-properties';
import { D341_FORM_SHORT, type D341Form } from '../viscosity/viscosity-temperature';

/** Temperature unit a sheet prints in; values are always computed in °C. */
export type SheetTemperatureUnit = 'C' | 'F';

/**
 * A temperature [°C] in the sheet's unit, in whole degrees (as the plant reads a gauge): rounded to
 * the nearest degree, or inward when `bound` says the value is a limit — a lower limit up, an upper
 * limit down — so the printed limit is never looser than the one set (66 °C is 150.8 °F: "do not
 * exceed 150 °F", not 151 °F). A value within 10⁻⁶ degree of a whole degree is that degree.
 */
function sheetTemp(tC: number, unit: SheetTemperatureUnit, bound?: 'lower' | 'upper'): number {
  const t = unit === 'F' ? cToF(tC) : tC;
  const whole = Math.round(t);
  if (bound === undefined || Math.abs(t - whole) < 1e-6) return whole;
  return bound === 'lower' ? Math.ceil(t) : Math.floor(t);
}

// ---------------------------------------------------------------------------------------------
// Batch size and rounding
// ---------------------------------------------------------------------------------------------

/** The batch size: a mass `{ kg }` [kg] or a volume `{ litres }` at 15 °C [L] (from `cost.ts`). */
export type { BatchSize };

/**
 * Number of decimals shown for kg and litres, chosen from the batch size when the caller does not
 * fix it: 2 below 100 (laboratory and pilot batches, weighed on a balance), 1 below 100 000, 0 from
 * 100 000 up (tank batches, read from load cells or flow meters).
 * Source: common practice (no source).
 *
 * @param total - the batch total in the unit shown [kg or L], > 0
 * @returns number of decimals, 0–2
 * @example quantityDecimals(1000) // → 1
 */
export function quantityDecimals(total: number): number {
  assertFinite('quantityDecimals', 'total', total);
  if (total < 100) return 2;
  if (total < 100_000) return 1;
  return 0;
}

/**
 * Rounds values to `decimals` so that the rounded values sum exactly to `total` rounded to the same
 * precision — the largest-remainder (Hamilton) method.
 *
 * Each value is scaled to integer units of 10^−decimals and floored; the units still missing to reach
 * round(total) go one each to the values with the largest discarded remainders (ties: the larger
 * value, then the earlier one). The result is returned as integer units, so sums are exact.
 *
 * @param values - the unrounded values, each ≥ 0, summing to `total` (within floating-point error)
 * @param total - their exact total, ≥ 0
 * @param decimals - decimals to keep, integer 0–6
 * @param targetUnits - the integer units the result must sum to, when not round(total × 10^decimals):
 *   at most one unit away from it (a column printed under a heel rounded on its own, so that heel +
 *   column = the batch as printed); default round(total × 10^decimals)
 * @returns integer units (value × 10^decimals) for each input, in input order, summing to
 *   `targetUnits` (default round(total × 10^decimals))
 * @throws BlendbenchInputError if a value is negative or not finite, the values do not add up to
 *   `total` within 1e-6 relative, or `targetUnits` is not an integer within one unit of round(total × 10^decimals)
 * @example largestRemainderUnits([33.333, 33.333, 33.334], 100, 1) // → [333, 333, 334]
 */
export function largestRemainderUnits(values: readonly number[], total: number, decimals: number, targetUnits?: number): number[] {
  const fn = 'largestRemainderUnits';
  assertFinite(fn, 'total', total);
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 6) {
    throw new BlendbenchInputError('decimals', decimals, `${fn}: decimals = ${decimals}; must be an integer 0–6`);
  }
  let sum = 0;
  values.forEach((v, i) => {
    assertFinite(fn, `values[${i}]`, v);
    if (v < 0) throw new BlendbenchInputError(`values[${i}]`, v, `${fn}: values[${i}] = ${v}; must be ≥ 0`);
    sum += v;
  });
  if (Math.abs(sum - total) > 1e-6 * Math.max(1, Math.abs(total))) {
    throw new BlendbenchInputError('values', sum, `${fn}: values sum to ${sum}, not to total = ${total}`);
  }
  const scale = 10 ** decimals;
  const rounded = Math.round(total * scale);
  if (targetUnits !== undefined && !(Number.isInteger(targetUnits) && Math.abs(targetUnits - rounded) <= 1 && targetUnits >= 0)) {
    throw new BlendbenchInputError('targetUnits', targetUnits, `${fn}: targetUnits = ${targetUnits}; must be a whole number of units within one of ${rounded}`);
  }
  const target = targetUnits ?? rounded;
  // A tiny epsilon keeps 1234.9999999997 (a float image of 1235) from flooring to 1234.
  const scaled = values.map((v) => v * scale);
  const floors = scaled.map((s) => Math.floor(s + 1e-9));
  let missing = target - floors.reduce((a, b) => a + b, 0);
  const order = scaled
    .map((s, i) => ({ i, rem: s - floors[i]!, s }))
    .sort((a, b) => b.rem - a.rem || b.s - a.s || a.i - b.i);
  const units = [...floors];
  // missing lies in [0, n] in exact arithmetic (in [−1, n + 1] with a target one unit off); guard
  // both ends against float noise. A second pass over the order takes a last unit beyond n.
  for (let k = 0; missing > 0 && order.length > 0; k = (k + 1) % order.length, missing--) units[order[k]!.i]! += 1;
  for (let k = order.length - 1; missing < 0 && k >= 0; k--) {
    const i = order[k]!.i;
    if (units[i]! > 0) {
      units[i]! -= 1;
      missing++;
    }
  }
  return units;
}

// ---------------------------------------------------------------------------------------------
// Charging order
// ---------------------------------------------------------------------------------------------

/** What a component does in the kettle, which decides when it is charged. */
export type ChargeRole = 'base-stock' | 'solvency-booster' | 'polymer' | 'additive-package';

export const CHARGE_ROLE_LABEL: Record<ChargeRole, string> = {
  'base-stock': 'Base stock',
  'solvency-booster': 'Solvency booster',
  polymer: 'Polymer',
  'additive-package': 'Additive package',
};

/** Rank of each role in the default charging order (lower is charged first). */
const ROLE_RANK: Record<ChargeRole, number> = {
  'base-stock': 0,
  'solvency-booster': 1,
  polymer: 2,
  'additive-package': 3,
};

/**
 * The charging role of a component category. Groups I–IV are base stocks; Group V fluids (esters,
 * alkylated naphthalene, alkylbenzene) are treated as solvency boosters, charged after the base
 * stocks; polymers next, the additive package last.
 * Source: common practice of gear-oil blending plants (no published source).
 *
 * @param category - the component's category
 * @returns its charging role
 */
export function chargeRole(category: ComponentCategory): ChargeRole {
  switch (category) {
    case 'group-v':
      return 'solvency-booster';
    case 'polymer':
      return 'polymer';
    case 'additive-package':
      return 'additive-package';
    default:
      return 'base-stock';
  }
}

/**
 * The component's measured viscosity nearest to 40 °C [mm²/s], used only to rank stocks within a
 * role (heaviest first); not a property prediction.
 */
function rankingViscosity(c: Component): number {
  // A ν40 not yet entered is no viscosity to rank by (its stored number is a placeholder): after the others.
  if (notEnteredFields(c).includes('kv40')) return -1;
  let best = c.viscosityPoints[0];
  for (const p of c.viscosityPoints) {
    if (best === undefined || Math.abs(p.tempC - 40) < Math.abs(best.tempC - 40)) best = p;
  }
  return best?.kv ?? 0;
}

// ---------------------------------------------------------------------------------------------
// The component table
// ---------------------------------------------------------------------------------------------

/** One row of the component table, in charging order. */
export interface BlendSheetRow {
  /** Position in the charging order, 1-based. */
  chargeOrder: number;
  componentId: string;
  code: string;
  name: string;
  category: ComponentCategory;
  /** Human label of the category, e.g. "Group II". */
  categoryLabel: string;
  role: ChargeRole;
  /** Unrounded mass fraction, 0–1. */
  massFraction: number;
  /** Unrounded volume fraction at 15 °C, 0–1. */
  volumeFraction: number;
  /** Mass % as displayed (rounded to `percentDecimals`; the column sums to exactly 100). */
  massPct: number;
  /** Volume % as displayed (rounded to `percentDecimals`; the column sums to exactly 100). */
  volumePct: number;
  /** Mass to charge as displayed [kg] (rounded to `quantityDecimals`; the column sums to the total). */
  kg: number;
  /** Volume to charge at 15 °C as displayed [L] (same rounding; the column sums to the total). */
  litres: number;
  /** Running total of the displayed kg, this row included [kg]. */
  runningKg: number;
  /** Running total of the displayed litres, this row included [L]. */
  runningLitres: number;
  /**
   * Volume to charge at the metering temperature as displayed [L] (ASTM D1250-80 Table 54D, same
   * rounding; the column sums to its total); null when no metering temperature is given.
   */
  litresAtMetering: number | null;
  /** Density at 15 °C [kg/L], for the operator who meters by volume. */
  density15: number;
  /** Price per kg in the component's currency, or null when the price cannot be converted. */
  pricePerKg: number | null;
  /** The component's cost in this batch (unrounded kg × price per kg), or null without a price. */
  lineCost: number | null;
}

/** Cost of the batch, when every component is priced in the same currency. */
export type BatchCosting =
  | {
      available: true;
      currency: string;
      perKg: number;
      /** Per litre at 15 °C. */
      perLitre: number;
      perBatch: number;
      /**
       * Per delivered litre, counted at the delivery temperature (ρ_blend(t) by ASTM D1250-80 Table 54D,
       * cost = ρ_blend(t) × per kg); null when no delivery temperature other than 15 °C is given.
       */
      perDeliveredLitre: { tempC: number; cost: number } | null;
    }
  | { available: false; reason: string };

export interface BlendSheet {
  recipeId: string;
  recipeName: string;
  grade: number;
  revision: number;
  /** Rows in charging order. */
  rows: BlendSheetRow[];
  /** What the batch size was given in. */
  batchBasis: 'kg' | 'litres';
  /** Unrounded batch mass [kg] and volume at 15 °C [L]. */
  totalKgExact: number;
  totalLitresExact: number;
  /** Displayed totals: exactly the sum of the displayed rows. */
  totalKg: number;
  totalLitres: number;
  /** Metering temperature [°C] and the displayed total litres at it; null without one. */
  metering: { tempC: number; totalLitres: number; totalLitresExact: number } | null;
  /** Blend density at 15 °C, ideal mixing (1/ρ = Σ wᵢ/ρᵢ) [kg/L]. */
  density15: number;
  /**
   * The heel as printed (rounded to `quantityDecimals`), or null without one. With a heel the kg and
   * litre columns are rounded so that heel + column total = the whole batch (heel + additions) rounded:
   * an operator who adds the heel line to the column finds the batch ordered, never one unit off.
   */
  heel: { kg: number; litres: number; kgExact: number; litresExact: number } | null;
  /** The whole batch as printed, heel included [kg, L at 15 °C]: `totalKg`/`totalLitres` plus the heel's printed values. */
  batchKg: number;
  batchLitres: number;
  /** Decimals of the kg and litre columns (chosen from the whole batch, heel included). */
  quantityDecimals: number;
  /** Decimals of the mass % and volume % columns. */
  percentDecimals: number;
  costing: BatchCosting;
}

export interface BlendSheetOptions {
  /** Component ids in the charging order wanted; ids left out follow in the default order. */
  chargeOrder?: readonly string[];
  /** Decimals for kg and litres; default {@link quantityDecimals} of the batch size. */
  quantityDecimals?: number;
  /** Decimals for mass % and volume %; default 2 (common practice (no source)). */
  percentDecimals?: number;
  /** Metering temperature [°C] for a "L at t" column (ASTM D1250-80 Table 54D); none by default. */
  meteringTempC?: number;
  /** Delivery temperature [°C] for the cost per delivered litre (ASTM D1250-80 Table 54D); 15 °C by default. */
  deliveryTempC?: number;
  /**
   * Oil already in the vessel (a heel): its mass [kg] and volume at 15 °C [L], ≥ 0. The table holds the
   * additions only (the batch size given is theirs); the heel is rounded on its own and the kg and litre
   * columns so that heel + column = the whole batch as printed (see {@link BlendSheet.heel}).
   */
  heel?: { kg: number; litres: number };
}

/**
 * Price of a component per kg in its own currency (`cost.ts` pricePerKg), or null when the price is
 * unusable (negative, not a number): the sheet still prints, only the costing says why it is missing.
 */
function pricePerKgOf(c: Component): number | null {
  try {
    return pricePerKg(c.price, c.density15);
  } catch {
    return null;
  }
}

/**
 * Builds the component table of a blend sheet: every recipe line with its mass %, volume % at 15 °C,
 * kg and litres at 15 °C for the batch, in charging order with running totals.
 *
 * Quantities: mᵢ = wᵢ·M; Vᵢ = mᵢ/ρᵢ; V = Σ Vᵢ (ideal mixing, no volume contraction); for a batch
 * given as a volume V, M = V·ρ with 1/ρ = Σ wᵢ/ρᵢ. Volume fractions φᵢ = Vᵢ/V.
 * Displayed values are rounded by {@link largestRemainderUnits} so each column sums to its total.
 *
 * Default charging order (common practice of blending plants, no published source): base stocks,
 * most viscous first; then solvency boosters; then polymers (added slowly or pre-dissolved); the
 * additive package last. Within a role: higher ν40 first, then larger mass, then stock code; a stock whose
 * ν40 is not yet entered (`Component.notEntered`) after the others of its role, as its ν40 is unknown.
 *
 * @param components - the library (at least every component the recipe names)
 * @param recipe - the recipe; its mass fractions sum to 1 (lines at exactly 0 are left off the sheet)
 * @param batch - batch size `{ kg }` [kg] or `{ litres }` [L at 15 °C], > 0
 * @param options - charging-order override and displayed precision
 * @returns the sheet: rows in charging order, exact and displayed totals, blend density, costing
 * @throws BlendbenchInputError if a line names a component not in `components`, the batch size is not
 *   a positive finite number, or the fractions or densities are invalid (from `batchQuantities`)
 * @example
 *   buildBlendSheet(lib, vg320, { kg: 1000 }).totalKg // → 1000
 */
export function buildBlendSheet(
  components: readonly Component[],
  recipe: Recipe,
  batch: BatchSize,
  options: BlendSheetOptions = {},
): BlendSheet {
  const fn = 'buildBlendSheet';
  const byId = new Map(components.map((c) => [c.id, c]));
  if (recipe.lines.length === 0) {
    throw new BlendbenchInputError('recipe.lines', recipe.lines, `${fn}: recipe "${recipe.name}" has no lines`);
  }
  // Lines at 0 % have nothing to charge: they are left off the sheet (they still count in the sum check).
  const parts = recipe.lines.flatMap((line, i) => {
    if (line.massFraction === 0) return [];
    const c = byId.get(line.componentId);
    if (!c) {
      throw new BlendbenchInputError(
        `recipe.lines[${i}].componentId`,
        line.componentId,
        `${fn}: recipe "${recipe.name}" names component ${line.componentId}, which is not in the library`,
      );
    }
    return [{ line, c }];
  });
  const batchValue = 'kg' in batch ? batch.kg : batch.litres;
  const batchField = 'kg' in batch ? 'batch.kg' : 'batch.litres';
  assertFinite(fn, batchField, batchValue);
  if (batchValue <= 0) {
    throw new BlendbenchInputError(batchField, batchValue, `${fn}: ${batchField} = ${batchValue}; a batch must be larger than 0`);
  }

  const q = batchQuantities(
    parts.map(({ line, c }) => ({ massFraction: line.massFraction, density15: c.density15 })),
    batch,
    options.meteringTempC,
  );

  // Charging order: explicit ids first, the rest by role, viscosity, mass, code.
  const explicit = new Map((options.chargeOrder ?? []).map((id, i) => [id, i]));
  const idx = parts.map((_, i) => i);
  idx.sort((a, b) => {
    const pa = parts[a]!;
    const pb = parts[b]!;
    const ea = explicit.get(pa.c.id);
    const eb = explicit.get(pb.c.id);
    if (ea !== undefined || eb !== undefined) {
      if (ea === undefined) return 1;
      if (eb === undefined) return -1;
      return ea - eb;
    }
    return (
      ROLE_RANK[chargeRole(pa.c.category)] - ROLE_RANK[chargeRole(pb.c.category)] ||
      rankingViscosity(pb.c) - rankingViscosity(pa.c) ||
      pb.line.massFraction - pa.line.massFraction ||
      pa.c.code.localeCompare(pb.c.code)
    );
  });

  const basis: 'kg' | 'litres' = 'kg' in batch ? 'kg' : 'litres';
  const heel = options.heel ?? null;
  if (heel) {
    for (const [k, v] of [['kg', heel.kg], ['litres', heel.litres]] as const) {
      assertFinite(fn, `options.heel.${k}`, v);
      if (v < 0) throw new BlendbenchInputError(`options.heel.${k}`, v, `${fn}: options.heel.${k} = ${v}; a heel cannot be negative`);
    }
  }
  const heelKgExact = heel?.kg ?? 0;
  const heelLitresExact = heel?.litres ?? 0;
  const qd = options.quantityDecimals ?? quantityDecimals(basis === 'kg' ? q.totalKg + heelKgExact : q.totalLitres + heelLitresExact);
  const pd = options.percentDecimals ?? 2;
  const qs = 10 ** qd;
  // With a heel, the heel is rounded on its own and the column takes what is left of the whole batch
  // rounded (one unit at most from its own rounding), so heel + column = the batch as printed.
  const heelKgUnits = Math.round(heelKgExact * qs);
  const heelLitreUnits = Math.round(heelLitresExact * qs);
  const columnUnits = (column: number, inHeel: number, heelUnits: number): number | undefined =>
    heel ? Math.max(0, Math.round((column + inHeel) * qs) - heelUnits) : undefined;

  const kgRaw = idx.map((i) => q.lines[i]!.kg);
  const lRaw = idx.map((i) => q.lines[i]!.litres);
  const kgUnits = largestRemainderUnits(kgRaw, q.totalKg, qd, columnUnits(q.totalKg, heelKgExact, heelKgUnits));
  const lUnits = largestRemainderUnits(lRaw, q.totalLitres, qd, columnUnits(q.totalLitres, heelLitresExact, heelLitreUnits));
  const mUnits =
    q.totalLitresAtMetering === null
      ? null
      : largestRemainderUnits(idx.map((i) => q.lines[i]!.litresAtMetering!), q.totalLitresAtMetering, qd);
  const massPctUnits = largestRemainderUnits(kgRaw.map((k) => (100 * k) / q.totalKg), 100, pd);
  const volPctUnits = largestRemainderUnits(lRaw.map((l) => (100 * l) / q.totalLitres), 100, pd);
  const ps = 10 ** pd;

  let runKg = 0;
  let runL = 0;
  const rows: BlendSheetRow[] = idx.map((i, k) => {
    const { line, c } = parts[i]!;
    runKg += kgUnits[k]!;
    runL += lUnits[k]!;
    const ppk = pricePerKgOf(c);
    return {
      chargeOrder: k + 1,
      componentId: c.id,
      code: c.code,
      name: c.name,
      category: c.category,
      categoryLabel: CATEGORY_LABEL[c.category],
      role: chargeRole(c.category),
      massFraction: line.massFraction,
      volumeFraction: q.lines[i]!.litres / q.totalLitres,
      massPct: massPctUnits[k]! / ps,
      volumePct: volPctUnits[k]! / ps,
      kg: kgUnits[k]! / qs,
      litres: lUnits[k]! / qs,
      runningKg: runKg / qs,
      runningLitres: runL / qs,
      litresAtMetering: mUnits === null ? null : mUnits[k]! / qs,
      density15: c.density15,
      pricePerKg: ppk,
      lineCost: ppk === null ? null : q.lines[i]!.kg * ppk,
    };
  });

  return {
    recipeId: recipe.id,
    recipeName: recipe.name,
    grade: recipe.grade,
    revision: recipe.revision,
    rows,
    batchBasis: basis,
    totalKgExact: q.totalKg,
    totalLitresExact: q.totalLitres,
    totalKg: runKg / qs,
    totalLitres: runL / qs,
    heel: heel ? { kg: heelKgUnits / qs, litres: heelLitreUnits / qs, kgExact: heelKgExact, litresExact: heelLitresExact } : null,
    batchKg: (runKg + heelKgUnits) / qs,
    batchLitres: (runL + heelLitreUnits) / qs,
    metering:
      mUnits === null || options.meteringTempC === undefined
        ? null
        : { tempC: options.meteringTempC, totalLitres: mUnits.reduce((a, b) => a + b, 0) / qs, totalLitresExact: q.totalLitresAtMetering! },
    density15: q.totalKg / q.totalLitres,
    quantityDecimals: qd,
    percentDecimals: pd,
    costing: batchCosting(parts.map((p) => p.c), rows, q.totalKg, q.totalLitres, () =>
      blendDensityAtTemperature(
        parts.map(({ line, c }) => ({ massFraction: line.massFraction, density15: c.density15 })),
        options.deliveryTempC!,
      ),
    options.deliveryTempC),
  };
}

function batchCosting(
  comps: readonly Component[],
  rows: readonly BlendSheetRow[],
  totalKg: number,
  totalLitres: number,
  densityAtDelivery: () => number,
  deliveryTempC: number | undefined,
): BatchCosting {
  // A blank currency marks a stock left out of costing (no price, no rate, values not entered: see
  // currency/exchange-rates.ts priceLibraryInBase): the batch has no usable price, whatever its amount.
  const blankIds = new Set(comps.filter((c) => c.price.currency.trim() === '').map((c) => c.id));
  const blank = rows.filter((r) => blankIds.has(r.componentId)).map((r) => r.code);
  if (blank.length > 0) return { available: false, reason: `no usable price for ${blank.join(', ')}` };
  const currencies = [...new Set(comps.map((c) => c.price.currency.trim()))];
  if (currencies.length !== 1) {
    return { available: false, reason: `components are priced in different currencies (${currencies.join(', ')})` };
  }
  const missing = rows.filter((r) => r.lineCost === null).map((r) => r.code);
  if (missing.length > 0) return { available: false, reason: `no usable price for ${missing.join(', ')}` };
  // Cost per batch = Σ mᵢ·pᵢ; per kg = that / M; per litre = that / V (= ρ·Σ wᵢ·pᵢ, check-values D2).
  const perBatch = rows.reduce((s, r) => s + (r.lineCost ?? 0), 0);
  const perKg = perBatch / totalKg;
  const perDeliveredLitre =
    deliveryTempC === undefined || deliveryTempC === 15 ? null : { tempC: deliveryTempC, cost: densityAtDelivery() * perKg };
  return { available: true, currency: currencies[0]!, perBatch, perKg, perLitre: perBatch / totalLitres, perDeliveredLitre };
}

// ---------------------------------------------------------------------------------------------
// Blending instructions
// ---------------------------------------------------------------------------------------------

export interface InstructionOptions {
  /** Charging temperature range [°C]; default 50–65 (common practice, domain notes). */
  heatToC?: readonly [number, number];
  /** Mixing time range [min]; default 30–60 (common practice, domain notes). */
  mixMinutes?: readonly [number, number];
  /** Unit the temperatures are printed in; default 'C' (°F = °C × 9/5 + 32, rounded to whole degrees). */
  temperatureUnit?: SheetTemperatureUnit;
}

/**
 * Default blending instructions for the sheet, one step per string, in the order the operator works.
 * Editable: the print view offers them as text the plant changes to its own procedure.
 *
 * Source: common practice of blending plants (no published source) — charge base
 * stocks, heat to about 50–65 °C, add polymer slowly or pre-dissolved, additive package last, mix
 * until uniform (often 30–60 min), sample for QC (common practice).
 *
 * @param sheet - the sheet from {@link buildBlendSheet} (its rows are in charging order)
 * @param options - temperatures and mixing time
 * @returns the steps, without numbers (the view numbers them)
 */
export function defaultBlendingInstructions(sheet: BlendSheet, options: InstructionOptions = {}): string[] {
  const [cLo, cHi] = options.heatToC ?? [50, 65];
  const unit = options.temperatureUnit ?? 'C';
  const tLo = sheetTemp(cLo, unit, 'lower');
  const tHi = sheetTemp(cHi, unit, 'upper');
  const deg = unit === 'F' ? '°F' : '°C';
  const [mLo, mHi] = options.mixMinutes ?? [30, 60];
  const codes = (role: ChargeRole) =>
    sheet.rows.filter((r) => r.role === role).map((r) => `${r.code} (step ${r.chargeOrder})`);
  const list = (xs: string[]) => xs.join(', ');
  const base = codes('base-stock');
  const boost = codes('solvency-booster');
  const poly = codes('polymer');
  const add = codes('additive-package');
  const steps: string[] = [];
  steps.push('Check that the vessel is clean, dry and drained, and that every stock code and lot matches this sheet.');
  if (base.length > 0) {
    steps.push(`Charge the base stocks in the order listed: ${list(base)}. Start the agitator once the blades are covered.`);
  }
  steps.push(`Heat to ${tLo}–${tHi} ${deg} with agitation; do not exceed ${tHi} ${deg}.`);
  if (boost.length > 0) steps.push(`Add the solvency booster(s): ${list(boost)}.`);
  if (poly.length > 0) {
    steps.push(
      `Add the polymer slowly into the vortex, or pre-dissolved in part of the base stock: ${list(poly)}. ` +
        'Mix until no undissolved polymer remains.',
    );
  }
  if (add.length > 0) {
    steps.push(`Add the additive package last, at no more than ${tHi} ${deg}: ${list(add)}.`);
  }
  steps.push(`Mix for ${mLo}–${mHi} min until uniform; check the charged quantities against the running totals.`);
  steps.push('Take a QC sample from the mixed batch; hold the batch until the laboratory releases it.');
  return steps;
}

// ---------------------------------------------------------------------------------------------
// QC release targets
// ---------------------------------------------------------------------------------------------

/** The predicted properties the sheet prints (a subset of the blend prediction, mapped by the view). */
export interface SheetPrediction {
  /** ν40 [mm²/s]. */
  kv40: number;
  /** ν100 [mm²/s]. */
  kv100: number;
  /** Viscosity index, reported (whole number, ASTM D2270), or null where undefined. */
  reportedVi: number | null;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point estimate [°C], or null. */
  anilinePoint: number | null;
  /** Flash point estimate, open cup [°C], or null. */
  flashPoint: number | null;
  /** Pour point estimate [°C], or null. */
  pourPoint: number | null;
  /**
   * True when the flash estimate relies on the Wickey–Chittenden index beyond its fitted range (every
   * gear oil: flash points of 200–300 °C); the row then says "extrapolated estimate". Absent → false.
   */
  flashPointExtrapolated?: boolean;
  /** True when the pour estimate lies beyond the Hu–Burns index's fitted range. Absent → false. */
  pourPointExtrapolated?: boolean;
  /**
   * Viscosity at the operating temperature, or null; flagged when the temperature lies outside the
   * measured 40–100 °C (extrapolated) or outside −20…150 °C (not to be trusted; ASTM D341 line).
   * `form` names the D341 form of the line (absent → 'd341-20'); the QC row's method column names it.
   */
  operating: { tempC: number; kv: number; form?: D341Form; extrapolated?: boolean; outsideBand?: boolean } | null;
}

/**
 * The few predicted numbers the sheet prints, taken from the core's blend prediction.
 *
 * @param p - from `predictBlend`
 * @returns the sheet's prediction (aniline point over the base fluid; operating viscosity if computed)
 */
export function sheetPrediction(p: BlendProperties): SheetPrediction {
  return {
    kv40: p.kv40,
    kv100: p.kv100,
    reportedVi: p.reportedVi,
    density15: p.density15,
    anilinePoint: p.anilinePoint?.value ?? null,
    flashPoint: p.flashPoint,
    pourPoint: p.pourPoint,
    flashPointExtrapolated: p.flashPointExtrapolated,
    pourPointExtrapolated: p.pourPointExtrapolated,
    operating: p.kvAtOperating,
  };
}

/** Options of the QC table: the plant's ν40 aim, the recipe's specification, the printing unit. */
export interface QcOptions {
  /** Plant aim band around the grade mid-point [% of mid-point]; clipped to ISO 3448 ±10 %. Default 5. */
  kv40TolerancePct?: number;
  /**
   * The product specification's release limits (per recipe). Blank limits print "Per specification";
   * no limit is ever derived from the prediction.
   */
  specification?: ReleaseSpecification;
  /**
   * Unit the flash, pour and aniline points and the operating temperature are printed in; default 'C'.
   * Limits are given in °C, then converted and rounded to whole degrees; `min`/`max` of those rows are
   * in this unit too. The standard test temperatures (40, 100 and 15 °C) stay in °C.
   */
  temperatureUnit?: SheetTemperatureUnit;
  /**
   * Writes a number with a fixed number of decimals for print (the user's decimal separator and
   * grouping); default `x.toFixed(decimals)` (a dot, no grouping).
   */
  formatNumber?: (x: number, decimals: number) => string;
}

export type QcKey =
  | 'appearance'
  | 'kv40'
  | 'kv100'
  | 'vi'
  | 'density15'
  | 'flash'
  | 'pour'
  | 'aniline'
  | 'kvOperating'
  | 'copper'
  | 'foam';

/** One line of the QC table: prediction, release target, test method; measured is left blank. */
export interface QcRow {
  key: QcKey;
  property: string;
  unit: string;
  /** The prediction as printed (already rounded), or "—". Shown for information beside the limit. */
  predicted: string;
  /** Release target as printed, e.g. "304.0–336.0", "≥ 90", or "Per specification". */
  target: string;
  /** Numeric limits of the target, where it has them. */
  min: number | null;
  max: number | null;
  /** Test method, e.g. "ASTM D445". */
  method: string;
  /** True when the row is a release criterion; false when it is recorded for information. */
  release: boolean;
  /** Where the limit comes from: the grade and plant aim, the recipe's specification, or nowhere (information). */
  limitSource: 'grade' | 'specification' | 'none';
  /**
   * True when the prediction itself falls outside [min, max]: the recipe is not expected to pass
   * (e.g. ν40 outside the plant aim band), and the sheet must say so before anyone blends it.
   */
  predictedOutsideTarget: boolean;
}

const fixedDot = (x: number, d: number) => x.toFixed(d);

/**
 * The QC row's mark for a flash or pour estimate beyond the range its blending index was fitted on
 * (Wickey–Chittenden: flash points below 200 °C; Hu–Burns: pour points of about −50…+10 °C).
 */
export const INDEX_EXTRAPOLATED = 'extrapolated estimate';

export const PER_SPECIFICATION = 'Per specification';

/** Decimals a printed limit may add beyond the row's own, to show the limit as entered (or converted). */
const LIMIT_EXTRA_DECIMALS = 2;

/**
 * A release limit as it may be printed: the limit itself, with the row's `d` decimals or as many more
 * as it needs (up to `d + 2`) to be shown exactly; a limit that needs still more is rounded inward
 * (a minimum up, a maximum down) at `d + 2` decimals, so the printed limit is never looser than the
 * specification. A limit typed as 219 °C prints 426.2 °F, not 426 °F (which a batch at 218.9 °C
 * would pass); 14.1234 mm²/s prints 14.13 as a minimum and 14.12 as a maximum.
 *
 * @param v - the limit, in the printed unit
 * @param side - 'min' (a lower limit) or 'max' (an upper limit)
 * @param d - the row's decimals
 * @returns the limit as printed and its decimals
 */
export function printedLimit(v: number, side: 'min' | 'max', d: number): { value: number; decimals: number } {
  const most = d + LIMIT_EXTRA_DECIMALS;
  // The tolerance of decimalsOf (1e-9 relative) absorbs the tail of a °F → °C → °F round trip.
  const need = decimalsOf(v);
  if (need <= most) return { value: Number(v.toFixed(need)), decimals: Math.max(d, need) };
  const scale = 10 ** most;
  const value = (side === 'min' ? Math.ceil(v * scale) : Math.floor(v * scale)) / scale;
  return { value, decimals: most };
}

/**
 * A release limit as printed: "a–b", "≥ a", "≤ b", or "Per specification" when neither is given.
 * Each limit is printed as {@link printedLimit} gives it: never rounded to a looser limit.
 *
 * @param min - lower limit, or null
 * @param max - upper limit, or null
 * @param d - decimals printed (at least; more where the limit needs them)
 * @param fmt - number formatter (default: "." without grouping)
 */
export function limitText(min: number | null, max: number | null, d: number, fmt: (x: number, d: number) => string = fixedDot): string {
  const show = (v: number, side: 'min' | 'max') => {
    const p = printedLimit(v, side, d);
    return fmt(p.value, p.decimals);
  };
  if (min !== null && max !== null) return `${show(min, 'min')}–${show(max, 'max')}`;
  if (min !== null) return `≥ ${show(min, 'min')}`;
  if (max !== null) return `≤ ${show(max, 'max')}`;
  return PER_SPECIFICATION;
}

/**
 * QC release targets beside the predicted properties, with the ASTM test method for each.
 *
 * ν40: inside the ISO 3448 band of the grade (mid-point ±10 %, ISO 3448 Table 1) and the plant's aim
 * band (mid-point ± `kv40TolerancePct`, default 5 %; plants aim within ±3–5 %, common practice,
 * domain notes). Every other release limit — ν100, VI, density, flash, pour, copper strip, foam —
 * comes from the recipe's product specification as the user entered it; a blank one prints
 * "Per specification". The predictions are printed beside the limits for information only: a limit
 * is never derived from the model's own estimate. Aniline point and viscosity at the operating
 * temperature are recorded for information.
 *
 * @param grade - ISO viscosity grade (mid-point ν40 [mm²/s])
 * @param predicted - the prediction (mapped from the blend prediction)
 * @param options - aim band, specification, temperature unit
 * @returns the QC rows in print order
 * @throws BlendbenchInputError if `grade` is not a tabulated ISO viscosity grade (from `gradeBand`)
 */
export function qcReleaseTargets(grade: number, predicted: SheetPrediction, options: QcOptions = {}): QcRow[] {
  const tol40 = options.kv40TolerancePct ?? 5;
  const spec = options.specification ?? BLANK_SPECIFICATION;
  const fmt = options.formatNumber ?? fixedDot;
  const limit = (min: number | null, max: number | null, d: number) => limitText(min, max, d, fmt);

  // ISO 3448 limits as tabulated exact decimals (iso-grades.ts); the aim band is computed in
  // thousandths so 320 × 0.95 prints 304.0, not 303.99999999999994.
  const iso = gradeBand(grade);
  const aimMin = Math.max(iso.min, Math.round(iso.mid * (100 - tol40) * 10) / 1000);
  const aimMax = Math.min(iso.max, Math.round(iso.mid * (100 + tol40) * 10) / 1000);
  const fromSpec = (min: number | null, max: number | null) => (min !== null || max !== null ? 'specification' : 'none') as QcRow['limitSource'];

  const rows: Omit<QcRow, 'predictedOutsideTarget'>[] = [
    {
      key: 'appearance', property: 'Appearance', unit: '', predicted: '—',
      target: 'Clear and bright, free of water and sediment', min: null, max: null, method: 'Visual', release: true, limitSource: 'none',
    },
    {
      key: 'kv40', property: 'Kinematic viscosity at 40 °C', unit: 'mm²/s', predicted: fmt(predicted.kv40, 1),
      target: `${fmt(aimMin, 1)}–${fmt(aimMax, 1)} (ISO VG ${grade}: ${fmt(iso.min, 1)}–${fmt(iso.max, 1)})`,
      min: aimMin, max: aimMax, method: 'ASTM D445', release: true, limitSource: 'grade',
    },
    {
      key: 'kv100', property: 'Kinematic viscosity at 100 °C', unit: 'mm²/s', predicted: fmt(predicted.kv100, 2),
      target: limit(spec.kv100Min, spec.kv100Max, 2), min: spec.kv100Min, max: spec.kv100Max, method: 'ASTM D445',
      release: true, limitSource: fromSpec(spec.kv100Min, spec.kv100Max),
    },
    {
      key: 'vi', property: 'Viscosity index', unit: '', predicted: predicted.reportedVi === null ? '—' : fmt(predicted.reportedVi, 0),
      target: limit(spec.viMin, null, 0), min: spec.viMin, max: null, method: 'ASTM D2270', release: true,
      limitSource: fromSpec(spec.viMin, null),
    },
    {
      key: 'density15', property: 'Density at 15 °C', unit: 'kg/L', predicted: fmt(predicted.density15, 4),
      target: limit(spec.density15Min, spec.density15Max, 4), min: spec.density15Min, max: spec.density15Max,
      method: 'ASTM D4052', release: true, limitSource: fromSpec(spec.density15Min, spec.density15Max),
    },
    {
      key: 'flash',
      property:
        predicted.flashPoint === null
          ? 'Flash point, open cup'
          : `Flash point, open cup (${predicted.flashPointExtrapolated ? INDEX_EXTRAPOLATED : 'estimate'})`,
      unit: '°C',
      predicted: predicted.flashPoint === null ? '—' : fmt(predicted.flashPoint, 0),
      target: limit(spec.flashMin, null, 0), min: spec.flashMin, max: null, method: 'ASTM D92', release: true,
      limitSource: fromSpec(spec.flashMin, null),
    },
    {
      key: 'pour',
      property:
        predicted.pourPoint === null
          ? 'Pour point'
          : `Pour point (${predicted.pourPointExtrapolated ? INDEX_EXTRAPOLATED : 'estimate'})`,
      unit: '°C',
      predicted: predicted.pourPoint === null ? '—' : fmt(predicted.pourPoint, 0),
      target: limit(null, spec.pourMax, 0), min: null, max: spec.pourMax, method: 'ASTM D97', release: true,
      limitSource: fromSpec(null, spec.pourMax),
    },
    {
      key: 'aniline', property: 'Aniline point (estimate)', unit: '°C',
      predicted: predicted.anilinePoint === null ? '—' : fmt(predicted.anilinePoint, 0),
      target: 'Information', min: null, max: null, method: 'ASTM D611', release: false, limitSource: 'none',
    },
  ];
  if (predicted.operating !== null) {
    rows.push({
      key: 'kvOperating',
      property: `Viscosity at ${fmt(predicted.operating.tempC, 0)} °C (calculated${operatingFlag(predicted.operating)})`,
      unit: 'mm²/s',
      predicted: fmt(predicted.operating.kv, 1), target: 'Information', min: null, max: null,
      method: D341_FORM_SHORT[predicted.operating.form ?? 'd341-20'], release: false, limitSource: 'none',
    });
  }
  rows.push(
    {
      key: 'copper', property: 'Copper strip corrosion', unit: '', predicted: '—', target: spec.copper.trim() || PER_SPECIFICATION,
      min: null, max: null, method: 'ASTM D130', release: true, limitSource: spec.copper.trim() ? 'specification' : 'none',
    },
    {
      key: 'foam', property: 'Foaming tendency', unit: 'mL', predicted: '—', target: spec.foam.trim() || PER_SPECIFICATION,
      min: null, max: null, method: 'ASTM D892', release: true, limitSource: spec.foam.trim() ? 'specification' : 'none',
    },
  );
  const unit = options.temperatureUnit ?? 'C';
  // ν100 and density are judged unrounded: their printed prediction gets the digits that show its verdict.
  // Flash and pour are judged as reported, to whole degrees (`outside`): the reported value is printed
  // where no digits of the estimate read on the side of its verdict (218.49 under "≥ 218.1" prints "218").
  const judgedRaw: Partial<Record<QcKey, { v: number; d: number; reported?: number }>> = {
    kv100: { v: predicted.kv100, d: 2 },
    density15: { v: predicted.density15, d: 4 },
  };
  if (predicted.flashPoint !== null) judgedRaw.flash = { v: predicted.flashPoint, d: 0, reported: Math.round(predicted.flashPoint) };
  if (predicted.pourPoint !== null) judgedRaw.pour = { v: predicted.pourPoint, d: 0, reported: Math.round(predicted.pourPoint) };
  return rows.map((r) => {
    const out = outside(r.key, predicted, r.min, r.max);
    const raw = judgedRaw[r.key];
    const shown = raw && (r.min !== null || r.max !== null) ? onItsSide(raw.v, raw.d, r.min, r.max, out, fmt, raw.reported) : r.predicted;
    const judged = { ...r, predicted: shown, predictedOutsideTarget: out };
    return unit === 'C' ? judged : inFahrenheit(judged, predicted, fmt);
  });
}

/** The flag of a viscosity read off the D341 line at the operating temperature: extrapolated, or outside −20…150 °C. */
function operatingFlag(o: NonNullable<SheetPrediction['operating']>): string {
  return o.outsideBand ? '; outside −20…150 °C, not to be trusted' : o.extrapolated ? '; extrapolated' : '';
}

/**
 * A QC row's temperatures re-expressed in °F. The verdict judged in °C stands; a prediction that prints
 * outside its printed °F limit is flagged as well (the rounding to whole °F can put it there).
 */
function inFahrenheit(r: QcRow, p: SheetPrediction, fmt: (x: number, d: number) => string): QcRow {
  const f = (tC: number) => sheetTemp(tC, 'F');
  const value: Partial<Record<QcKey, number | null>> = { flash: p.flashPoint, pour: p.pourPoint, aniline: p.anilinePoint };
  if (r.key === 'kvOperating' && p.operating !== null) {
    return { ...r, property: `Viscosity at ${fmt(f(p.operating.tempC), 0)} °F (calculated${operatingFlag(p.operating)})` };
  }
  if (!(r.key in value)) return r;
  const v = value[r.key];
  // Limits are converted, not rounded to whole degrees: rounding could loosen them (219 °C is
  // 426.2 °F; "≥ 426" would pass a batch at 218.9 °C). Printed as limitText prints them.
  const min = r.min === null ? null : printedLimit(cToF(r.min), 'min', 0).value;
  const max = r.max === null ? null : printedLimit(cToF(r.max), 'max', 0).value;
  const target = min !== null || max !== null ? limitText(min, max, 0, fmt) : r.target;
  // The verdict judged in °C stands; a prediction that prints outside the printed °F limit is flagged too
  // (218.6 °C passes "≥ 219" as 219 °C, but prints as 425 °F against "≥ 426.2 °F").
  const printedF = v === null || v === undefined ? null : f(v);
  const outsideF = printedF !== null && ((min !== null && printedF < min) || (max !== null && printedF > max));
  // The prediction in °F with the digits that put it on the side of its verdict, judged in °F; where the
  // °C verdict came from the value reported to whole °C (218.49 °C as 218 under "≥ 218.1 °C"), that
  // value converted (424.4 °F, printed "424" under "≥ 424.58"), never "425".
  const isOut = r.predictedOutsideTarget || outsideF;
  const limited = min !== null || max !== null;
  const shownF =
    v === null || v === undefined
      ? r.predicted
      : limited && (r.key === 'flash' || r.key === 'pour')
        ? onItsSide(cToF(v), 0, min, max, isOut, fmt, cToF(Math.round(v)))
        : fmt(printedF!, 0);
  return {
    ...r,
    unit: '°F',
    predicted: shownF,
    target,
    min,
    max,
    predictedOutsideTarget: isOut,
  };
}

/**
 * A prediction printed with the row's `d` decimals, or as many more as it takes (up to `d + 2`, as a
 * limit may have) to print it on the side of its verdict ({@link verdictDigits}): a pass within the
 * limits ("22.124" under "≥ 22.1234", not "22.12"), a miss beyond them ("22.1299" under "≥ 22.13", not "22.13").
 * Where the verdict was judged on the value as reported (`reported`: flash and pour to whole °C) and no
 * digits of the prediction read on its side, the reported value is printed, with the digits it needs.
 */
function onItsSide(
  v: number,
  d: number,
  min: number | null,
  max: number | null,
  isOutside: boolean,
  fmt: (x: number, d: number) => string,
  reported?: number,
): string {
  const verdict = isOutside ? 'missed' : 'met';
  const most = d + LIMIT_EXTRA_DECIMALS;
  const own = verdictDigits(v, { min, max }, verdict, d, most);
  if (own.onItsSide || reported === undefined) return fmt(v, own.digits);
  return fmt(reported, verdictDigits(reported, { min, max }, verdict, d, most).digits);
}

/** The numeric prediction behind a QC row, compared with its limits (rounded as printed). */
function outside(key: QcKey, p: SheetPrediction, min: number | null, max: number | null): boolean {
  const value: Partial<Record<QcKey, number | null>> = {
    kv40: Math.round(p.kv40 * 10) / 10,
    kv100: p.kv100,
    vi: p.reportedVi,
    density15: p.density15,
    flash: p.flashPoint === null ? null : Math.round(p.flashPoint),
    pour: p.pourPoint === null ? null : Math.round(p.pourPoint),
  };
  const v = value[key];
  if (v === undefined || v === null) return false;
  return (min !== null && v < min) || (max !== null && v > max);
}

// ---------------------------------------------------------------------------------------------
// Cautions and CSV
// ---------------------------------------------------------------------------------------------

/**
 * The cautions printed on every sheet. Source: the project's safety rule (BRIEF) and the domain notes'
 * "Blending practice and cautions".
 */
export const BLEND_SHEET_CAUTIONS: readonly string[] = [
  'Predicted properties are estimates. Laboratory confirmation of every release property is required before the batch is released.',
  'The safety data sheet of each component, site procedures and local regulations govern handling, storage and personal protection.',
  'Hot oil causes burns. Sulfur–phosphorus additive packages can release hydrogen sulfide when overheated: keep within the stated temperature and ventilate the vessel.',
  'Predictions do not replace laboratory tests, specification approval or the equipment builder’s requirements.',
];

/** A number for a CSV cell, written with a fixed number of decimals (a numeral, never text). */
export interface CsvFixed {
  readonly value: number;
  readonly decimals: number;
}

/**
 * One CSV record of the component table (column header → cell). Quantities are numbers with the
 * displayed precision (a spreadsheet reads them as numbers); codes and names are text, which the
 * CSV writer guards against formula injection.
 */
export type CsvRecord = Record<string, string | number | CsvFixed | null>;

/** A metering temperature as printed in a header: whole degrees, or one decimal when it has one. */
function meteringLabel(tempC: number): string {
  return Number.isInteger(tempC) ? String(tempC) : tempC.toFixed(1);
}

/**
 * The component table as CSV records, in charging order, with a final totals row. Numbers carry the
 * displayed precision (the columns still add up to the printed totals). With a metering temperature
 * the sheet's "L at t" column follows the 15 °C litres, its header naming t (ASTM D1250-80 Table 54D).
 *
 * With a heel (oil already in the vessel, `heel.kg` > 0) the sheet holds the additions only: the heel
 * is the first record (charge order 0, code HEEL, no shares), every running total counts it, and the
 * totals row is "TOTAL ADDED" (kg and litres of the additions; running total = heel + additions = the
 * batch), as on the printed sheet. The heel's kg and litres are those the sheet printed
 * ({@link BlendSheet.heel}, when it was built with the heel), so heel + additions = the batch as printed;
 * for a sheet built without it the heel is rounded on its own, and the running totals count it as printed.
 *
 * @param sheet - the sheet from {@link buildBlendSheet}
 * @param options - `includePrices`: add price per kg and line cost columns (costing copy only);
 *   `heel`: the heel's mass [kg], its litres at 15 °C [L] and what it is (free text)
 * @returns the records; the first record's keys are the header row
 */
export function blendSheetCsvRows(
  sheet: BlendSheet,
  options: { includePrices?: boolean; heel?: { kg: number; litres: number; description: string } } = {},
): CsvRecord[] {
  const qd = sheet.quantityDecimals;
  const pd = sheet.percentDecimals;
  const priced = options.includePrices === true;
  const currency = sheet.costing.available ? sheet.costing.currency : '';
  const at = (value: number, decimals: number): CsvFixed => ({ value, decimals });
  const priceKey = `Price per kg${currency ? ` (${currency})` : ''}`;
  // The metering column names its temperature (never a bare "litres"); "(metering)" keeps it apart from
  // the 15 °C column even when the plant meters at 15 °C.
  const meterKey = sheet.metering ? `Litres at ${meteringLabel(sheet.metering.tempC)} °C (metering)` : null;
  const costKey = `Line cost${currency ? ` (${currency})` : ''}`;
  const given = options.heel && options.heel.kg > 0 ? options.heel : null;
  // The heel as printed: the sheet's own rounding when it was built with the heel, else rounded here.
  const qs = 10 ** qd;
  const heel = given
    ? {
        description: given.description,
        kg: sheet.heel ? sheet.heel.kg : Math.round(given.kg * qs) / qs,
        litres: sheet.heel ? sheet.heel.litres : Math.round(given.litres * qs) / qs,
      }
    : null;
  const heelKg = heel?.kg ?? 0;
  const records: CsvRecord[] = sheet.rows.map((r) => {
    const rec: CsvRecord = {
      'Charge order': r.chargeOrder,
      Code: r.code,
      Name: r.name,
      Category: r.categoryLabel,
      'Mass %': at(r.massPct, pd),
      'Volume %': at(r.volumePct, pd),
      kg: at(r.kg, qd),
      'Litres at 15 °C': at(r.litres, qd),
    };
    if (meterKey) rec[meterKey] = r.litresAtMetering === null ? null : at(r.litresAtMetering, qd);
    rec['Running total kg'] = at(r.runningKg + heelKg, qd);
    if (priced) {
      rec[priceKey] = r.pricePerKg === null ? null : at(r.pricePerKg, 4);
      rec[costKey] = r.lineCost === null ? null : at(r.lineCost, 2);
    }
    return rec;
  });
  if (heel) {
    const rec: CsvRecord = {
      'Charge order': 0,
      Code: 'HEEL',
      Name: `Heel already in the vessel${heel.description.trim() ? ` (${heel.description.trim()})` : ''}`,
      Category: 'in vessel',
      'Mass %': null,
      'Volume %': null,
      kg: at(heel.kg, qd),
      'Litres at 15 °C': at(heel.litres, qd),
    };
    if (meterKey) rec[meterKey] = null;
    rec['Running total kg'] = at(heel.kg, qd);
    if (priced) {
      rec[priceKey] = null;
      rec[costKey] = null;
    }
    records.unshift(rec);
  }
  const total: CsvRecord = {
    'Charge order': null,
    Code: heel ? 'TOTAL ADDED' : 'TOTAL',
    Name: '',
    Category: '',
    'Mass %': at(100, pd),
    'Volume %': at(100, pd),
    kg: at(sheet.totalKg, qd),
    'Litres at 15 °C': at(sheet.totalLitres, qd),
  };
  if (meterKey) total[meterKey] = at(sheet.metering!.totalLitres, qd);
  total['Running total kg'] = at(sheet.totalKg + heelKg, qd);
  if (priced) {
    total[priceKey] = sheet.costing.available ? at(sheet.costing.perKg, 4) : null;
    total[costKey] = sheet.costing.available ? at(sheet.costing.perBatch, 2) : null;
  }
  records.push(total);
  return records;
}
