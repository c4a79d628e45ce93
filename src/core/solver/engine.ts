/**
 * The blending solver's numeric engine: precomputed component numbers, the LP formulation, the
 * branch and bound that makes the VI condition exact, and the fast path for many subsets.
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
 */
import type { Objective } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { viscosityIndex, VI_MIN_KV100 } from '../viscosity/viscosity-index';
import { pourBlendingIndex } from '../blending/pour-point';
import { flashBlendingIndex } from '../blending/flash-point';
import { blendCoordinates, type BlendCoordinates } from './coordinates';
import { ViBoundary, type ViChord } from './vi-boundary';
import { solveDenseLp } from './lp';

/** One component as the engine needs it (plain numbers; see `prepareComponents` for Components). */
export interface EngineComponent {
  id: string;
  /** Short label used in messages (the stock code). */
  label: string;
  /** ν40, ν100 used for blending (effective values of a calibrated component) [mm²/s]. */
  kv40: number;
  kv100: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point [°C]; null → left out of the aniline mean (additive package). */
  anilinePoint: number | null;
  /** Price per kg, in the problem's currency. */
  pricePerKg: number;
  /** Counts toward the polymer cap. */
  polymer: boolean;
  /** Counts toward the base-fluid oxidation rating (false for additive packages). */
  baseFluid: boolean;
  /** Oxidation-stability rating (Blendbench's 1–5 scale). */
  oxidation: number;
  /** Pour point [°C] and flash point [°C]; null if unknown. */
  pourPoint: number | null;
  flashPoint: number | null;
  /** Mass-fraction bounds (0–1); the fixed additive has min = max = its treat rate. */
  min: number;
  max: number;
  /** The additive package at a fixed treat rate. */
  fixedAdditive: boolean;
  /** False for withdrawn components (and for those a constraint cannot be checked on). */
  usable: boolean;
}

/** Targets in plain numbers; the ν40 band is final (target band already clipped to the ISO band). */
export interface EngineTargets {
  /** ν40 band [mm²/s], inclusive. */
  kv40Min: number;
  kv40Max: number;
  /** Minimum VI (unrounded); null → none. */
  minVi: number | null;
  /** Maximum aniline point [°C]; null → none. */
  maxAnilinePoint: number | null;
  /** Maximum polymer mass fraction (0–1); null → none. */
  maxPolymerFraction: number | null;
  /** Maximum pour-point estimate [°C]; null → none. */
  maxPourPoint: number | null;
  /** Minimum flash-point estimate [°C]; null → none. */
  minFlashPoint: number | null;
  objective: Objective;
  /** Mass fractions of the reference recipe, aligned with the components (for 'closest'). */
  referenceMassFractions: readonly number[] | null;
}

/** Constraint groups, switched off one at a time to find the binding one. */
export type ConstraintGroup = 'band' | 'vi' | 'aniline' | 'polymer' | 'bounds' | 'additive' | 'pour' | 'flash';

export const ALL_GROUPS: readonly ConstraintGroup[] = [
  'band',
  'vi',
  'aniline',
  'polymer',
  'bounds',
  'additive',
  'pour',
  'flash',
];

/** Reference properties for the 'closest' objective (computed from the reference recipe). */
export interface ClosestReference {
  x40: number;
  x100: number;
  anilinePoint: number;
  /** Σ cᵢwᵢ of the reference (1 for mass-basis rules). */
  viscBasis: number;
  /** Σ_A wᵢ/ρᵢ of the reference [L/kg]. */
  anilineVolume: number;
  /** X per 1 % of ν40 and ν100 at the reference. */
  perPct40: number;
  perPct100: number;
  kv40: number;
  kv100: number;
}

/**
 * Per-component numbers precomputed once for a set of components, targets and mixing rule;
 * {@link solvePrepared} then solves any subset quickly. Arrays are aligned with `components`.
 */
export interface PreparedProblem {
  readonly method: BlendMethod;
  readonly coords: BlendCoordinates;
  readonly components: readonly EngineComponent[];
  readonly targets: EngineTargets;
  readonly n: number;
  readonly x40: Float64Array;
  readonly x100: Float64Array;
  /** Viscosity basis weight cᵢ (1 or 1/ρᵢ). */
  readonly c: Float64Array;
  readonly invRho: Float64Array;
  /** Aniline point, NaN where null. */
  readonly ap: Float64Array;
  readonly price: Float64Array;
  readonly ox: Float64Array;
  /** Pour index / BI_max and flash index / FI_max (NaN where unknown or no limit). */
  readonly pourRel: Float64Array;
  readonly flashRel: Float64Array;
  /** Band in X: [bandA, bandB]. */
  readonly bandA: number;
  readonly bandB: number;
  readonly vi: ViBoundary | null;
  /**
   * Lazily computed numbers shared by every solve of this problem: h at the band ends and the
   * root relaxation of the VI condition (see {@link viRoot}).
   */
  readonly cache: { viRoot?: ViRoot; closest?: Float64Array[]; objectives?: Partial<Record<string, EngineObjective>> };
  readonly reference: ClosestReference | null;
  /** Indices with min > 0 (always in every subset). */
  readonly forced: readonly number[];
  /** Indices of usable components. */
  readonly usableIndices: readonly number[];
}

