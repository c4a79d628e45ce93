/**
 * Pour point of a blend by the Hu–Burns pour-point blending index, on a volume basis — a flagged
 * estimate.
 *
 *   BI = T^(1/0.08) = T^12.5,   T = t + 273.15 [K]
 *   BI_blend = Σ φᵢ·BIᵢ,   T_blend = BI_blend^0.08
 *
 * Hu and Burns wrote the index in degrees Rankine; the result does not depend on which absolute
 * scale is used (every index scales by the same factor 1.8^12.5), which the tests check.
 *
 * What is verified and what is not: the citation (authors, title, journal, volume, page) is as listed
 * in the references of Fahim, Al-Sahhaf and Elkilani, "Fundamentals of Petroleum Refining" (2010),
 * chapter "Product Blending" — Oil & Gas Journal, not Hydrocarbon Processing as first recalled. The
 * form BI = T^(1/0.08) and its exponent could not be checked against a published copy and stay from
 * memory. Fitted range: distillate fuel blends with pour points of roughly
 * {@link POUR_INDEX_FITTED_C} = −50…+10 °C (from memory); outside it the app marks the estimate as an
 * extrapolation ({@link pourIndexExtrapolated}).
 *
 * An estimate only: wax crystallisation and pour-point depressants defeat any such index, and a
 * blend's pour point must be measured (ASTM D97) before release. The app flags every value from
 * here as an estimate.
 *
 * @see Hu, J. and Burns, A., "Index predicts cloud, pour and flash points of distillate fuel blends",
 *   Oil & Gas Journal 68 (45) (1970) 66 (as cited in Fahim et al., Fundamentals of Petroleum Refining,
 *   2010, ch. Product Blending).
 */
import { BlendbenchInputError, assertFinite, assertTemperatureC } from '../errors';
import { blendByVolumeIndex } from './volume-index';

const KELVIN_OFFSET = 273.15;
const EXPONENT = 1 / 0.08; // 12.5

/** Pour points the Hu–Burns index was fitted on [°C] (distillate fuels; from memory). */
export const POUR_INDEX_FITTED_C = { min: -50, max: 10 } as const;

/**
 * Whether a pour-point estimate relies on the index outside its fitted range: true when the result or
 * any component's pour point lies outside {@link POUR_INDEX_FITTED_C}.
 *
 * @param resultC - the blend estimate [°C]
 * @param componentPourC - the components' pour points [°C] (nulls ignored)
 * @returns true for an extrapolation
 * @example pourIndexExtrapolated(-12, [-15, -9]) // → false
 */
export function pourIndexExtrapolated(resultC: number, componentPourC: readonly (number | null)[]): boolean {
  const out = (t: number) => t < POUR_INDEX_FITTED_C.min || t > POUR_INDEX_FITTED_C.max;
  return out(resultC) || componentPourC.some((t) => t !== null && out(t));
}

/**
 * Pour-point blending index:  BI = T^12.5, T in kelvin.
 *
 * @param tC - pour point [°C], above absolute zero
 * @returns BI [K^12.5]
 * @throws InvalidNumberError, BelowAbsoluteZeroError
 * @example pourBlendingIndex(-15) // → 258.15^12.5
 */
export function pourBlendingIndex(tC: number): number {
  assertTemperatureC('pourBlendingIndex', 'tC', tC);
  return Math.pow(tC + KELVIN_OFFSET, EXPONENT);
}

/**
 * Pour point of a blending index:  T = BI^0.08.
 *
 * @param bi - BI [K^12.5], ≥ 0
 * @returns pour point [°C]
 * @throws InvalidNumberError; BlendbenchInputError (negative index)
 * @example pourPointFromIndex(pourBlendingIndex(-15)) // → -15
 */
export function pourPointFromIndex(bi: number): number {
  const fn = 'pourPointFromIndex';
  assertFinite(fn, 'bi', bi);
  if (bi < 0) throw new BlendbenchInputError('bi', bi, `${fn}: bi = ${bi}; a pour-point blending index cannot be negative`);
  return Math.pow(bi, 0.08) - KELVIN_OFFSET;
}

/**
 * Estimated pour point of a blend, blending the index by volume. An estimate only (see module note).
 *
 * @param parts - `volumeFraction` φᵢ [0–1, sum 1 within 1e-9] and `pourPoint` [°C], null if unknown
 * @returns estimated pour point [°C], or null when a part with a non-zero fraction has none
 * @throws InvalidNumberError, FractionSumError, BelowAbsoluteZeroError
 * @example blendPourPoint([{ volumeFraction: 0.5, pourPoint: -15 }, { volumeFraction: 0.5, pourPoint: -45 }]) // → -25.12
 * @see check-values P1 (formula, from memory).
 */
export function blendPourPoint(
  parts: readonly { volumeFraction: number; pourPoint: number | null }[],
): number | null {
  return blendByVolumeIndex(
    'blendPourPoint',
    'pourPoint',
    parts.map((p) => ({ volumeFraction: p.volumeFraction, value: p.pourPoint })),
    pourBlendingIndex,
    pourPointFromIndex,
  );
}
