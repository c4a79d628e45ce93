/**
 * The blending solver's numeric engine: the fast path `solvePrepared` for many subsets, and the
 * formulation it solves. The pieces live beside it: `prepared.ts` (precomputed numbers),
 * `rows.ts` (the LP rows of one node), `objectives.ts`, `branch-and-bound.ts` (exact VI).
 *
 * ## Formulation
 * Variables are the mass fractions wᵢ ≥ 0 of the usable components. Every constraint of a blend
 * problem can be written as a HOMOGENEOUS linear inequality in w (right-hand side 0), because each
 * blend property is a weighted mean Σ kᵢwᵢPᵢ / Σ kᵢwᵢ (kᵢ = 1 for mass-basis rules, 1/ρᵢ for volume
 * basis) and "mean ≤ K" is Σ kᵢwᵢ(Pᵢ − K) ≤ 0:
 *
 *   ν40 band        Σ cᵢwᵢ(X40ᵢ − X(ν_lo)) ≥ 0,  Σ cᵢwᵢ(X40ᵢ − X(ν_hi)) ≤ 0    (Refutas cᵢ = 1; D7152 cᵢ = 1/ρᵢ)
 *   aniline point   Σ_{i∈A} (wᵢ/ρᵢ)(APᵢ − AP_max) ≤ 0    (A: components with an aniline point)
 *   polymer cap     Σ_{i∈P} wᵢ − p_max·Σ wᵢ ≤ 0
 *   bounds          wⱼ − lⱼ·Σ wᵢ ≥ 0,  wⱼ − uⱼ·Σ wᵢ ≤ 0   (additive treat rate: lⱼ = uⱼ = r)
 *   pour point      Σ (wᵢ/ρᵢ)(BIᵢ/BI_max − 1) ≤ 0          (pour index, blended by volume)
 *   flash point     Σ (wᵢ/ρᵢ)(FIᵢ/FI_max − 1) ≤ 0          (flash index falls as flash point rises)
 *   minimum VI      branch and bound on chords of h (see `vi-boundary.ts`)
 *
 * Because the rows are homogeneous, the fractions can be scaled freely; one normalisation row fixes
 * the scale, and choosing it per objective makes every objective LINEAR (Charnes–Cooper):
 *
 *   cost per litre  min Σ pᵢwᵢ / Σ wᵢ/ρᵢ      normalise Σ wᵢ/ρᵢ = 1 (then wᵢ = kg of i per litre of blend)
 *   solvency        min Σ_A (wᵢ/ρᵢ)APᵢ / Σ_A wᵢ/ρᵢ   normalise Σ_A wᵢ/ρᵢ = 1
 *   oxidation       max Σ_B wᵢrᵢ / Σ_B wᵢ   normalise Σ_B wᵢ = 1 (B: base fluid, additive excluded)
 *   closest         min d(w) with auxiliary variables, normalise Σ wᵢ = 1
 *
 * Charnes & Cooper (1962), "Programming with linear fractional functionals", Naval Research
 * Logistics Quarterly 9: a ratio of linear forms over a polyhedral cone is minimised by fixing the
 * denominator to 1; the substitution yᵢ = t·wᵢ with t = 1/denominator turns the constraints
 * Σwᵢ = 1, Aw ≤ b into the homogeneous A y − b·Σ y ≤ 0 used above. The solution is mapped back by
 * wᵢ = yᵢ / Σ yⱼ. Cost per litre is therefore optimised exactly, not through the per-kg proxy.
 *
 * For objectives other than cost, a second LP minimises cost among recipes within a hair of the
 * first optimum (lexicographic), so ties are broken by price.
 *
 * ## Three stocks
 * With three component variables (and no 'closest' auxiliaries) a node LP is a linear objective
 * over a polygon, solved exactly by `plane-lp3.ts` from the polygon's vertices (the simplex's
 * answer, rounded as it rounds; ties and near-infeasible slivers still go to the simplex), and the
 * VI branch and bound first tries one LP with the floor row X100 ≥ h(X(ν_lo)) before it builds the
 * root relaxation (`branch-and-bound.ts`). Where a node has only the usual rows (band, VI lines,
 * aniline; no bounds, polymer, pour or flash row, no extra rows), `rows.ts` writes them straight
 * into the vertex solver's planes, by the same arithmetic as the dense rows, instead of writing
 * dense rows for it to read back. Every other size takes the general path; `useVertexLp3` and
 * `useDirectLp3` in `rows.ts` switch these off, and tests/core/solver/plane-lp3.test.ts checks that
 * the paths give the same answers (the direct rows bit for bit).
 *
 * ## Other sizes
 * A node LP with the same usual rows is written straight into the simplex tableau (the entries
 * `lp.ts` would copy from the dense rows, by the same arithmetic), so the simplex pivots alike;
 * `useDirectTableau` switches it off and tests/core/solver/rows.test.ts checks the answers bit for
 * bit. Every other node LP (bounds, polymer, pour, flash, lazy cuts, 'closest') writes dense rows.
 */