/** VI accepted as feasible: VI ≥ minVi − this (the tolerance is 0.01; half of it is kept in reserve). */
export const VI_ACCEPT_TOLERANCE = 0.005;
/** Cap on LPs in one branch and bound (never reached in tests; a safety net). */
const MAX_LPS = 120;

/**
 * Precompute the engine's numbers.
 *
 * @param components - engine components (see {@link EngineComponent})
 * @param targets - final targets
 * @param method - mixing rule
 * @returns the prepared problem
 * @throws whatever the core's blending-coordinate functions throw for impossible viscosities
 */
export function prepareEngine(
  components: readonly EngineComponent[],
  targets: EngineTargets,
  method: BlendMethod,
): PreparedProblem {
  const coords = blendCoordinates(method);
  const n = components.length;
  const x40 = new Float64Array(n);
  const x100 = new Float64Array(n);
  const c = new Float64Array(n);
  const invRho = new Float64Array(n);
  const ap = new Float64Array(n);
  const price = new Float64Array(n);
  const ox = new Float64Array(n);
  const pourRel = new Float64Array(n).fill(Number.NaN);
  const flashRel = new Float64Array(n).fill(Number.NaN);
  const pourMax = targets.maxPourPoint === null ? null : pourBlendingIndex(targets.maxPourPoint);
  const flashMax = targets.minFlashPoint === null ? null : flashBlendingIndex(targets.minFlashPoint);
  const forced: number[] = [];
  const usableIndices: number[] = [];
  for (let i = 0; i < n; i++) {
    const k = components[i]!;
    x40[i] = coords.toX(k.kv40);
    x100[i] = coords.toX(k.kv100);
    invRho[i] = 1 / k.density15;
    c[i] = coords.massBasis ? 1 : invRho[i]!;
    ap[i] = k.anilinePoint === null ? Number.NaN : k.anilinePoint;
    price[i] = k.pricePerKg;
    ox[i] = k.baseFluid ? k.oxidation : 0;
    if (pourMax !== null && k.pourPoint !== null) pourRel[i] = pourBlendingIndex(k.pourPoint) / pourMax;
    if (flashMax !== null && k.flashPoint !== null) flashRel[i] = flashBlendingIndex(k.flashPoint) / flashMax;
    if (k.usable) usableIndices.push(i);
    if (k.min > 0) forced.push(i);
  }
  const bandA = coords.toX(targets.kv40Min);
  const bandB = coords.toX(targets.kv40Max);
  let vi: ViBoundary | null = null;
  if (targets.minVi !== null) vi = new ViBoundary(targets.minVi, coords);
  let reference: ClosestReference | null = null;
  if (targets.referenceMassFractions) {
    const w = targets.referenceMassFractions;
    let sc = 0;
    let s40 = 0;
    let s100 = 0;
    let sa = 0;
    let saAp = 0;
    for (let i = 0; i < n; i++) {
      const wi = w[i] ?? 0;
      if (wi <= 0) continue;
      sc += c[i]! * wi;
      s40 += c[i]! * wi * x40[i]!;
      s100 += c[i]! * wi * x100[i]!;
      if (!Number.isNaN(ap[i]!)) {
        sa += invRho[i]! * wi;
        saAp += invRho[i]! * wi * ap[i]!;
      }
    }
    if (sc > 0) {
      const rx40 = s40 / sc;
      const rx100 = s100 / sc;
      const kv40 = coords.toKv(rx40);
      const kv100 = coords.toKv(rx100);
      reference = {
        x40: rx40,
        x100: rx100,
        anilinePoint: sa > 0 ? saAp / sa : Number.NaN,
        viscBasis: sc,
        anilineVolume: sa,
        perPct40: coords.perPct(kv40),
        perPct100: coords.perPct(kv100),
        kv40,
        kv100,
      };
    }
  }
  return {
    method,
    coords,
    components,
    targets,
    n,
    x40,
    x100,
    c,
    invRho,
    ap,
    price,
    ox,
    pourRel,
    flashRel,
    bandA,
    bandB,
    vi,
    cache: {},
    reference,
    forced,
    usableIndices,
  };
}

/** h at the band ends and the VI relaxation on the whole band. */
export interface ViRoot {
  hA: number;
  hB: number;
  chords: readonly ViChord[];
}

