/**
 * Blending by a volume-weighted index — the shared mechanics of the flash-point and pour-point
 * estimates (`flash-point.ts`, `pour-point.ts`): each part's temperature is turned into a
 * blending index BIᵢ, the indices are averaged by volume, BI_blend = Σ φᵢ·BIᵢ, and the average is
 * turned back into a temperature. The index functions themselves carry the method and its source.
 */
import { assertFractions, assertTemperatureC } from '../errors';

/**
 * @param fn Name of the calling function, for error messages.
 * @param field Name of the temperature field in `parts`, for error messages (e.g. 'flashPoint').
 * @param parts Volume fractions φᵢ (0–1, summing to 1) and temperatures tᵢ [°C] (null = unknown).
 * @param toIndex tᵢ [°C] → BIᵢ.
 * @param fromIndex BI → t [°C].
 * @returns The blend's temperature [°C], or null when a part with a non-zero fraction has no value.
 * @throws FractionSumError, InvalidNumberError, BelowAbsoluteZeroError (from the checks).
 */
export function blendByVolumeIndex(
  fn: string,
  field: string,
  parts: readonly { volumeFraction: number; value: number | null }[],
  toIndex: (tC: number) => number,
  fromIndex: (bi: number) => number,
): number | null {
  assertFractions(
    fn,
    'volumeFraction',
    parts.map((p) => p.volumeFraction),
  );
  let bi = 0;
  for (const [i, p] of parts.entries()) {
    if (p.volumeFraction === 0) continue;
    if (p.value === null) return null;
    assertTemperatureC(fn, `parts[${i}].${field}`, p.value);
    bi += p.volumeFraction * toIndex(p.value);
  }
  return fromIndex(bi);
}
