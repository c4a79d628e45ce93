/**
 * The plain substitute search — plain numbers in, plain numbers out — for Node scripting and
 * outside checks (issue 3, item 7). Same conventions as `solveBlendPlain` (Refutas at 40 and
 * 100 °C, aniline point by volume over every given component, ideal-mixing density, cost per litre
 * = density × Σ wᵢ·priceᵢ, band targetKv40 × (1 ± tolerancePct/100) not clipped to an ISO band).
 */
import { BlendbenchInputError } from '../errors';
import { preparePlain, plainBlendProperties, type PlainBlend, type PlainProblem } from '../solver/plain';
import { searchPrepared, USED_FRACTION } from './substitutes';

export interface PlainSubstituteRequest extends Omit<PlainProblem, 'objective'> {
  /** Least cost per litre (the only objective of the search; may be left out). */
  objective?: 'cost';
  /** Largest number of components per combination, not counting those with minMassFraction > 0. */
  maxComponents: number;
  /** Ids that may not be used; ids not among the components are ignored. */
  withdrawn: string[];
}

export interface PlainSubstituteResult {
  /** One per distinct set of components used (fraction > 1e-6), cost per litre ascending. */
  candidates: PlainBlend[];
}

/**
 * Every feasible least-cost blend of up to `maxComponents` of the non-withdrawn components
 * (components with minMassFraction > 0 are always in and not counted), one per distinct set of
 * components used, sorted by cost per litre.
 *
 * For each combination: min cost per litre s.t. ν40 ∈ targetKv40·(1 ± tolerancePct/100),
 * VI ≥ minVi, aniline point ≤ maxAnilinePoint, bounds — the problem of `solveBlendPlain` restricted to
 * the combination. Of the optima with the same set of used components the cheapest is kept.
 * A withdrawn component is left out even if it has a minimum fraction.
 *
 * @param r The `solveBlendPlain` problem (objective 'cost') plus `maxComponents` (whole number ≥ 0)
 *   and `withdrawn` (ids).
 * @returns `{ candidates }`, each `{ massFractions, kv40, kv100, vi, density15, anilinePoint,
 *   costPerLitre }` recomputed by the core (massFractions holds every given id, zeros included),
 *   cost ascending (ties by the ids used).
 * @throws the core's named errors (BlendbenchInputError subclasses) for impossible input, including
 *   maxComponents not a whole number ≥ 0, withdrawn not an array of strings, objective not 'cost'.
 * @example
 * searchSubstitutesPlain({
 *   components: [
 *     { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 },
 *     { id: 'heavy', kv40: 460, kv100: 31, density15: 0.90, anilinePoint: 125, pricePerKg: 1.5 },
 *     { id: 'bright', kv40: 480, kv100: 31.5, density15: 0.90, anilinePoint: 122, pricePerKg: 1.2 },
 *   ],
 *   targetKv40: 220, tolerancePct: 5, maxComponents: 2, withdrawn: ['bright'],
 * }) // → { candidates: [{ massFractions: { light: 0.50…, heavy: 0.49…, bright: 0 }, kv40: 209, … }] }
 */
export function searchSubstitutesPlain(r: PlainSubstituteRequest): PlainSubstituteResult {
  const fn = 'searchSubstitutesPlain';
  if (!r || typeof r !== 'object') throw new BlendbenchInputError('r', r, `${fn}: the request must be an object`);
  const k = r.maxComponents;
  if (typeof k !== 'number' || !Number.isInteger(k) || k < 0) {
    throw new BlendbenchInputError('maxComponents', k, `${fn}: maxComponents = ${String(k)}; it must be a whole number ≥ 0`);
  }
  if (!Array.isArray(r.withdrawn) || r.withdrawn.some((id) => typeof id !== 'string')) {
    throw new BlendbenchInputError('withdrawn', r.withdrawn, `${fn}: withdrawn must be an array of component ids`);
  }
  const objective = (r as { objective?: unknown }).objective;
  if (objective !== undefined && objective !== 'cost') {
    throw new BlendbenchInputError('objective', objective, `${fn}: objective = ${String(objective)}; the search ranks by 'cost' only`);
  }
  const problem: PlainProblem = { ...r, objective: 'cost' };
  // Validate every component (withdrawn ones too): impossible input throws.
  preparePlain(problem, fn);
  const out = new Set(r.withdrawn);
  const kept = problem.components.filter((c) => !out.has(c.id));
  if (kept.length === 0) return { candidates: [] };
  const P = preparePlain({ ...problem, components: kept }, fn);
  const search = searchPrepared(P, k);
  while (!search.step(10_000).done) {
    /* keep solving */
  }
  const zeros: Record<string, number> = {};
  for (const c of problem.components) zeros[c.id] = 0;
  const candidates = search.result().candidates.map((cand) => {
    const w = kept.map((c) => cand.lines.find((l) => l.componentId === c.id)?.massFraction ?? 0);
    const blend = plainBlendProperties(kept, w);
    return { ...blend, massFractions: { ...zeros, ...blend.massFractions } };
  });
  const key = (b: PlainBlend): string =>
    Object.keys(b.massFractions)
      .filter((id) => b.massFractions[id]! > USED_FRACTION)
      .join('+');
  candidates.sort((a, b) => a.costPerLitre - b.costPerLitre || (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : 0));
  return { candidates };
}
