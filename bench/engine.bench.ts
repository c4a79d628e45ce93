/**
 * Bench: the blend solver, one set of lines per problem size (3 and 4 stocks), on the same seeded
 * random problems (ν40 band, sometimes a minimum VI and a maximum aniline point; least cost per
 * litre), against two baselines:
 *
 * - the honest 1 %-step grid: every blending number (Refutas VBN at 40 and 100 °C, 1/ρ, price,
 *   aniline term) precomputed once per problem, and every sum carried along the loops as a running
 *   sum (one addition per sum per grid point, no inner loop over the stocks); the band and aniline
 *   limit checked in VBN space (no exp/log), cost per litre computed, and the VI (ASTM D2270, the
 *   core's arithmetic without its input checks, as the solver evaluates it) only for points that
 *   are in band and cheaper than the best so far; one loop function per size, so each is compiled
 *   for its own size. The fastest grid over the same points we know how to write;
 * - HiGHS (WebAssembly build, the test-only oracle) solving the very LPs the solver solves for each
 *   problem (recorded with `observeDenseLps`, handed over as structured models to one persistent
 *   HiGHS instance; building the models is not timed). HiGHS is spared the branch and bound, the VI
 *   evaluations and the recomputation of the blend, so the ratio favours HiGHS.
 *
 * Lines per size: speed ratio against the grid (solver timed with validation and preparation,
 * `preparePlain` + `solvePrepared`, as the grid does its own precomputation; goals ≥ 10× at 3
 * stocks, ≥ 300× at 4), speed ratio against HiGHS (goal ≥ 100×), the solver's time per solve of a
 * prepared problem, as the substitute search calls it (goal ≤ 2 µs), and per LP. Then the solver's
 * worst cost against the grid's best feasible point (goal ≤ 0 %).
 *
 * Times are CPU time of this process (the machine is shared), each side's fastest of 25 rounds
 * (the same rule for every side; the sides take turns round by round, so a burst of load from other
 * work falls on all of them alike), all sides measured in the same run: compare the ratios, not the
 * absolute times, across runs. Each round starts with the young generation collected (untimed), and
 * the solver's rounds end with a timed collection of their own garbage (see {@link cpuMs}): no side
 * pays for another's garbage, and the solver pays for all of its own. Problems are random but seeded (the same every run); stocks are
 * invented around generic typicals (from memory, tests/reference/base-stock-typicals.md).
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { refutasVbn } from '../src/core/blending/refutas';
import { viscosityIndexUnchecked } from '../src/core/viscosity/viscosity-index';
import { blendCoordinates } from '../src/core/solver/coordinates';
import { ISO_GRADES } from '../src/core/viscosity/iso-grades';
import { solveBlendPlain, preparePlain, type PlainComponent, type PlainProblem } from '../src/core/solver/plain';
import { solvePrepared } from '../src/core/solver/engine';
import { observeDenseLps, type DenseLp } from '../src/core/solver/lp';
import type { BenchLine } from './types';
import { rng, typicalsAt } from './fixtures/random-problems';

/** Refutas coordinates: ν from VBN with the core's arithmetic (no checks). */
const REFUTAS = blendCoordinates('refutas');

