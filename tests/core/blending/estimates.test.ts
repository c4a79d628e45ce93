import { describe, expect, it } from 'vitest';
import { blendAnilinePoint } from '../../../src/core/blending/aniline';
import {
  BelowAbsoluteZeroError,
  BlendbenchInputError,
  FractionSumError,
  NonPositiveViscosityError,
} from '../../../src/core/errors';
import { blendFlashPoint, flashBlendingIndex, flashIndexExtrapolated, flashPointFromIndex } from '../../../src/core/blending/flash-point';
import { blendPourPoint, pourBlendingIndex, pourIndexExtrapolated, pourPointFromIndex } from '../../../src/core/blending/pour-point';
import { inGradeAfterShear, krlShearLossPct, shearedKv } from '../../../src/core/viscosity/shear';
import { expectClose } from '../../helpers/tolerance';

describe('flash point by blending index', () => {
  it('F1: BI(20 °C) = 3281, BI(50 °C) = 306.0', () => {
    // formula, log BI = −6.1188 + 2414/(T − 42.6) (tests/reference/check-values.md F1; constants from memory)
    expectClose(flashBlendingIndex(20), 3281, 0.5);
    expectClose(flashBlendingIndex(50), 306.0, 0.5);
  });
  it('reproduces every row of a published flash-point blending table (20–110 °C, whole numbers)', () => {
    // published table: R. J. Patel, "Flash Point Prediction - Petroleum Products Blending - Calculation
    // formula and table" (2017): flash point [°C] → index A, blended by volume %; printed as whole numbers,
    // so each row must agree within ±0.5. Every row of the table is checked.
    const table: Record<number, number> = {
      20: 3281, 21: 3004, 22: 2752, 23: 2524, 24: 2315, 25: 2126, 26: 1953, 27: 1795, 28: 1652, 29: 1520,
      30: 1400, 31: 1291, 32: 1190, 33: 1098, 34: 1014, 35: 937, 36: 866, 37: 801, 38: 742, 39: 687,
      40: 636, 41: 590, 42: 547, 43: 508, 44: 472, 45: 438, 46: 408, 47: 379, 48: 353, 49: 328,
      50: 306, 51: 285, 52: 266, 53: 248, 54: 232, 55: 216, 56: 202, 57: 189, 58: 177, 59: 165,
      60: 155, 61: 145, 62: 136, 63: 127, 64: 119, 65: 112, 66: 105, 67: 99, 68: 93, 69: 87,
      70: 82, 71: 77, 72: 72, 73: 68, 74: 64, 75: 60, 76: 57, 77: 54, 78: 51, 79: 48,
      80: 45, 81: 43, 82: 40, 83: 38, 84: 36, 85: 34, 86: 32, 87: 30, 88: 29, 89: 27,
      90: 26, 91: 24, 92: 23, 93: 22, 94: 21, 95: 20, 96: 19, 97: 18, 98: 17, 99: 16,
      100: 15, 101: 15, 102: 14, 103: 13, 104: 12, 105: 12, 106: 11, 107: 11, 108: 10, 109: 10, 110: 9,
    };
    for (const [t, a] of Object.entries(table)) expectClose(flashBlendingIndex(Number(t)), a, 0.5);
  });
  it('F2: 50/50 by volume of 200 °C and 250 °C → 215.95 °C', () => {
    // formula (tests/reference/check-values.md F2)
    expectClose(
      blendFlashPoint([
        { volumeFraction: 0.5, flashPoint: 200 },
        { volumeFraction: 0.5, flashPoint: 250 },
      ])!,
      215.95,
      0.1,
    );
  });
  it('index ↔ temperature round-trips; one component returns itself; unknown → null', () => {
    // inverse functions (identity)
    for (const t of [-20, 20, 150, 300]) expectClose(flashPointFromIndex(flashBlendingIndex(t)), t, 1e-9);
    expectClose(blendFlashPoint([{ volumeFraction: 1, flashPoint: 230 }])!, 230, 1e-9);
    expect(
      blendFlashPoint([
        { volumeFraction: 0.98, flashPoint: 230 },
        { volumeFraction: 0.02, flashPoint: null },
      ]),
    ).toBeNull();
    expect(
      blendFlashPoint([
        { volumeFraction: 1, flashPoint: 230 },
        { volumeFraction: 0, flashPoint: null },
      ]),
    ).not.toBeNull();
    expect(() => flashBlendingIndex(-300)).toThrow(BelowAbsoluteZeroError);
    expect(() => blendFlashPoint([{ volumeFraction: 0.5, flashPoint: 200 }])).toThrow(FractionSumError);
  });
});

