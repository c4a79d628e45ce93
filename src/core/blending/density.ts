/**
 * Density of a blend by ideal mixing, and conversion between mass and volume fractions.
 *
 * Ideal mixing means volumes add: a blend of masses mᵢ at densities ρᵢ occupies Σ mᵢ/ρᵢ, so
 *
 *   1/ρ_blend = Σ wᵢ/ρᵢ,   φᵢ = (wᵢ/ρᵢ)/Σ(wⱼ/ρⱼ) = wᵢ·ρ_blend/ρᵢ,   wᵢ = φᵢ·ρᵢ/Σ(φⱼ·ρⱼ)
 *
 * with wᵢ mass fractions, φᵢ volume fractions, all densities at 15 °C [kg/L]. Mineral and synthetic
 * base stocks mix within a fraction of a percent of this (common practice, no source); a measured
 * blend density is always preferred.
 */
import { assertDensity15, assertFractions } from '../errors';

/**
 * Density at 15 °C of a blend by ideal mixing:  1/ρ = Σ wᵢ/ρᵢ.
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1] and `density15` ρᵢ [kg/L, 0.6–1.3] of each part
 * @returns ρ_blend, density at 15 °C [kg/L]
 * @throws InvalidNumberError, FractionSumError, ImplausibleDensityError
 * @example blendDensity([{ massFraction: 0.6, density15: 0.865 }, { massFraction: 0.4, density15: 0.9 }]) // → 0.87867
 * @see common practice (ideal mixing, volume additivity).
 */
export function blendDensity(parts: readonly { massFraction: number; density15: number }[]): number {
  const fn = 'blendDensity';
  validateMassParts(fn, parts);
  const specificVolume = parts.reduce((s, p) => s + p.massFraction / p.density15, 0);
  return 1 / specificVolume;
}

/**
 * Volume fractions from mass fractions:  φᵢ = (wᵢ/ρᵢ)/Σ(wⱼ/ρⱼ).
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1] and `density15` ρᵢ [kg/L] of each part
 * @returns φᵢ, volume fractions at 15 °C [0–1], in part order, summing to 1
 * @throws InvalidNumberError, FractionSumError, ImplausibleDensityError
 * @example massToVolumeFractions([{ massFraction: 0.5, density15: 0.8 }, { massFraction: 0.5, density15: 1.0 }]) // → [0.5556, 0.4444]
 * @see common practice (ideal mixing).
 */
export function massToVolumeFractions(
  parts: readonly { massFraction: number; density15: number }[],
): number[] {
  const fn = 'massToVolumeFractions';
  validateMassParts(fn, parts);
  const v = parts.map((p) => p.massFraction / p.density15);
  const total = v.reduce((s, x) => s + x, 0);
  return v.map((x) => x / total);
}

/**
 * Mass fractions from volume fractions:  wᵢ = φᵢ·ρᵢ/Σ(φⱼ·ρⱼ).
 *
 * @param parts - `volumeFraction` φᵢ [0–1, sum 1] and `density15` ρᵢ [kg/L] of each part
 * @returns wᵢ, mass fractions [0–1], in part order, summing to 1
 * @throws InvalidNumberError, FractionSumError, ImplausibleDensityError
 * @example volumeToMassFractions([{ volumeFraction: 0.5, density15: 0.8 }, { volumeFraction: 0.5, density15: 1.0 }]) // → [0.4444, 0.5556]
 * @see common practice (ideal mixing).
 */
export function volumeToMassFractions(
  parts: readonly { volumeFraction: number; density15: number }[],
): number[] {
  const fn = 'volumeToMassFractions';
  assertFractions(
    fn,
    'volumeFraction',
    parts.map((p) => p.volumeFraction),
  );
  parts.forEach((p, i) => assertDensity15(fn, `parts[${i}].density15`, p.density15));
  const m = parts.map((p) => p.volumeFraction * p.density15);
  const total = m.reduce((s, x) => s + x, 0);
  return m.map((x) => x / total);
}

function validateMassParts(fn: string, parts: readonly { massFraction: number; density15: number }[]): void {
  assertFractions(
    fn,
    'massFraction',
    parts.map((p) => p.massFraction),
  );
  parts.forEach((p, i) => assertDensity15(fn, `parts[${i}].density15`, p.density15));
}