/** The root VI relaxation of a prepared problem, computed on first use and cached. */
export function viRoot(P: PreparedProblem): ViRoot | null {
  if (!P.vi) return null;
  if (!P.cache.viRoot) {
    const hA = P.vi.h(P.bandA);
    const hB = P.vi.h(P.bandB, hA);
    P.cache.viRoot = { hA, hB, chords: P.vi.relaxation(P.bandA, hA, P.bandB, hB) };
  }
  return P.cache.viRoot;
}

// ---------------------------------------------------------------------------------------------
// Objectives and LP construction
// ---------------------------------------------------------------------------------------------

/** A ratio objective num·w / den·w (linear after normalising den·w = 1). */
export interface RatioObjective {
  kind: 'ratio';
  sense: 'minimize' | 'maximize';
  num: Float64Array;
  den: Float64Array;
}
/** The 'closest' objective: min Σ of three auxiliary deviation variables, normalise Σ w = 1. */
export interface ClosestObjective {
  kind: 'closest';
}
export type EngineObjective = RatioObjective | ClosestObjective;

/** An extra homogeneous row coef·w + aux·Σaux (≤ | ≥) 0. */
interface ExtraRow {
  coef: Float64Array;
  aux: number;
  sense: 'le' | 'ge';
}

/** Cost per litre: Σ pᵢwᵢ / Σ wᵢ/ρᵢ. */
export function costObjective(P: PreparedProblem): RatioObjective {
  return { kind: 'ratio', sense: 'minimize', num: P.price, den: P.invRho };
}

/** Blend aniline point: Σ_A (wᵢ/ρᵢ)APᵢ / Σ_A wᵢ/ρᵢ. */
export function anilineObjective(P: PreparedProblem, sense: 'minimize' | 'maximize' = 'minimize'): RatioObjective {
  const num = new Float64Array(P.n);
  const den = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) {
    if (Number.isNaN(P.ap[i]!)) continue;
    num[i] = P.invRho[i]! * P.ap[i]!;
    den[i] = P.invRho[i]!;
  }
  return { kind: 'ratio', sense, num, den };
}

/** Base-fluid oxidation rating: Σ_B wᵢrᵢ / Σ_B wᵢ (maximise). */
export function oxidationObjective(P: PreparedProblem): RatioObjective {
  const den = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) den[i] = P.components[i]!.baseFluid ? 1 : 0;
  return { kind: 'ratio', sense: 'maximize', num: P.ox, den };
}

/** Blend X40 (viscosity coordinate at 40 °C), for the achievable-range diagnosis. */
export function x40Objective(P: PreparedProblem, sense: 'minimize' | 'maximize'): RatioObjective {
  const num = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) num[i] = P.c[i]! * P.x40[i]!;
  return { kind: 'ratio', sense, num, den: P.c };
}

/** Polymer mass fraction (minimise), for the diagnosis of the polymer cap. */
export function polymerObjective(P: PreparedProblem): RatioObjective {
  const num = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) num[i] = P.components[i]!.polymer ? 1 : 0;
  return { kind: 'ratio', sense: 'minimize', num, den: new Float64Array(P.n).fill(1) };
}

/** Pour index relative to the limit (minimise), by volume. */
export function pourObjective(P: PreparedProblem): RatioObjective {
  return relObjective(P, P.pourRel);
}
/** Flash index relative to the limit (minimise ⇔ highest flash point), by volume. */
export function flashObjective(P: PreparedProblem): RatioObjective {
  return relObjective(P, P.flashRel);
}
function relObjective(P: PreparedProblem, rel: Float64Array): RatioObjective {
  const num = new Float64Array(P.n);
  const den = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) {
    if (Number.isNaN(rel[i]!)) continue;
    num[i] = P.invRho[i]! * rel[i]!;
    den[i] = P.invRho[i]!;
  }
  return { kind: 'ratio', sense: 'minimize', num, den };
}

/** The objective the targets ask for (cached on the prepared problem). */
export function primaryObjective(P: PreparedProblem): EngineObjective {
  const cache = (P.cache.objectives ??= {});
  return (cache[P.targets.objective] ??= makePrimaryObjective(P));
}

function makePrimaryObjective(P: PreparedProblem): EngineObjective {
  switch (P.targets.objective) {
    case 'solvency':
      return anilineObjective(P);
    case 'oxidation':
      return oxidationObjective(P);
    case 'closest':
      return { kind: 'closest' };
    case 'cost':
    default:
      return costObjective(P);
  }
}

/** What one solve switches on. */
interface SolveContext {
  P: PreparedProblem;
  vars: readonly number[];
  groups: ReadonlySet<ConstraintGroup>;
  objective: EngineObjective;
  extra: readonly ExtraRow[];
  vi: ViBoundary | null;
  /** Add the three 'closest' deviation variables and rows (objective 'closest' or its tie-break). */
  withAux: boolean;
}

interface NodeSolution {
  status: 'optimal' | 'infeasible' | 'failed';
  /** Values of the component variables (aligned with ctx.vars) then the auxiliaries. */
  x: Float64Array;
  objective: number;
}

