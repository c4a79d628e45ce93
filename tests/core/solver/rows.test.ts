/**
 * Node LPs written straight into the simplex tableau (`rows.ts`, `solveNodeTableauDirect`): the
 * same tableau as the dense rows copied by `lp.ts`, so every answer must be identical.
 */
import { describe, expect, it } from 'vitest';
import { useDirectTableau } from '../../../src/core/solver/rows';
import type { PlainProblem } from '../../../src/core/solver/plain';
import { randomPlainProblem, rng } from './helpers';
import { expectSameAnswers } from './same-answers';

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
    const { optimal, infeasible, branched } = expectSameAnswers(all, useDirectTableau);
    // Both kinds of answer, and solves that needed the VI branch and bound, are among them.
    expect(optimal).toBeGreaterThan(5000);
    expect(infeasible).toBeGreaterThan(1000);
    expect(branched).toBeGreaterThan(500);
  });
});
