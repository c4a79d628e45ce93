/**
 * Named input errors for the calculation core, and the guards that raise them.
 *
 * Every core entry point validates its input and throws one of these, never returns `NaN` or
 * `null` as a sentinel. Each error carries the offending `field` and `value`; its message names the
 * function, the field, the value and the rule that was broken, e.g.
 * `viscosityIndex: kv100 = 1.9 mm²/s is below 2.0 mm²/s; ASTM D2270 defines no VI there`.
 */

/** Base class for every impossible or out-of-range input to the calculation core. */
export class BlendbenchInputError extends Error {
  /** Name of the offending input (e.g. `kv100`, `parts[2].massFraction`). */
  readonly field: string;
  /** The offending value as given. */
  readonly value: unknown;

  constructor(field: string, value: unknown, message: string) {
    super(message);
    this.name = 'BlendbenchInputError';
    this.field = field;
    this.value = value;
  }
}

/** A number is NaN or ±Infinity (or not a number at all). */
export class InvalidNumberError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'InvalidNumberError';
  }
}

/** A kinematic viscosity is zero or negative. */
export class NonPositiveViscosityError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'NonPositiveViscosityError';
  }
}

/** A higher temperature does not give a lower viscosity (e.g. ν100 ≥ ν40). */
export class ViscosityOrderError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'ViscosityOrderError';
  }
}

/** A viscosity lies outside the range a method is defined for (e.g. VI below ν100 = 2.0 mm²/s). */
export class ViscosityOutOfRangeError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'ViscosityOutOfRangeError';
  }
}

/** Fractions do not sum to 1 within 1e-9, or one of them is negative (or above 1). */
export class FractionSumError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'FractionSumError';
  }
}

/** A density at 15 °C lies outside the plausible range for oils (0.6–1.3 kg/L). */
export class ImplausibleDensityError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'ImplausibleDensityError';
  }
}

/** A temperature is below absolute zero (−273.15 °C). */
export class BelowAbsoluteZeroError extends BlendbenchInputError {
  constructor(field: string, value: unknown, message: string) {
    super(field, value, message);
    this.name = 'BelowAbsoluteZeroError';
  }
}

// ---------------------------------------------------------------------------------------------
// Guards. `fn` is the public function name, used to open the message.
// ---------------------------------------------------------------------------------------------

/** Tolerance on the sum of fractions: |Σ − 1| ≤ 1e-9 (issue 2, "within 1e-9"). */
export const FRACTION_SUM_TOLERANCE = 1e-9;

/** Plausible density of an oil or oil component at 15 °C [kg/L], inclusive. */
export const DENSITY15_MIN = 0.6;
export const DENSITY15_MAX = 1.3;

/** Absolute zero [°C]. */
export const ABSOLUTE_ZERO_C = -273.15;

/** Throws {@link InvalidNumberError} unless `value` is a finite number. */
export function assertFinite(fn: string, field: string, value: unknown): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InvalidNumberError(
      field,
      value,
      `${fn}: ${field} = ${String(value)} is not a finite number`,
    );
  }
}

/** Throws unless `kv` is a finite, strictly positive kinematic viscosity [mm²/s]. */
export function assertViscosity(fn: string, field: string, kv: unknown): asserts kv is number {
  assertFinite(fn, field, kv);
  if (kv <= 0) {
    throw new NonPositiveViscosityError(
      field,
      kv,
      `${fn}: ${field} = ${kv} mm²/s; a kinematic viscosity must be greater than 0`,
    );
  }
}

/**
 * Throws unless ν40 and ν100 are valid viscosities with ν100 < ν40 (every oil thins on heating).
 */
export function assertKv40Kv100(fn: string, kv40: unknown, kv100: unknown): void {
  assertViscosity(fn, 'kv40', kv40);
  assertViscosity(fn, 'kv100', kv100);
  if (kv100 >= kv40) {
    throw new ViscosityOrderError(
      'kv100',
      kv100,
      `${fn}: kv100 = ${kv100} mm²/s is not below kv40 = ${kv40} mm²/s; ` +
        'viscosity must fall as temperature rises',
    );
  }
}

