/**
 * Density and volume at a temperature — the petroleum measurement tables' method for lubricating
 * oils: ASTM D1250-80 / API MPMS Chapter 11.1 (1980) / ISO 91-1:1992, Table 54D ("Generalized
 * Lubricating Oils — Correction of Volume to 15 °C against Density at 15 °C").
 *
 *   α₁₅ = K₀/ρ₁₅² + K₁/ρ₁₅                 [1/°C],  ρ₁₅ in kg/m³,  K₀ = 0, K₁ = 0.6278 (lubricating oils)
 *   VCF = exp(−α₁₅·Δt·(1 + 0.8·α₁₅·Δt)),    Δt = t − 15 °C
 *   ρ_t = ρ₁₅·VCF;   V_t = m/ρ_t;   V₁₅ = V_t·VCF
 *
 * VCF (the table's "volume correction factor", CTL) turns a volume at t into the volume at 15 °C;
 * the density at t is ρ₁₅ times the same factor. Valid for the lubricating-oil commodity group over
 * ρ₁₅ = 800–1164 kg/m³ (Table 54D's density range, as listed by fuel_mcp, below) and, in Blendbench's use, −20…150 °C.
 * Outside the density range the same equation is used and {@link lubeTableInRange} says so (an
 * additive package or a polar Group V fluid is not a lubricating oil in the tables' sense either).
 *
 * What is verified and what is not: no copy of the printed tables was at hand, and no published
 * Table 54D value was found to check a VCF against. The constants and the form were verified against
 * independent open-source implementations: Zubastic120993/fuel_mcp (`vcf_official_full.py`, "ISO 91-1 /
 * ASTM D1250 Tables 54A–54D"): Table 54D K₀ = 0, K₁ = 0.6278, ρ₁₅ 800–1164 kg/m³, with the same
 * α and VCF equations; and joe02740/energycal (`src/lib/calc/REFERENCE.md` §2.3, API MPMS 11.1-2004):
 * lubricating oils K₀ = 0, K₁ = 0.34878, 800.9–1163.5 kg/m³ — the per-°F constant of the 60 °F tables
 * (0.34878 × 1.8 = 0.62780 per °C, the metric constant used here). The 2004 revision also shifts
 * temperatures to ITS-90 and rounds intermediate values; this implementation does not round (the
 * printed tables give VCF to 4–5 decimals), so it should agree with them to their last printed digit,
 * not beyond — unchecked against a printed row. The α and CTL equations themselves
 * ({@link tableThermalExpansion}, {@link tableCtl}) reproduce the published worked examples of API MPMS
 * 11.1-2004 § 11.1.6.1 (other commodity groups; values in the tests, with their provenance).
 *
 * @see ASTM D1250-80 (API MPMS 11.1, 1980), Volume X, Table 54D; ISO 91-1:1992.
 */
import { BlendbenchInputError, assertDensity15, assertFractions, assertTemperatureC } from '../errors';

/** Table 54D constants for lubricating oils (metric, 15 °C base): α₁₅ = K0/ρ² + K1/ρ, ρ in kg/m³. */
export const LUBE_OIL_TABLE_54D = { K0: 0, K1: 0.6278, density15MinKgM3: 800, density15MaxKgM3: 1164 } as const;

/** The reference temperature of the tables [°C]. */
export const REFERENCE_TEMP_C = 15;

/**
 * Thermal expansion coefficient at 15 °C for the lubricating-oil group:  α₁₅ = K₀/ρ² + K₁/ρ.
 *
 * @param density15 - ρ₁₅ [kg/L] (0.6–1.3)
 * @returns α₁₅ [1/°C]
 * @throws InvalidNumberError, ImplausibleDensityError
 * @example lubeThermalExpansion15(0.88) // → 7.1341e-4
 * @see ASTM D1250-80 Table 54D.
 */
export function lubeThermalExpansion15(density15: number): number {
  assertDensity15('lubeThermalExpansion15', 'density15', density15);
  return tableThermalExpansion(density15 * 1000, LUBE_OIL_TABLE_54D.K0, LUBE_OIL_TABLE_54D.K1);
}

/**
 * The tables' thermal expansion coefficient at the base temperature for any commodity group with
 * K₂ = 0:  α = K₀/ρ² + K₁/ρ = (K₀ + K₁·ρ)/ρ². No input check (the lubricating-oil functions check).
 *
 * @param rhoKgM3 - ρ at the base temperature [kg/m³]
 * @param K0 - the group's K₀ [(kg/m³)²/°C, or per °F for the 60 °F tables]
 * @param K1 - the group's K₁ [(kg/m³)/°C, or per °F]
 * @returns α [1/°C] (or 1/°F with the 60 °F tables' constants)
 * @example tableThermalExpansion(880, 0, 0.6278) // → 7.1341e-4
 * @see ASTM D1250-80 / API MPMS 11.1 (1980, and the same form in 2004).
 */
export function tableThermalExpansion(rhoKgM3: number, K0: number, K1: number): number {
  return (K0 + K1 * rhoKgM3) / (rhoKgM3 * rhoKgM3);
}

