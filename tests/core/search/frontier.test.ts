import { describe, expect, it } from 'vitest';
import { epsilonConstraintSweep, paretoFrontier } from '../../../src/core/search/frontier';
import { prepareComponents, solvePrepared } from '../../../src/core/solver/solve-blend';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import type { BlendTargets } from '../../../src/core/formulation/model';
import { stock } from '../../helpers/formulation-fixtures';
import { isClose } from '../../helpers/tolerance';

describe('paretoFrontier', () => {
  it('keeps exactly the non-dominated points, cost ascending', () => {
    // definition of Pareto dominance, both criteria minimised (arithmetic on the given points)
    const pts = [
      { c: 1, a: 130 },
      { c: 2, a: 120 },
      { c: 2.5, a: 125 }, // dominated by (2, 120)
      { c: 2, a: 121 }, // dominated by (2, 120)
      { c: 3, a: 100 },
      { c: 1, a: 130 }, // duplicate point: kept once
      { c: Number.NaN, a: 1 }, // not finite: left out
    ];
    expect(paretoFrontier(pts, (p) => p.c, (p) => p.a)).toEqual([
      { c: 1, a: 130 },
      { c: 2, a: 120 },
      { c: 3, a: 100 },
    ]);
  });
});

describe('epsilonConstraintSweep', () => {
  // Invented stocks with generic typicals (base-stock-typicals.md, from memory)
  const lib = [stock('g2heavy'), stock('g2hv'), stock('an12'), stock('pao40'), stock('add')];
  const targets: BlendTargets = {
    grade: 320,
    targetKv40: null,
    tolerancePct: 5,
    minVi: null,
    maxAnilinePoint: null,
    maxPolymerFraction: null,
    maxPourPoint: null,
    minFlashPoint: null,
    additive: { componentId: 'add', massFraction: 0.02 },
    bounds: {},
    objective: 'cost',
    referenceRecipeId: null,
    minInBandProbability: null,
  };
  const ids = ['g2heavy', 'g2hv', 'an12'];

  it('runs from the least-cost blend to the most solvent one, non-dominated', () => {
    // ε-constraint method (Haimes, Lasdon & Wismer 1971); endpoints are the two single-objective optima
    const pts = epsilonConstraintSweep({ components: lib, targets, componentIds: ids, steps: 9 });
    expect(pts.length).toBeGreaterThan(2);
    const P = prepareComponents(lib, targets);
    const subset = ids.map((id) => lib.findIndex((c) => c.id === id));
    const cheapest = solvePrepared(P, subset);
    const solvent = solvePrepared(prepareComponents(lib, { ...targets, objective: 'solvency' }), subset);
    if (cheapest.status !== 'optimal' || solvent.status !== 'optimal') throw new Error('test setup: infeasible');
    expect(isClose(pts[0]!.costPerLitre, cheapest.costPerLitre, 1e-9)).toBe(true);
    expect(isClose(pts.at(-1)!.anilinePoint, solvent.anilinePoint!, 1e-6)).toBe(true);
    for (let i = 1; i < pts.length; i++) {
      expect(pts[i]!.costPerLitre).toBeGreaterThan(pts[i - 1]!.costPerLitre);
      expect(pts[i]!.anilinePoint).toBeLessThan(pts[i - 1]!.anilinePoint);
    }
  });

  it('every point meets its ε and the targets when recomputed by the core', () => {
    // recomputation by predictBlend; tolerances of issue 3 item 7
    const pts = epsilonConstraintSweep({ components: lib, targets, componentIds: ids });
    for (const p of pts) {
      const pr = predictBlend(lib, p.lines);
      expect(pr.anilinePoint!.value).toBeLessThanOrEqual(p.anilineLimit + 0.01);
      expect(pr.kv40).toBeGreaterThanOrEqual(304 * (1 - 1e-4)); // VG 320 mid 320 − 5 % (ISO 3448 band 288–352)
      expect(pr.kv40).toBeLessThanOrEqual(336 * (1 + 1e-4));
      expect(p.lines.find((l) => l.componentId === 'add')!.massFraction).toBeCloseTo(0.02, 5);
    }
  });

  it('gives no points for a combination that cannot reach the grade, and rejects unknown ids', () => {
    // Group II neutrals alone cannot make VG 320 (check-values.md §6)
    expect(epsilonConstraintSweep({ components: lib, targets, componentIds: ['g2heavy', 'an12'] })).toEqual([]);
    expect(() => epsilonConstraintSweep({ components: lib, targets, componentIds: ['nope'] })).toThrow(/nope/);
    expect(() => epsilonConstraintSweep({ components: lib, targets, componentIds: ids, steps: 1 })).toThrow(/steps/);
  });
});
