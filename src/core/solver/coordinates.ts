/**
 * Blending coordinates of the two mixing rules, as the solver uses them.
 *
 * Both rules are linear in a transformed viscosity X(ν):
 *
 * - Refutas:      X = VBN = 14.534·ln(ln(ν + 0.8)) + 10.975,  X_blend = Σ wᵢ·Xᵢ  (mass fractions wᵢ)
 * - D7152 ASTM Blending Method:  X = log₁₀ log₁₀ Z(ν) (ASTM D341-20 Z),  X_blend = Σ φᵢ·Xᵢ  (volume fractions φᵢ)
 * - D7152 Wright method:  the same X, X_blend = Σ (φᵢ/Bᵢ)·Xᵢ / Σ φᵢ/Bᵢ at any one temperature, Bᵢ the
 *   slope of component i's D341-20 line through its ν40 and ν100 (derivation in `blending/wright.ts`)
 *
 * With basis weights cᵢ = 1 (mass), cᵢ = 1/ρᵢ (volume, since φᵢ = (wᵢ/ρᵢ)/Σ wⱼ/ρⱼ) or
 * cᵢ = 1/(ρᵢ·Bᵢ) (Wright) all three read
 *
 *   X_blend = Σ cᵢ·wᵢ·Xᵢ / Σ cᵢ·wᵢ,
 *
 * so a bound X_blend ≤ K is the homogeneous linear inequality Σ cᵢ·wᵢ·(Xᵢ − K) ≤ 0 in the mass
 * fractions — the form every solver row takes. X is increasing in ν, so a viscosity band maps to an
 * X band.
 *
 * @see `blending/refutas.ts`, `blending/astm-loglog.ts` and `blending/wright.ts` for the rules
 *   themselves (the solver calls the same functions, so its numbers agree with the calculation core).
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { kvFromRefutasVbn, refutasVbn } from '../blending/refutas';
import { astmLogLog, kvFromAstmLogLog } from '../blending/astm-loglog';
import { wrightWeight } from '../blending/wright';
import { D341_MIN_KV, d341LogLogZ, kvFromD341LogLogZ } from '../viscosity/viscosity-temperature';

export interface BlendCoordinates {
  readonly method: BlendMethod;
  /** True when the rule blends by mass fraction (cᵢ = 1); false for volume (cᵢ = 1/ρᵢ, Wright 1/(ρᵢBᵢ)). */
  readonly massBasis: boolean;
  /**
   * The basis weight cᵢ of a component with these ν40, ν100 [mm²/s] and ρ15 [kg/L]:
   * 1 (Refutas), 1/ρ (ASTM Blending Method) or 1/(ρ·B) (Wright).
   */
  basisWeight(kv40: number, kv100: number, density15: number): number;
  /** X(ν) [dimensionless] of a kinematic viscosity ν [mm²/s]. */
  toX(kv: number): number;
  /** ν(X) [mm²/s], the inverse of {@link toX}. */
  toKv(x: number): number;
  /**
   * The same two functions without input checks, for the solver's inner loops (arguments are
   * already known to be valid). Same arithmetic as the checked versions, so identical results.
   */
  toXRaw(kv: number): number;
  toKvRaw(x: number): number;
  /**
   * Whether {@link toX} accepts ν [mm²/s] (a finite number in the rule's range); where it does,
   * {@link toXRaw} returns the identical value without the checks.
   */
  acceptsKv(kv: unknown): boolean;
  /** dX for a +1 % change of ν at ν [per %], the local scale used by the 'closest' objective. */
  perPct(kv: number): number;
  /**
   * Factor applied to coordinate rows so that the simplex sees coefficients of order 1
   * (VBN differences are O(1–10); log-log differences are O(0.01–0.3)).
   */
  readonly rowScale: number;
}

const REFUTAS: BlendCoordinates = {
  method: 'refutas',
  massBasis: true,
  basisWeight: () => 1,
  toX: refutasVbn,
  toKv: kvFromRefutasVbn,
  // Same expressions as blending/refutas.ts (14.534, 10.975, natural logarithms).
  toXRaw: (kv) => 14.534 * Math.log(Math.log(kv + 0.8)) + 10.975,
  toKvRaw: (x) => Math.exp(Math.exp((x - 10.975) / 14.534)) - 0.8,
  // refutasVbn's checks: a finite number above 0.2 mm²/s.
  acceptsKv: (kv) => typeof kv === 'number' && kv > 0.2 && kv < Number.POSITIVE_INFINITY,
  // d VBN/dν = 14.534 / ((ν + 0.8)·ln(ν + 0.8)); × ν/100 for one per cent.
  perPct: (kv) => ((14.534 / ((kv + 0.8) * Math.log(kv + 0.8))) * kv) / 100,
  rowScale: 1,
};

const ASTM_D7152: BlendCoordinates = {
  method: 'astm-d7152',
  massBasis: false,
  basisWeight: (_kv40, _kv100, density15) => 1 / density15,
  toX: astmLogLog,
  toKv: kvFromAstmLogLog,
  // Same functions as blending/astm-loglog.ts (ASTM D341-20 Z and its published inverse).
  toXRaw: (kv) => d341LogLogZ(kv),
  toKvRaw: (x) => kvFromD341LogLogZ(x),
  // astmLogLog's checks: a finite number from the D341-20 minimum up.
  acceptsKv: (kv) => typeof kv === 'number' && kv >= D341_MIN_KV && kv < Number.POSITIVE_INFINITY,
  // d/dν log₁₀ log₁₀(ν + 0.7) = 1 / (ln10² · log₁₀(ν + 0.7) · (ν + 0.7)); × ν/100. (The D341-20 term
  // changes this local scale by less than 0.1 % above 2 mm²/s; it only weighs the 'closest' distance.)
  perPct: (kv) => ((1 / (Math.LN10 * Math.LN10 * Math.log10(kv + 0.7) * (kv + 0.7))) * kv) / 100,
  rowScale: 30,
};

const D7152_WRIGHT: BlendCoordinates = {
  ...ASTM_D7152,
  method: 'd7152-wright',
  basisWeight: (kv40, kv100, density15) => wrightWeight(kv40, kv100) / density15,
};

/** The blending coordinates of a mixing rule. */
export function blendCoordinates(method: BlendMethod): BlendCoordinates {
  if (method === 'astm-d7152') return ASTM_D7152;
  if (method === 'd7152-wright') return D7152_WRIGHT;
  return REFUTAS;
}
