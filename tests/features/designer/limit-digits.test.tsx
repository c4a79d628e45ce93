// @vitest-environment jsdom
// s25 walk: a property that misses its limit by less than the shown rounding read as meeting it —
// "Viscosity index 96 (96.0) ✗ not met: minimum 96". A failing value is shown with the digits that
// show it beyond its limit, and the limit with its own digits.
import { describe, expect, it } from 'vitest';
import { buildRows } from '../../../src/features/designer/PropertiesPanel';
import { predictRecipe } from '../../../src/features/designer/predict';
import { makeFormatter } from '../../../src/components/format';
import { DEFAULT_SETTINGS } from '../../../src/state/settings';
import { demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';

const components = demoComponents();
const r320 = demoRecipes().find((r) => r.grade === 320)!;
const pred = predictRecipe(r320.lines, components, 'refutas', { grade: 320 });
if (!pred.ok) throw new Error(pred.message);
const p = pred.props;
const fmt = makeFormatter(DEFAULT_SETTINGS);
const numberIn = (s: string) => Number(s.replace(/[^\d.−-]/g, '').replace('−', '-'));

describe('designer: a value that fails its limit never reads as meeting it', () => {
  it('VI just below its minimum shows the digits that put it below', () => {
    // The limit: the demo blend's own VI plus 0.02 (no check value: the row is read against its own inputs).
    const minVi = Math.round((p.vi! + 0.02) * 1000) / 1000;
    const row = buildRows(pred, { ...demoTargets()[r320.id]!, minVi }, fmt).find((r) => r.key === 'vi')!;
    expect(row.status).toBe('fail');
    const shown = numberIn(row.value.match(/\(([^)]+)\)/)![1]!);
    const limit = numberIn(row.statusText);
    expect(limit).toBe(minVi);
    expect(shown).toBeLessThan(limit);
  });

  it('a met minimum keeps one decimal', () => {
    const row = buildRows(pred, { ...demoTargets()[r320.id]!, minVi: Math.floor(p.vi!) - 1 }, fmt).find((r) => r.key === 'vi')!;
    expect(row.status).toBe('ok');
    expect(row.value).toMatch(/\(\d+\.\d\)$/);
  });

  it('aniline point just above its maximum shows the digits that put it above', () => {
    const ap = p.anilinePoint!.value;
    const maxAnilinePoint = Math.round((ap - 0.02) * 1000) / 1000;
    const row = buildRows(pred, { ...demoTargets()[r320.id]!, maxAnilinePoint }, fmt).find((r) => r.key === 'anilinePoint')!;
    expect(row.status).toBe('fail');
    const limit = numberIn(row.statusText.split('maximum')[1]!);
    expect(limit).toBe(maxAnilinePoint);
    expect(numberIn(row.value)).toBeGreaterThan(limit);
  });

  it('flash point just below its minimum shows the digits that put it below', () => {
    const minFlashPoint = Math.round((p.flashPoint! + 0.3) * 10) / 10;
    const row = buildRows(pred, { ...demoTargets()[r320.id]!, minFlashPoint }, fmt).find((r) => r.key === 'flash')!;
    expect(row.status).toBe('fail');
    const limit = numberIn(row.statusText.split('minimum')[1]!.split(';')[0]!);
    expect(limit).toBe(minFlashPoint);
    expect(numberIn(row.value)).toBeLessThan(limit);
  });
});