import { viscosityIndexUnchecked, VI_MIN_KV100 } from '../viscosity/viscosity-index';
import { ALL_GROUP_SET, groupOn, viBandFloor, type ConstraintGroup, type PreparedProblem } from './prepared';
import { costObjective, primaryObjective, tieBreakRow, type EngineObjective, type ExtraRow } from './objectives';
import { optimise, type OptimiseContext, type OptimiseOutcome } from './branch-and-bound';
import type { ViBoundary } from './vi-boundary';
import { hasLotSpread, inBandSeparator, probabilityOfFractions, type InBandSeparator } from '../qc/robust';

export * from './prepared';
export * from './objectives';
export { VI_ACCEPT_TOLERANCE } from './branch-and-bound';

/** No extra rows (shared and frozen: only a lazy constraint's private pool is ever added to). */
const NO_EXTRA: readonly ExtraRow[] = Object.freeze([]);

/** The options of a normal solve (shared: no object per call). */
const NO_OPTIONS: SolvePreparedOptions = Object.freeze({});

/** A solved blend in plain numbers (the fast path's answer). */
export interface EngineOptimal {
  status: 'optimal';
  /** Mass fractions aligned with the prepared components (zeros for the unused). */
  massFractions: Float64Array;
  /** Value of the primary objective (cost per litre; aniline point °C; oxidation rating; distance). */
  objectiveValue: number;
  kv40: number;
  kv100: number;
  /** Unrounded VI; null where ν100 < 2.0 mm²/s. */
  vi: number | null;
  density15: number;
  /** Aniline point over components that have one [°C]; null if none is used. */
  anilinePoint: number | null;
  costPerLitre: number;
  lpCount: number;
  /**
   * Probability that a batch lands in the solve band under the components' lot spread
   * (`qc/lot-spread.ts`); null when no component has a spread.
   */
  inBandProbability: number | null;
  /**
   * With a minimum probability in band and `certify`: a lower bound on the primary objective over
   * every blend that meets it (see `qc/robust.ts`); the optimum lies between it and objectiveValue.
   */
  lowerBound?: number;
}
export interface EngineInfeasible {
  status: 'infeasible';
  lpCount: number;
  /** True when the LP solver failed (cycled) rather than proving infeasibility. */
  solverFailure?: boolean;
}
export type EngineResult = EngineOptimal | EngineInfeasible;

export interface SolvePreparedOptions {
  /** Constraint groups to enforce (default: all). */
  groups?: ReadonlySet<ConstraintGroup>;
  /** Override the objective (diagnosis). */
  objective?: EngineObjective;
  /** Override the VI boundary (diagnosis); undefined → the prepared one. */
  vi?: ViBoundary | null;
  /** Skip the cost tie-break stage for non-cost objectives (default false). */
  noTieBreak?: boolean;
  /** Leave out the minimum probability in band (the nominal recipe, e.g. for the premium). */
  nominal?: boolean;
  /** With a minimum probability in band: also compute `lowerBound` (one more branch and bound). */
  certify?: boolean;
}


/**
 * Solve the prepared problem over a subset of its components — the fast path.
 *
 * @param P - from {@link prepareEngine} (or `prepareComponents`)
 * @param subset - indices into P.components that may be used; components with min > 0 (the fixed
 *   additive) are added automatically; unusable (withdrawn) indices are ignored; null → all usable
 * @param options - diagnosis switches (leave out for a normal solve)
 * @returns the optimal blend in plain numbers, or infeasible (no reason: see `solveBlend` for that)
 */
