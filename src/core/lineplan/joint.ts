/**
 * The line-plan engine: every grade of a line solved at once, least total cost over a period,
 * sharing the supply of limited stocks and an optional limit on the number of distinct stocks
 * (tanks) across the line.
 *
 * ## Formulation
 * Variables: w_gi ≥ 0, the mass fraction of stock i in grade g (only stocks usable in that grade;
 * a stock at a fixed share, such as the additive package at its treat rate, is a constant r_gi).
 * With the demand D_g of each grade in kg, everything that couples the grades is linear in w:
 *
 *   least total cost     min Σ_g D_g Σ_i p_i·w_gi                  (p_i per kg)
 *   each grade           Σ_i w_gi = 1, and its own homogeneous rows (see `solver/engine.ts`):
 *                        ν40 band, aniline, polymer, pour, flash limits, per-stock bounds
 *   supply of stock i    Σ_g D_g·w_gi ≤ S_i                          (kg over the period)
 *   minimum use          Σ_g D_g·w_gi ≥ M_i                          (a stock that must stay in use)
 *   tank limit           w_gi ≤ y_i,  Σ_i y_i ≤ K,  y_i ∈ {0, 1}
 *
 * Because the demand is in mass and the fractions are mass fractions, the total cost is the exact
 * Σ_g D_g·(cost per kg of grade g) — no Charnes–Cooper transformation is needed.
 *
 * ## Exactness: one best-first branch and bound for both non-linear parts
 * - **Minimum VI of a grade.** The same relaxation as the single-grade solver (`vi-boundary.ts`):
 *   on an interval [a, b] of the grade's X40 the curve X100 ≥ h(X40) is replaced by valid linear
 *   under-estimators. A grade gets those rows only once its VI has been found violated (until then
 *   leaving them out is also a relaxation); a violated grade is split at its X40.
 * - **Tank limit.** y_i is relaxed to y_i ≥ 0; the rows w_gi ≤ y_i are added where a solution
 *   breaks them (a cut loop: the final LP of every node satisfies all of them, so it is the full
 *   relaxation). A node whose stocks in use exceed K branches on one stock: left out of every grade
 *   (y_i = 0), or kept (y_i = 1, counted against K).
 * Every node LP is a relaxation of the true problem restricted to the node, and the children of a
 * node cover it; the smallest open bound is therefore a lower bound on the optimum at all times,
 * and the first node popped whose solution meets every condition when recomputed (VI by ASTM D2270
 * within `VI_ACCEPT_TOLERANCE`, stocks in use ≤ K) is optimal.
 *
 * - **Minimum probability in band of a grade** (`qc/robust.ts`). The grade's separator gives the
 *   lifted outer approximation (ρ ≥ ‖Dw‖ in the rotated-cone form and tangents of the allowed
 *   deviation, all rows homogeneous in the grade's fractions, so they hold with Σ w = 1 as they do
 *   in the single-grade solver's Charnes–Cooper variables). A node solution whose recomputed
 *   probability falls short gets tangents at itself and the node is solved again (Kelley's cutting
 *   planes, as in the single-grade solver; the rows are valid for every blend meeting the
 *   probability, so they are kept for every node). A node is accepted only when every grade's
 *   probability, recomputed, reaches the solver's acceptance level — above the minimum asked for.
 *
 * The same tree also answers the two questions an infeasible plan raises: the least shortfall of
 * supply (slack tonnes on the supply and minimum-use rows, minimised), and the least number of
 * distinct stocks the line can be made from (Σ y minimised; an integer, so a node is accepted when
 * its count equals its bound rounded up).
 */
import type { PreparedProblem } from '../solver/prepared';
import { viRoot } from '../solver/prepared';
import type { ViChord } from '../solver/vi-boundary';
import { viOf, VI_ACCEPT_TOLERANCE } from '../solver/branch-and-bound';
import { LpWorkspace, solveDenseLp } from '../solver/lp';
import type { ExtraRow } from '../solver/objectives';
import { inBandModel, inBandSeparator, type InBandSeparator } from '../qc/robust';
import { solvePrepared } from '../solver/engine';