/**
 * Build and solve the LP for X40 ∈ [a, b] with the given VI relaxation lines.
 * Rows are written into one buffer (hot path of the substitute search: no closures, few allocations).
 */
function solveNode(ctx: SolveContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[]): NodeSolution {
  const { P, vars, groups, objective, extra } = ctx;
  const nv = vars.length;
  const nAux = ctx.withAux ? 3 : 0;
  const width = nv + nAux;
  const s = P.coords.rowScale;
  const t = P.targets;
  const comps = P.components;

  // A fixed treat rate r is substituted rather than written as an equality (two simplex rows):
  // wₐ = r·Σw ⇔ wₐ = κ·Σ_{j≠a} wⱼ with κ = r/(1 − r); column a is folded into the others below.
  let fold = -1;
  if (nv > 1 && groups.has('additive')) {
    for (let j = 0; j < nv; j++) {
      const k = comps[vars[j]!]!;
      if (k.fixedAdditive && k.min === k.max && k.min < 1) {
        fold = j;
        break;
      }
    }
  }

  const maxRows = 8 + chords.length + 2 * nv + extra.length + 2 * nAux;
  // Row r is buf[r·width … (r+1)·width) with bounds rowLo[r] ≤ row·x ≤ rowHi[r] (±∞ = absent).
  const buf = new Float64Array(maxRows * width);
  const rowLo = new Float64Array(maxRows).fill(Number.NEGATIVE_INFINITY);
  const rowHi = new Float64Array(maxRows).fill(Number.POSITIVE_INFINITY);
  let m = 0; // number of rows so far
  let o = 0; // offset of the next row in buf

  // Normalisation row (Charnes–Cooper): den·w = 1. When minimising with every numerator
  // coefficient ≥ 0 the optimum lies on the row anyway (every other row is homogeneous, so scaling
  // w down towards the row never worsens the objective), and the one-sided row den·w ≥ 1 gives the
  // same optimum with one simplex row instead of two. (Not when maximising: den·w ≤ 1 would admit
  // w = 0 and hide infeasibility.)
  let oneSided = !(objective.kind === 'ratio' && objective.sense === 'maximize');
  for (let j = 0; j < nv; j++) {
    const i = vars[j]!;
    if (objective.kind === 'ratio') {
      buf[o + j] = objective.den[i]!;
      if (objective.num[i]! < 0) oneSided = false;
    } else buf[o + j] = 1;
  }
  rowLo[m] = 1;
  if (!oneSided) rowHi[m] = 1;
  m++;
  o += width;

  if (bandRows) {
    // a ≤ X40 ≤ b:  Σ cᵢwᵢ(X40ᵢ − a) ≥ 0,  Σ cᵢwᵢ(X40ᵢ − b) ≤ 0.
    const point = !(b - a > 1e-12);
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = s * P.c[i]! * (P.x40[i]! - a);
      if (!point) buf[o + width + j] = s * P.c[i]! * (P.x40[i]! - b);
    }
    if (point) {
      rowLo[m] = 0;
      rowHi[m++] = 0;
      o += width;
    } else {
      rowLo[m++] = 0;
      rowHi[m++] = 0;
      o += 2 * width;
    }
  }
  for (let q = 0; q < chords.length; q++) {
    // X100 ≥ alpha + beta·X40  ⇔  Σ cᵢwᵢ(X100ᵢ − alpha − beta·X40ᵢ) ≥ 0.
    const chord = chords[q]!;
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = s * P.c[i]! * (P.x100[i]! - chord.alpha - chord.beta * P.x40[i]!);
    }
    rowLo[m++] = 0;
    o += width;
  }
  if (t.maxAnilinePoint !== null && groups.has('aniline')) {
    // Σ_A (wᵢ/ρᵢ)(APᵢ − AP_max) ≤ 0 (scaled by 0.1).
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      if (!Number.isNaN(P.ap[i]!)) buf[o + j] = 0.1 * P.invRho[i]! * (P.ap[i]! - t.maxAnilinePoint);
    }
    rowHi[m++] = 0;
    o += width;
  }
  if (t.maxPolymerFraction !== null && groups.has('polymer')) {
    // Σ_P wᵢ − p_max·Σ wᵢ ≤ 0.
    let any = false;
    for (let j = 0; j < nv; j++) {
      const poly = comps[vars[j]!]!.polymer;
      if (poly) any = true;
      buf[o + j] = (poly ? 1 : 0) - t.maxPolymerFraction;
    }
    if (any) {
      rowHi[m++] = 0;
      o += width;
    } else buf.fill(0, o, o + width);
  }
  if (t.maxPourPoint !== null && groups.has('pour')) {
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = P.invRho[i]! * (P.pourRel[i]! - 1);
    }
    rowHi[m++] = 0;
    o += width;
  }
  if (t.minFlashPoint !== null && groups.has('flash')) {
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = P.invRho[i]! * (P.flashRel[i]! - 1);
    }
    rowHi[m++] = 0;
    o += width;
  }
  // Per-component bounds: wⱼ − l·Σw ≥ 0, wⱼ − u·Σw ≤ 0 (the folded additive needs none).
  const boundsOn = groups.has('bounds');
  const additiveOn = groups.has('additive');
  for (let j = 0; j < nv; j++) {
    if (j === fold) continue;
    const k = comps[vars[j]!]!;
    if (!(k.fixedAdditive ? additiveOn : boundsOn)) continue;
    const lo = k.min;
    const hi = k.max;
    if (lo <= 0 && hi >= 1) continue;
    if (lo === hi) {
      for (let q = 0; q < nv; q++) buf[o + q] = -lo;
      buf[o + j] = 1 - lo;
      rowLo[m] = 0;
      rowHi[m++] = 0;
      o += width;
      continue;
    }
    if (lo > 0) {
      for (let q = 0; q < nv; q++) buf[o + q] = -lo;
      buf[o + j] = 1 - lo;
      rowLo[m++] = 0;
      o += width;
    }
    if (hi < 1) {
      for (let q = 0; q < nv; q++) buf[o + q] = -hi;
      buf[o + j] = 1 - hi;
      rowHi[m++] = 0;
      o += width;
    }
  }
  for (const e of extra) {
    for (let j = 0; j < nv; j++) buf[o + j] = e.coef[vars[j]!]!;
    for (let q = 0; q < nAux; q++) buf[o + nv + q] = e.aux;
    if (e.sense === 'le') rowHi[m++] = 0;
    else rowLo[m++] = 0;
    o += width;
  }
  const obj = new Float64Array(width);
  let sense: 'minimize' | 'maximize' = 'minimize';
  if (objective.kind === 'ratio') {
    for (let j = 0; j < nv; j++) obj[j] = objective.num[vars[j]!]!;
    sense = objective.sense;
  }
  if (nAux > 0) {
    // 'closest': aux_q ≥ |f_q·w|, i.e. aux_q − f_q·w ≥ 0 and aux_q + f_q·w ≥ 0; objective Σ aux_q.
    const f = closestForms(P);
    for (let q = 0; q < 3; q++) {
      const fq = f[q]!;
      for (let j = 0; j < nv; j++) {
        const v = fq[vars[j]!]!;
        buf[o + j] = -v;
        buf[o + width + j] = v;
      }
      buf[o + nv + q] = 1;
      buf[o + width + nv + q] = 1;
      rowLo[m++] = 0;
      rowLo[m++] = 0;
      o += 2 * width;
      if (objective.kind === 'closest') obj[nv + q] = 1;
    }
  }
  if (fold >= 0) {
    // Fold column `fold`: a'ⱼ = aⱼ + κ·a_fold for the other component columns, then a_fold = 0
    // (the column stays, empty, and is restored from the others after the solve).
    const k = comps[vars[fold]!]!;
    const kappa = k.min / (1 - k.min);
    for (let r = 0; r < m; r++) {
      const ro = r * width;
      const af = buf[ro + fold]!;
      if (af !== 0) {
        for (let j = 0; j < nv; j++) if (j !== fold) buf[ro + j] = buf[ro + j]! + kappa * af;
        buf[ro + fold] = 0;
      }
    }
    const of = obj[fold]!;
    if (of !== 0) {
      for (let j = 0; j < nv; j++) if (j !== fold) obj[j] = obj[j]! + kappa * of;
      obj[fold] = 0;
    }
    const sol = solveDenseLp(sense, width, obj, m, buf, rowLo, rowHi);
    if (sol.status !== 'optimal') {
      return { status: sol.status === 'infeasible' ? 'infeasible' : 'failed', x: sol.x, objective: Number.NaN };
    }
    let others = 0;
    for (let j = 0; j < nv; j++) if (j !== fold) others += sol.x[j]!;
    sol.x[fold] = kappa * others;
    return { status: 'optimal', x: sol.x, objective: sol.objective };
  }
  const sol = solveDenseLp(sense, width, obj, m, buf, rowLo, rowHi);
  if (sol.status === 'optimal') return { status: 'optimal', x: sol.x, objective: sol.objective };
  return { status: sol.status === 'infeasible' ? 'infeasible' : 'failed', x: sol.x, objective: Number.NaN };
}