export function solvePrepared(
  P: PreparedProblem,
  subset: readonly number[] | null = null,
  options: SolvePreparedOptions = NO_OPTIONS,
): EngineResult {
  const groups = options.groups ?? ALL_GROUP_SET;
  const t = P.targets;
  // Variables: the subset's usable components plus every forced one.
  // (Read-only from here on, so the prepared list itself serves when every usable one may be used.)
  let vars: readonly number[];
  if (subset === null) vars = P.usableIndices;
  else {
    const chosen: number[] = [];
    for (let q = 0; q < subset.length; q++) {
      const i = subset[q]!;
      if (P.components[i]?.usable && chosen.indexOf(i) < 0) chosen.push(i);
    }
    for (let q = 0; q < P.forced.length; q++) {
      const i = P.forced[q]!;
      if (chosen.indexOf(i) < 0 && P.components[i]!.usable) chosen.push(i);
    }
    vars = chosen;
  }
  // A forced component that cannot be used makes the problem infeasible (bounds active).
  for (let q = 0; q < P.forced.length; q++) {
    const i = P.forced[q]!;
    const k = P.components[i]!;
    const active = k.fixedAdditive ? groupOn(groups, 'additive') : groupOn(groups, 'bounds');
    if (active && !vars.includes(i)) return { status: 'infeasible', lpCount: 0 };
  }
  if (vars.length === 0) return { status: 'infeasible', lpCount: 0 };
  const vi = options.vi === undefined ? P.vi : options.vi;
  // Cheap necessary conditions (a blend mean lies between its components' values).
  if (options.objective === undefined) {
    let min40 = Number.POSITIVE_INFINITY;
    let max40 = Number.NEGATIVE_INFINITY;
    let max100 = Number.NEGATIVE_INFINITY;
    let thickest = -1;
    let minAp = Number.POSITIVE_INFINITY;
    for (let q = 0; q < vars.length; q++) {
      const i = vars[q]!;
      const x40 = P.x40[i]!;
      if (x40 < min40) min40 = x40;
      if (x40 > max40) max40 = x40;
      if (P.x100[i]! > max100) {
        max100 = P.x100[i]!;
        thickest = i;
      }
      if (P.ap[i]! < minAp) minAp = P.ap[i]!; // (false for NaN: no aniline point)
    }
    if (groupOn(groups, 'band')) {
      const eps = 1e-9;
      if (max40 < P.bandA - eps || min40 > P.bandB + eps) return { status: 'infeasible', lpCount: 0 };
      // VI: X100 ≥ h(X40) ≥ h(ν_lo) (h increasing), so the thickest stock at 100 °C must reach h(ν_lo)
      // (computed once per prepared problem); the margin (≈ 0.05 VI) keeps this test strictly on the
      // safe side of the VI tolerance. h(ν_lo) is needed only when the thickest stock's own ν100 Y
      // does not already allow ν_lo (U_max(Y) ≥ ν_lo ⇒ h(ν_lo) ≤ X(Y), U_max rising with Y): that
      // test needs no logarithm, so a problem solved once (the plain API) mostly skips h(ν_lo).
      // (A ν100 found to allow ν_lo is kept, so later subsets of the same problem compare only.)
      if (groupOn(groups, 'vi') && vi && vi === P.vi) {
        const margin = 1e-3 / P.coords.rowScale;
        const floor = P.cache.viFloor;
        if (floor !== undefined) {
          if (max100 + margin < floor) return { status: 'infeasible', lpCount: 0 };
        } else {
          const kv100 = P.components[thickest]!.kv100;
          const sure = P.cache.viSureKv100;
          if (!(sure !== undefined && kv100 >= sure)) {
            if (kv100 >= VI_MIN_KV100 && vi.uMax(kv100) >= t.kv40Min) P.cache.viSureKv100 = kv100;
            else if (max100 + margin < viBandFloor(P)!) return { status: 'infeasible', lpCount: 0 };
          }
        }
      }
    }
    if (groupOn(groups, 'aniline') && t.maxAnilinePoint !== null && minAp > t.maxAnilinePoint + 1e-9) {
      return { status: 'infeasible', lpCount: 0 };
    }
  }
  const objective = options.objective ?? primaryObjective(P);
  if (objective.kind === 'closest' && !P.reference) return { status: 'infeasible', lpCount: 0 };
  const withAux = objective.kind === 'closest';
  // The probability in band, as a lazy constraint of the branch and bound (qc/robust.ts).
  const pMin = options.nominal ? null : (t.minInBandProbability ?? null);
  const lazy = pMin !== null && pMin > 0 && groupOn(groups, 'band') ? inBandSeparator(P, pMin) : null;
  const ctx: OptimiseContext = { P, vars, groups, objective, extra: NO_EXTRA, vi, withAux, lazy };
  const first = optimise(ctx);
  let lpCount = first.lpCount;
  if (first.status !== 'optimal') {
    return first.status === 'failed'
      ? { status: 'infeasible', lpCount, solverFailure: true }
      : { status: 'infeasible', lpCount };
  }
  let w = first.w;
  let used: OptimiseOutcome = first;
  const isCost = objective.kind === 'ratio' && objective.num === P.price && objective.den === P.invRho;
  if (!isCost && !options.noTieBreak && options.objective === undefined) {
    // Lexicographic tie-break: least cost per litre among recipes within a hair of the optimum.
    const extra = tieBreakRow(P, objective, first.value);
    const second = optimise({ ...ctx, objective: costObjective(P), extra: [extra] });
    lpCount += second.lpCount;
    if (second.status === 'optimal') {
      w = second.w;
      used = second;
    }
  }
  const out = finish(P, vars, w, first.value, lpCount, lazy, used);
  if (lazy && options.certify) {
    // Certificate: the same problem with cuts for level p itself (valid for every blend that meets
    // it), solved without new cuts — an outer approximation, so its optimum is a lower bound.
    const lb = optimise({ ...ctx, lazy: lazy.certificate() });
    out.lpCount += lb.lpCount;
    if (lb.status === 'optimal') out.lowerBound = lb.value;
  }
  return out;
}
/**
 * The answer of an optimal solve. ν40, ν100 and the VI are computed when first read (and kept):
 * the substitute search reads them only for a candidate better than the one it holds, a benchmark
 * that times the solve reads none, `solveBlendPlain` reads all three. Their values are those the
 * solve would have computed at once — the blend's X40 and X100 through the mixing rule's checked
 * inverse and the VI by ASTM D2270 (the core's arithmetic), or the numbers the branch and bound's
 * VI check computed on these very fractions.
 */