/** A line-plan problem in plain numbers; every grade is prepared on the same components, in the same order. */
export interface JointProblem {
  /** One prepared problem per grade (targets, usable stocks, bounds, fixed treat rates). */
  readonly grades: readonly PreparedProblem[];
  /** Demand of each grade over the period [kg], > 0. */
  readonly demandKg: readonly number[];
  /** Supply of each stock over the period [kg]; Infinity = not limited. */
  readonly supplyKg: readonly number[];
  /** Least use of each stock over the period [kg]; 0 = none. */
  readonly minUseKg: readonly number[];
  /** Largest number of distinct stocks in use across the line (fraction > 1e-6 in any grade); null = no limit. */
  readonly maxStocks: number | null;
  /** Stocks that stay in use (they count toward the tank limit whatever the plan). */
  readonly keep: readonly boolean[];
}

/**
 * What the tree minimises: the total cost; the supply shortfall (tonnes short of the supply and
 * minimum-use rows, tank limit ignored); or the number of distinct stocks (tank limit ignored).
 */
export type JointMode = 'cost' | 'shortfall' | 'count';

export interface JointOptions {
  mode?: JointMode;
  /** Safety net on the number of LPs (default 20 000; never reached in the tests). */
  maxLps?: number;
}

export interface JointOptimal {
  status: 'optimal';
  /** Mass fractions per grade, aligned with the components; dust below 1e-6 dropped; each sums to 1. */
  fractions: Float64Array[];
  /** Total cost (currency) | shortfall [t] | number of stocks, by mode. */
  objective: number;
  /** Shortfall mode: tonnes short of each stock's supply, and of its minimum use. */
  supplyShortT: Float64Array | null;
  useShortT: Float64Array | null;
  lpCount: number;
  nodeCount: number;
}
export interface JointNotSolved {
  /** 'infeasible': proved; 'limit': the LP limit was reached first; 'failed': the LP solver failed. */
  status: 'infeasible' | 'limit' | 'failed';
  lpCount: number;
  nodeCount: number;
}
export type JointResult = JointOptimal | JointNotSolved;

/** A stock in use: mass fraction above this in some grade (the plain API's definition). */
export const IN_USE_FRACTION = 1e-6;

/** VI relaxation of one grade at a node: X40 ∈ [a, b], with h(a), h(b) and the chords. */
interface GradeVi {
  a: number;
  b: number;
  ha: number;
  hb: number;
  chords: readonly ViChord[];
}

interface Node {
  vi: (GradeVi | null)[];
  /** 1 = stock left out of every grade. */
  out: Uint8Array;
  /** 1 = stock kept by branching (counted against K). */
  kept: Uint8Array;
  /** Link rows w_gi ≤ y_i present (index g·n + i). */
  links: Uint8Array;
  bound: number;
  /** Raw fractions per grade (with dust), from the node's LP. */
  w: Float64Array[];
  /** Lifted variables of each grade's probability condition (null for a grade without one). */
  lift: (Float64Array | null)[];
  /** y per stock (tank and count modes), or the shortfall slacks [t]: supply then minimum use (shortfall mode). */
  aux: Float64Array | null;
}

/** Per-grade numbers that do not change between nodes. */
interface GradeSetup {
  P: PreparedProblem;
  /** Stocks that are variables in this grade. */
  vars: number[];
  /** Stocks at a fixed share (min = max > 0) and their shares. */
  fixed: number[];
  fixedShare: number[];
  /** The grade's minimum probability in band, when it has one and some stock has a lot spread. */
  robust: RobustGrade | null;
}

/** A grade's probability condition: its separator, the stocks it spans and the rows drawn so far. */
interface RobustGrade {
  sep: InBandSeparator;
  /** Every stock of the grade (variables and fixed shares), ascending: the separator's variables. */
  all: number[];
  /** Number of lifted LP variables. */
  nLift: number;
  /** Rows so far (valid for every blend that meets the probability: kept for every node). */
  rows: ExtraRow[];
}

