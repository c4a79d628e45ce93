// @vitest-environment jsdom
// s25 walk: a property that misses its limit by less than the shown rounding read as meeting it —
// "Viscosity index 96 (96.0) ✗ not met: minimum 96". A failing value is shown with the digits that
// show it beyond its limit, and the limit with its own digits.
import { describe, expect, it } from 'vitest';
import { buildRows, passingDigits } from '../../../src/features/designer/PropertiesPanel';
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

describe('designer: a value that meets its limit never reads as missing it', () => {
  // s25 walk: "94.6 ✓ minimum 94.65" — a pass within the 0.01 tolerance (CHECK_TOLERANCE) rounded below
  // its 2-decimal limit. Limits set around each demo blend's own values (no check value: the row is read
  // against its own inputs).
  const steps = Array.from({ length: 21 }, (_, i) => (i - 10) / 1000);
  const reads = (shown: number, limit: number, side: 'min' | 'max', statusText: string) =>
    (side === 'min' ? shown >= limit : shown <= limit) || /met within the check tolerance/.test(statusText);
  const blends = demoRecipes().map((r) => {
    const pr = predictRecipe(r.lines, components, 'refutas', { grade: r.grade });
    if (!pr.ok) throw new Error(pr.message);
    return { pr, targets: demoTargets()[r.id]! };
  });

  it('the digits helper: a met value is written with the digits that put it on its side of the limit', () => {
    // Invented values (common practice (no source)): 94.648 against a minimum of 94.65 reads 94.65, not 94.6.
    expect(passingDigits(94.648, 94.65, 1, 'below')).toBe(2);
    expect(passingDigits(94.7, 94.65, 1, 'below')).toBe(1);
    expect(passingDigits(122.004, 121.999, 1, 'above')).toBe(3);
    // no digits can show a pass 0.009 below the limit: the most the helper gives is 3
    expect(passingDigits(94.641, 94.65, 1, 'below')).toBe(3);
  });

  it('VI at or just below a 2-decimal minimum: the ✓ value reads as met', () => {
    for (const { pr, targets } of blends) {
      for (const s of steps) {
        const minVi = Math.round((pr.props.vi! + s) * 100) / 100;
        const row = buildRows(pr, { ...targets, minVi }, fmt).find((r) => r.key === 'vi')!;
        if (row.status !== 'ok') continue;
        const shown = numberIn(row.value.match(/\(([^)]+)\)/)![1]!);
        expect(reads(shown, minVi, 'min', row.statusText), `${row.value} ✓ ${row.statusText}`).toBe(true);
      }
    }
  });

  it('a flash point at or just below a 2-decimal minimum is not written as the whole degree below it', () => {
    for (const { pr, targets } of blends) {
      for (const s of steps) {
        const limit = Math.round((pr.props.flashPoint! + s) * 100) / 100;
        const row = buildRows(pr, { ...targets, minFlashPoint: limit }, fmt).find((r) => r.key === 'flash')!;
        if (row.status !== 'ok') continue;
        expect(reads(numberIn(row.value), limit, 'min', row.statusText), `${row.value} ✓ ${row.statusText}`).toBe(true);
      }
    }
  });

  it('aniline point at or just above a 2-decimal maximum: the ✓ value does not read above it', () => {
    for (const { pr, targets } of blends) {
      for (const s of steps) {
        const maxAnilinePoint = Math.round((pr.props.anilinePoint!.value + s) * 100) / 100;
        const row = buildRows(pr, { ...targets, maxAnilinePoint }, fmt).find((r) => r.key === 'anilinePoint')!;
        if (row.status !== 'ok') continue;
        const limit = numberIn(row.statusText.split('maximum')[1]!.split(';')[0]!);
        expect(reads(numberIn(row.value), limit, 'max', row.statusText), `${row.value} ✓ ${row.statusText}`).toBe(true);
      }
    }
  });
});