// The answer's plain fields, as EngineOptimal declares them (merged into the class below, which
// writes them in its constructor).
interface OptimalAnswer extends Omit<EngineOptimal, 'status' | 'kv40' | 'kv100' | 'vi'> {}
class OptimalAnswer implements EngineOptimal {
  readonly status = 'optimal' as const;
  /** The mixing rule's coordinates and the blend's X40, X100 (for ν40, ν100 on first read). */
  private readonly coords: PreparedProblem['coords'];
  private readonly x40: number;
  private readonly x100: number;
  /** ν40, ν100 [mm²/s] once known (NaN before), the VI once known (undefined before). */
  private nu40: number;
  private nu100: number;
  private index: number | null | undefined;

  constructor(
    massFractions: Float64Array,
    objectiveValue: number,
    density15: number,
    anilinePoint: number | null,
    costPerLitre: number,
    lpCount: number,
    inBandProbability: number | null,
    coords: PreparedProblem['coords'],
    x40: number,
    x100: number,
    nu40: number,
    nu100: number,
    index: number | null | undefined,
  ) {
    this.massFractions = massFractions;
    this.objectiveValue = objectiveValue;
    this.density15 = density15;
    this.anilinePoint = anilinePoint;
    this.costPerLitre = costPerLitre;
    this.lpCount = lpCount;
    this.inBandProbability = inBandProbability;
    this.lowerBound = undefined;
    this.coords = coords;
    this.x40 = x40;
    this.x100 = x100;
    this.nu40 = nu40;
    this.nu100 = nu100;
    this.index = index;
  }

  /** ν40 of the blend [mm²/s]: ν(X40) by the mixing rule. */
  get kv40(): number {
    if (Number.isNaN(this.nu40)) this.nu40 = this.coords.toKv(this.x40);
    return this.nu40;
  }

  /** ν100 of the blend [mm²/s]: ν(X100) by the mixing rule. */
  get kv100(): number {
    if (Number.isNaN(this.nu100)) this.nu100 = this.coords.toKv(this.x100);
    return this.nu100;
  }

