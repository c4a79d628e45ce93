import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  BelowAbsoluteZeroError,
  BlendbenchInputError,
  InvalidNumberError,
  NonPositiveViscosityError,
  ViscosityOrderError,
  ViscosityOutOfRangeError,
} from '../../../src/core/errors';
import {
  WALTHER_MIN_KV,
  fitWalther,
  kv40kv100FromPoints,
  kvAtTemperature,
  temperatureAtKv,
  temperatureForViscosity,
  viscosityAtTemperature,
  waltherLine,
} from '../../../src/core/viscosity/viscosity-temperature';
import { expectClose, expectRelClose, isClose } from '../../helpers/tolerance';

describe('ASTM D341 Walther form: check values', () => {
  it('W1: ν40 73.30, ν100 8.86', () => {
    // formula, ASTM D341 two-point form (shared/reference/check-values.md W1), 1e-4 relative
    const line = waltherLine(73.3, 8.86);
    expectRelClose(line.A, 9.458393, 1e-4);
    expectRelClose(line.B, 3.680946, 1e-4);
    expectRelClose(kvAtTemperature(line, 60), 30.0826, 1e-4);
    expectRelClose(kvAtTemperature(line, 0), 1233.07, 1e-4);
    expectRelClose(viscosityAtTemperature(73.3, 8.86, 60), 30.0826, 1e-4);
  });

  it('W2: ν40 220, ν100 19.0', () => {
    // formula, ASTM D341 two-point form (shared/reference/check-values.md W2)
    const line = waltherLine(220, 19.0);
    expectRelClose(kvAtTemperature(line, 40), 220, 1e-6);
    expectRelClose(kvAtTemperature(line, 100), 19.0, 1e-6);
    expectClose(viscosityAtTemperature(220, 19.0, 80), 35.6, 0.01);
  });

  it('temperature for a viscosity inverts the line', () => {
    // inverse of the W1 line (shared/reference/check-values.md W1: 30.0826 mm²/s at 60 °C)
    expectClose(temperatureForViscosity(73.3, 8.86, 30.0826), 60, 0.01);
    expectClose(temperatureAtKv(waltherLine(73.3, 8.86), 1233.07), 0, 0.01);
    expect(temperatureForViscosity(73.3, 8.86, 73.3)).toBe(40);
    expect(temperatureForViscosity(73.3, 8.86, 8.86)).toBe(100);
  });

  it('returns measured values unchanged at 40 and 100 °C', () => {
    // identity: the two-point line passes through its inputs (shared/reference/check-values.md W2)
    expect(viscosityAtTemperature(220, 19, 40)).toBe(220);
    expect(viscosityAtTemperature(220, 19, 100)).toBe(19);
  });
});

describe('least-squares fit for three or more points', () => {
  it('recovers the line from points lying on it', () => {
    // identity: least squares of exactly collinear points returns the line (common practice, no source)
    const line = waltherLine(73.3, 8.86);
    const points = [20, 40, 60, 100, 120].map((t) => ({ tempC: t, kv: kvAtTemperature(line, t) }));
    const fit = fitWalther(points);
    expectRelClose(fit.A, line.A, 1e-9);
    expectRelClose(fit.B, line.B, 1e-9);
  });

  it('fits scattered points between them, and two points exactly', () => {
    // common practice (no source): an OLS line through (40, 100, 60 °C ± scatter) stays near all three
    const pts = [
      { tempC: 40, kv: 220 },
      { tempC: 100, kv: 19 },
      { tempC: 60, kv: 80 },
    ];
    const fit = fitWalther(pts);
    expect(fit.B).toBeGreaterThan(0);
    const two = fitWalther(pts.slice(0, 2));
    expectRelClose(two.A, waltherLine(220, 19).A, 1e-12);
    expectRelClose(kvAtTemperature(fit, 40), 220, 0.05);
  });

  it('kv40kv100FromPoints keeps measured values and reads missing ones off the fit', () => {
    // ASTM D2270 works from measured ν40/ν100; missing ones from the D341 line (W1 check values)
    expect(kv40kv100FromPoints([{ tempC: 40, kv: 220 }, { tempC: 100, kv: 19 }, { tempC: 60, kv: 80 }])).toEqual({
      kv40: 220,
      kv100: 19,
    });
    const line = waltherLine(73.3, 8.86);
    const r = kv40kv100FromPoints([
      { tempC: 0, kv: kvAtTemperature(line, 0) },
      { tempC: 60, kv: kvAtTemperature(line, 60) },
    ]);
    expectRelClose(r.kv40, 73.3, 1e-9);
    expectRelClose(r.kv100, 8.86, 1e-9);
  });
});

