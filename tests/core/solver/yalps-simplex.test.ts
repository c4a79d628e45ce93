/**
 * The copy of yalps' simplex (src/core/solver/yalps-simplex.ts) stays yalps' simplex: the installed
 * package is the version it was copied from, with the same simplex text in its build, and
 * `solveDenseLp` (which writes its own tableau and runs the copy) answers exactly as `yalps.solve`
 * answers the same model — status, every variable and the objective, bit for bit.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { solve, type Coefficients, type Constraint } from 'yalps';
import { LpWorkspace, observeDenseLps, solveDenseLp, type DenseLp, type LpSolution } from '../../../src/core/solver/lp';
import { solveBlendPlain } from '../../../src/core/solver/plain';
import { randomPlainProblem, rng } from './helpers';

const YALPS = join(__dirname, '..', '..', '..', 'node_modules', 'yalps');

/** The model `solveDenseLp` used to hand to `yalps.solve` (rows 0…m−1, objective key −1), and its answer. */
function viaYalps(
  sense: 'minimize' | 'maximize',
  n: number,
  objective: ArrayLike<number>,
  m: number,
  a: ArrayLike<number>,
  lo: ArrayLike<number>,
  hi: ArrayLike<number>,
): LpSolution {
  const constraints: [number, Constraint][] = [];
  for (let r = 0; r < m; r++) {
    const l = lo[r]!;
    const u = hi[r]!;
    const hasLo = l > Number.NEGATIVE_INFINITY;
    const hasHi = u < Number.POSITIVE_INFINITY;
    if (hasLo && hasHi) constraints.push([r, l === u ? { equal: l } : { min: l, max: u }]);
    else if (hasLo) constraints.push([r, { min: l }]);
    else if (hasHi) constraints.push([r, { max: u }]);
  }
  const variables: [number, Coefficients<number>][] = [];
  for (let j = 0; j < n; j++) {
    const coefs: [number, number][] = [];
    if (objective[j]! !== 0) coefs.push([-1, objective[j]!]);
    for (let r = 0; r < m; r++) if (a[r * n + j]! !== 0) coefs.push([r, a[r * n + j]!]);
    variables.push([j, coefs]);
  }
  const model = { direction: sense, objective: -1, constraints, variables } as const;
  let sol = solve<number, number>(model, { precision: 1e-8 });
  if (sol.status === 'cycled') sol = solve<number, number>(model, { precision: 1e-8, checkCycles: true });
  const x = new Float64Array(n);
  if (sol.status !== 'optimal') {
    const status = sol.status === 'infeasible' ? 'infeasible' : sol.status === 'unbounded' ? 'unbounded' : 'failed';
    return { status, x, objective: Number.NaN };
  }
  for (const [j, v] of sol.variables) x[j] = v;
  return { status: 'optimal', x, objective: sol.result };
}

interface RandomLp {
  sense: 'minimize' | 'maximize';
  n: number;
  c: Float64Array;
  m: number;
  a: Float64Array;
  lo: Float64Array;
  hi: Float64Array;
}

/** Random LPs: blending-shaped (homogeneous rows and one normalisation row) or general, some degenerate. */
function randomLp(r: () => number): RandomLp {
  const n = 1 + Math.floor(r() * 7);
  const m = Math.floor(r() * 9);
  const blending = r() < 0.6;
  const c = new Float64Array(n);
  for (let j = 0; j < n; j++) c[j] = r() < 0.15 ? 0 : blending ? 0.5 + 4 * r() : 10 * r() - 5;
  const a = new Float64Array(m * n);
  const lo = new Float64Array(m).fill(Number.NEGATIVE_INFINITY);
  const hi = new Float64Array(m).fill(Number.POSITIVE_INFINITY);
  for (let q = 0; q < m; q++) {
    // Degenerate cases: a copy of an earlier row, an all-zero row, a zero column.
    if (q > 0 && r() < 0.1) a.copyWithin(q * n, (q - 1) * n, q * n);
    else for (let j = 0; j < n; j++) a[q * n + j] = r() < 0.2 ? 0 : blending ? 6 * r() - 3 : 10 * r() - 5;
    const kind = r();
    if (blending) {
      if (q === 0) {
        for (let j = 0; j < n; j++) a[j] = 0.9 + 0.3 * r();
        lo[0] = 1;
        if (kind < 0.5) hi[0] = 1;
      } else if (kind < 0.45) hi[q] = 0;
      else if (kind < 0.9) lo[q] = 0;
      else {
        lo[q] = 0;
        hi[q] = 0;
      }
    } else {
      const b = 10 * r() - 3;
      if (kind < 0.35) hi[q] = b;
      else if (kind < 0.7) lo[q] = b;
      else if (kind < 0.85) {
        lo[q] = b;
        hi[q] = b + 5 * r();
      } else if (kind < 0.95) {
        lo[q] = b;
        hi[q] = b;
      } // else: a row with no bound at all (ignored by both)
    }
  }
  return { sense: r() < 0.25 ? 'maximize' : 'minimize', n, c, m, a, lo, hi };
}

