/**
 * The one rule for the digits that put a value printed beside its limit on the side of its verdict
 * (constraint reasons, designer properties panel, blend sheet QC table).
 */
import { describe, expect, it } from 'vitest';
import { verdictDigits } from '../../../src/core';

// t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale)
const toF = (tC: number) => (tC * 9) / 5 + 32;

describe('verdictDigits', () => {
  it('writes a miss beyond a minimum, with no more digits than it needs', () => {
    // worked example (commit 3be5836): "minimum VI: 95.96, limit at least 96", not "96.0"
    expect(verdictDigits(95.96, { min: 96, max: null }, 'missed', 1, 3)).toEqual({ digits: 2, onItsSide: true });
    // common practice (no source): a clear miss keeps the usual decimals
    expect(verdictDigits(94.2, { min: 96, max: null }, 'missed', 1, 3)).toEqual({ digits: 1, onItsSide: true });
  });

  it('writes a pass on the limit side of a minimum', () => {
    // worked example (commit 6506701): "95 (94.65) ✓ minimum 94.65", not "94.6"
    expect(verdictDigits(94.648, { min: 94.65, max: null }, 'met', 1, 3)).toEqual({ digits: 2, onItsSide: true });
    // common practice (no source): a value on the limit meets it
    expect(verdictDigits(96, { min: 96, max: null }, 'met', 1, 3)).toEqual({ digits: 1, onItsSide: true });
  });

  it('writes a pass and a miss on their sides of a maximum', () => {
    // common practice (no source): 121.96 under "maximum 121.96" reads "122.0" at one decimal, above it
    expect(verdictDigits(121.96, { min: null, max: 121.96 }, 'met', 1, 3)).toEqual({ digits: 2, onItsSide: true });
    // common practice (no source): 10.004 % against at most 10 % reads "10.0" and "10.00" at one and two
    expect(verdictDigits(100 * 0.10004, { min: null, max: 100 * 0.1 }, 'missed', 1, 3)).toEqual({ digits: 3, onItsSide: true });
  });

  it('judges the digits as printed: a negative half rounds away from zero', () => {
    // common practice (no source): −5.5 °C prints "−6" (as formatFixed prints), which is not above
    // a maximum of −6 °C; the miss needs "−5.5"
    expect(verdictDigits(-5.5, { min: null, max: -6 }, 'missed', 0, 3)).toEqual({ digits: 1, onItsSide: true });
  });

  it('judges a temperature in the unit shown (°F)', () => {
    // definition of the Fahrenheit scale: 99.8 °C = 211.64 °F against 100 °C = 212 °F; "212" would read
    // as meeting the minimum, "211.6" shows the miss
    expect(verdictDigits(toF(99.8), { min: toF(100), max: null }, 'missed', 0, 2)).toEqual({ digits: 1, onItsSide: true });
    // definition of the Fahrenheit scale: 218.9 °C = 426.02 °F misses 219 °C = 426.2 °F already at "426"
    expect(verdictDigits(toF(218.9), { min: toF(219), max: null }, 'missed', 0, 2)).toEqual({ digits: 0, onItsSide: true });
  });

  it('between two limits: a pass inside, a miss outside (blend sheet QC rows)', () => {
    // worked example (commit 43d2cd4): "22.124" under "≥ 22.1234", "22.1299" under "≥ 22.13"
    expect(verdictDigits(22.124, { min: 22.1234, max: 30 }, 'met', 2, 4)).toEqual({ digits: 3, onItsSide: true });
    expect(verdictDigits(22.1299, { min: 22.13, max: 30 }, 'missed', 2, 4)).toEqual({ digits: 4, onItsSide: true });
  });

  it('says when no rounding up to the most digits shows the verdict (met within the check tolerance)', () => {
    // worked example (commit 6506701): 94.641 meets a minimum of 94.65 only within the 0.01 check
    // tolerance; the caller adds "(met within the check tolerance)"
    expect(verdictDigits(94.641, { min: 94.65, max: null }, 'met', 1, 3)).toEqual({ digits: 3, onItsSide: false });
    // common practice (no source): 122.004 above a maximum of 121.999, met within the tolerance
    expect(verdictDigits(122.004, { min: null, max: 121.999 }, 'met', 1, 3)).toEqual({ digits: 3, onItsSide: false });
  });
});