/** The 'closest' deviation forms, computed once per prepared problem. */
function closestForms(P: PreparedProblem): Float64Array[] {
  if (!P.cache.closest) P.cache.closest = closestRows(P, P.reference!);
  return P.cache.closest;
}

/**
 * The three deviation forms of the 'closest' objective, per component:
 *   f₁ = cᵢ(X40ᵢ − X40_ref) / (s40·C_ref),  f₂ = cᵢ(X100ᵢ − X100_ref) / (s100·C_ref),
 *   f₃ = [i∈A]·(1/ρᵢ)(APᵢ − AP_ref) / V_ref
 * with s = X per 1 % of viscosity at the reference, C_ref = Σ cᵢwᵢ and V_ref = Σ_A wᵢ/ρᵢ of the
 * reference. Under Σw = 1, |f₁·w| is the ν40 deviation in % (linearised; exact in X for Refutas),
 * |f₂·w| the same at 100 °C, |f₃·w| the aniline-point deviation in °C times V(w)/V_ref (≈ 1).
 */
function closestRows(P: PreparedProblem, ref: ClosestReference): Float64Array[] {
  const f1 = new Float64Array(P.n);
  const f2 = new Float64Array(P.n);
  const f3 = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) {
    f1[i] = (P.c[i]! * (P.x40[i]! - ref.x40)) / (ref.perPct40 * ref.viscBasis);
    f2[i] = (P.c[i]! * (P.x100[i]! - ref.x100)) / (ref.perPct100 * ref.viscBasis);
    if (!Number.isNaN(P.ap[i]!) && ref.anilineVolume > 0) {
      f3[i] = (P.invRho[i]! * (P.ap[i]! - ref.anilinePoint)) / ref.anilineVolume;
    }
  }
  return [f1, f2, f3];
}

