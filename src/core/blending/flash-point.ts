/**
 * Flash point of a blend by a flash-point blending index, on a volume basis — an estimate.
 *
 *   log₁₀ BI = −6.1188 + 2414/(T − 42.6),   T = t + 273.15 [K]
 *   BI_blend = Σ φᵢ·BIᵢ,   T_blend = 2414/(log₁₀ BI_blend + 6.1188) + 42.6
 *
 * The index is large for low flash points, so a small share of a volatile component (e.g. an
 * additive package's light diluent) lowers the blend flash point more than its share suggests —
 * the point of blending by index rather than by temperature. Constants from memory; they reproduce
 * a published constants table (shared/reference/check-values.md F1). A flash point is a safety
 * property: this estimate never replaces the measured value (ASTM D92 / D93) required before release.
 */
import { BlendbenchInputError, assertTemperatureC, assertFinite } from '../errors';
import { blendByVolumeIndex } from './volume-index';

const KELVIN_OFFSET = 273.15;
/** Below T = 42.6 K the index is undefined (pole of the equation). */
const POLE_K = 42.6;

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
 * @see check-values F1, F2 (formula; constants from memory).
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
