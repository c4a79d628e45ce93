// @vitest-environment jsdom
// s25 verdict lane: the digits of a value beside its limit are judged as the app prints them. A pour
// point of −5.5 °C misses a maximum of −6 °C, yet was written "−6 °C" (Math.round(−5.5) is −5, so one
// whole degree looked enough; the printer rounds a half away from zero).
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
const fmt = makeFormatter(DEFAULT_SETTINGS);

describe('designer: a negative value half-way between whole degrees', () => {
  it('a pour point of −5.5 °C against a maximum of −6 °C is written beyond the limit', () => {
    // common practice (no source): invented values; −5.5 is 0.5 above −6, a miss beyond the 0.01 tolerance
    const p = { ...pred, props: { ...pred.props, pourPoint: -5.5 } };
    const row = buildRows(p, { ...demoTargets()[r320.id]!, maxPourPoint: -6 }, fmt).find((r) => r.key === 'pour')!;
    expect(row.status).toBe('fail');
    expect(row.value).toBe('−5.5 °C');
  });
});