/** Throws {@link BelowAbsoluteZeroError} unless `tempC` is finite and ≥ −273.15 °C. */
export function assertTemperatureC(fn: string, field: string, tempC: unknown): asserts tempC is number {
  assertFinite(fn, field, tempC);
  if (tempC < ABSOLUTE_ZERO_C) {
    throw new BelowAbsoluteZeroError(
      field,
      tempC,
      `${fn}: ${field} = ${tempC} °C is below absolute zero (${ABSOLUTE_ZERO_C} °C)`,
    );
  }
}

/**
 * Throws unless `tempC` is strictly above absolute zero, as the Walther equation needs log T with
 * T > 0 K.
 */
export function assertAboveAbsoluteZeroC(fn: string, field: string, tempC: unknown): asserts tempC is number {
  assertFinite(fn, field, tempC);
  if (tempC <= ABSOLUTE_ZERO_C) {
    throw new BelowAbsoluteZeroError(
      field,
      tempC,
      `${fn}: ${field} = ${tempC} °C is at or below absolute zero (${ABSOLUTE_ZERO_C} °C)`,
    );
  }
}

/** Throws {@link ImplausibleDensityError} unless 0.6 ≤ ρ15 ≤ 1.3 kg/L. */
export function assertDensity15(fn: string, field: string, density15: unknown): asserts density15 is number {
  assertFinite(fn, field, density15);
  if (density15 < DENSITY15_MIN || density15 > DENSITY15_MAX) {
    throw new ImplausibleDensityError(
      field,
      density15,
      `${fn}: ${field} = ${density15} kg/L is outside the plausible range ` +
        `${DENSITY15_MIN}–${DENSITY15_MAX} kg/L for an oil at 15 °C (check units: kg/L, not kg/m³)`,
    );
  }
}

/**
 * Throws unless every fraction is finite and in [0, 1], there is at least one, and they sum to 1
 * within {@link FRACTION_SUM_TOLERANCE}.
 *
 * @param fn - public function name for the message
 * @param field - name of the fraction field, e.g. `massFraction`
 * @param fractions - the fractions, in part order
 */
export function assertFractions(fn: string, field: string, fractions: readonly number[]): void {
  if (fractions.length === 0) {
    throw new FractionSumError('parts', fractions, `${fn}: parts is empty; a blend needs at least one part`);
  }
  let sum = 0;
  fractions.forEach((f, i) => {
    const name = `parts[${i}].${field}`;
    assertFinite(fn, name, f);
    if (f < 0 || f > 1) {
      throw new FractionSumError(name, f, `${fn}: ${name} = ${f}; a fraction must lie between 0 and 1`);
    }
    sum += f;
  });
  if (Math.abs(sum - 1) > FRACTION_SUM_TOLERANCE) {
    throw new FractionSumError(
      field,
      sum,
      `${fn}: ${field} values sum to ${sum}; they must sum to 1 within ${FRACTION_SUM_TOLERANCE}`,
    );
  }
}

/**
 * Run `f`; an input error it throws is thrown again, of the same class, with `prefix` in front of its
 * field (`targetKv40` → `grades[2].targetKv40`) and of the field named in its message — so a caller
 * that validates a part of its input reports the whole path. Other errors pass through unchanged.
 *
 * @param prefix - e.g. `grades[2].`
 * @param f - the validation or computation
 * @param opts - `keep(field)`: true for fields already complete (left alone); `message(m)`: rewrites
 *   the message instead of the default (the field renamed in the "field =" part)
 * @returns what `f` returns
 */
export function inField<T>(
  prefix: string,
  f: () => T,
  opts: { keep?: (field: string) => boolean; message?: (message: string) => string } = {},
): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof BlendbenchInputError && !(opts.keep?.(e.field) ?? false)) {
      const Ctor = e.constructor as new (field: string, value: unknown, message: string) => BlendbenchInputError;
      const field = `${prefix}${e.field}`;
      throw new Ctor(field, e.value, opts.message ? opts.message(e.message) : e.message.replace(`: ${e.field} =`, `: ${field} =`));
    }
    throw e;
  }
}
