/**
 * The lot-spread model applied to a recipe of library components: each line blends with its
 * blending viscosity (a calibration's effective ν40 where present) and its stock's lot spread (its
 * own, or the category's common-practice default; `lot-spread.ts`).
 */
import type { Component, RecipeLine } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { resolveBlendParts } from '../formulation/blend-properties';
import { gradeBand } from '../viscosity/iso-grades';
import { batchKv40Distribution, kv40InBandProbability, kv40LotSpreadPct, type Kv40Distribution, type SpreadPart } from './lot-spread';

/**
 * The spread-model parts of a recipe.
 *
 * @param components - the library (every component the lines name)
 * @param lines - mass fractions summing to 1
 * @returns one part per line: mass fraction, blending ν40 [mm²/s], relative SD (fraction), density
 * @throws BlendbenchInputError for a line naming no component
 */
export function recipeSpreadParts(components: readonly Component[], lines: readonly RecipeLine[]): SpreadPart[] {
  return resolveBlendParts('recipeSpreadParts', components, lines).map((p) => ({
    massFraction: p.line.massFraction,
    kv40: p.kv40,
    kv40RelSd: kv40LotSpreadPct(p.component) / 100,
    density15: p.component.density15,
    kv100: p.kv100,
  }));
}

/** A recipe's batch-ν40 distribution and its probabilities of landing in the plant band and the ISO band. */
export interface RecipeInBand {
  distribution: Kv40Distribution;
  /** The plant band [mm²/s] and P(batch ν40 in it). */
  plant: { min: number; max: number; probability: number };
  /** The grade's ISO 3448 band [mm²/s] and P(batch ν40 in it). */
  iso: { min: number; max: number; probability: number };
}

/**
 * Probabilities that batches of a recipe land in the plant band and in the ISO 3448 band of its grade.
 *
 * @param components - the library
 * @param lines - the recipe's mass fractions (summing to 1)
 * @param grade - ISO viscosity grade (e.g. 320)
 * @param plantBand - the plant's band [mm²/s] (e.g. the designer's target ± tolerance, or the sheet's aim ± 5 %)
 * @param method - mixing rule (default 'refutas')
 * @returns the distribution and both probabilities
 * @throws the errors of `batchKv40Distribution` and `gradeBand`
 */
export function recipeInBand(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  grade: number,
  plantBand: { min: number; max: number },
  method: BlendMethod = 'refutas',
): RecipeInBand {
  const distribution = batchKv40Distribution(recipeSpreadParts(components, lines), method);
  const iso = gradeBand(grade);
  return {
    distribution,
    plant: { min: plantBand.min, max: plantBand.max, probability: kv40InBandProbability(distribution, plantBand) },
    iso: { min: iso.min, max: iso.max, probability: kv40InBandProbability(distribution, iso) },
  };
}