/** Normalised mass fractions of a node solution, aligned with ctx.vars. */
/** Null when the LP returned no blend at all (every fraction 0: numerically degenerate data). */
function fractions(x: Float64Array, nv: number): Float64Array | null {
  const w = new Float64Array(nv);
  let sum = 0;
  for (let j = 0; j < nv; j++) {
    const v = x[j]! > 0 ? x[j]! : 0;
    w[j] = v;
    sum += v;
  }
  if (!(sum > 0)) return null;
  for (let j = 0; j < nv; j++) w[j] = w[j]! / sum;
  return w;
}

/** Blend X40 and X100 of fractions over ctx.vars. */
function blendX(P: PreparedProblem, vars: readonly number[], w: Float64Array): { x40: number; x100: number } {
  let sc = 0;
  let s40 = 0;
  let s100 = 0;
  for (let j = 0; j < vars.length; j++) {
    const i = vars[j]!;
    const cw = P.c[i]! * w[j]!;
    sc += cw;
    s40 += cw * P.x40[i]!;
    s100 += cw * P.x100[i]!;
  }
  return { x40: s40 / sc, x100: s100 / sc };
}

/** Unrounded VI of a blend from its coordinates; −Infinity where D2270 defines none. */
function viOf(P: PreparedProblem, x40: number, x100: number): number {
  const kv40 = P.coords.toKvRaw(x40);
  const kv100 = P.coords.toKvRaw(x100);
  if (!Number.isFinite(kv40) || !Number.isFinite(kv100)) return Number.NEGATIVE_INFINITY;
  if (!(kv100 >= VI_MIN_KV100) || !(kv100 < kv40)) return Number.NEGATIVE_INFINITY;
  return viscosityIndex(kv40, kv100);
}

export interface OptimiseOutcome {
  status: 'optimal' | 'infeasible' | 'failed';
  /** Mass fractions aligned with ctx.vars (optimal only). */
  w: Float64Array;
  /** Objective value: the ratio (or the closest distance) at the optimum. */
  value: number;
  lpCount: number;
}

/**
 * Optimise over ctx: one LP when there is no VI condition; otherwise best-first branch and bound
 * over X40 intervals. Each node's LP replaces h by its padded chord on the node's interval, so it
 * is a relaxation of the true problem restricted to that interval; the union of the children is
 * the parent's interval, so the smallest open node value is a lower bound on the true optimum at all
 * times. The first node popped whose solution satisfies the true VI condition (recomputed by
 * ASTM D2270, within {@link VI_ACCEPT_TOLERANCE}) is therefore optimal: its value equals the global
 * lower bound. A node whose solution violates the condition is split at the solution's X40; the
 * chord gap shrinks quadratically with the interval, so few splits are needed.
 */
