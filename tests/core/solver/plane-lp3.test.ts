/**
 * The three-variable vertex solver of node LPs (`plane-lp3.ts`): where it answers, it answers as
 * the dense simplex does (which tests/core/solver/yalps-simplex.test.ts checks bit for bit against
 * yalps.solve), and whole solves with it equal whole solves without it.
 */
import { describe, expect, it } from 'vitest';
import { solvePlaneLp3 } from '../../../src/core/solver/plane-lp3';
import { LpWorkspace, observeDenseLps, solveDenseLp, type DenseLp } from '../../../src/core/solver/lp';
import { useDirectLp3, useVertexLp3 } from '../../../src/core/solver/rows';
import { preparePlain, solveBlendPlain, type PlainProblem, type PlainSolveResult } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';
import { randomPlainProblem, rng } from './helpers';
import { expectSameAnswers } from './same-answers';

/** The dense simplex's answer, copied out of its workspace. */
function simplex(lp: DenseLp, ws: LpWorkspace): { status: string; x: number[]; objective: number } {
  const s = solveDenseLp(lp.sense, lp.n, lp.objective, lp.m, lp.a, lp.lo, lp.hi, ws);
  return { status: s.status, x: [...s.x], objective: s.objective };
}

/** A dense LP from rows [coefficients, lo, hi]. */
function lpOf(sense: 'minimize' | 'maximize', objective: number[], rows: [number[], number, number][]): DenseLp {
  return {
    sense,
    n: 3,
    objective: Float64Array.from(objective),
    m: rows.length,
    a: Float64Array.from(rows.flatMap((r) => r[0])),
    lo: Float64Array.from(rows.map((r) => r[1])),
    hi: Float64Array.from(rows.map((r) => r[2])),
  };
}

const INF = Number.POSITIVE_INFINITY;

/** A seeded mix of three-stock problems: VI, aniline, bounds, fixed shares, both objectives. */
function threeStockProblems(count: number, seed: number): PlainProblem[] {
  const r = rng(seed);
  const out: PlainProblem[] = [];
  for (let i = 0; i < count; i++) {
    const p = randomPlainProblem(r, { k: 3, vi: 0.5, aniline: 0.4, bounds: 0.3, objective: i % 5 === 0 ? 'solvency' : 'cost' });
    if (r() < 0.05) {
      // A fixed share (an equality row), as a treat rate is written.
      const c = p.components[Math.floor(r() * 3)]!;
      c.minMassFraction = c.maxMassFraction = 0.02 + 0.3 * r();
    }
    if (r() < 0.05) {
      // Bounds at the ends of their range (0 and 1): no rows at all.
      p.components[0]!.minMassFraction = 0;
      p.components[0]!.maxMassFraction = 1;
    }
    out.push(p);
  }
  return out;
}

