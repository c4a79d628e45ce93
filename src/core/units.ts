/**
 * Unit conversions at the boundary (user input and display). The equations in the core work in
 * fixed units — °C (kelvin inside the equations that need it), mm²/s, kg/L at 15 °C, money per kg —
 * and convert here, once, when values enter or leave.
 *
 * Temperature and mass/volume factors come from mathjs, imported selectively (only the `unit`
 * function and its dependencies), so the factors are a general-purpose library's rather than ours.
 * Money is never converted between currencies: a price keeps the currency the user names.
 */
import { create, unitDependencies } from 'mathjs';
import type { Price, PriceBasis } from './formulation/model';
import { ABSOLUTE_ZERO_C, BelowAbsoluteZeroError, BlendbenchInputError, assertDensity15, assertFinite } from './errors';

const math = create({ unitDependencies } as { unitDependencies: NonNullable<typeof unitDependencies> }, {});

/** Absolute zero [°F]. */
const ABSOLUTE_ZERO_F = -459.67;

/**
 * Degrees Celsius to degrees Fahrenheit:  t_F = 9/5·t_C + 32.
 *
 * @param tC - temperature [°C], ≥ −273.15
 * @returns temperature [°F]
 * @throws InvalidNumberError, BelowAbsoluteZeroError
 * @example cToF(40) // → 104
 */
export function cToF(tC: number): number {
  assertAtOrAbove('cToF', 'tC', tC, ABSOLUTE_ZERO_C, '°C');
  // Kept at absolute zero or above: the factors' rounding must not turn a valid input into an invalid one.
  return Math.max(ABSOLUTE_ZERO_F, math.unit(tC, 'degC').toNumber('degF'));
}

/**
 * Degrees Fahrenheit to degrees Celsius:  t_C = 5/9·(t_F − 32).
 *
 * @param tF - temperature [°F], ≥ −459.67
 * @returns temperature [°C]
 * @throws InvalidNumberError, BelowAbsoluteZeroError
 * @example fToC(212) // → 100
 */
export function fToC(tF: number): number {
  assertAtOrAbove('fToC', 'tF', tF, ABSOLUTE_ZERO_F, '°F');
  // −459.67 °F came out as −273.15000000000003 °C, below absolute zero, refused by the next conversion.
  return Math.max(ABSOLUTE_ZERO_C, math.unit(tF, 'degF').toNumber('degC'));
}

/**
 * Degrees Celsius to kelvin:  T = t + 273.15.
 *
 * @param tC - temperature [°C], ≥ −273.15
 * @returns temperature [K], ≥ 0
 * @throws InvalidNumberError, BelowAbsoluteZeroError
 * @example cToK(40) // → 313.15
 */
export function cToK(tC: number): number {
  assertAtOrAbove('cToK', 'tC', tC, ABSOLUTE_ZERO_C, '°C');
  return Math.max(0, math.unit(tC, 'degC').toNumber('K'));
}

/**
 * Centistokes to mm²/s: the identity (1 cSt = 1 mm²/s exactly), named so that the unit a value
 * arrives in is visible in code.
 *
 * @param cSt - kinematic viscosity [cSt]
 * @returns kinematic viscosity [mm²/s]
 * @throws InvalidNumberError
 * @example cStToMm2s(320) // → 320
 */
export function cStToMm2s(cSt: number): number {
  assertFinite('cStToMm2s', 'cSt', cSt);
  return cSt;
}

/**
 * mm²/s to centistokes: the identity (1 mm²/s = 1 cSt exactly).
 *
 * @param mm2s - kinematic viscosity [mm²/s]
 * @returns kinematic viscosity [cSt]
 * @throws InvalidNumberError
 * @example mm2sToCSt(320) // → 320
 */
export function mm2sToCSt(mm2s: number): number {
  assertFinite('mm2sToCSt', 'mm2s', mm2s);
  return mm2s;
}

/** Display label of each price basis (kept in the model, beside the other labels, so that showing it needs no mathjs). */
export { PRICE_BASIS_LABEL } from './formulation/model';

/** Kilograms in one basis unit, for a stock of density ρ15 [kg/L]. */
function kgPerBasisUnit(fn: string, basis: PriceBasis, density15: number): number {
  switch (basis) {
    case 'per-kg':
      return 1;
    case 'per-tonne':
      return math.unit(1, 'tonne').toNumber('kg'); // 1000
    case 'per-litre':
      return density15; // 1 L at 15 °C weighs ρ15 kg
    default:
      throw new BlendbenchInputError(
        'basis',
        basis,
        `${fn}: basis = ${String(basis)} is not one of per-kg, per-litre, per-tonne`,
      );
  }
}

/**
 * A price restated on another basis, in the same currency:
 * amount_to = amount_from × (kg per `to` unit)/(kg per `from` unit), with 1 L = ρ15 kg, 1 t = 1000 kg.
 *
 * @param price - amount, basis and currency as quoted
 * @param to - basis wanted
 * @param density15 - ρ15 of the stock [kg/L] (used only when a per-litre basis is involved, but always
 *   checked for plausibility)
 * @returns the price on basis `to`, same currency
 * @throws InvalidNumberError, ImplausibleDensityError, BlendbenchInputError (unknown basis)
 * @example convertPrice({ amount: 900, basis: 'per-tonne', currency: 'EUR' }, 'per-litre', 0.9) // → { amount: 0.81, basis: 'per-litre', currency: 'EUR' }
 * @see common practice.
 */
export function convertPrice(price: Price, to: PriceBasis, density15: number): Price {
  const fn = 'convertPrice';
  assertFinite(fn, 'price.amount', price.amount);
  assertDensity15(fn, 'density15', density15);
  const from = kgPerBasisUnit(fn, price.basis, density15);
  const dest = kgPerBasisUnit(fn, to, density15);
  return { amount: (price.amount * dest) / from, basis: to, currency: price.currency };
}

function assertAtOrAbove(fn: string, field: string, v: unknown, min: number, unit: string): asserts v is number {
  assertFinite(fn, field, v);
  if (v < min) {
    throw new BelowAbsoluteZeroError(field, v, `${fn}: ${field} = ${v} ${unit} is below absolute zero (${min} ${unit})`);
  }
}