describe('stated valid range and input errors', () => {
  it('refuses viscosities below 2.0 mm²/s (D341 correction terms not implemented)', () => {
    expect(WALTHER_MIN_KV).toBe(2.0);
    expect(() => waltherLine(8, 1.8)).toThrow(ViscosityOutOfRangeError);
    expect(() => viscosityAtTemperature(20, 4, 250)).toThrow(ViscosityOutOfRangeError);
    expect(() => temperatureForViscosity(20, 4, 1.5)).toThrow(ViscosityOutOfRangeError);
    expect(() => fitWalther([{ tempC: 40, kv: 8 }, { tempC: 100, kv: 1.9 }])).toThrow(ViscosityOutOfRangeError);
  });
  it('rejects non-finite, non-positive, disordered and sub-zero-kelvin input', () => {
    expect(() => viscosityAtTemperature(Number.NaN, 10, 40)).toThrow(InvalidNumberError);
    expect(() => viscosityAtTemperature(100, 10, Number.NaN)).toThrow(InvalidNumberError);
    expect(() => viscosityAtTemperature(100, -1, 40)).toThrow(NonPositiveViscosityError);
    expect(() => viscosityAtTemperature(10, 100, 40)).toThrow(ViscosityOrderError);
    expect(() => viscosityAtTemperature(100, 10, -300)).toThrow(BelowAbsoluteZeroError);
    expect(() => kvAtTemperature({ A: 9, B: -1 }, 40)).toThrow(ViscosityOrderError);
    expect(() => fitWalther([{ tempC: 40, kv: 100 }])).toThrow(BlendbenchInputError);
    expect(() => fitWalther([{ tempC: 40, kv: 100 }, { tempC: 40, kv: 90 }])).toThrow(ViscosityOrderError);
    expect(() =>
      fitWalther([
        { tempC: 40, kv: 100 },
        { tempC: 100, kv: 10 },
        { tempC: 60, kv: 120 },
      ]),
    ).toThrow(/fitWalther: points\[2\] .* is not thinner/);
  });
});

describe('properties', () => {
  const kv100Arb = fc.double({ min: 2, max: 300, noNaN: true });
  const ratioArb = fc.double({ min: 2.5, max: 30, noNaN: true });

  it('fit → evaluate at 40/100 °C returns the inputs', () => {
    // identity: the two-point line passes through its inputs (ASTM D341 two-point form)
    fc.assert(
      fc.property(kv100Arb, ratioArb, (kv100, ratio) => {
        const kv40 = kv100 * ratio;
        const line = fitWalther([
          { tempC: 40, kv: kv40 },
          { tempC: 100, kv: kv100 },
        ]);
        return isClose(kvAtTemperature(line, 40), kv40, 1e-9) && isClose(kvAtTemperature(line, 100), kv100, 1e-9);
      }),
    );
  });

  it('viscosity falls as temperature rises, and temperature ↔ viscosity round-trips', () => {
    // monotonic Walther line with B > 0 (ASTM D341); inverse functions (identity)
    fc.assert(
      fc.property(kv100Arb, ratioArb, fc.double({ min: 0, max: 95, noNaN: true }), (kv100, ratio, t) => {
        const kv40 = kv100 * ratio;
        const line = waltherLine(kv40, kv100);
        const kvT = kvAtTemperature(line, t);
        const kvT5 = kvAtTemperature(line, t + 5);
        return kvT5 < kvT && isClose(temperatureAtKv(line, kvT), t, 0, 1e-6);
      }),
    );
  });
});