/**
 * The tables' correction of a volume for temperature (CTL, the volume correction factor):
 *   CTL = exp(−α·Δt·(1 + 0.8·α·Δt)),  Δt = t − t_base.
 * No input check (the lubricating-oil functions check).
 *
 * @param alpha - α at the base temperature [1/°C] (or 1/°F with Δt in °F)
 * @param deltaT - Δt = t − t_base [°C] (or °F)
 * @returns CTL [dimensionless]
 * @example tableCtl(7.1341e-4, 45) // → 0.96761
 * @see ASTM D1250-80 / API MPMS 11.1 (1980). The 2004 revision writes the bracket 1 + 0.8·α·(Δt + δ₆₀)
 *   with δ₆₀ = 0.01374979547 °F and Δt from 60.0068749 °F (IPTS-68) — both from memory, but with them
 *   its published worked examples are reproduced to 1e-10 (tests); the shift changes CTL by less than
 *   1e-6 for any lubricating oil between −20 and 150 °C, so the 1980 form is kept.
 */
export function tableCtl(alpha: number, deltaT: number): number {
  // No rounding of intermediate values (the printed tables round VCF to 4–5 decimals).
  return Math.exp(-alpha * deltaT * (1 + 0.8 * alpha * deltaT));
}

/**
 * Volume correction factor to 15 °C (Table 54D):  VCF = exp(−α₁₅·Δt·(1 + 0.8·α₁₅·Δt)), Δt = t − 15.
 * Volume at t × VCF = volume at 15 °C; density at t = ρ₁₅ × VCF.
 *
 * @param density15 - ρ₁₅ [kg/L]
 * @param tempC - t [°C], −50…300
 * @returns VCF [dimensionless]; 1 at 15 °C, below 1 above it
 * @throws InvalidNumberError, ImplausibleDensityError, BlendbenchInputError (temperature outside −50…300 °C)
 * @example lubeVolumeCorrectionFactor(0.88, 60) // → 0.96761
 * @see ASTM D1250-80 Table 54D; ISO 91-1.
 */
export function lubeVolumeCorrectionFactor(density15: number, tempC: number): number {
  const fn = 'lubeVolumeCorrectionFactor';
  assertDensity15(fn, 'density15', density15);
  assertTableTemp(fn, tempC);
  return tableCtl(lubeThermalExpansion15(density15), tempC - REFERENCE_TEMP_C);
}

/**
 * Density at a temperature:  ρ_t = ρ₁₅·VCF(ρ₁₅, t).
 *
 * @param density15 - ρ₁₅ [kg/L]
 * @param tempC - t [°C]
 * @returns ρ_t [kg/L]
 * @throws as {@link lubeVolumeCorrectionFactor}
 * @example densityAtTemperature(0.88, 60) // → 0.85150
 * @see ASTM D1250-80 Table 54D.
 */
export function densityAtTemperature(density15: number, tempC: number): number {
  return density15 * lubeVolumeCorrectionFactor(density15, tempC);
}

/** Whether ρ₁₅ lies inside Table 54D's density range (800–1164 kg/m³). */
export function lubeTableInRange(density15: number): boolean {
  const rho = density15 * 1000;
  return rho >= LUBE_OIL_TABLE_54D.density15MinKgM3 && rho <= LUBE_OIL_TABLE_54D.density15MaxKgM3;
}

/**
 * Density of a blend at a temperature, ideal mixing at that temperature:
 * 1/ρ_t = Σ wᵢ/ρᵢ,t, each component corrected by its own VCF (the volumes that are metered).
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1] and `density15` ρᵢ [kg/L]
 * @param tempC - t [°C]
 * @returns ρ_t of the blend [kg/L]
 * @throws InvalidNumberError, ImplausibleDensityError, FractionSumError, BlendbenchInputError
 * @example blendDensityAtTemperature([{ massFraction: 1, density15: 0.88 }], 60) // → 0.85150
 * @see ASTM D1250-80 Table 54D; ideal mixing (common practice).
 */
export function blendDensityAtTemperature(
  parts: readonly { massFraction: number; density15: number }[],
  tempC: number,
): number {
  const fn = 'blendDensityAtTemperature';
  assertFractions(
    fn,
    'massFraction',
    parts.map((p) => p.massFraction),
  );
  assertTableTemp(fn, tempC);
  let v = 0;
  parts.forEach((p, i) => {
    assertDensity15(fn, `parts[${i}].density15`, p.density15);
    if (p.massFraction > 0) v += p.massFraction / densityAtTemperature(p.density15, tempC);
  });
  return 1 / v;
}

function assertTableTemp(fn: string, tempC: unknown): asserts tempC is number {
  assertTemperatureC(fn, 'tempC', tempC);
  if (tempC < -50 || tempC > 300) {
    throw new BlendbenchInputError('tempC', tempC, `${fn}: tempC = ${tempC} °C lies outside −50…300 °C, beyond the petroleum measurement tables`);
  }
}
