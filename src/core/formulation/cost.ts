/**
 * Cost of a blend per kg, per litre and per batch, and batch quantities in kg and litres at 15 °C.
 *
 * All money amounts are in the one currency the user names; these functions never convert between
 * currencies. Volumes are at 15 °C (densities ρ15 [kg/L]); blend density by ideal mixing.
 *
 *   price per kg of a part:  p_kg = amount (per kg) | amount/ρ15 (per litre) | amount/1000 (per tonne)
 *   blend cost per kg:       c_kg = Σ wᵢ·p_kg,ᵢ
 *   blend cost per litre:    c_L  = ρ_blend · Σ wᵢ·p_kg,ᵢ  (= Σ φᵢ·p_L,ᵢ)
 */
import type { Price } from './model';
import { blendDensity } from '../blending/density';
import { blendDensityAtTemperature, densityAtTemperature } from '../blending/density-temperature';
import { BlendbenchInputError, assertDensity15, assertFinite, assertFractions } from '../errors';

function assertPrice(fn: string, field: string, v: unknown): asserts v is number {
  assertFinite(fn, field, v);
  if (v < 0) {
    throw new BlendbenchInputError(field, v, `${fn}: ${field} = ${v}; a price must not be negative`);
  }
}

/**
 * A quoted price converted to price per kilogram.
 *
 * @param price - amount and basis (`per-kg`, `per-litre` at 15 °C, or `per-tonne` = 1000 kg)
 * @param density15 - ρ15, density at 15 °C [kg/L], used for a per-litre price
 * @returns price per kg [currency/kg]
 * @throws InvalidNumberError, BlendbenchInputError (negative amount or unknown basis),
 *   ImplausibleDensityError
 * @example pricePerKg({ amount: 1.8, basis: 'per-litre', currency: 'EUR' }, 0.9) // → 2.0
 * @see common practice.
 */
export function pricePerKg(price: Price, density15: number): number {
  const fn = 'pricePerKg';
  assertPrice(fn, 'price.amount', price.amount);
  assertDensity15(fn, 'density15', density15);
  switch (price.basis) {
    case 'per-kg':
      return price.amount;
    case 'per-litre':
      return price.amount / density15;
    case 'per-tonne':
      return price.amount / 1000;
    default:
      throw new BlendbenchInputError(
        'price.basis',
        price.basis,
        `${fn}: price.basis = ${String(price.basis)} is not one of per-kg, per-litre, per-tonne`,
      );
  }
}

/**
 * Cost per kg of a blend:  c_kg = Σ wᵢ·p_kg,ᵢ.
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1] and `pricePerKg` p_kg,ᵢ [currency/kg] of each part
 * @returns blend cost [currency/kg]
 * @throws InvalidNumberError, FractionSumError, BlendbenchInputError (negative price)
 * @example blendCostPerKg([{ massFraction: 0.6, pricePerKg: 1 }, { massFraction: 0.4, pricePerKg: 2 }]) // → 1.4
 * @see common practice.
 */
export function blendCostPerKg(parts: readonly { massFraction: number; pricePerKg: number }[]): number {
  const fn = 'blendCostPerKg';
  assertFractions(
    fn,
    'massFraction',
    parts.map((p) => p.massFraction),
  );
  parts.forEach((p, i) => assertPrice(fn, `parts[${i}].pricePerKg`, p.pricePerKg));
  return parts.reduce((s, p) => s + p.massFraction * p.pricePerKg, 0);
}

/**
 * Cost per litre (at 15 °C) of a blend:  c_L = ρ_blend·Σ wᵢ·p_kg,ᵢ, with 1/ρ_blend = Σ wᵢ/ρᵢ.
 * Equal to Σ φᵢ·p_L,ᵢ, the volume-weighted per-litre prices (check-values D2).
 *
 * @param parts - `massFraction` wᵢ, `pricePerKg` [currency/kg], `density15` ρᵢ [kg/L] of each part
 * @returns blend cost [currency/L]
 * @throws InvalidNumberError, FractionSumError, ImplausibleDensityError, BlendbenchInputError
 * @example blendCostPerLitre([{ massFraction: 1, pricePerKg: 2, density15: 0.9 }]) // → 1.8
 * @see common practice.
 */
export function blendCostPerLitre(
  parts: readonly { massFraction: number; pricePerKg: number; density15: number }[],
): number {
  const perKg = blendCostPerKg(parts);
  const rho = blendDensity(parts);
  return rho * perKg;
}

