/**
 * What a change of stock data does to the saved recipes that use the stock: each recipe's predicted
 * ν40, ν100 and density before and after, and whether ν40 leaves (or re-enters) the ISO 3448 band of
 * the recipe's grade. Shown before a calibration or an edit of a stock's viscosities or density is
 * stored, so no recipe's prediction moves unannounced.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { predictBlend } from '../formulation/blend-properties';
import type { Component, Recipe, RecipeStatus } from '../formulation/model';
import { gradeBand } from '../viscosity/iso-grades';

/** The numbers compared before and after. */
export interface ImpactPrediction {
  /** ν40, ν100 [mm²/s]. */
  kv40: number;
  kv100: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
}

/** One recipe's prediction before and after the change. */
export interface RecipeImpact {
  recipeId: string;
  name: string;
  revision: number;
  status: RecipeStatus;
  grade: number;
  /** The prediction with the stored data, or the reason it fails. */
  before: ImpactPrediction | { error: string };
  /** The prediction with the changed data, or the reason it fails. */
  after: ImpactPrediction | { error: string };
  /** ISO 3448 band of the grade [mm²/s]; null when the grade is not tabulated. */
  band: { min: number; max: number } | null;
  /** ν40 inside the band before / after (false when not predicted or no band). */
  inBandBefore: boolean;
  inBandAfter: boolean;
}

function predictOrError(components: readonly Component[], recipe: Recipe, method: BlendMethod): ImpactPrediction | { error: string } {
  try {
    const p = predictBlend(components, recipe.lines, { method });
    return { kv40: p.kv40, kv100: p.kv100, density15: p.density15 };
  } catch (e) {
    return { error: e instanceof Error ? e.message : String(e) };
  }
}

/** Relative change below this counts as no change (floating-point noise). */
const SAME = 1e-9;
const moved = (a: ImpactPrediction | { error: string }, b: ImpactPrediction | { error: string }): boolean => {
  if ('error' in a || 'error' in b) return 'error' in a !== 'error' in b || ('error' in a && 'error' in b && a.error !== b.error);
  return (['kv40', 'kv100', 'density15'] as const).some((k) => Math.abs(a[k] - b[k]) > SAME * Math.abs(a[k]));
};

/**
 * The recipes whose predictions a change of stock data moves.
 *
 * @param recipes - the saved recipes (archived ones are left out)
 * @param before - the library as stored
 * @param after - the library with the change applied (same ids)
 * @param changedIds - ids of the stocks that change (only recipes using one of them are predicted)
 * @param method - the mixing rule of the predictions
 * @returns one entry per recipe whose ν40, ν100 or density moves (or whose prediction starts or stops
 *   failing); those leaving their band first, then by the size of the ν40 change
 * @example predictionImpact(recipes, lib, libWithCalibration, ['demo-bw-510'], 'refutas')
 *   // → [{ name: 'Gear oil VG 680 …', before: { kv40: 682.9 … }, after: { kv40: 717.9 … }, inBandAfter: true … }]
 */
export function predictionImpact(
  recipes: readonly Recipe[],
  before: readonly Component[],
  after: readonly Component[],
  changedIds: readonly string[],
  method: BlendMethod,
): RecipeImpact[] {
  const changed = new Set(changedIds);
  const out: RecipeImpact[] = [];
  for (const r of recipes) {
    if (r.archived || !r.lines.some((l) => l.massFraction > 0 && changed.has(l.componentId))) continue;
    const b = predictOrError(before, r, method);
    const a = predictOrError(after, r, method);
    if (!moved(b, a)) continue;
    let band: { min: number; max: number } | null = null;
    try {
      const g = gradeBand(r.grade);
      band = { min: g.min, max: g.max };
    } catch {
      band = null;
    }
    const inBand = (p: ImpactPrediction | { error: string }) => band !== null && !('error' in p) && p.kv40 >= band.min && p.kv40 <= band.max;
    out.push({
      recipeId: r.id,
      name: r.name,
      revision: r.revision,
      status: r.status,
      grade: r.grade,
      before: b,
      after: a,
      band,
      inBandBefore: inBand(b),
      inBandAfter: inBand(a),
    });
  }
  const shift = (x: RecipeImpact) => ('error' in x.before || 'error' in x.after ? Infinity : Math.abs(x.after.kv40 - x.before.kv40) / x.before.kv40);
  return out.sort((x, y) => Number(y.inBandBefore && !y.inBandAfter) - Number(x.inBandBefore && !x.inBandAfter) || shift(y) - shift(x));
}