function expectIdentical(mine: LpSolution, ref: LpSolution, what: string): void {
  expect(mine.status, what).toBe(ref.status);
  expect(Object.is(mine.objective, ref.objective), `${what}: objective ${mine.objective} vs ${ref.objective}`).toBe(true);
  expect([...mine.x], what).toEqual([...ref.x]);
}

describe('yalps simplex copy', () => {
  it('is a copy of the installed yalps 0.6.4 simplex', () => {
    // The copy was made from yalps 0.6.4; its build's `src/util.ts` + `src/simplex.ts` section (the
    // functions copied) hashes to this value. If yalps is upgraded, compare the new section with
    // src/core/solver/yalps-simplex.ts, update the copy, then this hash.
    const pkg = JSON.parse(readFileSync(join(YALPS, 'package.json'), 'utf8')) as { version: string };
    expect(pkg.version).toBe('0.6.4');
    const dist = readFileSync(join(YALPS, 'dist', 'index.js'), 'utf8');
    const section = dist.slice(dist.indexOf('// src/util.ts'), dist.indexOf('// src/branchAndCut.ts'));
    expect(createHash('sha256').update(section).digest('hex')).toBe('66a09d826e7195ef4a769a7af995ca91c9d51e637c18695cbf6f28d8c6863791');
    // The tableau layout that writeTableau in lp.ts reproduces (`tableauModel`, src/tableau.ts).
    const tableau = dist.slice(dist.indexOf('// src/tableau.ts'), dist.indexOf('// src/util.ts'));
    expect(createHash('sha256').update(tableau).digest('hex')).toBe('088a0fe1ec3daa3a3499e4f9fb37fbd87c994e6d16b55fe9f905a915bb278779');
  });

  it('solveDenseLp answers exactly as yalps.solve on 4,000 random LPs, with and without a reused workspace', () => {
    // reference library: yalps.solve itself, on the model solveDenseLp used to build (bit-for-bit equality)
    const r = rng(2024);
    const ws = new LpWorkspace();
    const seen = { optimal: 0, infeasible: 0, unbounded: 0 };
    for (let k = 0; k < 4000; k++) {
      const p = randomLp(r);
      const ref = viaYalps(p.sense, p.n, p.c, p.m, p.a, p.lo, p.hi);
      const what = `LP ${k}: ${JSON.stringify({ ...p, c: [...p.c], a: [...p.a], lo: [...p.lo], hi: [...p.hi] })}`;
      expectIdentical(solveDenseLp(p.sense, p.n, p.c, p.m, p.a, p.lo, p.hi), ref, what);
      expectIdentical(solveDenseLp(p.sense, p.n, p.c, p.m, p.a, p.lo, p.hi, ws), ref, what);
      if (ref.status in seen) seen[ref.status as keyof typeof seen]++;
    }
    expect(seen.optimal).toBeGreaterThan(1000);
    expect(seen.infeasible).toBeGreaterThan(100);
    expect(seen.unbounded).toBeGreaterThan(50);
  });

  it('every LP of 2,000 random blending problems gets exactly yalps.solve\'s answer (seed 1919)', () => {
    // reference library: yalps.solve itself, on the very LPs the solver builds (bit-for-bit equality)
    const r = rng(1919);
    const lps: DenseLp[] = [];
    const before = observeDenseLps((lp) => lps.push(lp));
    try {
      for (let k = 0; k < 2000; k++) {
        const objective = r() < 0.2 ? 'solvency' : 'cost';
        solveBlendPlain(randomPlainProblem(r, { k: 2 + Math.floor(r() * 5), vi: 0.6, aniline: 0.4, bounds: 0.3, objective }));
      }
    } finally {
      observeDenseLps(before);
    }
    const ws = new LpWorkspace();
    for (let q = 0; q < lps.length; q++) {
      const lp = lps[q]!;
      const ref = viaYalps(lp.sense, lp.n, lp.objective, lp.m, lp.a, lp.lo, lp.hi);
      expectIdentical(solveDenseLp(lp.sense, lp.n, lp.objective, lp.m, lp.a, lp.lo, lp.hi, ws), ref, `LP ${q}`);
    }
    expect(lps.length).toBeGreaterThan(2000);
  });

  it('a workspace answer lives in the workspace until its next solve (its x: with as many variables)', () => {
    // min x0 + x1, x0 + x1 ≥ 1 → value 1 (by hand; common practice (no source))
    const ws = new LpWorkspace();
    const one = solveDenseLp('minimize', 2, [1, 1], 1, [1, 1], [1], [Infinity], ws);
    expect(one.objective).toBe(1);
    const kept = one.x.slice();
    // max x0 s.t. x0 ≤ 3, x1 ≤ 2 → x = (3, 0) (by hand)
    const two = solveDenseLp('maximize', 2, [1, 0], 2, [1, 0, 0, 1], [-Infinity, -Infinity], [3, 2], ws);
    expect(two).toBe(one); // the workspace's one answer object, overwritten
    expect(two.x).toBe(one.x); // the same buffer, overwritten
    expect([...two.x]).toEqual([3, 0]);
    expect(kept[0]! + kept[1]!).toBe(1);
  });
});
