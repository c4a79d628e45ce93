/**
 * Flash point of a blend by the Wickey–Chittenden flash-point blending index, on a volume basis —
 * an estimate.
 *
 *   log₁₀ BI = −6.1188 + 2414/(T − 42.6),   T = t + 273.15 [K]
 *   BI_blend = Σ φᵢ·BIᵢ,   T_blend = 2414/(log₁₀ BI_blend + 6.1188) + 42.6
 *
 * The same index is often printed in °F: log₁₀ BI = −6.1188 + 4345.2/(t_F + 383). The two forms are
 * one equation (T − 42.6 K = (t_F + 383)/1.8 and 2414 × 1.8 = 4345.2) — checked in the tests.
 *
 * What is verified and what is not: the constants (−6.1188, 2414, 42.6) reproduce, to the printed
 * whole number, every row of a published flash-point blending table (flash point 20–110 °C → index,
 * e.g. 20 °C → 3281, 50 °C → 306, 110 °C → 9; R. J. Patel, "Flash Point Prediction – Petroleum
 * Products Blending – Calculation formula and table", 2017), which blends the index by volume as here.
 * That table does not name its origin: the attribution to Wickey and Chittenden, the paper's
 * citation and the fitted range below remain from memory (no copy of the paper at hand).
 *
 * The index is large for low flash points, so a small share of a volatile component (e.g. an
 * additive package's light diluent) lowers the blend flash point more than its share suggests —
 * the point of blending by index rather than by temperature.
 *
 * Fitted range: the correlation was fitted on petroleum fuels and distillate fractions, whose flash
 * points lie well below {@link FLASH_INDEX_FITTED_MAX_C} = 200 °C (from memory). Gear-oil base stocks
 * flash at 200–300 °C, so every gear-oil estimate is an EXTRAPOLATION of the index
 * ({@link flashIndexExtrapolated}); the app says so beside the value. A flash point is a safety
 * property: this estimate never replaces the measured value (ASTM D92 / D93) required before release.
 *
 * @see Wickey, R. O. and Chittenden, D. H., "Flash points of blends correlated", Hydrocarbon
 *   Processing 42 (6) (1963) 157–158 (citation from memory).
 */
import { BlendbenchInputError, assertTemperatureC, assertFinite } from '../errors';
import { blendByVolumeIndex } from './volume-index';

const KELVIN_OFFSET = 273.15;
/** Below T = 42.6 K the index is undefined (pole of the equation). */
const POLE_K = 42.6;

/** Upper end of the flash points the Wickey–Chittenden index was fitted on [°C] (from memory). */
export const FLASH_INDEX_FITTED_MAX_C = 200;

/**
 * Whether a flash-point estimate relies on the index beyond its fitted range: true when the result or
 * any component's flash point lies at or above {@link FLASH_INDEX_FITTED_MAX_C}.
 *
 * @param resultC - the blend estimate [°C]
 * @param componentFlashC - the components' flash points [°C] (nulls ignored)
 * @returns true for an extrapolation
 * @example flashIndexExtrapolated(230, [220, 250]) // → true
 */
export function flashIndexExtrapolated(resultC: number, componentFlashC: readonly (number | null)[]): boolean {
  return resultC >= FLASH_INDEX_FITTED_MAX_C || componentFlashC.some((t) => t !== null && t >= FLASH_INDEX_FITTED_MAX_C);
}

/**
 * Flash-point blending index of a flash point:  log₁₀ BI = −6.1188 + 2414/(T − 42.6).
 *
 * @param tC - flash point [°C]
 * @returns BI [dimensionless]
 * @throws InvalidNumberError, BelowAbsoluteZeroError, BlendbenchInputError (T ≤ 42.6 K)
 * @example flashBlendingIndex(20) // → 3281;  flashBlendingIndex(50) // → 306.0
 */
export function flashBlendingIndex(tC: number): number {
  const fn = 'flashBlendingIndex';
  assertTemperatureC(fn, 'tC', tC);
  const T = tC + KELVIN_OFFSET;
  if (T <= POLE_K) {
    throw new BlendbenchInputError('tC', tC, `${fn}: tC = ${tC} °C is at or below ${POLE_K} K, where the index is undefined`);
  }
  return Math.pow(10, -6.1188 + 2414 / (T - POLE_K));
}

/**
 * Flash point of a blending index:  T = 2414/(log₁₀ BI + 6.1188) + 42.6.
 *
 * @param bi - BI [dimensionless], > 10^−6.1188
 * @returns flash point [°C]
 * @throws InvalidNumberError; BlendbenchInputError (BI outside the index's range)
 * @example flashPointFromIndex(306.0) // → 50.0
 */
export function flashPointFromIndex(bi: number): number {
  const fn = 'flashPointFromIndex';
  assertFinite(fn, 'bi', bi);
  const d = Math.log10(bi) + 6.1188;
  if (!(bi > 0) || d <= 0) {
    throw new BlendbenchInputError('bi', bi, `${fn}: bi = ${bi} is outside the range of the flash blending index (> 10^−6.1188)`);
  }
  return 2414 / d + POLE_K - KELVIN_OFFSET;
}

/**
 * Estimated flash point of a blend, blending the index by volume.
 *
 * @param parts - `volumeFraction` φᵢ [0–1, sum 1 within 1e-9] and `flashPoint` [°C] of each part,
 *   null if unknown
 * @returns estimated flash point [°C], or null when a part with a non-zero fraction has no flash
 *   point (an unknown, possibly volatile component could dominate: no safe estimate exists)
 * @throws InvalidNumberError, FractionSumError, BelowAbsoluteZeroError
 * @example blendFlashPoint([{ volumeFraction: 0.5, flashPoint: 200 }, { volumeFraction: 0.5, flashPoint: 250 }]) // → 215.95
 * @see Wickey and Chittenden (1963); check-values F1, F2 (formula; constants from memory).
 */
export function blendFlashPoint(
  parts: readonly { volumeFraction: number; flashPoint: number | null }[],
): number | null {
  return blendByVolumeIndex(
    'blendFlashPoint',
    'flashPoint',
    parts.map((p) => ({ volumeFraction: p.volumeFraction, value: p.flashPoint })),
    flashBlendingIndex,
    flashPointFromIndex,
  );
}
