import { describe, expect, it } from 'vitest';
import { predictionImpact } from '../../../src/core/recipes/impact';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import { newRecipeLifecycle, type Recipe } from '../../../src/core/formulation/model';
import { makeComponent, STOCKS } from '../../helpers/formulation-fixtures';

const lib = [makeComponent(STOCKS.g2hv!), makeComponent(STOCKS.g2heavy!), makeComponent(STOCKS.pao6!)];
const recipe = (id: string, lines: Array<[string, number]>, extra: Partial<Recipe> = {}): Recipe => ({
  id,
  name: id,
  grade: 320,
  lines: lines.map(([componentId, massFraction]) => ({ componentId, massFraction })),
  revision: 1,
  isReference: false,
  notes: '',
  updatedAt: '2026-01-01T00:00:00Z',
  ...newRecipeLifecycle(),
  ...extra,
});

describe('predictionImpact', () => {
  const a = recipe('a', [['g2hv', 0.8], ['g2heavy', 0.2]]);
  const b = recipe('b', [['g2hv', 0.5], ['pao6', 0.5]], { grade: 150 });
  const other = recipe('other', [['g2heavy', 0.5], ['pao6', 0.5]], { grade: 46 });
  const archived = recipe('arch', [['g2hv', 1]], { archived: true, grade: 460 });

  it('lists only the recipes using the changed stock, with the same predictions as the core before and after', () => {
    const after = lib.map((c) => (c.id === 'g2hv' ? { ...c, calibration: { ...nullCal, effectiveKv40: 900, effectiveKv100: 50 } } : c));
    const impact = predictionImpact([a, b, other, archived], lib, after, ['g2hv'], 'refutas');
    expect(impact.map((r) => r.recipeId).sort()).toEqual(['a', 'b']);
    const ra = impact.find((r) => r.recipeId === 'a')!;
    // agreement with an independent call of the core's prediction (identity)
    expect(ra.before).toEqual(pick(predictBlend(lib, a.lines)));
    expect(ra.after).toEqual(pick(predictBlend(after, a.lines)));
    // ISO 3448 VG 320: 288–352 (check-values.md G2)
    expect(ra.band).toEqual({ min: 288, max: 352 });
  });

  it('puts recipes that leave their band first, and lists nothing when predictions do not move', () => {
    const after = lib.map((c) => (c.id === 'g2hv' ? { ...c, calibration: { ...nullCal, effectiveKv40: 900, effectiveKv100: 50 } } : c));
    const impact = predictionImpact([b, a], lib, after, ['g2hv'], 'refutas');
    // Refutas by the core: recipe a 335.2 → 554.9 mm²/s, out of VG 320 (288–352, check-values.md G2);
    // recipe b 99.3 → 127.1 mm²/s, outside VG 150 (135–165, ISO 3448 mid-point ±10 %) before and after.
    expect(impact.map((r) => [r.recipeId, r.inBandBefore, r.inBandAfter])).toEqual([
      ['a', true, false],
      ['b', false, false],
    ]);
    expect(predictionImpact([a, b], lib, lib.map((c) => ({ ...c })), ['g2hv'], 'refutas')).toEqual([]);
    // a price change moves no prediction
    expect(predictionImpact([a], lib, lib.map((c) => ({ ...c, price: { ...c.price, amount: 9 } })), ['g2hv'], 'refutas')).toEqual([]);
  });
});

const nullCal = {
  effectiveKv40: 0,
  effectiveKv100: 0,
  trial: { massFractions: {}, measuredKv40: 1, measuredKv100: 1, labReference: '' },
  method: 'refutas' as const,
  calibratedOn: '2026-01-01',
};
const pick = (p: { kv40: number; kv100: number; density15: number }) => ({ kv40: p.kv40, kv100: p.kv100, density15: p.density15 });
