import { describe, expect, it } from 'vitest';
import { checkComponent, checkValue, checkViscosityPair } from '../../src/state/checks';
import { demoComponents } from '../../src/state/demo';

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
    expect(checkValue('pourPoint', -95).warning).toMatch(/−95 °C is outside the usual −80 to 40 °C/);
    expect(checkValue('price', 0).warning).toMatch(/free/);
    expect(checkValue('density15', 1.15).warning).toMatch(/unusual/);
    expect(checkValue('anilinePoint', 100)).toEqual({});
  });

  it('passes a sound stock and catches a clash of codes', () => {
    expect(checkComponent(bs, demoComponents())).toEqual({ errors: [], warnings: [] });
    const clash = { ...bs, id: 'other' };
    expect(checkComponent(clash, demoComponents()).errors[0]!.message).toMatch(/already used/);
  });

  it('warns when VI does not fit the category (API 1509 Appendix E: Group III has VI ≥ 120)', () => {
    // ν40 100 / ν100 11.0 gives VI ≈ 94-95 by ASTM D2270 (cf. shared/reference/check-values.md V6: 100/11.4 → 100.26)
    const g3 = { ...bs, category: 'group-iii' as const, viscosityPoints: [{ tempC: 40, kv: 100 }, { tempC: 100, kv: 11.0 }] };
    expect(checkComponent(g3).warnings.map((w) => w.message).join()).toMatch(/below 120, the Group III floor/);
  });
});