describe('solvePlaneLp3 — exact LP for three variables on a normalisation plane', () => {
  it('answers small LPs as the simplex does', () => {
    // reference library: yalps' simplex (solveDenseLp, bit-identical to yalps.solve)
    const ws = new LpWorkspace();
    const cases = [
      // min y0 + 2y1 + 3y2, y0 + y1 + y2 = 1, y0 − y1 ≤ 0: the optimum y = (0.5, 0.5, 0).
      lpOf('minimize', [1, 2, 3], [[[1, 1, 1], 1, 1], [[1, -1, 0], -INF, 0]]),
      // A one-sided normalisation and a band (two rows) as the blending LPs write them.
      lpOf('minimize', [1.2, 0.9, 1.7], [[[1.1, 1.15, 1.12], 1, INF], [[-3, -1, 4], 0, INF], [[-4, -2, 3], -INF, 0]]),
      lpOf('maximize', [3, 1, 2], [[[1, 1, 1], 1, 1], [[1, -2, 0.5], 0, 0]]),
      // Infeasible: y0 ≥ 0 rows that only y = 0 meets on the plane.
      lpOf('minimize', [1, 1, 2], [[[1, 1, 1], 1, 1], [[-1, -1, -1], 0, INF]]),
    ];
    for (const lp of cases) {
      const mine = solvePlaneLp3(lp.sense, lp.objective, lp.m, lp.a, lp.lo, lp.hi);
      expect(mine).not.toBeNull();
      const ref = simplex(lp, ws);
      expect(mine!.status).toBe(ref.status);
      expect([...mine!.x]).toEqual(ref.x);
      if (ref.status === 'optimal') expect(mine!.objective).toBe(ref.objective);
    }
    const first = solvePlaneLp3('minimize', [1, 2, 3], 2, cases[0]!.a, cases[0]!.lo, cases[0]!.hi)!;
    // worked by hand (common practice (no source)): the vertex (0.5, 0.5, 0) costs 1.5
    expect([...first.x]).toEqual([0.5, 0.5, 0]);
    expect(first.objective).toBe(1.5);
  });

  it('hands ties, slivers and other shapes of LP to the simplex', () => {
    // Every vertex of the triangle costs the same: the simplex's pivot rules choose.
    expect(solvePlaneLp3('minimize', [1, 1, 1], 1, [1, 1, 1], [1], [1])).toBeNull();
    // A feasible set 1e-8 wide (y0 − y1 between 0 and a hair): not decided here.
    expect(solvePlaneLp3('minimize', [1, 2, 3], 3, [1, 1, 1, 1, -1, 0, 1, -1 + 3e-8, 0], [1, 0, -INF], [1, INF, 0])).toBeNull();
    // Row 0 not a normalisation with every coefficient > 0, a row with a non-zero bound, a
    // one-sided normalisation when maximising.
    expect(solvePlaneLp3('minimize', [1, 2, 3], 1, [1, 0, 1], [1], [1])).toBeNull();
    expect(solvePlaneLp3('minimize', [1, 2, 3], 2, [1, 1, 1, 1, 0, 0], [1, -INF], [1, 0.5])).toBeNull();
    expect(solvePlaneLp3('maximize', [1, 2, 3], 1, [1, 1, 1], [1], [INF])).toBeNull();
  });

  it('answers every node LP of 3,000 seeded three-stock problems exactly as the simplex, and decides almost all', () => {
    // reference library: yalps' simplex (solveDenseLp, bit-identical to yalps.solve)
    const lps: DenseLp[] = [];
    let list = lps;
    const before = observeDenseLps((lp) => {
      if (lp.n === 3) list.push(lp);
    });
    // The LPs of least-cost solves alone (the hot path), then every LP of the plain API (the
    // diagnosis of infeasible problems included: its LPs that maximise a coordinate with a 1e-6
    // weight on another are near-ties by design, left to the simplex).
    const costLps: DenseLp[] = [];
    try {
      list = costLps;
      for (const p of threeStockProblems(1000, 3102)) if (p.objective === 'cost') solvePrepared(preparePlain(p));
      list = lps;
      for (const p of threeStockProblems(3000, 3101)) solveBlendPlain(p);
    } finally {
      observeDenseLps(before);
    }
    const decides = (lp: DenseLp) => solvePlaneLp3(lp.sense, lp.objective, lp.m, lp.a, lp.lo, lp.hi) !== null;
    expect(costLps.filter(decides).length / costLps.length).toBeGreaterThan(0.99);
    const ws = new LpWorkspace();
    let decided = 0;
    let identical = 0;
    for (const lp of lps) {
      const mine = solvePlaneLp3(lp.sense, lp.objective, lp.m, lp.a, lp.lo, lp.hi);
      if (!mine) continue;
      decided++;
      const status = mine.status;
      const x = [...mine.x];
      const objective = mine.objective;
      const ref = simplex(lp, ws);
      expect(status).toBe(ref.status);
      // Both round to the simplex's step of 1e-8; their last floating-point digits can fall on
      // either side of a rounding boundary, so one step apart at most (and rarely).
      const step = 1e-8 + (ref.status === 'optimal' ? 1e-12 * Math.abs(ref.objective) : 0);
      for (let j = 0; j < 3; j++) expect(Math.abs(x[j]! - ref.x[j]!)).toBeLessThanOrEqual(step);
      if (ref.status === 'optimal') expect(Math.abs(objective - ref.objective)).toBeLessThanOrEqual(step);
      if (x.every((v, j) => v === ref.x[j]) && (ref.status !== 'optimal' || objective === ref.objective)) identical++;
    }
    expect(lps.length).toBeGreaterThan(3000);
    expect(decided / lps.length).toBeGreaterThan(0.9);
    expect(identical / decided).toBeGreaterThan(0.999);
  });
});