  /** Unrounded VI by ASTM D2270; null where ν100 < 2.0 mm²/s (or not below ν40). */
  get vi(): number | null {
    if (this.index === undefined) {
      const kv40 = this.kv40;
      const kv100 = this.kv100;
      this.index = kv100 >= VI_MIN_KV100 && kv100 < kv40 ? viscosityIndexUnchecked(kv40, kv100) : null;
    }
    return this.index;
  }

  /** The answer as a plain object (what JSON and structured clones see: every property, ν and VI included). */
  toJSON(): Omit<EngineOptimal, never> {
    const { status, massFractions, objectiveValue, kv40, kv100, vi, density15, anilinePoint, costPerLitre, lpCount, inBandProbability, lowerBound } = this;
    const plain: EngineOptimal = { status, massFractions, objectiveValue, kv40, kv100, vi, density15, anilinePoint, costPerLitre, lpCount, inBandProbability };
    if (lowerBound !== undefined) plain.lowerBound = lowerBound;
    return plain;
  }
}

/**
 * Properties of a solution in plain numbers (the same equations as the core). ν40, ν100 and the VI
 * are taken from the VI check of the branch and bound where it computed them on these very
 * fractions (no simplex dust dropped), else computed from the blend's X40 and X100 when first read
 * ({@link OptimalAnswer}). Takes `w` over (the optimisation's own array): when the variables are
 * every component in order, it becomes the answer's fractions.
 */
function finish(
  P: PreparedProblem,
  vars: readonly number[],
  w: Float64Array,
  value: number,
  lpCount: number,
  lazy: InBandSeparator | null,
  checked: OptimiseOutcome,
): EngineOptimal {
  // (The prepared list of usable indices with every component in it is 0, 1, …, n − 1.)
  const massFractions = vars === P.usableIndices && vars.length === P.n && w.length === P.n ? w : new Float64Array(P.n);
  let sv = 0;
  let sp = 0;
  let sa = 0;
  let saAp = 0;
  // Drop simplex dust (< 1e-6, far below any weighing precision; moves ν40 by < 1e-5 relative
  // and VI by < 0.002) and renormalise to Σ = 1.
  let total = 0;
  let dropped = false;
  const raw = lazy ? w.slice() : null;
  for (let j = 0; j < vars.length; j++) {
    if (w[j]! < 1e-6 && w[j] !== 0) {
      w[j] = 0;
      dropped = true;
    }
    total += w[j]!;
  }
  for (let j = 0; j < vars.length; j++) w[j] = w[j]! / total;
  // A recipe accepted for its probability in band keeps it: if dropping the dust would cost the
  // probability, the fractions stay as solved.
  if (raw && probabilityOfFractions(P, vars, w) < lazy!.p) w.set(raw);
  const reuse = !dropped && !raw && checked.vi !== undefined;
  // Blend X40 and X100 in the same pass (as blendX: Σ cᵢwᵢXᵢ / Σ cᵢwᵢ).
  let sc = 0;
  let s40 = 0;
  let s100 = 0;
  for (let j = 0; j < vars.length; j++) {
    const i = vars[j]!;
    const wi = w[j]!;
    massFractions[i] = wi;
    if (!reuse) {
      const cw = P.c[i]! * wi;
      sc += cw;
      s40 += cw * P.x40[i]!;
      s100 += cw * P.x100[i]!;
    }
    sv += wi * P.invRho[i]!;
    sp += wi * P.price[i]!;
    if (!Number.isNaN(P.ap[i]!) && wi > 0) {
      sa += wi * P.invRho[i]!;
      saAp += wi * P.invRho[i]! * P.ap[i]!;
    }
  }
  const density15 = 1 / sv;
  return new OptimalAnswer(
    massFractions,
    value,
    density15,
    sa > 0 ? saAp / sa : null,
    density15 * sp,
    lpCount,
    hasLotSpread(P) ? probabilityOfFractions(P, vars, w) : null,
    P.coords,
    reuse ? Number.NaN : s40 / sc,
    reuse ? Number.NaN : s100 / sc,
    reuse ? checked.kv40! : Number.NaN,
    reuse ? checked.kv100! : Number.NaN,
    reuse ? checked.vi! : undefined,
  );
}
