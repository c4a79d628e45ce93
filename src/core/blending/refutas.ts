/**
 * Blend viscosity by the Refutas viscosity blending number (VBN), on a mass basis.
 *
 *   VBN = 14.534 · ln(ln(ν + 0.8)) + 10.975
 *   VBN_blend = Σ wᵢ · VBNᵢ          (wᵢ mass fractions; every νᵢ at the same temperature)
 *   ν = exp(exp((VBN − 10.975)/14.534)) − 0.8
 *
 * Natural logarithms throughout; versions printed with log₁₀ or with "14.543" are wrong.
 * The rule describes Newtonian petroleum and synthetic base stocks. It does not hold for viscosity
 * modifiers, thickening polymers or additive packages: give such a component an effective blending
 * viscosity calibrated from a measured blend (see `Calibration` in model.ts).
 *
 * Valid range: ν > 0.2 mm²/s mathematically (ln(ν + 0.8) > 0); in practice the base-stock range.
 *
 * @see The Refutas viscosity blending equation in its widely published form (constants 14.534 and
 *   10.975, natural logarithms), as vetted in the project's check values (B1–B3). No primary
 *   publication of Refutas has been consulted for this implementation.
 */
import { ViscosityOutOfRangeError, assertFinite, assertFractions, assertViscosity } from '../errors';

const VBN_A = 14.534;
const VBN_B = 10.975;

function assertRefutasKv(fn: string, field: string, kv: unknown): asserts kv is number {
  assertViscosity(fn, field, kv);
  if (kv <= 0.2) {
    throw new ViscosityOutOfRangeError(
      field,
      kv,
      `${fn}: ${field} = ${kv} mm²/s; the Refutas blending number needs ν > 0.2 mm²/s (ln(ν + 0.8) > 0)`,
    );
  }
}

/**
 * Refutas viscosity blending number of a kinematic viscosity:  VBN = 14.534·ln(ln(ν + 0.8)) + 10.975.
 *
 * @param kv - ν, kinematic viscosity at the blending temperature [mm²/s], > 0.2
 * @returns VBN [dimensionless]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError (ν ≤ 0.2)
 * @example refutasVbn(100) // → 33.1962
 */
export function refutasVbn(kv: number): number {
  assertRefutasKv('refutasVbn', 'kv', kv);
  return VBN_A * Math.log(Math.log(kv + 0.8)) + VBN_B;
}

/**
 * Kinematic viscosity of a Refutas blending number:  ν = exp(exp((VBN − 10.975)/14.534)) − 0.8.
 *
 * @param vbn - VBN [dimensionless], any finite value
 * @returns ν [mm²/s] (always > 0.2)
 * @throws InvalidNumberError if `vbn` is not finite or the result overflows
 * @example kvFromRefutasVbn(33.1962) // → 100.00
 */
export function kvFromRefutasVbn(vbn: number): number {
  const fn = 'kvFromRefutasVbn';
  assertFinite(fn, 'vbn', vbn);
  const kv = Math.exp(Math.exp((vbn - VBN_B) / VBN_A)) - 0.8;
  assertFinite(fn, 'result', kv);
  return kv;
}

/**
 * Kinematic viscosity of a blend by Refutas:  VBN_blend = Σ wᵢ·VBNᵢ, then invert.
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1 within 1e-9] and `kv` νᵢ [mm²/s] of each part, all at
 *   the same temperature
 * @returns ν of the blend at that temperature [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError, FractionSumError
 * @example blendViscosityRefutas([{ massFraction: 0.5, kv: 100 }, { massFraction: 0.5, kv: 460 }]) // → 203.39
 */
export function blendViscosityRefutas(parts: readonly { massFraction: number; kv: number }[]): number {
  const fn = 'blendViscosityRefutas';
  assertFractions(
    fn,
    'massFraction',
    parts.map((p) => p.massFraction),
  );
  parts.forEach((p, i) => assertRefutasKv(fn, `parts[${i}].kv`, p.kv));
  // A single component at fraction 1 returns itself exactly (no round trip through ln/exp).
  const only = parts.filter((p) => p.massFraction > 0);
  if (only.length === 1) return only[0]!.kv;
  const vbn = parts.reduce((s, p) => s + p.massFraction * refutasVbn(p.kv), 0);
  return kvFromRefutasVbn(vbn);
}

/**
 * Mass fraction of the heavy stock in a two-component blend that reaches a target viscosity by
 * Refutas (exact, since VBN blends linearly):  w_heavy = (VBN_target − VBN_light)/(VBN_heavy − VBN_light).
 *
 * @param kvLight - ν of the light stock [mm²/s]
 * @param kvHeavy - ν of the heavy stock [mm²/s], above kvLight
 * @param targetKv - target ν of the blend [mm²/s], from kvLight to kvHeavy inclusive
 * @returns w_heavy, mass fraction of the heavy stock [0–1]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOutOfRangeError (kvLight ≥ kvHeavy,
 *   or target outside [kvLight, kvHeavy])
 * @example refutasHeavyFraction(100, 460, 220) // → 0.55126
 */
export function refutasHeavyFraction(kvLight: number, kvHeavy: number, targetKv: number): number {
  const fn = 'refutasHeavyFraction';
  assertRefutasKv(fn, 'kvLight', kvLight);
  assertRefutasKv(fn, 'kvHeavy', kvHeavy);
  assertRefutasKv(fn, 'targetKv', targetKv);
  assertTwoComponent(fn, kvLight, kvHeavy, targetKv);
  const vL = refutasVbn(kvLight);
  const vH = refutasVbn(kvHeavy);
  const vT = refutasVbn(targetKv);
  return (vT - vL) / (vH - vL);
}

/** Shared two-component checks: light below heavy, target between them (inclusive). */
export function assertTwoComponent(fn: string, kvLight: number, kvHeavy: number, targetKv: number): void {
  if (kvLight >= kvHeavy) {
    throw new ViscosityOutOfRangeError(
      'kvHeavy',
      kvHeavy,
      `${fn}: kvHeavy = ${kvHeavy} mm²/s is not above kvLight = ${kvLight} mm²/s; the heavy stock must be the thicker`,
    );
  }
  if (targetKv < kvLight || targetKv > kvHeavy) {
    throw new ViscosityOutOfRangeError(
      'targetKv',
      targetKv,
      `${fn}: targetKv = ${targetKv} mm²/s lies outside ${kvLight}–${kvHeavy} mm²/s; ` +
        'no blend of the two stocks reaches it',
    );
  }
}
