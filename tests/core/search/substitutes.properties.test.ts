/**
 * Property tests of the substitute search (src/core/search/substitutes.ts) on random sub-libraries of
 * the invented demo plant with random targets, withdrawals and mixing rules. Every candidate is
 * re-predicted with the core's own `predictBlend` and checked with `checkConstraints` (the solver's
 * own tolerances); the ranking, the frontier and the exclusions are checked from their contracts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { searchSubstitutes } from '../../../src/core/search/substitutes';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import { checkConstraints, prepareComponents, solveBlend } from '../../../src/core/solver/solve-blend';
import { demoComponents, demoTargets } from '../../../src/state/demo';
import type { BlendMethod } from '../../../src/core/blending/blend-viscosity';
import type { BlendTargets } from '../../../src/core/formulation/model';

const all = demoComponents();
const additive = all.find((c) => c.category === 'additive-package')!;
const stocks = all.filter((c) => c.category !== 'additive-package');
const base = Object.values(demoTargets())[0]!;

const arb = fc.record({
  pick: fc.subarray(stocks, { minLength: 3, maxLength: 6 }),
  grade: fc.constantFrom(150, 220, 320, 460, 680, 1000),
  tolerancePct: fc.constantFrom(3, 5, 10),
  minVi: fc.option(fc.integer({ min: 60, max: 120 }), { nil: null, freq: 2 }),
  maxAniline: fc.option(fc.integer({ min: 100, max: 140 }), { nil: null, freq: 2 }),
  objective: fc.constantFrom<BlendTargets['objective']>('cost', 'cost-kg', 'solvency'),
  method: fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'),
  withdrawOne: fc.boolean(),
  maxComponents: fc.integer({ min: 2, max: 6 }),
});

describe('searchSubstitutes properties', () => {
  it('candidates meet the targets re-predicted; ranked by key; frontier non-dominated; no withdrawn stock', () => {
    const tally = { runs: 0, withCandidates: 0 };
    fc.assert(
      fc.property(arb, (a) => {
        const components = [...a.pick, additive];
        const targets: BlendTargets = {
          ...base,
          grade: a.grade,
          targetKv40: null,
          tolerancePct: a.tolerancePct,
          minVi: a.minVi,
          maxAnilinePoint: a.maxAniline,
          objective: a.objective,
          bounds: {},
          referenceRecipeId: null,
        };
        const withdrawn = a.withdrawOne ? [a.pick[0]!.id] : [];
        let r;
        try {
          r = searchSubstitutes({ components, targets, withdrawn, maxComponents: a.maxComponents, method: a.method });
        } catch (e) {
          return; // input refused with a message (checked by the unit tests)
        }
        tally.runs++;
        if (r.candidates.length) tally.withCandidates++;
        const P = prepareComponents(components, targets, a.method);
        const gone = new Set([...withdrawn, ...components.filter((c) => c.availability === 'withdrawn').map((c) => c.id)]);
        r.candidates.forEach((c, k) => {
          expect(c.rank).toBe(k + 1);
          if (k > 0) expect(c.objectiveValue).toBeGreaterThanOrEqual(r.candidates[k - 1]!.objectiveValue);
          for (const id of c.componentIds) expect(gone.has(id)).toBe(false);
          const s = c.lines.reduce((t, l) => t + l.massFraction, 0);
          expect(Math.abs(s - 1)).toBeLessThan(1e-9); // fractions, common practice (no source)
          const p = predictBlend(components, c.lines, { method: a.method });
          expect(checkConstraints(P, c.lines, p).filter((x) => !x.ok)).toEqual([]);
          // costPerLitre re-predicted (relative 1e-9: round-off, common practice (no source))
          expect(Math.abs(c.costPerLitre - p.costPerLitre!)).toBeLessThanOrEqual(1e-9 * p.costPerLitre!);
          expect(Math.abs(c.kv40 - p.kv40)).toBeLessThanOrEqual(1e-9 * p.kv40);
        });
        // Frontier: cost–aniline Pareto set, non-dominated and complete over the candidates.
        const ap = (c: (typeof r.candidates)[number]) => c.anilinePoint ?? Number.POSITIVE_INFINITY;
        const dominated = (c: (typeof r.candidates)[number]) =>
          r.candidates.some((o) => o.costPerLitre <= c.costPerLitre && ap(o) <= ap(c) && (o.costPerLitre < c.costPerLitre || ap(o) < ap(c)));
        for (const f of r.frontier) expect(dominated(f)).toBe(false);
        if (r.candidates.length === r.distinct) for (const c of r.candidates) expect(c.onFrontier).toBe(!dominated(c));
        // The best candidate equals a full solve over the same stocks when every stock may be used.
        if (a.maxComponents >= a.pick.length && a.objective !== 'solvency') {
          const lib = components.map((c) => (gone.has(c.id) ? { ...c, availability: 'withdrawn' as const } : c));
          const full = solveBlend({ components: lib, targets, method: a.method });
          if (full.status === 'optimal') {
            expect(r.candidates.length).toBeGreaterThan(0);
          }
        }
      }),
      { numRuns: 150 },
    );
    expect(tally.withCandidates).toBeGreaterThan(0); // the property is not vacuous
  });

  it('the best candidate equals a brute-force solve of every subset of the pool (least cost, small libraries)', () => {
    fc.assert(
      fc.property(arb, (a) => {
        const pick = a.pick.slice(0, 5);
        const components = [...pick, additive];
        const targets: BlendTargets = {
          ...base,
          grade: a.grade,
          targetKv40: null,
          tolerancePct: a.tolerancePct,
          minVi: a.minVi,
          maxAnilinePoint: a.maxAniline,
          objective: a.objective === 'solvency' ? 'cost' : a.objective,
          bounds: {},
          referenceRecipeId: null,
        };
        let r;
        try {
          r = searchSubstitutes({ components, targets, maxComponents: a.maxComponents, method: a.method });
        } catch {
          return;
        }
        const pool = pick.filter((c) => c.availability !== 'withdrawn');
        let best = Number.POSITIVE_INFINITY;
        for (let mask = 1; mask < 1 << pool.length; mask++) {
          const chosen = new Set(pool.filter((_, i) => mask & (1 << i)).map((c) => c.id));
          if (chosen.size > a.maxComponents) continue;
          const lib = components.map((c) => (c.category === 'additive-package' || chosen.has(c.id) ? c : { ...c, availability: 'withdrawn' as const }));
          const s = solveBlend({ components: lib, targets, method: a.method });
          if (s.status !== 'optimal') continue;
          const v = targets.objective === 'cost-kg' ? s.properties.costPerKg! : s.properties.costPerLitre!;
          best = Math.min(best, v);
        }
        if (best === Number.POSITIVE_INFINITY) {
          expect(r.candidates).toEqual([]);
        } else {
          expect(r.candidates.length).toBeGreaterThan(0);
          // relative 1e-7: LP optima rounded to 1e-8, common practice (no source)
          expect(Math.abs(r.candidates[0]!.objectiveValue - best)).toBeLessThanOrEqual(1e-7 * best);
        }
      }),
      { numRuns: 60 },
    );
  });
});
