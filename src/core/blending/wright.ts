/**
 * Blend viscosity by the ASTM D7152 Wright method: every component is described by its ASTM D341
 * line (viscosities at two temperatures), and the blend reaches a given viscosity at the
 * volume-weighted mean of the logarithms of the temperatures at which its components reach it:
 *
 *   log₁₀ T_blend(ν) = Σ φᵢ · log₁₀ Tᵢ(ν),      log₁₀ Tᵢ(ν) = (Aᵢ − log₁₀ log₁₀ Z(ν)) / Bᵢ
 *
 * (T [K], φᵢ volume fractions, Aᵢ and Bᵢ the D341-20 constants of component i through its ν40 and
 * ν100, Z the D341-20 function). Because log T_blend is linear in log log Z, the blend is itself a
 * D341 line:
 *
 *   1/B_b = Σ φᵢ/Bᵢ,    A_b = B_b · Σ φᵢ·Aᵢ/Bᵢ,
 *
 * and, equivalently, at any one temperature the blend's log log Z is the mean of the components'
 * weighted by φᵢ/Bᵢ:  log log Z_b(T) = Σ (φᵢ/Bᵢ)·log log Zᵢ(T) / Σ φᵢ/Bᵢ. The ASTM Blending Method
 * (constant temperature, `astm-loglog.ts`) is the same mean with weights φᵢ; the Wright method gives
 * a component with a flat viscosity–temperature line (small B, high VI) more weight.
 *
 * The inverse (fraction of a heavy stock reaching a target ν at temperature t) is exact, because
 * log T_blend is linear in φ:  φ_heavy = (log T − log T_light(ν)) / (log T_heavy(ν) − log T_light(ν)).
 *
 * Valid range: ν ≥ 0.21 mm²/s at every temperature used (D341-20); each component needs ν40 > ν100.
 * D7152 states that its methods may not apply to viscosity-index improvers, additive packages or
 * strongly non-Newtonian fluids (calibrate those from a measured blend).
 *
 * Source note: no copy of D7152 was at hand; the form above (the constant-viscosity interpolation in
 * log T) was written from memory and then verified, not changed, against:
 * - the published scope of D7152-11 (2016): the Wright Blending Methods need each component's
 *   viscosity at two temperatures, are "generally preferred", work "at constant viscosity" (the
 *   standard's Excel adjunct), and use volume fractions (mass fractions "with minimal error" for base
 *   stocks); the ASTM Blending Method works at constant temperature;
 * - an independent implementation of D7152-11 with two temperatures per component
 *   (rensalzado/DiluentESPOptimization, `cInjectionObj.m`, `BlendingASTM_D7152`), which solves
 *   Σ xᵢ·log Tᵢ(W) = log T_blend for the blend's W = log log Z — the same equation; the tests compare
 *   the two to 1e-9;
 * - the closed form against the definition solved by an independent root finder (tests).
 * The D7152 worked example itself was not available: no check value from the standard.
 *
 * @see ASTM D7152, Standard Practice for Calculating Viscosity of a Blend of Petroleum Products,
 *   Wright method (the standard calls it generally preferred to the ASTM Blending Method);
 *   ASTM D341-20 for the lines; Wright, W. A., Journal of Materials 4 (1969) 19–27.
 */
import { ViscosityOutOfRangeError, assertAboveAbsoluteZeroC, assertFractions, assertKv40Kv100 } from '../errors';
import { d341LogLogZ, kvAtTemperature, waltherLine, type WaltherLine } from '../viscosity/viscosity-temperature';
import { assertLogLogKv } from './astm-loglog';

const KELVIN_OFFSET = 273.15;

/** One component for the Wright method: its volume fraction and its viscosities at 40 and 100 °C. */
export interface WrightPart {
  /** Volume fraction φᵢ [0–1]; a blend's parts sum to 1. */
  volumeFraction: number;
  /** ν40 [mm²/s]. */
  kv40: number;
  /** ν100 [mm²/s], below kv40. */
  kv100: number;
}

/**
 * The blend's D341 line by the Wright method:  1/B_b = Σ φᵢ/Bᵢ,  A_b = B_b·Σ φᵢ·Aᵢ/Bᵢ.
 *
 * @param parts - volume fractions φᵢ (sum 1 within 1e-9) and ν40, ν100 [mm²/s] of each part
 * @returns the blend's line {A, B, form: 'd341-20'}
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError, ViscosityOutOfRangeError,
 *   FractionSumError
 * @example wrightBlendLine([{ volumeFraction: 1, kv40: 73.3, kv100: 8.86 }]) // → { A: 9.458393, B: 3.680946 }
 * @see ASTM D7152 (Wright method); ASTM D341-20.
 */