function optimise(ctx: SolveContext): OptimiseOutcome {
  const { P, vars, groups } = ctx;
  const nv = vars.length;
  const empty = { status: 'infeasible' as const, w: new Float64Array(0), value: Number.NaN, lpCount: 0 };
  if (nv === 0) return empty;
  const bandOn = groups.has('band');
  let a = P.bandA;
  let b = P.bandB;
  if (!bandOn) {
    a = Number.POSITIVE_INFINITY;
    b = Number.NEGATIVE_INFINITY;
    for (const i of vars) {
      a = Math.min(a, P.x40[i]!);
      b = Math.max(b, P.x40[i]!);
    }
  }
  const vi = groups.has('vi') ? ctx.vi : null;
  const sign = ctx.objective.kind === 'ratio' && ctx.objective.sense === 'maximize' ? -1 : 1;
  // First LP without the VI condition: a relaxation; if its optimum already meets the VI it is
  // optimal, and the (costlier) VI relaxation is never built. Most recipes end here.
  const plain = solveNode(ctx, a, b, bandOn, []);
  if (plain.status !== 'optimal') return { ...empty, status: plain.status, lpCount: 1 };
  const w0 = fractions(plain.x, nv);
  if (!w0) return { ...empty, status: 'failed', lpCount: 1 };
  if (!vi) return { status: 'optimal', w: w0, value: plain.objective, lpCount: 1 };
  const bx0 = blendX(P, vars, w0);
  if (viOf(P, bx0.x40, bx0.x100) >= vi.minVi - VI_ACCEPT_TOLERANCE) {
    return { status: 'optimal', w: w0, value: plain.objective, lpCount: 1 };
  }
  const minAccept = vi.minVi - VI_ACCEPT_TOLERANCE;
  interface Node {
    a: number;
    b: number;
    ha: number;
    hb: number;
    sol: NodeSolution;
  }
  let lpCount = 1;
  const open: Node[] = [];
  let failed = false;
  const addNode = (na: number, nb: number, ha: number, hb: number, cached?: readonly ViChord[] | null): void => {
    const chords = cached ?? vi.relaxation(na, ha, nb, hb);
    const sol = solveNode(ctx, na, nb, true, chords);
    lpCount++;
    if (sol.status === 'failed') failed = true;
    if (sol.status === 'optimal') open.push({ a: na, b: nb, ha, hb, sol });
  };
  const root = bandOn && vi === P.vi ? viRoot(P) : null;
  if (root) addNode(a, b, root.hA, root.hB, root.chords);
  else addNode(a, b, vi.h(a), vi.h(b));
  while (open.length > 0 && lpCount < MAX_LPS) {
    // Best-first: the open node with the smallest (signed) objective.
    let best = 0;
    for (let k = 1; k < open.length; k++) {
      if (sign * open[k]!.sol.objective < sign * open[best]!.sol.objective) best = k;
    }
    const node = open[best]!;
    open.splice(best, 1);
    const w = fractions(node.sol.x, nv);
    if (!w) {
      failed = true;
      continue;
    }
    const bx = blendX(P, vars, w);
    if (viOf(P, bx.x40, bx.x100) >= minAccept) {
      return { status: 'optimal', w, value: node.sol.objective, lpCount };
    }
    // Split at the solution's X40, kept away from the ends so both children shrink.
    const span = node.b - node.a;
    if (!(span > 1e-10)) continue; // a point interval whose chord is exact cannot improve
    const split = Math.min(node.b - 0.02 * span, Math.max(node.a + 0.02 * span, bx.x40));
    const hs = vi.h(split, node.ha);
    addNode(node.a, split, node.ha, hs);
    addNode(split, node.b, hs, node.hb);
  }
  return { ...empty, status: failed && open.length === 0 ? 'failed' : 'infeasible', lpCount };
}

// ---------------------------------------------------------------------------------------------
// Public engine entry points
// ---------------------------------------------------------------------------------------------

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
}