class Rows {
  readonly coef: Float64Array[] = [];
  readonly lo: number[] = [];
  readonly hi: number[] = [];
  /** Set when a row without variables cannot hold (the node is then infeasible). */
  impossible = false;
  constructor(readonly width: number) {}
  /** Add lo ≤ a·x ≤ hi; returns a (fill it in). */
  add(lo: number, hi: number): Float64Array {
    const a = new Float64Array(this.width);
    this.coef.push(a);
    this.lo.push(lo);
    this.hi.push(hi);
    return a;
  }
  /** Drop rows without a coefficient, noting any whose bounds exclude 0. */
  compact(): void {
    for (let r = this.coef.length - 1; r >= 0; r--) {
      const a = this.coef[r]!;
      let any = false;
      for (let j = 0; j < a.length; j++) {
        if (a[j] !== 0) {
          any = true;
          break;
        }
      }
      if (any) continue;
      if (this.lo[r]! > 1e-9 || this.hi[r]! < -1e-9) this.impossible = true;
      this.coef.splice(r, 1);
      this.lo.splice(r, 1);
      this.hi.splice(r, 1);
    }
  }
}

/**
 * Solve a line plan.
 *
 * @param J - the problem ({@link JointProblem}); demands > 0 [kg], supplies and minimum uses [kg]
 * @param options - mode ('cost' by default) and the LP limit
 * @returns the optimal fractions per grade and the objective, or infeasible / limit / failed
 */