/**
 * Cost per litre of a blend at a temperature (e.g. per delivered litre at the delivery temperature):
 * c_L(t) = ρ_blend(t)·Σ wᵢ·p_kg,ᵢ, with ρ_blend(t) by the petroleum measurement tables' lubricating-oil
 * correction of each component (ASTM D1250-80 Table 54D, `blending/density-temperature.ts`).
 * At 15 °C it equals {@link blendCostPerLitre}.
 *
 * @param parts - `massFraction` wᵢ, `pricePerKg` [currency/kg], `density15` ρᵢ [kg/L] of each part
 * @param tempC - the temperature at which the litres are counted [°C]
 * @returns blend cost [currency per litre at tempC]
 * @throws as {@link blendCostPerLitre}; BlendbenchInputError (temperature outside −50…300 °C)
 * @example blendCostPerLitreAt([{ massFraction: 1, pricePerKg: 2, density15: 0.88 }], 60) // → 1.70299
 * @see ASTM D1250-80 Table 54D; common practice.
 */
export function blendCostPerLitreAt(
  parts: readonly { massFraction: number; pricePerKg: number; density15: number }[],
  tempC: number,
): number {
  const perKg = blendCostPerKg(parts);
  return blendDensityAtTemperature(parts, tempC) * perKg;
}

/** A batch size, by mass or by volume at 15 °C. */
export type BatchSize = { kg: number } | { litres: number };

/**
 * Quantities of each part for a batch, in kg, in litres at 15 °C and, when a metering temperature
 * is given, in litres at that temperature (what a hot meter counts).
 *
 *   total kg = batch kg, or batch litres × ρ_blend;  total L = total kg / ρ_blend
 *   line kg = wᵢ × total kg;  line L = line kg / ρᵢ   (Σ line L = total L under ideal mixing)
 *   line L at t = line kg / ρᵢ(t), ρᵢ(t) by ASTM D1250-80 Table 54D; total L at t = Σ line L at t
 *
 * @param parts - `massFraction` wᵢ [0–1, sum 1] and `density15` ρᵢ [kg/L] of each part
 * @param batch - `{ kg }` or `{ litres }` (at 15 °C), > 0
 * @param meteringTempC - optional metering temperature t [°C] for litres at t
 * @returns totals and per-part lines, in part order
 * @throws InvalidNumberError, FractionSumError, ImplausibleDensityError, BlendbenchInputError
 *   (batch size not positive)
 * @example batchQuantities([{ massFraction: 1, density15: 0.9 }], { kg: 900 }) // → { totalKg: 900, totalLitres: 1000, … }
 * @example batchQuantities([{ massFraction: 1, density15: 0.88 }], { kg: 880 }, 60) // → { …, totalLitresAtMetering: 1033.47 }
 * @see common practice.
 */
export function batchQuantities(
  parts: readonly { massFraction: number; density15: number }[],
  batch: BatchSize,
  meteringTempC?: number,
): {
  totalKg: number;
  totalLitres: number;
  lines: { kg: number; litres: number; litresAtMetering: number | null }[];
  totalLitresAtMetering: number | null;
} {
  const fn = 'batchQuantities';
  const rho = blendDensity(parts);
  parts.forEach((p, i) => assertDensity15(fn, `parts[${i}].density15`, p.density15));
  let totalKg: number;
  if ('kg' in batch) {
    assertPositive(fn, 'batch.kg', batch.kg);
    totalKg = batch.kg;
  } else {
    assertPositive(fn, 'batch.litres', batch.litres);
    totalKg = batch.litres * rho;
  }
  const totalLitres = 'litres' in batch ? batch.litres : totalKg / rho;
  const at = meteringTempC === undefined ? null : meteringTempC;
  const lines = parts.map((p) => {
    const kg = p.massFraction * totalKg;
    return { kg, litres: kg / p.density15, litresAtMetering: at === null ? null : kg / densityAtTemperature(p.density15, at) };
  });
  const totalLitresAtMetering = at === null ? null : lines.reduce((s, l) => s + l.litresAtMetering!, 0);
  return { totalKg, totalLitres, lines, totalLitresAtMetering };
}

function assertPositive(fn: string, field: string, v: unknown): asserts v is number {
  assertFinite(fn, field, v);
  if (v <= 0) {
    throw new BlendbenchInputError(field, v, `${fn}: ${field} = ${v}; a batch size must be greater than 0`);
  }
}