describe('three-stock node LPs written straight into the vertex solver', () => {
  it('give the same answers bit for bit on 20,000 seeded problems as the dense rows read back', () => {
    // common practice (no source): the direct rows are the dense rows' numbers by the same
    // arithmetic, so every answer, LP count and reason must be identical, not merely close
    const { optimal, infeasible } = expectSameAnswers(threeStockProblems(20_000, 2211), useDirectLp3);
    expect(optimal).toBeGreaterThan(5000);
    expect(infeasible).toBeGreaterThan(1000);
  });
});

describe('three-stock solves with and without the three-stock path', () => {
  it('give the same answers on 20,000 seeded problems (fractions to 1e-9, the same reasons)', () => {
    // common practice (no source): the special path (vertex LPs, the floor LP before the root
    // relaxation) must not change any answer of the general one (simplex, root relaxation)
    const problems = threeStockProblems(20_000, 2112);
    const solveAll = (on: boolean): PlainSolveResult[] => {
      const before = useVertexLp3(on);
      try {
        return problems.map((p) => solveBlendPlain(p));
      } finally {
        useVertexLp3(before);
      }
    };
    const withIt = solveAll(true);
    const without = solveAll(false);
    let optimal = 0;
    let infeasible = 0;
    let withVi = 0;
    for (let q = 0; q < problems.length; q++) {
      const a = withIt[q]!;
      const b = without[q]!;
      expect(a.status).toBe(b.status);
      if (a.status === 'infeasible' && b.status === 'infeasible') {
        infeasible++;
        expect(a.reason).toBe(b.reason);
        continue;
      }
      if (a.status !== 'optimal' || b.status !== 'optimal') continue;
      optimal++;
      if (problems[q]!.minVi !== undefined) withVi++;
      for (const id of Object.keys(b.massFractions)) expect(Math.abs(a.massFractions[id]! - b.massFractions[id]!)).toBeLessThanOrEqual(1e-9);
      expect(Math.abs(a.costPerLitre - b.costPerLitre)).toBeLessThanOrEqual(1e-9 * b.costPerLitre);
      expect(Math.abs(a.vi - b.vi)).toBeLessThanOrEqual(1e-6);
    }
    // Both kinds of answer, with and without a minimum VI, are among them.
    expect(optimal).toBeGreaterThan(5000);
    expect(infeasible).toBeGreaterThan(1000);
    expect(withVi).toBeGreaterThan(2000);
  });

  it('settle some infeasible problems by the floor LP, without the root relaxation', () => {
    // common practice (no source): the floor LP is a relaxation, so it only ever proves infeasibility
    const problems = threeStockProblems(4000, 77).filter((p) => p.minVi !== undefined && p.objective === 'cost');
    let settled = 0;
    for (const p of problems) {
      const before = useVertexLp3(false);
      const G = preparePlain(p);
      const general = solvePrepared(G);
      useVertexLp3(true);
      const S = preparePlain(p);
      const special = solvePrepared(S);
      useVertexLp3(before);
      expect(special.status).toBe(general.status);
      if (G.cache.viRoot !== undefined && S.cache.viRoot === undefined) {
        settled++;
        expect(special.status).toBe('infeasible');
      }
    }
    expect(settled).toBeGreaterThan(20);
  });
});