describe('pour point by blending index (an estimate)', () => {
  it('P1: 50/50 by volume of −15 °C and −45 °C → −25.12 °C', () => {
    // formula, BI = T^(1/0.08) (tests/reference/check-values.md P1; from memory, an estimate only)
    expectClose(
      blendPourPoint([
        { volumeFraction: 0.5, pourPoint: -15 },
        { volumeFraction: 0.5, pourPoint: -45 },
      ])!,
      -25.12,
      0.05,
    );
  });
  it('round-trips; unknown → null', () => {
    // inverse functions (identity)
    for (const t of [-60, -15, 0, 10]) expectClose(pourPointFromIndex(pourBlendingIndex(t)), t, 1e-9);
    expect(blendPourPoint([{ volumeFraction: 1, pourPoint: null }])).toBeNull();
    expect(() => pourBlendingIndex(-274)).toThrow(BelowAbsoluteZeroError);
  });
});

describe('aniline point (volume basis, an approximation)', () => {
  it('volume-weighted over parts that have one, renormalised', () => {
    // volume-weighted mean: the approximation the app labels as such (common practice, no source)
    expect(
      blendAnilinePoint([
        { volumeFraction: 0.5, anilinePoint: 100 },
        { volumeFraction: 0.5, anilinePoint: 120 },
      ]),
    ).toEqual({ value: 110, basis: 'all' });
    const r = blendAnilinePoint([
      { volumeFraction: 0.49, anilinePoint: 100 },
      { volumeFraction: 0.49, anilinePoint: 120 },
      { volumeFraction: 0.02, anilinePoint: null },
    ]);
    expectClose(r.value, 110, 1e-12);
    expect(r.basis).toBe('base-fluid');
    expect(() => blendAnilinePoint([{ volumeFraction: 1, anilinePoint: null }])).toThrow(BlendbenchInputError);
  });
});

describe('permanent shear loss, KRL definition', () => {
  it('S1: loss % = 100(ν_before − ν_after)/ν_before', () => {
    // standard, KRL definition ISO 26422 / CEC L-45 (tests/reference/check-values.md S1)
    expect(krlShearLossPct(20, 18)).toBe(10);
    expect(krlShearLossPct(40, 30)).toBe(25);
    expect(shearedKv(20, 10)).toBe(18);
    expectClose(shearedKv(37.3, krlShearLossPct(37.3, 31.1)), 31.1, 1e-12); // inverse (identity)
  });
  it('in grade after shear, the ν100 loss carried over to ν40', () => {
    // carry-over assumption stated in src/core/viscosity/shear.ts (common practice, no source); band ISO 3448 G2
    expect(inGradeAfterShear(330, 8, 320)).toBe(true); // 303.6 mm²/s
    expect(inGradeAfterShear(330, 15, 320)).toBe(false); // 280.5 mm²/s
    expect(() => shearedKv(20, 100)).toThrow(BlendbenchInputError);
    expect(() => krlShearLossPct(0, 1)).toThrow(NonPositiveViscosityError);
  });
});

describe('published forms and fitted ranges of the flash and pour indices (issue 13 §3)', () => {
  it('Wickey–Chittenden in kelvin equals its °F form log BI = −6.1188 + 4345.2/(t_F + 383)', () => {
    // algebraic identity of the two published forms (constants from memory, check-values.md F1)
    for (const tC of [20, 50, 150, 250]) {
      const tF = tC * 1.8 + 32;
      expectClose(Math.log10(flashBlendingIndex(tC)), -6.1188 + 4345.2 / (tF + 383), 1e-3);
    }
  });
  it('Hu–Burns gives the same blend in kelvin or in Rankine', () => {
    // identity: T^12.5 scales by 1.8^12.5 for every part (check-values.md P1 value −25.12 °C)
    const parts = [
      { volumeFraction: 0.5, pourPoint: -15 },
      { volumeFraction: 0.5, pourPoint: -45 },
    ];
    const k = blendPourPoint(parts)!;
    const rankine = Math.pow(0.5 * Math.pow((-15 + 273.15) * 1.8, 12.5) + 0.5 * Math.pow((-45 + 273.15) * 1.8, 12.5), 0.08) / 1.8 - 273.15;
    expectClose(k, rankine, 1e-9);
    expectClose(k, -25.12, 0.05);
  });
  it('gear-oil flash points (200–300 °C) are marked as extrapolation; pour points outside −50…10 °C too', () => {
    // fitted ranges as stated in flash-point.ts / pour-point.ts (from memory)
    expect(flashIndexExtrapolated(230, [220, 250])).toBe(true);
    expect(flashIndexExtrapolated(150, [140, 160])).toBe(false);
    expect(pourIndexExtrapolated(-12, [-15, -9])).toBe(false);
    expect(pourIndexExtrapolated(-12, [-60, 3])).toBe(true);
  });
});

