/**
 * The core's one number formatter: the user's decimal separator, grouping and temperature unit, so a
 * reason composed in the core reads like the tables.
 */
import { describe, expect, it } from 'vitest';
import { checkInWords, decimalsOf, displayWords, formatFixed, sayNumber } from '../../../src/core';

describe('formatFixed', () => {
  it('writes the decimal separator, grouping and a true minus', () => {
    // common practice (no source): "," decimal with "." grouping; "." decimal with a narrow no-break space
    expect(formatFixed(-12345.678, 1, { decimalSeparator: ',', thousandsGrouping: true })).toBe('−12.345,7');
    expect(formatFixed(12345.678, 1, { thousandsGrouping: true })).toBe('12\u202f345.7');
    // four integer digits stay ungrouped (common practice (no source))
    expect(formatFixed(1196, 0, { thousandsGrouping: true })).toBe('1196');
    expect(formatFixed(-0.04, 1)).toBe('0.0');
    expect(formatFixed(2.5, 2, { decimalSeparator: ',' })).toBe('2,50');
  });

  it('says an entered number as typed', () => {
    expect(sayNumber(0.25 * 100, { decimalSeparator: ',' })).toBe('25');
    expect(sayNumber(12.5, { decimalSeparator: ',' })).toBe('12,5');
    expect(decimalsOf(0.125)).toBe(3);
  });
});

describe('displayWords', () => {
  it('writes temperatures in the display unit', () => {
    // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale): −10 °C = 14 °F
    expect(displayWords({ temperatureUnit: 'F' }).temp(-10)).toBe('14.0 °F');
    expect(displayWords({ temperatureUnit: 'F', decimalSeparator: ',' }).sayTemp(-6)).toBe('21,2 °F');
    expect(displayWords({ decimalSeparator: ',' }).kv(30.52)).toBe('30,5');
    expect(displayWords({ decimalSeparator: ',' }).pct(0.4)).toBe('40,0 %');
  });

  it('puts a recomputed constraint in words with the user separator and unit', () => {
    const c = { constraint: 'minimum pour point [°C]', name: 'maximum pour point', quantity: 'temperature' as const, value: -3.04, limit: '≤ -6', min: null, max: -6, ok: false };
    // t_F = 9/5·t_C + 32: −3.04 °C = 26.5 °F; −6 °C = 21.2 °F
    expect(checkInWords(c, { temperatureUnit: 'F', decimalSeparator: ',' })).toBe('maximum pour point: 26,5 °F, limit at most 21,2 °F');
    const share = { constraint: 'maximum polymer share', name: 'maximum polymer share', quantity: 'fraction' as const, value: 0.31, limit: '≤ 0.25', min: null, max: 0.25, ok: false };
    expect(checkInWords(share, { decimalSeparator: ',' })).toBe('maximum polymer share: 31,0 %, limit at most 25 %');
  });

  it('writes a value that misses its limit by less than the usual rounding with the digits that show the miss (s25 walk)', () => {
    // Before: "minimum VI: 96.0, limit at least 96" for a VI of 95.96. Values invented (common practice (no source)).
    const vi = { constraint: 'minimum VI', name: 'minimum VI', quantity: 'vi' as const, value: 95.96, limit: '≥ 96', min: 96, max: null, ok: false };
    expect(checkInWords(vi)).toBe('minimum VI: 95.96, limit at least 96');
    const ap = { constraint: 'maximum aniline point [°C]', name: 'maximum aniline point', quantity: 'temperature' as const, value: 122.03, limit: '≤ 122', min: null, max: 122, ok: false };
    expect(checkInWords(ap)).toBe('maximum aniline point: 122.03 °C, limit at most 122 °C');
    const kv = { constraint: 'ν40 band [mm²/s]', name: 'ν40 band', quantity: 'kv' as const, value: 303.8, limit: '304–336', min: 304, max: 336, ok: false };
    expect(checkInWords(kv)).toBe('ν40 band: 303.8 mm²/s, limit 304 mm²/s to 336 mm²/s');
    // a clear miss keeps the usual digits
    expect(checkInWords({ ...vi, value: 94.2 })).toBe('minimum VI: 94.2, limit at least 96');
  });
});
