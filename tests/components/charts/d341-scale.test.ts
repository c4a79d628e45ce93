import { describe, expect, it } from 'vitest';
import {
  KV_TICK_CANDIDATES,
  d341Kv,
  d341LineFromPoints,
  d341TempC,
  d341Segments,
  d341X,
  d341Y,
  fittedRangeOf,
  formatKvTick,
  kvAxis,
  pickTicks,
  temperatureFlag,
  temperatureTicks,
} from '../../../src/components/charts/d341-scale';
import { d341LogLogZ, kvAtTemperature, waltherLine } from '../../../src/core/viscosity/viscosity-temperature';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('ASTM D341 chart axes', () => {
  it('puts the W1 oil on the straight line y = A − B·x', () => {
    // ASTM D341 two-point fit, W1: ν40 73.30, ν100 8.86 → A = 9.458393, B = 3.680946 (tests/reference/check-values.md §2 W1)
    const { a, b } = d341LineFromPoints({ tempC: 40, kv: 73.3 }, { tempC: 100, kv: 8.86 });
    expect(rel(a, 9.458393)).toBeLessThan(1e-4);
    expect(rel(b, 3.680946)).toBeLessThan(1e-4);
    // ν at 60 °C = 30.0826 and at 0 °C = 1233.07 lie on that line (tests/reference/check-values.md §2 W1)
    expect(rel(d341Y(30.0826), a - b * d341X(60))).toBeLessThan(1e-4);
    expect(rel(d341Kv(a - b * d341X(0)), 1233.07)).toBeLessThan(1e-4);
  });

  it('passes through both W2 points and gives ν at 80 °C', () => {
    // ASTM D341, W2: ν40 220, ν100 19.0; ν at 80 °C = 35.60 ± 0.01 (tests/reference/check-values.md §2 W2)
    const { a, b } = d341LineFromPoints({ tempC: 40, kv: 220 }, { tempC: 100, kv: 19 });
    expect(rel(d341Kv(a - b * d341X(40)), 220)).toBeLessThan(1e-6);
    expect(rel(d341Kv(a - b * d341X(100)), 19)).toBeLessThan(1e-6);
    expect(Math.abs(d341Kv(a - b * d341X(80)) - 35.6)).toBeLessThan(0.01);
  });

  it('uses log10 of the absolute temperature and log10 log10 Z with the D341-20 Z (the core functions)', () => {
    // Definition of the D341 co-ordinates (tests/reference/check-values.md §2): T = t + 273.15 K; at 99.3 mm²/s
    // D341-20's extra term is below 1e-20, so Z = ν + 0.7 = 100 and log10 log10 Z = log10 2
    expect(d341X(26.85)).toBeCloseTo(Math.log10(300), 12);
    expect(d341Y(99.3)).toBeCloseTo(Math.log10(2), 12);
    // identity with the core: the chart is drawn with the same functions the calculations use. At 2 mm²/s
    // the D341-20 term (7.5e-4 mm²/s, ASTM D341-20 Z) makes the full form differ from ν + 0.7.
    for (const v of [2, 2.5, 10, 460]) expect(d341Y(v)).toBe(d341LogLogZ(v));
    expect(d341Y(2)).not.toBe(Math.log10(Math.log10(2.7)));
    const line = d341LineFromPoints({ tempC: 40, kv: 30 }, { tempC: 100, kv: 2.4 });
    const core = waltherLine(30, 2.4);
    expect(line).toEqual({ a: core.A, b: core.B });
    expect(d341Kv(line.a - line.b * d341X(130))).toBe(kvAtTemperature(core, 130));
  });

  it('splits a line into measured, extrapolated and below-pour stretches', () => {
    // design rule of the chart (issue 13 §7): measured = inside the fitted temperatures; below the pour point wins
    expect(d341Segments(-20, 120)).toEqual([
      { kind: 'extrapolated', fromC: -20, toC: 40 },
      { kind: 'measured', fromC: 40, toC: 100 },
      { kind: 'extrapolated', fromC: 100, toC: 120 },
    ]);
    expect(d341Segments(-30, 120, { minC: 20, maxC: 100 }, -12)).toEqual([
      { kind: 'below-pour', fromC: -30, toC: -12 },
      { kind: 'extrapolated', fromC: -12, toC: 20 },
      { kind: 'measured', fromC: 20, toC: 100 },
      { kind: 'extrapolated', fromC: 100, toC: 120 },
    ]);
    // a pour point above 40 °C (a polymer concentrate) makes the cold measured part "below pour"
    expect(d341Segments(-20, 120, undefined, 50).map((s) => s.kind)).toEqual(['below-pour', 'measured', 'extrapolated']);
    expect(fittedRangeOf([{ tempC: 40 }, { tempC: 100 }, { tempC: 20 }])).toEqual({ minC: 20, maxC: 100 });
  });

  it('flags temperatures read off the chart as the core does', () => {
    // core assessTemperature: extrapolated outside 40–100 °C, not to be trusted outside −20…150 °C
    expect(temperatureFlag(60)).toBe('');
    expect(temperatureFlag(0)).toBe('extrapolated');
    expect(temperatureFlag(-30)).toBe('outside -20 °C…150 °C: not to be trusted');
    expect(temperatureFlag(-30, (c) => `${Math.round((c * 9) / 5 + 32)} °F`)).toBe('outside -4 °F…302 °F: not to be trusted');
    expect(temperatureFlag(170)).toMatch(/not to be trusted/);
  });

  it('round-trips both axes', () => {
    // identity (inverse functions), common practice (no source)
    for (const t of [-30, 0, 40, 100, 150]) expect(d341TempC(d341X(t))).toBeCloseTo(t, 9);
    for (const v of [10, 320, 1e5]) expect(rel(d341Kv(d341Y(v)), v)).toBeLessThan(1e-9);
    // at 2 mm²/s too: the core inverts D341-20's Z exactly (published inverse polished by Newton steps)
    expect(rel(d341Kv(d341Y(2)), 2)).toBeLessThan(1e-9);
  });

  it('picks round, well-spaced ticks', () => {
    // design choice, not a check value: ticks start at 5 mm²/s, keep every decade, ≥ 0.02 axis units apart
    const ticks = pickTicks(KV_TICK_CANDIDATES, 5, 20000, d341Y, 0.02);
    expect(ticks[0]).toBe(5);
    for (const decade of [10, 100, 1000, 10000]) expect(ticks).toContain(decade);
    for (let i = 1; i < ticks.length; i++) {
      expect(ticks[i]!).toBeGreaterThan(ticks[i - 1]!);
      expect(d341Y(ticks[i]!) - d341Y(ticks[i - 1]!)).toBeGreaterThanOrEqual(0.02);
    }
    expect(formatKvTick(20000)).toBe('20 000');
    expect(formatKvTick(320)).toBe('320');
    expect(formatKvTick(1e6)).toBe('1 000 000'); // never "1e6"
  });

  it('kvAxis: ticks of one even series, at least a label apart', () => {
    // design choice, not a check value: a tight 1–2–5 frame, ticks from one series
    const { range, ticks } = kvAxis(6, 150000, d341Y, () => 0.02);
    expect(range).toEqual([5, 200000]);
    const mantissas = new Set(ticks.map((t) => Number((t / 10 ** Math.floor(Math.log10(t))).toPrecision(3))));
    for (const series of [[1, 2, 5], [1, 5], [1]]) {
      if ([...mantissas].every((m) => series.includes(m))) return;
    }
    throw new Error(`irregular ticks ${ticks.join(', ')}`);
  });

  it('temperature ticks are round in the user’s unit, evenly stepped', () => {
    // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale)
    const toF = (c: number) => (c * 9) / 5 + 32;
    const toC = (f: number) => ((f - 32) * 5) / 9;
    const ticks = temperatureTicks(-20, 120, toF, toC, d341X, 0.004).map(toF);
    const steps = new Set(ticks.slice(1).map((t, i) => Math.round(t - ticks[i]!)));
    expect(steps.size).toBe(1);
    for (const t of ticks) expect(Math.abs(t - Math.round(t))).toBeLessThan(1e-9);
    expect(ticks[0]! % [...steps][0]!).toBeCloseTo(0, 9);
  });
});

describe('round linear ticks', () => {
  it('gives 1–2–5 steps that cover the domain', async () => {
    const { niceDomain, niceTicks, niceStep } = await import('../../../src/components/charts/nice');
    // arithmetic identities of the 1–2–5 rule, common practice (no source)
    expect(niceStep(10, 5)).toBe(2);
    expect(niceStep(0.9, 5)).toBe(0.2);
    const d = niceDomain(1.37, 4.4);
    expect(d[0]).toBeLessThanOrEqual(1.37);
    expect(d[1]).toBeGreaterThanOrEqual(4.4);
    expect(niceTicks([0, 160])).toEqual([0, 50, 100, 150]);
    expect(niceTicks([70, 160])).toEqual([80, 100, 120, 140, 160]);
  });
});