const ALL_GROUP_SET: ReadonlySet<ConstraintGroup> = new Set(ALL_GROUPS);

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
  options: SolvePreparedOptions = {},
): EngineResult {
  const groups = options.groups ?? ALL_GROUP_SET;
  const t = P.targets;
  // Variables: the subset's usable components plus every forced one.
  let vars: number[];
  if (subset === null) vars = P.usableIndices.slice();
  else {
    vars = [];
    for (let q = 0; q < subset.length; q++) {
      const i = subset[q]!;
      if (P.components[i]?.usable && vars.indexOf(i) < 0) vars.push(i);
    }
    for (let q = 0; q < P.forced.length; q++) {
      const i = P.forced[q]!;
      if (vars.indexOf(i) < 0 && P.components[i]!.usable) vars.push(i);
    }
  }
  // A forced component that cannot be used makes the problem infeasible (bounds active).
  for (const i of P.forced) {
    const k = P.components[i]!;
    const active = k.fixedAdditive ? groups.has('additive') : groups.has('bounds');
    if (active && !vars.includes(i)) return { status: 'infeasible', lpCount: 0 };
  }
  if (vars.length === 0) return { status: 'infeasible', lpCount: 0 };
  const vi = options.vi === undefined ? P.vi : options.vi;
  // Cheap necessary conditions (a blend mean lies between its components' values).
  if (options.objective === undefined) {
    let min40 = Number.POSITIVE_INFINITY;
    let max40 = Number.NEGATIVE_INFINITY;
    let max100 = Number.NEGATIVE_INFINITY;
    let minAp = Number.POSITIVE_INFINITY;
    for (const i of vars) {
      min40 = Math.min(min40, P.x40[i]!);
      max40 = Math.max(max40, P.x40[i]!);
      max100 = Math.max(max100, P.x100[i]!);
      if (!Number.isNaN(P.ap[i]!)) minAp = Math.min(minAp, P.ap[i]!);
    }
    if (groups.has('band')) {
      const eps = 1e-9;
      if (max40 < P.bandA - eps || min40 > P.bandB + eps) return { status: 'infeasible', lpCount: 0 };
      // VI: X100 ≥ h(X40) ≥ h(ν_lo) (h increasing), so the thickest stock at 100 °C must reach h(ν_lo);
      // the margin (≈ 0.05 VI) keeps this test strictly on the safe side of the VI tolerance.
      // Tested without h (a root search) as g(max X100 + margin) < X(ν_lo) — the same condition,
      // since g = h⁻¹ is increasing — at the cost of one evaluation of g.
      if (groups.has('vi') && vi && vi === P.vi && vi.g(max100 + 1e-3 / P.coords.rowScale) < P.bandA) {
        return { status: 'infeasible', lpCount: 0 };
      }
    }
    if (groups.has('aniline') && t.maxAnilinePoint !== null && minAp > t.maxAnilinePoint + 1e-9) {
      return { status: 'infeasible', lpCount: 0 };
    }
  }
  const objective = options.objective ?? primaryObjective(P);
  if (objective.kind === 'closest' && !P.reference) return { status: 'infeasible', lpCount: 0 };
  const withAux = objective.kind === 'closest';
  const ctx: SolveContext = { P, vars, groups, objective, extra: [], vi, withAux };
  const first = optimise(ctx);
  let lpCount = first.lpCount;
  if (first.status !== 'optimal') {
    return first.status === 'failed'
      ? { status: 'infeasible', lpCount, solverFailure: true }
      : { status: 'infeasible', lpCount };
  }
  let w = first.w;
  const isCost = objective.kind === 'ratio' && objective.num === P.price && objective.den === P.invRho;
  if (!isCost && !options.noTieBreak && options.objective === undefined) {
    // Lexicographic tie-break: least cost per litre among recipes within a hair of the optimum.
    const extra = tieBreakRow(P, objective, first.value);
    const second = optimise({ ...ctx, objective: costObjective(P), extra: [extra] });
    lpCount += second.lpCount;
    if (second.status === 'optimal') w = second.w;
  }
  return finish(P, vars, w, first.value, lpCount);
}

/** Row "primary objective within ε of its optimum", homogeneous. */
function tieBreakRow(P: PreparedProblem, objective: EngineObjective, value: number): ExtraRow {
  const eps = 1e-9 * Math.max(1, Math.abs(value));
  if (objective.kind === 'closest') {
    // Σ aux − (d* + ε)·Σ w ≤ 0 (aux rows are homogeneous, so this holds at any scale).
    const coef = new Float64Array(P.n).fill(-(value + eps));
    return { coef, aux: 1, sense: 'le' };
  }
  const bound = objective.sense === 'minimize' ? value + eps : value - eps;
  const coef = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) coef[i] = objective.num[i]! - bound * objective.den[i]!;
  return { coef, aux: 0, sense: objective.sense === 'minimize' ? 'le' : 'ge' };
}

/** Properties of a solution in plain numbers (the same equations as the core). */
function finish(P: PreparedProblem, vars: readonly number[], w: Float64Array, value: number, lpCount: number): EngineOptimal {
  const massFractions = new Float64Array(P.n);
  let sv = 0;
  let sp = 0;
  let sa = 0;
  let saAp = 0;
  // Drop simplex dust (< 1e-6, far below any weighing precision; moves ν40 by < 1e-5 relative
  // and VI by < 0.002) and renormalise to Σ = 1.
  let total = 0;
  for (let j = 0; j < vars.length; j++) {
    if (w[j]! < 1e-6) w[j] = 0;
    total += w[j]!;
  }
  for (let j = 0; j < vars.length; j++) w[j] = w[j]! / total;
  for (let j = 0; j < vars.length; j++) {
    const i = vars[j]!;
    const wi = w[j]!;
    massFractions[i] = wi;
    sv += wi * P.invRho[i]!;
    sp += wi * P.price[i]!;
    if (!Number.isNaN(P.ap[i]!) && wi > 0) {
      sa += wi * P.invRho[i]!;
      saAp += wi * P.invRho[i]! * P.ap[i]!;
    }
  }
  const bx = blendX(P, vars, w);
  const kv40 = P.coords.toKv(bx.x40);
  const kv100 = P.coords.toKv(bx.x100);
  const vi = kv100 >= VI_MIN_KV100 && kv100 < kv40 ? viscosityIndex(kv40, kv100) : null;
  const density15 = 1 / sv;
  return {
    status: 'optimal',
    massFractions,
    objectiveValue: value,
    kv40,
    kv100,
    vi,
    density15,
    anilinePoint: sa > 0 ? saAp / sa : null,
    costPerLitre: density15 * sp,
    lpCount,
  };
}
