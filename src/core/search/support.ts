/**
 * How many stocks an optimal blend can need: a bound from the number of constraint rows, used to
 * settle large combinations of the substitute search without solving them.
 *
 * Argument (the fundamental theorem of linear programming, in the form "a basic solution has at
 * most as many non-zero variables as there are tight rows"; Dantzig 1963, ch. 3; for the nonlinear
 * VI condition the same step as in Carathéodory's theorem). Let w* be an optimal blend over a
 * combination V. Fix the blend's X40 and X100 (its blending coordinates at 40 and 100 °C, see
 * `solver/coordinates.ts`) at the values of w*. Every blend of V with those two values has the same
 * ν40, ν100 and VI as w*, so the problem
 *
 *   minimise the objective over w ≥ 0 subject to the linear rows and X40(w) = X40*, X100(w) = X100*
 *
 * is a linear program (after the Charnes–Cooper normalisation, see `solver/engine.ts`) with the same
 * optimum as the original. It has a basic optimal solution, and a basic solution has at most as many
 * non-zero fractions as the LP has tight rows:
 *
 *   1 normalisation + 1 X40 + 1 X100 (only with a minimum VI; without it, at most one side of the
 *   ν40 band is tight) + 1 each for the aniline, pour and flash limits when set + 1 for the polymer
 *   cap when a polymer is present + 1 per component with a bound below 100 % (its two bound rows
 *   cannot both be tight unless they coincide) + the tie-break row (objectives other than cost:
 *   the cheapest blend within a hair of the optimum is one more row) + 3 for 'closest' (its
 *   objective is fixed by X100, the aniline deviation and, for the volume-basis rule, Σ wᵢ/ρᵢ).
 *
 * The fixed additive package is substituted out of the rows (`solver/rows.ts`), so it takes no row
 * and no variable; any other always-included component (a minimum fraction) is a non-zero variable
 * with its own bound row, and so cancels out.
 *
 * Consequence: when a combination T of free stocks has more members than this bound, some optimal
 * blend leaves one of them out, so T's optimum is already the optimum of one of its sub-combinations
 * (one stock fewer) and T adds no new recipe (up to exact ties). The search then settles T without an
 * LP, and settles whole combination sizes at once when no combination of that size can pass the
 * bound.
 *
 * Rows added to the search's solves in future (e.g. through `extra` rows in `solver/rows.ts`) must be
 * added to {@link SupportBound.base} — each can make one more stock useful. A minimum probability in
 * band (`qc/robust.ts`) is a curved condition, not a row: with it the bound is switched off.
 */
import type { PreparedProblem } from '../solver/prepared';

export interface SupportBound {
  /** Rows that are present whatever the combination. */
  readonly base: number;
  /** 1 where the pool member is a polymer and a polymer cap is set (and no forced polymer already counts). */
  readonly polymerRow: Uint8Array;
  /** 1 where the pool member has a maximum fraction below 100 % (one more possible tight row). */
  readonly boundRow: Uint8Array;
  /** Polymer-row flag for "any pool polymer" (0 or 1) and the number of bounded pool members. */
  readonly anyPolymer: number;
  readonly boundedCount: number;
}

/**
 * The support bound of a prepared problem over a pool of free components.
 *
 * @param P - the prepared problem (targets, components, objective)
 * @param pool - indices of the free components the combinations are drawn from
 * @param extraRows - further rows every solve carries (0 for the substitute search today)
 * @returns the per-problem and per-member parts of the bound; see {@link maxUsefulSize}
 * @example supportBound(P, pool).base // → 3 for a band, a minimum VI and the cost objective
 */
export function supportBound(P: PreparedProblem, pool: readonly number[], extraRows = 0): SupportBound {
  const t = P.targets;
  let base = 2; // normalisation + X40 (or one band side)
  if (t.minVi !== null) base++;
  if (t.maxAnilinePoint !== null) base++;
  if (t.maxPourPoint !== null) base++;
  if (t.minFlashPoint !== null) base++;
  if (t.objective !== 'cost') base++; // tie-break row
  if (t.objective === 'closest') base += 3;
  base += extraRows;
  // A minimum probability in band is not a row: independent lots average out, so a robust optimum
  // can use every member of a combination (qc/robust.ts). No combination is settled by this bound then.
  if ((t.minInBandProbability ?? 0) > 0 && P.components.some((k) => (k.kv40RelSd ?? 0) > 0)) base = Number.POSITIVE_INFINITY;
  let forcedPolymer = false;
  for (const i of P.forced) {
    const k = P.components[i]!;
    if (k.usable && k.polymer) forcedPolymer = true;
  }
  const capOn = t.maxPolymerFraction !== null;
  if (capOn && forcedPolymer) base++;
  const polymerRow = new Uint8Array(pool.length);
  const boundRow = new Uint8Array(pool.length);
  let anyPolymer = 0;
  let boundedCount = 0;
  for (let q = 0; q < pool.length; q++) {
    const k = P.components[pool[q]!]!;
    if (capOn && !forcedPolymer && k.polymer) polymerRow[q] = anyPolymer = 1;
    if (k.max < 1 || k.min > 0) {
      boundRow[q] = 1;
      boundedCount++;
    }
  }
  return { base, polymerRow, boundRow, anyPolymer, boundedCount };
}

/**
 * The largest combination size that can still hold a new recipe: sizes above it are settled whole.
 *
 * @param S - from {@link supportBound}
 * @param size - a combination size
 * @returns true when some combination of `size` pool members may need all of them
 */
export function sizeCanMatter(S: SupportBound, size: number): boolean {
  return size <= S.base + S.anyPolymer + Math.min(S.boundedCount, size);
}

/**
 * Whether one combination (pool positions `comb[0…size)`) may need all its members.
 *
 * @returns false when its optimum is, by the support bound, the optimum of a sub-combination
 */
export function combinationCanMatter(S: SupportBound, comb: ArrayLike<number>, size: number): boolean {
  let rows = S.base;
  let poly = 0;
  for (let j = 0; j < size; j++) {
    const q = comb[j]!;
    poly |= S.polymerRow[q]!;
    rows += S.boundRow[q]!;
  }
  return size <= rows + poly;
}
