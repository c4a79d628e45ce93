/**
 * Node LPs written straight into the simplex tableau (`rows.ts`, `solveNodeTableauDirect`): the
 * same tableau as the dense rows copied by `lp.ts`, so every answer must be identical.
 */
import { describe, expect, it } from 'vitest';
import { useDirectTableau } from '../../../src/core/solver/rows';
import { preparePlain, solveBlendPlain, type PlainProblem } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';
import { randomPlainProblem, rng } from './helpers';

/** Seeded problems of `k` stocks: VI, aniline, bounds (which keep the dense rows), both objectives. */
function problems(count: number, k: number, seed: number): PlainProblem[] {
  const r = rng(seed);
  const out: PlainProblem[] = [];
  for (let i = 0; i < count; i++) {
    out.push(randomPlainProblem(r, { k, vi: 0.5, aniline: 0.4, bounds: 0.2, objective: i % 5 === 0 ? 'solvency' : 'cost' }));
  }
  return out;
}

describe('node LPs with their tableau written directly', () => {
  it('give the same answers bit for bit as the dense rows copied into the tableau (20,000 seeded problems of 2, 4 and 5 stocks)', () => {
    // common practice (no source): the direct tableau holds the dense rows' numbers, each computed
    // and copied by the same arithmetic, so the simplex pivots alike: every answer, LP count and
    // reason must be identical, not merely close
    const all = [...problems(2000, 2, 41), ...problems(15_000, 4, 42), ...problems(3000, 5, 43)];
    const solveAll = (on: boolean) => {
      const before = useDirectTableau(on);
      try {
        return all.map((p) => {
          const r = solvePrepared(preparePlain(p));
          return { status: r.status, lpCount: r.lpCount, w: r.status === 'optimal' ? [...r.massFractions] : [], plain: solveBlendPlain(p) };
        });
      } finally {
        useDirectTableau(before);
      }
    };
    const direct = solveAll(true);
    const dense = solveAll(false);
    let optimal = 0;
    let infeasible = 0;
    let branched = 0;
    for (let q = 0; q < all.length; q++) {
      const a = direct[q]!;
      const b = dense[q]!;
      expect(a.status).toBe(b.status);
      expect(a.lpCount).toBe(b.lpCount);
      expect(a.w).toEqual(b.w);
      expect(a.plain).toEqual(b.plain);
      if (a.status === 'optimal') optimal++;
      else infeasible++;
      if (a.lpCount > 1) branched++;
    }
    // Both kinds of answer, and solves that needed the VI branch and bound, are among them.
    expect(optimal).toBeGreaterThan(5000);
    expect(infeasible).toBeGreaterThan(1000);
    expect(branched).toBeGreaterThan(500);
  });
});