// Rows 0–11 of the shared typicals: the selection these seeds were drawn from.
const TYPICALS = typicalsAt([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);

/** Random problems with `k` components, seeded. */
export function randomProblems(count: number, k: number, seed: number): PlainProblem[] {
  const r = rng(seed);
  const out: PlainProblem[] = [];
  while (out.length < count) {
    const picks = new Set<number>();
    while (picks.size < k) picks.add(Math.floor(r() * TYPICALS.length));
    const components: PlainComponent[] = [...picks].map((t, i) => {
      const [kv40, kv100, rho, ap] = TYPICALS[t]!;
      const f = 0.9 + 0.2 * r();
      return {
        id: `s${i}`,
        kv40: kv40 * f,
        kv100: kv100 * (0.95 + 0.1 * r()) * f ** 0.6,
        density15: rho,
        anilinePoint: ap + 10 * (r() - 0.5),
        pricePerKg: 0.9 + 4 * r(),
      };
    });
    const lo = Math.min(...components.map((c) => c.kv40));
    const hi = Math.max(...components.map((c) => c.kv40));
    const grades = ISO_GRADES.filter((g) => g.grade >= 100 && g.mid > lo && g.mid < hi);
    if (grades.length === 0) continue;
    const grade = grades[Math.floor(r() * grades.length)]!;
    const p: PlainProblem = { components, targetKv40: grade.mid, tolerancePct: 5, objective: 'cost' };
    if (r() < 0.5) p.minVi = 90 + 30 * r();
    if (r() < 0.3) p.maxAnilinePoint = 110 + 20 * r();
    out.push(p);
  }
  return out;
}

/** A grid problem's precomputed numbers (see {@link gridSearch}). */
interface GridSetup {
  n: number;
  /** Refutas VBN at 100 °C per stock (for the VI of a candidate point). */
  v100: number[];
  /** Band in per-cent VBN units: 100·X(ν_lo), 100·X(ν_hi). */
  A: number;
  B: number;
  minVi: number | undefined;
  /** Steps of the running sums (moving 1 % from the last stock to stock i) and their start. */
  dx: number[];
  dv: number[];
  ds: number[];
  dt: number[];
  x0: number;
  vv0: number;
  s0: number;
  t0: number;
}

/** The grid's precomputation: every blending number once per problem. */
function gridSetup(p: PlainProblem): GridSetup {
  const n = p.components.length;
  if (n !== 3 && n !== 4) throw new Error('grid search: 3 or 4 components only');
  const cs = p.components;
  const v40 = cs.map((c) => refutasVbn(c.kv40));
  const v100 = cs.map((c) => refutasVbn(c.kv100));
  const inv = cs.map((c) => 1 / c.density15);
  const price = cs.map((c) => c.pricePerKg);
  const apMax = p.maxAnilinePoint;
  const apT = cs.map((c, i) => (apMax === undefined ? 0 : inv[i]! * (c.anilinePoint - apMax)));
  const last = n - 1;
  // Sums: x = 100·X40, v = 100·Σw/ρ, s = 100·Σw·p, t = 100·Σ aniline term (w in per cent).
  return {
    n,
    v100,
    A: 100 * refutasVbn(p.targetKv40 * (1 - p.tolerancePct / 100)),
    B: 100 * refutasVbn(p.targetKv40 * (1 + p.tolerancePct / 100)),
    minVi: p.minVi,
    dx: v40.map((x) => x - v40[last]!),
    dv: inv.map((x) => x - inv[last]!),
    ds: price.map((x) => x - price[last]!),
    dt: apT.map((x) => x - apT[last]!),
    x0: 100 * v40[last]!,
    vv0: 100 * inv[last]!,
    s0: 100 * price[last]!,
    t0: 100 * apT[last]!,
  };
}

/**
 * The VI test of an in-band point cheaper than the best so far (w in per cent; x = 100·X40): ν from
 * VBN and the VI by ASTM D2270 with the core's arithmetic, without the input checks (the numbers
 * are valid by construction; the solver's own VI checks skip them too), so that the grid's many VI
 * evaluations cost what they must.
 */
function gridViOk(g: GridSetup, x: number, w0: number, w1: number, w2: number, w3: number): boolean {
  const minVi = g.minVi;
  if (minVi === undefined) return true;
  const v100 = g.v100;
  const x100 = (w0 * v100[0]! + w1 * v100[1]! + w2 * v100[2]! + (g.n === 4 ? w3 * v100[3]! : 0)) / 100;
  const kv100 = REFUTAS.toKvRaw(x100);
  if (!(kv100 >= 2)) return false;
  const kv40 = REFUTAS.toKvRaw(x / 100);
  return kv100 < kv40 && viscosityIndexUnchecked(kv40, kv100) >= minVi;
}

/** The 3-stock grid (its own function, so that its compiled code serves this size alone). */
function gridLoop3(g: GridSetup): number {
  const { A, B, dx, dv, ds, dt } = g;
  const dx1 = dx[1]!, dv1 = dv[1]!, ds1 = ds[1]!, dt1 = dt[1]!;
  let best = Number.POSITIVE_INFINITY;
  let xa = g.x0, va = g.vv0, sa = g.s0, ta = g.t0;
  for (let a = 0; a <= 100; a++) {
    let x = xa, v = va, s = sa, t = ta;
    for (let b = 0; a + b <= 100; b++) {
      if (x >= A && x <= B && t <= 0 && s < best * v && gridViOk(g, x, a, b, 100 - a - b, 0)) best = s / v;
      x += dx1;
      v += dv1;
      s += ds1;
      t += dt1;
    }
    xa += dx[0]!;
    va += dv[0]!;
    sa += ds[0]!;
    ta += dt[0]!;
  }
  return best;
}

/** The 4-stock grid (its own function, as {@link gridLoop3}). */
function gridLoop4(g: GridSetup): number {
  const { A, B, dx, dv, ds, dt } = g;
  const dx2 = dx[2]!, dv2 = dv[2]!, ds2 = ds[2]!, dt2 = dt[2]!;
  let best = Number.POSITIVE_INFINITY;
  let xa = g.x0, va = g.vv0, sa = g.s0, ta = g.t0;
  for (let a = 0; a <= 100; a++) {
    let xb = xa, vb = va, sb = sa, tb = ta;
    for (let b = 0; a + b <= 100; b++) {
      let x = xb, v = vb, s = sb, t = tb;
      for (let c = 0; a + b + c <= 100; c++) {
        if (x >= A && x <= B && t <= 0 && s < best * v && gridViOk(g, x, a, b, c, 100 - a - b - c)) best = s / v;
        x += dx2;
        v += dv2;
        s += ds2;
        t += dt2;
      }
      xb += dx[1]!;
      vb += dv[1]!;
      sb += ds[1]!;
      tb += dt[1]!;
    }
    xa += dx[0]!;
    va += dv[0]!;
    sa += ds[0]!;
    ta += dt[0]!;
  }
  return best;
}

/**
 * Best cost per litre on the 1 %-step grid (3 or 4 stocks), every sum a running sum; null when no
 * grid point is feasible. Sums are kept in "per cent" units (Σ wᵢ·100·vᵢ) and compared with the
 * limits × 100. Each size has its own loop function, so V8 compiles each for its size alone (one
 * function for both sizes was compiled now for one, now for the other: 3-stock problems took
 * 22 µs or 14 µs depending on the order of its background compiles).
 */
export function gridSearch(p: PlainProblem): number | null {
  const g = gridSetup(p);
  const best = g.n === 3 ? gridLoop3(g) : gridLoop4(g);
  return Number.isFinite(best) ? best : null;
}

/**
 * A minor garbage collection (V8's scavenge of the young generation). Node exposes `gc` only with
 * --expose-gc; the flag set at run time makes it available to a new context.
 */
setFlagsFromString('--expose-gc');
const minorGc = runInNewContext('gc') as (options: { type: 'minor' }) => void;

/**
 * CPU time of this process spent in f [ms] (user + system). Every round starts with the young
 * generation collected, untimed, so that no side pays for collecting what the side before it left
 * (HiGHS's JavaScript glue leaves model and result objects there, whose copying fell on the next
 * side that allocates — the solver's round, by 0.05–0.1 µs per 3-stock problem; the grid
 * allocates almost nothing in its loops). With `ownGarbage` the round also ends with a timed
 * collection, so that it pays for all the garbage it made (the solver's sides; a collection costs
 * 0.05–0.08 ms, so this errs against the solver).
 */
function cpuMs(f: () => void, ownGarbage = false): number {
  minorGc({ type: 'minor' });
  const c0 = process.cpuUsage();
  f();
  if (ownGarbage) minorGc({ type: 'minor' });
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1000;
}

interface HighsModel {
  options: { set(values: Record<string, boolean | number | string>): unknown };
  passModel(m: unknown): unknown;
  run(): unknown;
  getModelStatus(): number;
  getObjectiveValue(): number;
  dispose(): void;
}
interface HighsRuntime {
  createModel(): HighsModel;
  infinity: number;
  constants: { objectiveSense: { minimize: unknown; maximize: unknown }; modelStatus: { optimal: number } };
}

/** The HiGHS model of one recorded LP (rows in CSR form; variables ≥ 0). */
function highsModelOf(h: HighsRuntime, lp: DenseLp): unknown {
  const starts = [0];
  const indices: number[] = [];
  const values: number[] = [];
  for (let r = 0; r < lp.m; r++) {
    for (let j = 0; j < lp.n; j++) {
      const v = lp.a[r * lp.n + j]!;
      if (v !== 0) {
        indices.push(j);
        values.push(v);
      }
    }
    starts.push(indices.length);
  }
  const inf = h.infinity;
  return {
    numCols: lp.n,
    numRows: lp.m,
    sense: lp.sense === 'minimize' ? h.constants.objectiveSense.minimize : h.constants.objectiveSense.maximize,
    colCost: Float64Array.from(lp.objective),
    colLower: new Float64Array(lp.n),
    colUpper: new Float64Array(lp.n).fill(inf),
    rowLower: Float64Array.from(lp.lo, (x) => (x === Number.NEGATIVE_INFINITY ? -inf : x)),
    rowUpper: Float64Array.from(lp.hi, (x) => (x === Number.POSITIVE_INFINITY ? inf : x)),
    matrix: { format: 'csr', numRows: lp.m, numCols: lp.n, starts: Int32Array.from(starts), indices: Int32Array.from(indices), values: Float64Array.from(values) },
  };
}

export async function run(): Promise<BenchLine[]> {
  const mod = (await import('highs')) as unknown as { default: () => Promise<HighsRuntime> };
  const highs = await mod.default();
  const hm = highs.createModel();
  hm.options.set({ output_flag: false });
  const ROUNDS = 25;
  const sets = [
    { k: 3, problems: randomProblems(60, 3, 11), gridGoal: 10 },
    { k: 4, problems: randomProblems(30, 4, 12), gridGoal: 300 },
  ];
  const lines: BenchLine[] = [];
  let worstPct = Number.NEGATIVE_INFINITY;
  let missedFeasible = 0;
  let compared = 0;
  try {
    for (const set of sets) {
      const { k, problems } = set;
      const prepared = problems.map((p) => preparePlain(p));
      // The LPs the solver solves for each problem, recorded once.
      const lps: DenseLp[] = [];
      const solverValues: number[] = [];
      observeDenseLps((lp) => lps.push(lp));
      for (const P of prepared) solvePrepared(P);
      observeDenseLps(null);
      const models = lps.map((lp) => highsModelOf(highs, lp));
      const runHighs = (): void => {
        solverValues.length = 0;
        for (const m of models) {
          hm.passModel(m);
          hm.run();
          solverValues.push(hm.getModelStatus() === highs.constants.modelStatus.optimal ? hm.getObjectiveValue() : Number.NaN);
        }
      };
      // Warm-up (JIT) of every side before any timing, until each is compiled for both sizes.
      for (const other of sets) for (let w = 0; w < 20; w++) for (const p of other.problems) gridSearch(p);
      for (let w = 0; w < 3; w++) {
        for (let q = 0; q < 50; q++) for (const p of problems) solvePrepared(preparePlain(p));
        runHighs();
      }
      // HiGHS agrees with the solver's own LP values (sanity of the recording).
      let agree = 0;
      let optimalLps = 0;
      {
        const { solveDenseLp } = await import('../src/core/solver/lp');
        lps.forEach((lp, q) => {
          const mine = solveDenseLp(lp.sense, lp.n, lp.objective, lp.m, lp.a, lp.lo, lp.hi);
          if (mine.status !== 'optimal') return;
          optimalLps++;
          if (Math.abs(mine.objective - solverValues[q]!) <= 1e-6 * Math.max(1, Math.abs(mine.objective))) agree++;
        });
      }
      // The sides take turns, one round each, ROUNDS times (each keeps its fastest round): a
      // passing burst of load on the shared machine then falls on every side alike.
      const REPEAT = 80;
      let gridMs = Number.POSITIVE_INFINITY;
      let fullMs = Number.POSITIVE_INFINITY;
      let solveMs = Number.POSITIVE_INFINITY;
      let highsMs = Number.POSITIVE_INFINITY;
      for (let round = 0; round < ROUNDS; round++) {
        gridMs = Math.min(
          gridMs,
          cpuMs(() => {
            for (const p of problems) gridSearch(p);
          }),
        );
        fullMs = Math.min(
          fullMs,
          cpuMs(() => {
            for (let q = 0; q < REPEAT; q++) for (const p of problems) solvePrepared(preparePlain(p));
          }, true) / REPEAT,
        );
        solveMs = Math.min(
          solveMs,
          cpuMs(() => {
            for (let q = 0; q < REPEAT; q++) for (const P of prepared) solvePrepared(P);
          }, true) / REPEAT,
        );
        highsMs = Math.min(highsMs, cpuMs(runHighs));
      }
      const n = problems.length;
      const perProblemUs = (ms: number) => (1000 * ms) / n;
      lines.push(
        {
          name: `solver vs honest 1 %-grid (running sums), ${k} stocks`,
          measured: gridMs / fullMs,
          unit: '×',
          op: '>=',
          goal: set.gridGoal,
          note:
            `${n} problems, CPU per problem: grid ${perProblemUs(gridMs).toFixed(0)} µs, solver with validation and preparation ` +
            `${perProblemUs(fullMs).toFixed(2)} µs (solve alone ${perProblemUs(solveMs).toFixed(2)} µs, ×${(gridMs / solveMs).toFixed(0)})`,
        },
        {
          name: `solver vs HiGHS on the same LPs, ${k} stocks`,
          measured: highsMs / solveMs,
          unit: '×',
          op: '>=',
          goal: 100,
          note:
            `${lps.length} LPs for ${n} problems; CPU per problem: HiGHS ${perProblemUs(highsMs).toFixed(1)} µs for the LPs alone, ` +
            `solver ${perProblemUs(solveMs).toFixed(2)} µs for the whole solve; HiGHS's optimum equals the solver's on ${agree} of ${optimalLps} optimal LPs (1e-6)`,
        },
        {
          name: `solver time per ${k}-stock solve, prepared problem (Node)`,
          measured: perProblemUs(solveMs),
          unit: 'µs',
          op: '<=',
          goal: 2,
          note: `as the substitute search calls it; validation and preparation add ${(perProblemUs(fullMs) - perProblemUs(solveMs)).toFixed(2)} µs per problem`,
        },
        {
          name: `solver time per LP, ${k} stocks (Node)`,
          measured: (1000 * solveMs) / lps.length,
          unit: 'µs',
          op: '<=',
          goal: 2,
          note: `${(lps.length / n).toFixed(2)} LPs per solve; the time per solve divided by the LPs (rows, simplex, branch and bound, blend recomputed)`,
        },
      );
      for (const p of problems) {
        const gridBest = gridSearch(p);
        if (gridBest === null) continue;
        const res = solveBlendPlain(p);
        if (res.status !== 'optimal') {
          missedFeasible++;
          continue;
        }
        compared++;
        let rel = (res.costPerLitre - gridBest) / gridBest;
        if (Math.abs(rel) < 1e-9) rel = 0; // floating-point noise
        worstPct = Math.max(worstPct, 100 * rel);
      }
    }
  } finally {
    hm.dispose();
  }
  lines.push({
    name: 'solver cost vs best feasible grid point (worst case)',
    measured: missedFeasible > 0 ? Number.POSITIVE_INFINITY : worstPct,
    unit: '%',
    op: '<=',
    goal: 0,
    note: `${compared} problems with a feasible grid point; ${missedFeasible} of them reported infeasible by the solver`,
  });
  return lines;
}
