/**
 * Objectives of the blending LP. Every objective is a ratio of two linear forms in the mass
 * fractions, num·w / den·w, made linear by fixing den·w = 1 (Charnes–Cooper, see `engine.ts`),
 * except 'closest', which minimises three auxiliary deviation variables.
 */
import type { PreparedProblem, ClosestReference, RatioObjective, EngineObjective } from './prepared';

export type { RatioObjective, ClosestObjective, EngineObjective } from './prepared';


/** An extra homogeneous row coef·w + aux·Σaux + lift·(lifted variables) (≤ | ≥) 0. */
export interface ExtraRow {
  coef: Float64Array;
  aux: number;
  sense: 'le' | 'ge';
  /** Coefficients of the context's lifted variables (`SolveContext.lift`), by position; absent → 0. */
  lift?: ArrayLike<number>;
}

/** Cost per litre (at 15 °C): Σ pᵢwᵢ / Σ wᵢ/ρᵢ. */
export function costObjective(P: PreparedProblem): RatioObjective {
  return { kind: 'ratio', sense: 'minimize', num: P.price, den: P.invRho };
}

/** Cost per kg: Σ pᵢwᵢ / Σ wᵢ (ties go to the lower cost per litre, as for every non-cost objective). */
export function costPerKgObjective(P: PreparedProblem): RatioObjective {
  return { kind: 'ratio', sense: 'minimize', num: P.price, den: new Float64Array(P.n).fill(1) };
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
function relObjective(P: PreparedProblem, rel: ArrayLike<number>): RatioObjective {
  const num = new Float64Array(P.n);
  const den = new Float64Array(P.n);
  for (let i = 0; i < P.n; i++) {
    if (Number.isNaN(rel[i]!)) continue;
    num[i] = P.invRho[i]! * rel[i]!;
    den[i] = P.invRho[i]!;
  }
  return { kind: 'ratio', sense: 'minimize', num, den };
}

/**
 * The objective the targets ask for (cached on the prepared problem in one slot, with the name it
 * was made for: a copy of the problem with other targets shares the cache).
 */
export function primaryObjective(P: PreparedProblem): EngineObjective {
  const cache = P.cache;
  const made = cache.primary;
  if (made !== undefined && cache.primaryOf === P.targets.objective) return made;
  cache.primaryOf = P.targets.objective;
  return (cache.primary = makePrimaryObjective(P));
}

function makePrimaryObjective(P: PreparedProblem): EngineObjective {
  switch (P.targets.objective) {
    case 'solvency':
      return anilineObjective(P);
    case 'oxidation':
      return oxidationObjective(P);
    case 'closest':
      return { kind: 'closest' };
    case 'cost-kg':
      return costPerKgObjective(P);
    case 'cost':
    default:
      return costObjective(P);
  }
}

/** The 'closest' deviation forms, computed once per prepared problem. */
export function closestForms(P: PreparedProblem): Float64Array[] {
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

/** Row "primary objective within ε of its optimum", homogeneous. */
export function tieBreakRow(P: PreparedProblem, objective: EngineObjective, value: number): ExtraRow {
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

