import { describe, expect, it } from 'vitest';
import {
  BelowAbsoluteZeroError,
  BlendbenchInputError,
  FractionSumError,
  ImplausibleDensityError,
  InvalidNumberError,
  NonPositiveViscosityError,
  ViscosityOrderError,
  ViscosityOutOfRangeError,
  assertDensity15,
  assertFractions,
  assertKv40Kv100,
  assertTemperatureC,
  assertViscosity,
} from '../../src/core/errors';

function caught(f: () => unknown): BlendbenchInputError {
  try {
    f();
  } catch (e) {
    if (e instanceof BlendbenchInputError) return e;
    throw e;
  }
  throw new Error('expected a BlendbenchInputError');
}

describe('named input errors', () => {
  it('each subclass has its own name and keeps field and value', () => {
    const cases: [new (f: string, v: unknown, m: string) => BlendbenchInputError, string][] = [
      [InvalidNumberError, 'InvalidNumberError'],
      [NonPositiveViscosityError, 'NonPositiveViscosityError'],
      [ViscosityOrderError, 'ViscosityOrderError'],
      [ViscosityOutOfRangeError, 'ViscosityOutOfRangeError'],
      [FractionSumError, 'FractionSumError'],
      [ImplausibleDensityError, 'ImplausibleDensityError'],
      [BelowAbsoluteZeroError, 'BelowAbsoluteZeroError'],
    ];
    for (const [Ctor, name] of cases) {
      const e = new Ctor('kv40', 7, 'fn: kv40 = 7 broke a rule');
      expect(e).toBeInstanceOf(BlendbenchInputError);
      expect(e).toBeInstanceOf(Error);
      expect(e.name).toBe(name);
      expect(e.field).toBe('kv40');
      expect(e.value).toBe(7); // no calculation: the error carries the offending input
      expect(e.message).toBe('fn: kv40 = 7 broke a rule');
    }
  });

  it('guards name the function, field, value and rule', () => {
    let e = caught(() => assertViscosity('f', 'kv', -1));
    expect(e).toBeInstanceOf(NonPositiveViscosityError);
    expect(e.message).toBe('f: kv = -1 mm²/s; a kinematic viscosity must be greater than 0');

    e = caught(() => assertViscosity('f', 'kv', Number.NaN));
    expect(e).toBeInstanceOf(InvalidNumberError);
    expect(e.message).toBe('f: kv = NaN is not a finite number');

    e = caught(() => assertKv40Kv100('f', 10, 10));
    expect(e).toBeInstanceOf(ViscosityOrderError);
    expect(e.field).toBe('kv100');

    e = caught(() => assertTemperatureC('f', 't', -273.16));
    expect(e).toBeInstanceOf(BelowAbsoluteZeroError);
    expect(e.message).toMatch(/^f: t = -273.16 °C is below absolute zero/);
    expect(() => assertTemperatureC('f', 't', -273.15)).not.toThrow();

    e = caught(() => assertDensity15('f', 'rho', 1.31));
    expect(e).toBeInstanceOf(ImplausibleDensityError);
    expect(() => assertDensity15('f', 'rho', 0.6)).not.toThrow(); // limits inclusive
    expect(() => assertDensity15('f', 'rho', 1.3)).not.toThrow();
  });

  it('fractions: sum within 1e-9, none negative, at least one', () => {
    expect(() => assertFractions('f', 'w', [0.3, 0.7])).not.toThrow();
    expect(() => assertFractions('f', 'w', [0.3, 0.7 + 9e-10])).not.toThrow();
    let e = caught(() => assertFractions('f', 'w', [0.3, 0.7 + 2e-9]));
    expect(e).toBeInstanceOf(FractionSumError);
    expect(e.message).toMatch(/^f: w values sum to 1\.000000002.*within 1e-9/);
    e = caught(() => assertFractions('f', 'w', [-0.1, 1.1]));
    expect(e).toBeInstanceOf(FractionSumError);
    expect(e.field).toBe('parts[0].w');
    expect(() => assertFractions('f', 'w', [])).toThrow(FractionSumError);
    expect(() => assertFractions('f', 'w', [Number.NaN])).toThrow(InvalidNumberError);
  });
});
