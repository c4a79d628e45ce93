/**
 * Blend viscosity by the ASTM D7152 ASTM Blending Method (constant temperature), on a volume basis.
 *
 *   log₁₀ log₁₀ Z(ν_blend) = Σ φᵢ · log₁₀ log₁₀ Z(νᵢ),   Z(ν) = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²)
 *
 * with φᵢ volume fractions and every νᵢ at the same temperature [mm²/s]. Z is the ASTM D341-20
 * function (`viscosity/viscosity-temperature.ts`), inverted by D341-20's published inverse; valid
 * range that of D341-20, ν ≥ 0.21 mm²/s. Above 5 mm²/s the exponential term is below 1e-10, so the
 * check values computed with Z = ν + 0.7 (B4) hold unchanged.
 *
 * ASTM D7152 states that its methods may not apply to viscosity-index improvers, additive packages
 * or strongly non-Newtonian fluids: a polymeric component needs its own treatment (an effective
 * blending viscosity calibrated from a measured blend, see `Calibration` in model.ts).
 *
 * @see ASTM D7152, Standard Practice for Calculating Viscosity of a Blend of Petroleum Products,
 *   ASTM Blending Method (constant temperature); ASTM D341-20 for Z. Form as recalled
 *   (no copy of D7152 at hand); D7152-11's published definition: "a blending method at constant
 *   temperature, using components in volume percent".
 */
import { ViscosityOutOfRangeError, assertFinite, assertFractions, assertViscosity } from '../errors';
import { D341_MIN_KV, d341LogLogZ, kvFromD341LogLogZ } from '../viscosity/viscosity-temperature';
import { assertTwoComponent } from './refutas';

/** Throws unless ν is within the D341-20 range (≥ 0.21 mm²/s). */
export function assertLogLogKv(fn: string, field: string, kv: unknown): asserts kv is number {
  assertViscosity(fn, field, kv);
  if (kv < D341_MIN_KV) {
    throw new ViscosityOutOfRangeError(
      field,
      kv,
      `${fn}: ${field} = ${kv} mm²/s; the log-log rule needs ν ≥ ${D341_MIN_KV} mm²/s (the ASTM D341-20 range)`,
    );
  }
}

/**
 * The D7152 / D341-20 blending value of a viscosity:  log₁₀ log₁₀ Z(ν).
 *
 * @param kv - ν at the blending temperature [mm²/s], ≥ 0.21
 * @returns log₁₀ log₁₀ Z(ν) [dimensionless]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError (ν < 0.21)
 * @example astmLogLog(100) // → 0.30329
 * @see ASTM D341-20 (Z); ASTM D7152.
 */
export function astmLogLog(kv: number): number {
  assertLogLogKv('astmLogLog', 'kv', kv);
  return d341LogLogZ(kv);
}

/** Inverse of {@link astmLogLog}: ν = Z⁻¹(10^(10^x)), D341-20's published inverse. */
export function kvFromAstmLogLog(x: number): number {
  const fn = 'kvFromAstmLogLog';
  assertFinite(fn, 'x', x);
  const kv = kvFromD341LogLogZ(x);
  assertFinite(fn, 'result', kv);
  return kv;
}

/**
 * Kinematic viscosity of a blend by the ASTM D7152 ASTM Blending Method (constant temperature).
 *
 * @param parts - `volumeFraction` φᵢ [0–1, sum 1 within 1e-9] and `kv` νᵢ [mm²/s] of each part, all
 *   at the same temperature
 * @returns ν of the blend at that temperature [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError, FractionSumError
 * @example blendViscosityAstmD7152([{ volumeFraction: 0.5, kv: 100 }, { volumeFraction: 0.5, kv: 460 }]) // → 203.35
 */
export function blendViscosityAstmD7152(parts: readonly { volumeFraction: number; kv: number }[]): number {
  const fn = 'blendViscosityAstmD7152';
  assertFractions(
    fn,
    'volumeFraction',
    parts.map((p) => p.volumeFraction),
  );
  parts.forEach((p, i) => assertLogLogKv(fn, `parts[${i}].kv`, p.kv));
  const only = parts.filter((p) => p.volumeFraction > 0);
  if (only.length === 1) return only[0]!.kv;
  const x = parts.reduce((s, p) => s + p.volumeFraction * astmLogLog(p.kv), 0);
  return kvFromAstmLogLog(x);
}

/**
 * Volume fraction of the heavy stock in a two-component blend reaching a target viscosity by the
 * log-log rule (exact, since the rule is linear in φ):
 * φ_heavy = (x_target − x_light)/(x_heavy − x_light), x = log₁₀ log₁₀ Z(ν) (ASTM D341-20).
 *
 * @param kvLight - ν of the light stock [mm²/s]
 * @param kvHeavy - ν of the heavy stock [mm²/s], above kvLight
 * @param targetKv - target ν [mm²/s], from kvLight to kvHeavy inclusive
 * @returns φ_heavy, volume fraction of the heavy stock [0–1]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError
 * @example astmHeavyFraction(100, 460, 203.35) // → 0.5
 */
export function astmHeavyFraction(kvLight: number, kvHeavy: number, targetKv: number): number {
  const fn = 'astmHeavyFraction';
  assertLogLogKv(fn, 'kvLight', kvLight);
  assertLogLogKv(fn, 'kvHeavy', kvHeavy);
  assertLogLogKv(fn, 'targetKv', targetKv);
  assertTwoComponent(fn, kvLight, kvHeavy, targetKv);
  const xL = astmLogLog(kvLight);
  const xH = astmLogLog(kvHeavy);
  return (astmLogLog(targetKv) - xL) / (xH - xL);
}
