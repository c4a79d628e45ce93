/**
 * The probability of each candidate landing in the plant band and in the ISO band under the stocks'
 * lot spread of ν40 (`core/qc`), and — when the search asked for a minimum probability — the recipe
 * of the same stocks without it, so that the premium can be stated (derived, never stored).
 */
import type { BlendTargets, Component, RecipeLine } from '../../core/formulation/model';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { recipeInBand } from '../../core/qc/recipe-spread';
import { prepareComponents, solvePrepared } from '../../core/solver/solve-blend';

export interface InBandOf {
  /** Probability of landing in the plant band (the search's band) and in the grade's ISO band, 0–1. */
  plant: number;
  iso: number;
  /**
   * The same stocks solved without the minimum probability (the search's objective and other
   * constraints): its cost per litre and probability in the plant band; null when the search asked
   * for no minimum, or that recipe could not be solved.
   */
  nominal: { costPerLitre: number; probability: number } | null;
}

/** Probabilities of one recipe; null when it cannot be assessed (an empty or unpredictable recipe). */
export function recipeProbabilities(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  grade: number,
  band: { min: number; max: number },
  method: BlendMethod,
): { plant: number; iso: number } | null {
  const used = lines.filter((l) => l.massFraction > 0);
  if (used.length === 0) return null;
  try {
    const r = recipeInBand(components, used, grade, band, method);
    return { plant: r.plant.probability, iso: r.iso.probability };
  } catch {
    return null;
  }
}

/**
 * Probabilities of every candidate, by candidate key, and the nominal recipe of its stocks when the
 * targets ask for a minimum probability in band.
 *
 * @param components - the library the search ran on
 * @param candidates - the ranked candidates
 * @param targets - the search's targets (their band is `band`)
 * @param band - the plant band the search solved to [mm²/s]
 * @param forcedIds - stocks in every candidate (added by the solver itself)
 * @param method - mixing rule
 */
export function candidatesInBand(
  components: readonly Component[],
  candidates: readonly SubstituteCandidate[],
  targets: BlendTargets,
  band: { min: number; max: number },
  forcedIds: readonly string[],
  method: BlendMethod,
): Map<string, InBandOf> {
  const out = new Map<string, InBandOf>();
  const robust = (targets.minInBandProbability ?? 0) > 0;
  let P: ReturnType<typeof prepareComponents> | null = null;
  if (robust) {
    try {
      P = prepareComponents(components, targets, method);
    } catch {
      P = null;
    }
  }
  const index = new Map(components.map((c, i) => [c.id, i]));
  const forced = new Set(forcedIds);
  for (const c of candidates) {
    const pr = recipeProbabilities(components, c.lines, targets.grade, band, method);
    if (!pr) continue;
    let nominal: InBandOf['nominal'] = null;
    if (P) {
      const subset = c.componentIds.filter((id) => !forced.has(id)).map((id) => index.get(id)!);
      const r = solvePrepared(P, subset, { nominal: true });
      if (r.status === 'optimal') nominal = { costPerLitre: r.costPerLitre, probability: r.inBandProbability ?? 1 };
    }
    out.set(c.key, { ...pr, nominal });
  }
  return out;
}
