/**
 * Test helper: whole solves with one of the solver's switches (`useDirectLp3`, `useDirectTableau`
 * in `rows.ts`) on and off, compared bit for bit — for paths that must give the very same answers.
 */
import { expect } from 'vitest';
import { preparePlain, solveBlendPlain, type PlainProblem, type PlainSolveResult } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';

interface Answer {
  status: string;
  lpCount: number;
  w: number[];
  plain: PlainSolveResult;
}

/** Every problem solved by `solvePrepared` and `solveBlendPlain` with the switch set to `on`. */
function answersWith(problems: readonly PlainProblem[], toggle: (on: boolean) => boolean, on: boolean): Answer[] {
  const before = toggle(on);
  try {
    return problems.map((p) => {
      const r = solvePrepared(preparePlain(p));
      return { status: r.status, lpCount: r.lpCount, w: r.status === 'optimal' ? [...r.massFractions] : [], plain: solveBlendPlain(p) };
    });
  } finally {
    toggle(before);
  }
}

/**
 * Expects the same status, LP count, fractions and plain answer (reasons included) for every problem
 * with the switch on and off.
 *
 * @returns how many answers were optimal, infeasible, and took more than one LP
 */
export function expectSameAnswers(
  problems: readonly PlainProblem[],
  toggle: (on: boolean) => boolean,
): { optimal: number; infeasible: number; branched: number } {
  const on = answersWith(problems, toggle, true);
  const off = answersWith(problems, toggle, false);
  const counts = { optimal: 0, infeasible: 0, branched: 0 };
  for (let q = 0; q < problems.length; q++) {
    const a = on[q]!;
    const b = off[q]!;
    expect(a.status).toBe(b.status);
    expect(a.lpCount).toBe(b.lpCount);
    expect(a.w).toEqual(b.w);
    expect(a.plain).toEqual(b.plain);
    if (a.status === 'optimal') counts.optimal++;
    else counts.infeasible++;
    if (a.lpCount > 1) counts.branched++;
  }
  return counts;
}
