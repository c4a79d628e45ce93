/**
 * Property tests of the ε-constraint sweep (src/core/search/frontier.ts) on combinations of the
 * invented demo stocks: every point meets the targets re-predicted (`predictBlend`, `checkConstraints`)
 * with its own aniline limit; the points are non-dominated, cost ascending and aniline descending;
 * the first point is the combination's least-cost blend.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { epsilonConstraintSweep } from '../../../src/core/search/frontier';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import { checkConstraints, prepareComponents, solveBlend } from '../../../src/core/solver/solve-blend';
import { demoComponents, demoTargets } from '../../../src/state/demo';
import type { BlendMethod } from '../../../src/core/blending/blend-viscosity';
import type { BlendTargets } from '../../../src/core/formulation/model';

const lib = demoComponents();
const free = lib.filter((c) => c.category !== 'additive-package' && c.availability !== 'withdrawn');
const base = Object.values(demoTargets())[0]!;

describe('epsilonConstraintSweep properties', () => {
  it('points meet the targets, are non-dominated and ordered; the first is the least-cost blend', () => {
    fc.assert(
      fc.property(
        fc.subarray(free.map((c) => c.id), { minLength: 2, maxLength: 4 }),
        fc.constantFrom(150, 220, 320, 460, 680),
        fc.option(fc.integer({ min: 100, max: 135 }), { nil: null }),
        fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'),
        fc.integer({ min: 2, max: 8 }),
        (ids, grade, maxAniline, method, steps) => {
          const targets: BlendTargets = { ...base, grade, maxAnilinePoint: maxAniline, referenceRecipeId: null };
          const pts = epsilonConstraintSweep({ components: lib, targets, componentIds: ids, method, steps });
          if (pts.length === 0) return;
          for (const p of pts) {
            const q = predictBlend(lib, p.lines, { method });
            const P = prepareComponents(lib, { ...targets, maxAnilinePoint: Math.min(p.anilineLimit, maxAniline ?? p.anilineLimit) }, method);
            expect(checkConstraints(P, p.lines, q).filter((c) => !c.ok)).toEqual([]);
            for (const l of p.lines) expect([...ids, base.additive!.componentId]).toContain(l.componentId);
          }
          for (let k = 1; k < pts.length; k++) {
            expect(pts[k]!.costPerLitre).toBeGreaterThanOrEqual(pts[k - 1]!.costPerLitre);
            expect(pts[k]!.anilinePoint).toBeLessThan(pts[k - 1]!.anilinePoint);
          }
          const only = lib.map((c) => (ids.includes(c.id) || c.category === 'additive-package' ? c : { ...c, availability: 'withdrawn' as const }));
          const s = solveBlend({ components: only, targets: { ...targets, objective: 'cost' }, method });
          expect(s.status).toBe('optimal');
          if (s.status === 'optimal') {
            // relative 1e-7: LP optima rounded to 1e-8, common practice (no source)
            expect(Math.abs(pts[0]!.costPerLitre - s.properties.costPerLitre!)).toBeLessThanOrEqual(1e-7 * s.properties.costPerLitre!);
          }
        },
      ),
      { numRuns: 120 },
    );
  });
});