export function wrightBlendLine(parts: readonly WrightPart[]): WaltherLine {
  const fn = 'wrightBlendLine';
  assertFractions(
    fn,
    'volumeFraction',
    parts.map((p) => p.volumeFraction),
  );
  let q = 0; // Σ φᵢ/Bᵢ
  let p = 0; // Σ φᵢ·Aᵢ/Bᵢ
  parts.forEach((part, i) => {
    assertKv40Kv100(fn, part.kv40, part.kv100);
    assertLogLogKv(fn, `parts[${i}].kv40`, part.kv40);
    assertLogLogKv(fn, `parts[${i}].kv100`, part.kv100);
    if (part.volumeFraction === 0) return;
    const line = waltherLine(part.kv40, part.kv100);
    q += part.volumeFraction / line.B;
    p += (part.volumeFraction * line.A) / line.B;
  });
  const B = 1 / q;
  return { A: p * B, B, form: 'd341-20' };
}

/**
 * The Wright weight of a component relative to its volume fraction: 1/Bᵢ, the inverse slope of its
 * D341-20 line through ν40 and ν100. At one temperature the Wright blend is the mean of log log Zᵢ
 * weighted by φᵢ/Bᵢ (see the module note) — the form the solver uses.
 *
 * @param kv40 - ν40 [mm²/s]
 * @param kv100 - ν100 [mm²/s], below kv40
 * @returns 1/B [dimensionless]
 * @throws as {@link waltherLine}
 * @example wrightWeight(73.3, 8.86) // → 0.271669
 */
export function wrightWeight(kv40: number, kv100: number): number {
  return 1 / waltherLine(kv40, kv100).B;
}

/**
 * Kinematic viscosity of a blend at a temperature by the ASTM D7152 Wright method.
 * A single part at fraction 1 returns its own D341 line (its measured values at 40 and 100 °C).
 *
 * @param parts - volume fractions φᵢ (sum 1) and ν40, ν100 [mm²/s] of each part
 * @param tempC - t [°C], above absolute zero
 * @returns ν of the blend at t [mm²/s]
 * @throws as {@link wrightBlendLine}; BelowAbsoluteZeroError; ViscosityOutOfRangeError (result
 *   below the D341-20 range)
 * @example blendViscosityWright([{ volumeFraction: 0.5, kv40: 100, kv100: 11 }, { volumeFraction: 0.5, kv40: 460, kv100: 31 }], 40) // → 210.61
 * @see ASTM D7152 (Wright method).
 */
export function blendViscosityWright(parts: readonly WrightPart[], tempC: number): number {
  assertAboveAbsoluteZeroC('blendViscosityWright', 'tempC', tempC);
  const line = wrightBlendLine(parts);
  const only = parts.filter((p) => p.volumeFraction > 0);
  if (only.length === 1) {
    if (tempC === 40) return only[0]!.kv40;
    if (tempC === 100) return only[0]!.kv100;
  }
  return kvAtTemperature(line, tempC);
}

/**
 * Volume fraction of the heavy stock in a two-component blend that reaches `targetKv` at `tempC` by
 * the Wright method (exact: log T_blend is linear in φ):
 *
 *   φ_heavy = (log T − log T_light(ν)) / (log T_heavy(ν) − log T_light(ν))
 *
 * @param light - ν40, ν100 of the light stock [mm²/s]
 * @param heavy - ν40, ν100 of the heavy stock [mm²/s]
 * @param targetKv - target ν at `tempC` [mm²/s]
 * @param tempC - temperature of the target [°C] (40 for an ISO grade)
 * @returns φ_heavy [0–1]
 * @throws ViscosityOutOfRangeError when the heavy stock is not the thicker at `tempC` or the target
 *   lies outside the two stocks' viscosities there; the errors of {@link waltherLine}
 * @example wrightHeavyFraction({ kv40: 100, kv100: 11 }, { kv40: 460, kv100: 31 }, 220, 40) // → 0.5285
 * @see ASTM D7152 (Wright method).
 */
export function wrightHeavyFraction(
  light: { kv40: number; kv100: number },
  heavy: { kv40: number; kv100: number },
  targetKv: number,
  tempC: number,
): number {
  const fn = 'wrightHeavyFraction';
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  assertLogLogKv(fn, 'targetKv', targetKv);
  const lineL = waltherLine(light.kv40, light.kv100);
  const lineH = waltherLine(heavy.kv40, heavy.kv100);
  const kvL = kvAtTemperature(lineL, tempC);
  const kvH = kvAtTemperature(lineH, tempC);
  if (kvL >= kvH) {
    throw new ViscosityOutOfRangeError(
      'heavy',
      heavy,
      `${fn}: at ${tempC} °C the heavy stock (${kvH.toPrecision(4)} mm²/s) is not thicker than the light one (${kvL.toPrecision(4)} mm²/s)`,
    );
  }
  if (targetKv < kvL || targetKv > kvH) {
    throw new ViscosityOutOfRangeError(
      'targetKv',
      targetKv,
      `${fn}: targetKv = ${targetKv} mm²/s lies outside ${kvL.toPrecision(4)}–${kvH.toPrecision(4)} mm²/s at ${tempC} °C; no blend of the two stocks reaches it`,
    );
  }
  const logT = Math.log10(tempC + KELVIN_OFFSET);
  const y = d341LogLogZ(targetKv);
  const uL = (lineL.A - y) / lineL.B;
  const uH = (lineH.A - y) / lineH.B;
  return (logT - uL) / (uH - uL);
}
