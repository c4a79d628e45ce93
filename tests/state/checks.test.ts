import { beforeAll, describe, expect, it } from 'vitest';
import { loadUnitConversions } from '../../src/components/format';
import { checkComponent, checkLabelText, checkValue, checkViscosityPair, viOrReason } from '../../src/state/checks';
import { makeFormatter } from '../../src/components/format';
import { DEFAULT_SETTINGS } from '../../src/state/settings';
import { demoComponents } from '../../src/state/demo';


beforeAll(async () => {
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
});

describe('entry checks for a component', () => {
  const bs = demoComponents().find((c) => c.code === 'BW-190')!;

  it('refuses impossible values with specific messages', () => {
    expect(checkViscosityPair(100, 120).error).toBe('ν100 (120 mm²/s) must be below ν40 (100 mm²/s)');
    expect(checkValue('kv40', 0).error).toMatch(/above zero/);
    expect(checkValue('density15', 885).error).toMatch(/looks like kg\/m³: enter kg\/L \(e\.g\. 0\.885\)/);
    expect(checkValue('price', -1).error).toMatch(/cannot be negative/);
    expect(checkValue('saturatesPct', 101).error).toMatch(/between 0 and 100/);
    expect(checkValue('oxidationRating', 9).error).toMatch(/from 1 to 5/);
  });

  it('flags implausible but possible values as warnings', () => {
    expect(checkValue('kv40', 80_000).warning).toMatch(/outside the usual/);
    expect(checkValue('pourPoint', -95).warning).toMatch(/−95 °C is outside the usual −80 °C to 40 °C/);
    expect(checkValue('price', 0).warning).toBe('no price: left out of costing and solving until one is entered'); // s24: never costed as free
    expect(checkValue('density15', 1.15).warning).toMatch(/unusual/);
    expect(checkValue('anilinePoint', 100)).toEqual({});
  });

  it('passes a sound stock and catches a clash of codes', () => {
    expect(checkComponent(bs, demoComponents())).toEqual({ errors: [], warnings: [] });
    const clash = { ...bs, id: 'other' };
    expect(checkComponent(clash, demoComponents()).errors[0]!.message).toMatch(/already used/);
  });

  it('warns when VI does not fit the category (API 1509 Appendix E: Group III has VI ≥ 120)', () => {
    // ν40 100 / ν100 11.0 gives VI ≈ 94-95 by ASTM D2270 (cf. tests/reference/check-values.md V6: 100/11.4 → 100.26)
    const g3 = { ...bs, category: 'group-iii' as const, viscosityPoints: [{ tempC: 40, kv: 100 }, { tempC: 100, kv: 11.0 }] };
    expect(checkComponent(g3).warnings.map((w) => w.message).join()).toMatch(/below 120, the Group III floor/);
  });

  it('refuses ν40 or ν100 below 2.0 mm²/s, the ASTM D2270 scope (check-values: D2270 defines no VI below Y = 2.0)', () => {
    // standard: ASTM D2270 §1 scope, ν100 of at least 2.0 mm²/s
    expect(checkValue('kv100', 0.001).error).toMatch(/below 2 mm²\/s, where ASTM D2270 defines no viscosity index/);
    expect(checkValue('kv100', 1.99).error).toMatch(/below 2 mm²\/s/);
    expect(checkValue('kv100', 2)).toEqual({});
    expect(checkValue('kv40', 1.5).error).toMatch(/below 2 mm²\/s/);
    const thin = { ...bs, viscosityPoints: [{ tempC: 40, kv: 3 }, { tempC: 100, kv: 0.001 }] };
    expect(checkComponent(thin).errors.map((e) => e.field)).toContain('kv100');
  });

  it('gives no VI while ν100 is not below ν40, or below 2.0 mm²/s, and says why', () => {
    expect(viOrReason(485, 500)).toEqual({ reason: 'ν100 ≥ ν40', why: 'no VI: ν100 must be below ν40' });
    expect(viOrReason(485, 485)).toMatchObject({ reason: 'ν100 ≥ ν40' });
    expect(viOrReason(3, 1.5)).toMatchObject({ reason: 'ν100 < 2' });
    // ν40 485 / ν100 31.8 → VI 96 by ASTM D2270 (cf. tests/reference/check-values.md V8: 480/31.5 → 96.09)
    expect(Math.round((viOrReason(485, 31.8) as { vi: number }).vi)).toBe(96);
  });

  it('refuses empty, blank and control-character codes and names', () => {
    expect(checkLabelText('stock code', '')).toBe('a stock code is required');
    expect(checkLabelText('name', '   ')).toBe('a name is required');
    expect(checkLabelText('stock code', 'BW\u0007280')).toMatch(/control character \(U\+0007\)/);
    expect(checkLabelText('name', 'Heavy\u0085neutral')).toMatch(/U\+0085/); // a C1 control (next line)
    expect(checkLabelText('name', 'Heavy neutral 2')).toBeUndefined();
    expect(checkComponent({ ...bs, code: 'BW\u0000X' }).errors[0]!.message).toMatch(/control character/);
    expect(checkComponent({ ...bs, code: ' ' }).errors[0]!.message).toBe('a stock code is required');
  });

  it('writes numbers in messages with the user’s separator and temperature unit', () => {
    const comma = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',', temperatureUnit: 'F' });
    // 885 kg/m³ = 0.885 kg/L (unit definition); shown with the comma the user types
    expect(checkValue('density15', 885, comma).error).toBe('885 looks like kg/m³: enter kg/L (e.g. 0,885)');
    // −95 °C = −139 °F, −80 °C = −112 °F, 40 °C = 104 °F (definition of the Fahrenheit scale)
    expect(checkValue('pourPoint', -95, comma).warning).toBe('−139 °F is outside the usual −112 °F to 104 °F for a pour point; check the value');
  });
});