export function solveJoint(J: JointProblem, options: JointOptions = {}): JointResult {
  const mode = options.mode ?? 'cost';
  const maxLps = options.maxLps ?? 20_000;
  const G = J.grades.length;
  const n = G > 0 ? J.grades[0]!.n : 0;
  let lpCount = 0;
  let nodeCount = 0;
  const ws = new LpWorkspace(); // one tableau for every LP of this solve (x is read at once)
  const none = (status: JointNotSolved['status']): JointNotSolved => ({ status, lpCount, nodeCount });
  if (G === 0) return none('infeasible');

  // Grade set-up; a stock required in a grade but unusable there makes the plan infeasible.
  const grades: GradeSetup[] = [];
  const forced = new Uint8Array(n);
  for (let g = 0; g < G; g++) {
    const P = J.grades[g]!;
    const s: GradeSetup = { P, vars: [], fixed: [], fixedShare: [], robust: null };
    for (let i = 0; i < n; i++) {
      const k = P.components[i]!;
      if (!k.usable) {
        if (k.min > 0) return none('infeasible');
        continue;
      }
      if (k.max <= 0) continue;
      if (k.min === k.max) {
        s.fixed.push(i);
        s.fixedShare.push(k.min);
        forced[i] = 1;
      } else {
        s.vars.push(i);
        if (k.min > 0) forced[i] = 1;
      }
    }
    const pMin = P.targets.minInBandProbability ?? null;
    if (pMin !== null && pMin > 0 && inBandModel(P).any) {
      // A grade that cannot reach its probability even on its own makes the plan impossible. The
      // cutting planes would approach an empty set only slowly, so the single-grade solver (whose
      // small LPs prove it quickly) is asked first.
      const alone = solvePrepared(P);
      lpCount += alone.lpCount;
      if (alone.status !== 'optimal') return none('infeasible');
      const all = [...s.vars, ...s.fixed].sort((x, y) => x - y);
      const sep = inBandSeparator(P, pMin);
      const start = sep.begin(all);
      s.robust = { sep, all, nLift: start.lift, rows: start.rows.slice() };
    }
    grades.push(s);
  }
  for (let i = 0; i < n; i++) if (J.keep[i] || J.minUseKg[i]! > 0) forced[i] = 1;
  let dTot = 0;
  let dMax = 0;
  for (const d of J.demandKg) {
    dTot += d;
    dMax = Math.max(dMax, d);
  }
  const capped: number[] = [];
  const minUse: number[] = [];
  for (let i = 0; i < n; i++) {
    if (J.supplyKg[i]! < Number.POSITIVE_INFINITY) capped.push(i);
    if (J.minUseKg[i]! > 0) minUse.push(i);
  }
  const tank = mode === 'cost' && J.maxStocks !== null;
  const useY = tank || mode === 'count';
  let forcedCount = 0;
  for (let i = 0; i < n; i++) forcedCount += forced[i]!;

  /** Build and solve the LP of a node (with the link-row cut loop); fills node.bound, node.w. */
  const solveNode = (node: Node): 'optimal' | 'infeasible' | 'failed' => {
    for (let round = 0; round < 200; round++) {
      const r = buildAndSolve(node);
      if (r !== 'optimal') return r;
      // Probability in band: tangents where a grade's recomputed probability falls short.
      let added = separateRobust(node);
      if (!useY) {
        if (!added) return 'optimal';
        continue;
      }
      // Cut loop: add w_gi ≤ y_i where broken.
      const y = node.aux!;
      for (let g = 0; g < G; g++) {
        const w = node.w[g]!;
        for (const i of grades[g]!.vars) {
          if (node.out[i] || forced[i] || node.kept[i]) continue;
          if (w[i]! > y[i]! + 1e-9 && !node.links[g * n + i]) {
            node.links[g * n + i] = 1;
            added = true;
          }
        }
      }
      if (!added) return 'optimal';
    }
    return 'failed';
  };

  /** Probability cuts for every grade whose node solution falls short; true when any was added. */
  const separateRobust = (node: Node): boolean => {
    let added = false;
    for (let g = 0; g < G; g++) {
      const rg = grades[g]!.robust;
      if (!rg) continue;
      const w = node.w[g]!;
      const nv = rg.all.length;
      const wv = new Float64Array(nv);
      const x = new Float64Array(nv + rg.nLift);
      let sum = 0;
      for (let j = 0; j < nv; j++) {
        const v = Math.max(0, w[rg.all[j]!]!);
        x[j] = v;
        sum += v;
      }
      if (!(sum > 0)) continue;
      for (let j = 0; j < nv; j++) wv[j] = x[j]! / sum;
      const l = node.lift[g]!;
      for (let k = 0; k < rg.nLift; k++) x[nv + k] = l[k]!;
      const rows = rg.sep.separate(rg.all, wv, x, nv);
      if (rows) {
        for (const row of rows) rg.rows.push(row);
        added = true;
      }
    }
    return added;
  };

  /** One LP for a node: fills node.w, node.bound and node.aux. */
  const buildAndSolve = (node: Node): 'optimal' | 'infeasible' | 'failed' => {
    // Columns.
    const col: Int32Array[] = [];
    let width = 0;
    for (let g = 0; g < G; g++) {
      const c = new Int32Array(n).fill(-1);
      for (const i of grades[g]!.vars) if (!node.out[i]) c[i] = width++;
      col.push(c);
    }
    // Free stocks: not forced, not kept, not out, a variable somewhere. With no room left under the
    // tank limit every free stock is out.
    const yCol = new Int32Array(n).fill(-1);
    let keptCount = 0;
    for (let i = 0; i < n; i++) if (node.kept[i] && !forced[i]) keptCount++;
    if (tank && J.maxStocks! - forcedCount - keptCount <= 0) {
      for (let g = 0; g < G; g++) for (let i = 0; i < n; i++) if (!forced[i] && !node.kept[i]) col[g]![i] = -1;
    }
    if (useY) {
      for (let i = 0; i < n; i++) {
        if (forced[i] || node.kept[i] || node.out[i]) continue;
        let any = false;
        for (let g = 0; g < G && !any; g++) any = col[g]![i]! >= 0;
        if (any) yCol[i] = width++;
      }
    }
    // Lifted variables of each grade's probability condition.
    const liftAt = new Int32Array(G).fill(-1);
    for (let g = 0; g < G; g++) {
      const rg = grades[g]!.robust;
      if (rg) {
        liftAt[g] = width;
        width += rg.nLift;
      }
    }
    const sCol = new Int32Array(n).fill(-1); // supply shortfall slack [t]
    const uCol = new Int32Array(n).fill(-1); // minimum-use shortfall slack [t]
    if (mode === 'shortfall') {
      for (const i of capped) sCol[i] = width++;
      for (const i of minUse) uCol[i] = width++;
    }
    const R = new Rows(width);
    const obj = new Float64Array(width);

    for (let g = 0; g < G; g++) {
      const { P, vars, fixed, fixedShare } = grades[g]!;
      const c = col[g]!;
      const t = P.targets;
      const s = P.coords.rowScale;
      // Σ w = 1.
      let fixedSum = 0;
      for (const r of fixedShare) fixedSum += r;
      const sum = R.add(1 - fixedSum, 1 - fixedSum);
      for (const i of vars) if (c[i]! >= 0) sum[c[i]!] = 1;
      // Homogeneous rows Σ_i f_i·w_i (≥ | ≤) 0 over every stock, the fixed ones moved to the right.
      const homogeneous = (f: (i: number) => number, lo: boolean, hi: boolean): void => {
        let k = 0;
        for (let q = 0; q < fixed.length; q++) k += f(fixed[q]!) * fixedShare[q]!;
        const row = R.add(lo ? -k : Number.NEGATIVE_INFINITY, hi ? -k : Number.POSITIVE_INFINITY);
        for (const i of vars) if (c[i]! >= 0) row[c[i]!] = f(i);
      };
      const v = node.vi[g];
      const a = v ? v.a : P.bandA;
      const b = v ? v.b : P.bandB;
      // ν40 in [a, b] (blending coordinates): Σ cᵢwᵢ(X40ᵢ − a) ≥ 0, Σ cᵢwᵢ(X40ᵢ − b) ≤ 0.
      if (!(b - a > 1e-12)) homogeneous((i) => s * P.c[i]! * (P.x40[i]! - a), true, true);
      else {
        homogeneous((i) => s * P.c[i]! * (P.x40[i]! - a), true, false);
        homogeneous((i) => s * P.c[i]! * (P.x40[i]! - b), false, true);
      }
      // VI: X100 ≥ α + β·X40 for each under-estimator of h on [a, b].
      if (v) {
        for (const ch of v.chords) homogeneous((i) => s * P.c[i]! * (P.x100[i]! - ch.alpha - ch.beta * P.x40[i]!), true, false);
      }
      if (t.maxAnilinePoint !== null) {
        const m = t.maxAnilinePoint;
        homogeneous((i) => (Number.isNaN(P.ap[i]!) ? 0 : 0.1 * P.invRho[i]! * (P.ap[i]! - m)), false, true);
      }
      if (t.maxPolymerFraction !== null) {
        const m = t.maxPolymerFraction;
        homogeneous((i) => (P.components[i]!.polymer ? 1 : 0) - m, false, true);
      }
      if (t.maxPourPoint !== null) homogeneous((i) => (Number.isNaN(P.pourRel[i]!) ? 0 : P.invRho[i]! * (P.pourRel[i]! - 1)), false, true);
      if (t.minFlashPoint !== null) homogeneous((i) => (Number.isNaN(P.flashRel[i]!) ? 0 : P.invRho[i]! * (P.flashRel[i]! - 1)), false, true);
      // Per-stock bounds (Σ w = 1, so they are plain bounds on w).
      for (const i of vars) {
        const k = P.components[i]!;
        if (c[i]! < 0) {
          if (k.min > 0) R.impossible = true;
          continue;
        }
        if (k.min > 0) R.add(k.min, Number.POSITIVE_INFINITY)[c[i]!] = 1;
        if (k.max < 1) R.add(Number.NEGATIVE_INFINITY, k.max)[c[i]!] = 1;
      }
      // Probability in band: the separator's homogeneous rows, fixed shares moved to the right.
      const rg = grades[g]!.robust;
      if (rg) {
        for (const er of rg.rows) {
          let k = 0;
          for (let q = 0; q < fixed.length; q++) k += er.coef[fixed[q]!]! * fixedShare[q]!;
          const le = er.sense === 'le';
          const row = R.add(le ? Number.NEGATIVE_INFINITY : -k, le ? -k : Number.POSITIVE_INFINITY);
          for (const i of vars) if (c[i]! >= 0) row[c[i]!] = er.coef[i]!;
          if (er.lift) for (let q = 0; q < rg.nLift; q++) row[liftAt[g]! + q] = er.lift[q] ?? 0;
        }
      }
      // Objective: cost of this grade's share of the line, per kg of the whole line.
      if (mode === 'cost') for (const i of vars) if (c[i]! >= 0) obj[c[i]!] = (J.demandKg[g]! / dTot) * P.price[i]!;
    }

    // Supply and minimum use (scaled by the largest demand so that coefficients are at most 1).
    const fixedUse = (i: number): number => {
      let u = 0;
      for (let g = 0; g < G; g++) {
        const q = grades[g]!.fixed.indexOf(i);
        if (q >= 0) u += J.demandKg[g]! * grades[g]!.fixedShare[q]!;
      }
      return u;
    };
    const useRow = (i: number, lo: number, hi: number): Float64Array => {
      const row = R.add(lo, hi);
      for (let g = 0; g < G; g++) {
        const j = col[g]![i]!;
        if (j >= 0) row[j] = J.demandKg[g]! / dMax;
      }
      return row;
    };
    for (const i of capped) {
      const row = useRow(i, Number.NEGATIVE_INFINITY, (J.supplyKg[i]! - fixedUse(i)) / dMax);
      if (sCol[i]! >= 0) {
        row[sCol[i]!] = -1000 / dMax;
        obj[sCol[i]!] = 1;
      }
    }
    for (const i of minUse) {
      const row = useRow(i, (J.minUseKg[i]! - fixedUse(i)) / dMax, Number.POSITIVE_INFINITY);
      if (uCol[i]! >= 0) {
        row[uCol[i]!] = 1000 / dMax;
        obj[uCol[i]!] = 1;
      }
    }
    // Tank limit: Σ y ≤ K − (stocks always in use) − (stocks kept by branching); w_gi ≤ y_i where cut.
    if (useY) {
      if (tank) {
        const room = J.maxStocks! - forcedCount - keptCount;
        if (room < 0) return 'infeasible';
        const row = R.add(Number.NEGATIVE_INFINITY, room);
        for (let i = 0; i < n; i++) if (yCol[i]! >= 0) row[yCol[i]!] = 1;
      }
      for (let g = 0; g < G; g++) {
        for (const i of grades[g]!.vars) {
          const j = col[g]![i]!;
          if (j < 0 || yCol[i]! < 0 || !node.links[g * n + i]) continue;
          const row = R.add(Number.NEGATIVE_INFINITY, 0);
          row[j] = 1;
          row[yCol[i]!] = -1;
        }
      }
      if (mode === 'count') for (let i = 0; i < n; i++) if (yCol[i]! >= 0) obj[yCol[i]!] = 1;
      // Cover cuts: a mean lies between the values of the stocks that make it, so each grade needs a
      // stock at or above the low end of its X40 interval and one at or below the high end (and one
      // at or below each maximum it has: aniline, pour, flash). When no stock always in use provides
      // it, Σ y over the free stocks that do is at least 1.
      for (let g = 0; g < G; g++) {
        const { P, vars, fixed } = grades[g]!;
        const c = col[g]!;
        const v = node.vi[g];
        const a = v ? v.a : P.bandA;
        const b = v ? v.b : P.bandB;
        const t = P.targets;
        const cover = (ok: (i: number) => boolean): void => {
          for (const i of fixed) if (ok(i)) return;
          for (const i of vars) if (c[i]! >= 0 && yCol[i]! < 0 && ok(i)) return;
          const row = R.add(1, Number.POSITIVE_INFINITY);
          for (const i of vars) if (c[i]! >= 0 && yCol[i]! >= 0 && ok(i)) row[yCol[i]!] = 1;
        };
        cover((i) => P.x40[i]! >= a - 1e-12);
        cover((i) => P.x40[i]! <= b + 1e-12);
        if (t.maxAnilinePoint !== null) cover((i) => P.ap[i]! <= t.maxAnilinePoint!);
        if (t.maxPourPoint !== null) cover((i) => P.pourRel[i]! <= 1);
        if (t.minFlashPoint !== null) cover((i) => P.flashRel[i]! <= 1);
      }
    }
    R.compact();
    if (R.impossible) return 'infeasible';
    if (lpCount >= maxLps) return 'failed';
    const m = R.coef.length;
    const buf = new Float64Array(m * width);
    for (let r = 0; r < m; r++) buf.set(R.coef[r]!, r * width);
    lpCount++;
    const sol = solveDenseLp('minimize', width, obj, m, buf, R.lo, R.hi, ws);
    if (sol.status !== 'optimal') return sol.status === 'infeasible' ? 'infeasible' : 'failed';
    const x = sol.x;
    // Fractions per grade (fixed shares included), objective in the mode's unit.
    let constant = 0;
    for (let g = 0; g < G; g++) {
      const { P, vars, fixed, fixedShare } = grades[g]!;
      const w = new Float64Array(n);
      for (const i of vars) {
        const j = col[g]![i]!;
        if (j >= 0) w[i] = Math.max(0, x[j]!);
      }
      for (let q = 0; q < fixed.length; q++) {
        w[fixed[q]!] = fixedShare[q]!;
        if (mode === 'cost') constant += J.demandKg[g]! * fixedShare[q]! * P.price[fixed[q]!]!;
      }
      node.w[g] = w;
      const rg = grades[g]!.robust;
      node.lift[g] = rg ? Float64Array.from({ length: rg.nLift }, (_, q) => Math.max(0, x[liftAt[g]! + q]!)) : null;
    }
    if (mode === 'cost') node.bound = sol.objective * dTot + constant;
    else if (mode === 'count') node.bound = sol.objective + forcedCount + keptCount;
    else node.bound = sol.objective;
    if (useY) {
      const y = new Float64Array(n);
      for (let i = 0; i < n; i++) if (yCol[i]! >= 0) y[i] = x[yCol[i]!]!;
      node.aux = y;
    } else if (mode === 'shortfall') {
      const sl = new Float64Array(2 * n);
      for (let i = 0; i < n; i++) {
        if (sCol[i]! >= 0) sl[i] = Math.max(0, x[sCol[i]!]!);
        if (uCol[i]! >= 0) sl[n + i] = Math.max(0, x[uCol[i]!]!);
      }
      node.aux = sl;
    }
    return 'optimal';
  };

  /** Stocks in use in a node's solution (fraction above IN_USE_FRACTION in some grade, or always in use). */
  const inUse = (node: Node): Uint8Array => {
    const used = new Uint8Array(n);
    for (let i = 0; i < n; i++) used[i] = forced[i]!;
    for (let g = 0; g < G; g++) {
      const w = node.w[g]!;
      for (let i = 0; i < n; i++) if (w[i]! > IN_USE_FRACTION) used[i] = 1;
    }
    return used;
  };

  /** The grade whose recomputed VI falls furthest below its minimum, with its X40; null if none. */
  const worstVi = (node: Node): { g: number; x40: number } | null => {
    let worst: { g: number; x40: number } | null = null;
    let gap = 0;
    for (let g = 0; g < G; g++) {
      const P = grades[g]!.P;
      if (!P.vi) continue;
      const w = node.w[g]!;
      let sc = 0;
      let s40 = 0;
      let s100 = 0;
      for (let i = 0; i < n; i++) {
        const cw = P.c[i]! * w[i]!;
        if (cw === 0) continue;
        sc += cw;
        s40 += cw * P.x40[i]!;
        s100 += cw * P.x100[i]!;
      }
      const x40 = s40 / sc;
      const vi = viOf(P, x40, s100 / sc);
      const short = P.vi.minVi - VI_ACCEPT_TOLERANCE - vi;
      if (short > gap) {
        gap = short;
        worst = { g, x40 };
      }
    }
    return worst;
  };

  const newNode = (parent: Node | null): Node => ({
    vi: parent ? parent.vi.slice() : new Array<GradeVi | null>(G).fill(null),
    out: parent ? parent.out.slice() : new Uint8Array(n),
    kept: parent ? parent.kept.slice() : new Uint8Array(n),
    links: parent ? parent.links.slice() : new Uint8Array(G * n),
    bound: Number.NaN,
    w: new Array<Float64Array>(G),
    lift: new Array<Float64Array | null>(G).fill(null),
    aux: null,
  });

  const open: Node[] = [];
  let failed = false;
  const push = (node: Node): void => {
    nodeCount++;
    const r = solveNode(node);
    if (r === 'failed') failed = true;
    if (r === 'optimal') open.push(node);
  };
  push(newNode(null));

  while (open.length > 0) {
    if (lpCount >= maxLps) return none('limit');
    let best = 0;
    for (let k = 1; k < open.length; k++) if (open[k]!.bound < open[best]!.bound) best = k;
    const node = open[best]!;
    open[best] = open[open.length - 1]!;
    open.pop();

    // 1. The minimum VI of each grade, recomputed by ASTM D2270.
    const bad = worstVi(node);
    if (bad) {
      const P = grades[bad.g]!.P;
      const vi = P.vi!;
      const v = node.vi[bad.g];
      if (!v) {
        // First violation of this grade: add its relaxation on the whole band.
        const root = viRoot(P)!;
        const child = newNode(node);
        child.vi[bad.g] = { a: P.bandA, b: P.bandB, ha: root.hA, hb: root.hB, chords: root.chords };
        push(child);
        continue;
      }
      const span = v.b - v.a;
      if (!(span > 1e-10)) continue; // a point interval, whose chord is exact, cannot improve
      const split = Math.min(v.b - 0.02 * span, Math.max(v.a + 0.02 * span, bad.x40));
      const hs = vi.h(split, v.ha);
      const left = newNode(node);
      left.vi[bad.g] = { a: v.a, b: split, ha: v.ha, hb: hs, chords: vi.relaxation(v.a, v.ha, split, hs) };
      push(left);
      const right = newNode(node);
      right.vi[bad.g] = { a: split, b: v.b, ha: hs, hb: v.hb, chords: vi.relaxation(split, hs, v.b, v.hb) };
      push(right);
      continue;
    }

    // 2. The number of distinct stocks.
    if (useY) {
      const used = inUse(node);
      let count = 0;
      for (let i = 0; i < n; i++) count += used[i]!;
      const limit = mode === 'count' ? Math.ceil(node.bound - 1e-9) : J.maxStocks!;
      if (count > limit) {
        // Branch on the free stock in use with the largest fraction in some grade: keeping it barely
        // moves the bound, leaving it out moves it most (tried against the smallest and the most
        // fractional on seeded plans: 3–10 times fewer LPs).
        let pick = -1;
        let largest = 0;
        for (let i = 0; i < n; i++) {
          if (!used[i] || forced[i] || node.kept[i]) continue;
          let most = 0;
          for (let g = 0; g < G; g++) most = Math.max(most, node.w[g]![i]!);
          if (most > largest) {
            largest = most;
            pick = i;
          }
        }
        if (pick < 0) continue; // only required stocks in use: no child can do better
        const dropped = newNode(node);
        dropped.out[pick] = 1;
        push(dropped);
        const kept = newNode(node);
        kept.kept[pick] = 1;
        push(kept);
        continue;
      }
    }
    return finish(node, mode === 'count' ? countOf(node) : node.bound);
  }
  return none(failed ? 'failed' : 'infeasible');

  function countOf(node: Node): number {
    const used = inUse(node);
    let c = 0;
    for (let i = 0; i < n; i++) c += used[i]!;
    return c;
  }

  function finish(node: Node, objective: number): JointOptimal {
    const fractions = node.w.map((raw, g) => {
      const { vars } = grades[g]!;
      const w = raw.slice();
      // Drop simplex dust (< 1e-6, far below weighing precision) and rescale the variable stocks so
      // the grade sums to exactly 1 (the simplex holds Σ w = 1 to about 1e-8); fixed shares
      // (treat rates) keep their exact value.
      let kept = 0;
      for (const i of vars) {
        if (w[i]! < IN_USE_FRACTION) w[i] = 0;
        else kept += w[i]!;
      }
      let fixedSum = 0;
      for (const r of grades[g]!.fixedShare) fixedSum += r;
      if (kept > 0) for (const i of vars) w[i] = (w[i]! * (1 - fixedSum)) / kept;
      return w;
    });
    let supplyShortT: Float64Array | null = null;
    let useShortT: Float64Array | null = null;
    if (mode === 'shortfall' && node.aux) {
      supplyShortT = node.aux.slice(0, n);
      useShortT = node.aux.slice(n);
    }
    return { status: 'optimal', fractions, objective, supplyShortT, useShortT, lpCount, nodeCount };
  }
}
