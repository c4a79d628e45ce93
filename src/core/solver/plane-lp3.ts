/**
 * An exact solver for the node LPs of three-stock blends: three variables, every row homogeneous
 * except the normalisation row — solved by listing the vertices of a polygon, with no tableau.
 *
 * ## What it solves
 * The node LPs of `rows.ts` with three component variables and nothing else (no 'closest'
 * auxiliaries, no lifted variables, no folded additive column):
 *
 *   minimise (or maximise)  c·y
 *   subject to              d·y = 1   (or d·y ≥ 1 when minimising with c ≥ 0)   — row 0
 *                           aᵣ·y ≥ 0, aᵣ·y ≤ 0 or aᵣ·y = 0                       — rows 1 … m − 1
 *                           y ≥ 0,  with every dⱼ > 0.
 *
 * ## Why listing vertices is exact
 * With every dⱼ > 0 the set {y ≥ 0, d·y = 1} is a triangle, so the feasible set P is a bounded
 * polygon in the plane d·y = 1, and a linear objective attains its optimum over a non-empty bounded
 * polygon at one of its vertices (the fundamental theorem of linear programming; e.g. Chvátal,
 * "Linear Programming" (1983), ch. 3). A vertex is where two of the constraint planes through the
 * origin — yⱼ = 0 or aᵣ·y = 0, with normals g, g′ — meet the plane d·y = 1: on the line through
 * the origin along the cross product g × g′, at y = (g × g′) / (d·(g × g′)). So every vertex of P is
 * one of these at most K(K − 1)/2 points (K = 3 + the rows), and the optimum is the best of those
 * that satisfy every row. With d·y ≥ 1 (one-sided, minimising with c ≥ 0) every vertex of the
 * feasible set still lies on d·y = 1 (a feasible point with d·y > 1 lies on a ray through the origin
 * inside the homogeneous cone, so it is no vertex), and the simplex's basic solutions are vertices,
 * so the same list holds the simplex's answer.
 *
 * ## Same answer as the simplex
 * The answer is rounded exactly as the dense simplex rounds its own (yalps' `roundToPrecision` to
 * 1e-8, entries ≤ 1e-8 set to 0; the objective value likewise), so where the optimum is one vertex
 * the two agree to the last rounding step. The cases where the two could differ go to the simplex
 * instead ({@link solvePlaneLp3} returns null):
 * - two different vertices within 1e-9 (relative) of the best value — a tie the simplex breaks by
 *   its pivot rules;
 * - a candidate point that misses a row by more than 1e-9 but not by more than 1e-6 (relative to the
 *   row's largest coefficient) — a sliver the simplex's own tolerance (1e-8 on tableau entries) may
 *   count as feasible or not;
 * - a row 0 that is not a normalisation with every dⱼ > 0, a row with a non-zero bound, or a
 *   one-sided normalisation when maximising or with a negative cost.
 * tests/core/solver/plane-lp3.test.ts compares it with the simplex on recorded and random LPs, and
 * the three-stock solves with and without it on 20,000 seeded problems.
 */
import { roundToPrecision } from './yalps-simplex';
import type { LpSolution } from './lp';

/** The simplex's zero and rounding step (yalps' `precision`, as in `lp.ts`). */
const PRECISION = 1e-8;
/** A candidate counts as feasible when no row misses by more than this (relative). */
const FEASIBLE = 1e-9;
/** A candidate that misses a row by more than {@link FEASIBLE} but not by this is undecidable here. */
const CLEARLY_INFEASIBLE = 1e-6;
/** Two feasible vertices whose values differ by less than this (relative) are a tie. */
const TIE = 1e-9;

/** Normals of the constraint planes (3 per plane) and each row's kind, grown to the largest LP seen. */
let normals = new Float64Array(3 * 16);
/** Per plane from index 3 on (a row): 1 (n·y ≥ 0) or 3 (n·y = 0). */
let kinds = new Int8Array(16);
/** Feasible vertices of one solve: their values and points. */
let candF = new Float64Array(64);
let candY = new Float64Array(3 * 64);

/** The answer of every solve (overwritten by the next; the caller copies what it keeps). */
const ANSWER: LpSolution = { status: 'optimal', x: new Float64Array(3), objective: Number.NaN };

/**
 * Solve a three-variable node LP by listing the vertices of its feasible polygon (see the module
 * comment); null where the answer could differ from the dense simplex's, which then solves it.
 *
 * @param sense - 'minimize' or 'maximize'
 * @param c - objective coefficients cⱼ (length ≥ 3)
 * @param m - number of rows (row 0 the normalisation d·y = 1 or ≥ 1)
 * @param a - row-major coefficients, 3 per row
 * @param lo - lower bound of each row (row 0: 1; others 0 or −∞)
 * @param hi - upper bound of each row (row 0: 1 or +∞; others 0 or +∞)
 * @returns the optimum (y rounded to 1e-8 as the simplex rounds it, value c·y likewise), 'infeasible'
 *   when no vertex is feasible, or null (undecidable here: use the simplex). The answer object and
 *   its `x` are this module's and are overwritten by the next solve.
 */
export function solvePlaneLp3(
  sense: 'minimize' | 'maximize',
  c: ArrayLike<number>,
  m: number,
  a: ArrayLike<number>,
  lo: ArrayLike<number>,
  hi: ArrayLike<number>,
): LpSolution | null {
  // Row 0: the normalisation d·y = 1 (or ≥ 1) with every dⱼ > 0.
  const d0 = a[0]!, d1 = a[1]!, d2 = a[2]!;
  if (!(d0 > 0 && d1 > 0 && d2 > 0) || lo[0] !== 1) return null;
  const c0 = c[0]!, c1 = c[1]!, c2 = c[2]!;
  if (hi[0] !== 1) {
    if (hi[0] !== Number.POSITIVE_INFINITY || sense !== 'minimize' || !(c0 >= 0 && c1 >= 0 && c2 >= 0)) return null;
  }
  // The constraint planes: yⱼ = 0 (unit normals), then each row with a bound.
  planeLp3Begin(m);
  for (let r = 1; r < m; r++) {
    const l = lo[r]!;
    const u = hi[r]!;
    const hasLo = l !== Number.NEGATIVE_INFINITY;
    const hasHi = u !== Number.POSITIVE_INFINITY;
    if (!hasLo && !hasHi) continue;
    if ((hasLo && l !== 0) || (hasHi && u !== 0)) return null;
    const o = 3 * r;
    planeLp3Row(a[o]!, a[o + 1]!, a[o + 2]!, hasLo, hasHi);
  }
  return planeLp3Solve(sense, d0, d1, d2, c0, c1, c2);
}

/** Number of planes written so far in {@link normals} (3 + the rows with a condition). */
let planes = 3;

/**
 * Start the planes of one LP with room for `rows` rows: the unit normals of y ≥ 0. The rows follow
 * by {@link planeLp3Row}, then {@link planeLp3Solve} solves. (The split form lets `rows.ts` write a
 * node's rows straight into the planes; {@link solvePlaneLp3} reads them from dense rows.)
 *
 * @param rows - an upper bound on the number of {@link planeLp3Row} calls to follow
 */
export function planeLp3Begin(rows: number): void {
  const planesMax = 3 + rows;
  if (normals.length < 3 * planesMax) {
    normals = new Float64Array(6 * planesMax);
    kinds = new Int8Array(2 * planesMax);
  }
  const N = normals;
  N[0] = 1;
  N[1] = 0;
  N[2] = 0;
  N[3] = 0;
  N[4] = 1;
  N[5] = 0;
  N[6] = 0;
  N[7] = 0;
  N[8] = 1;
  planes = 3;
}

/**
 * One homogeneous row x·y₀ + y·y₁ + z·y₂ ≥ 0 (hasLo), ≤ 0 (hasHi) or = 0 (both) as a plane. A row
 * of zeros is no condition and is left out.
 */
export function planeLp3Row(x: number, y: number, z: number, hasLo: boolean, hasHi: boolean): void {
  const big = Math.max(Math.abs(x), Math.abs(y), Math.abs(z));
  if (!(big > 0)) return; // 0 ≥ 0, 0 ≤ 0: no condition
  // Stored scaled to a largest coefficient of 1 and signed so that the row reads n·y ≥ 0 (an
  // equality keeps kind 3): the miss of a point is then −n·y (or |n·y|).
  const N = normals;
  const k = planes;
  const sg = hasLo ? 1 / big : -1 / big;
  N[3 * k] = x * sg;
  N[3 * k + 1] = y * sg;
  N[3 * k + 2] = z * sg;
  kinds[k] = hasLo && hasHi ? 3 : 1;
  planes = k + 1;
}

/**
 * The normalisation row d and the objective c of the LP to solve, as d₀, d₁, d₂, c₀, c₁, c₂
 * (module memory, written by {@link planeLp3Solve}). Handed to the solving function this way
 * rather than as six arguments: a call that is not inlined passes each number argument boxed as a
 * heap number (six allocations per LP), and `planeLp3Solve`, which only writes them, is small
 * enough to be inlined where it is called.
 */
const PLANE_LP3_DC = new Float64Array(6);

/**
 * Solve over the planes written since {@link planeLp3Begin}: minimise (or maximise) c·y on
 * d·y = 1 (every dⱼ > 0; a one-sided d·y ≥ 1 only when minimising with c ≥ 0, which the caller
 * checks). Same answer, and the same null, as {@link solvePlaneLp3} on the same rows.
 */
export function planeLp3Solve(
  sense: 'minimize' | 'maximize',
  d0: number,
  d1: number,
  d2: number,
  c0: number,
  c1: number,
  c2: number,
): LpSolution | null {
  const dc = PLANE_LP3_DC;
  dc[0] = d0;
  dc[1] = d1;
  dc[2] = d2;
  dc[3] = c0;
  dc[4] = c1;
  dc[5] = c2;
  return planeLp3SolveWritten(sense);
}

/** {@link planeLp3Solve} with d and c already written to {@link PLANE_LP3_DC}. */
function planeLp3SolveWritten(sense: 'minimize' | 'maximize'): LpSolution | null {
  const dc = PLANE_LP3_DC;
  const d0 = dc[0]!, d1 = dc[1]!, d2 = dc[2]!;
  const c0 = dc[3]!, c1 = dc[4]!, c2 = dc[5]!;
  // (Module arrays read into locals: the loops below then load no module binding.)
  const N = normals;
  const kind = kinds;
  const k = planes;
  const pairs = (k * (k - 1)) / 2;
  if (candF.length < pairs) {
    candF = new Float64Array(2 * pairs);
    candY = new Float64Array(6 * pairs);
  }
  const cf = candF;
  const cy = candY;
  const sign = sense === 'minimize' ? 1 : -1;
  let count = 0;
  let best = -1;
  let bestF = Number.POSITIVE_INFINITY;
  for (let p = 0; p < k - 1; p++) {
    const px = N[3 * p]!, py = N[3 * p + 1]!, pz = N[3 * p + 2]!;
    for (let q = p + 1; q < k; q++) {
      const qx = N[3 * q]!, qy = N[3 * q + 1]!, qz = N[3 * q + 2]!;
      // The line where both planes meet, along g × g′, and its point on d·y = 1.
      const ex = py * qz - pz * qy;
      const ey = pz * qx - px * qz;
      const ez = px * qy - py * qx;
      const s = d0 * ex + d1 * ey + d2 * ez;
      const norm = Math.abs(ex) + Math.abs(ey) + Math.abs(ez);
      if (!(Math.abs(s) > 1e-12 * norm)) continue; // parallel planes, or a line inside d·y = 0
      const inv = 1 / s;
      const y0 = ex * inv, y1 = ey * inv, y2 = ez * inv;
      // Worst miss of any condition (y ≥ 0, then the rows), each row scaled to a largest
      // coefficient of 1.
      let miss = -y0;
      if (-y1 > miss) miss = -y1;
      if (-y2 > miss) miss = -y2;
      if (miss > CLEARLY_INFEASIBLE) continue;
      for (let r = 3; r < k; r++) {
        const v = N[3 * r]! * y0 + N[3 * r + 1]! * y1 + N[3 * r + 2]! * y2;
        const e = kind[r] === 3 ? Math.abs(v) : -v;
        if (e > miss) {
          miss = e;
          if (miss > CLEARLY_INFEASIBLE) break;
        }
      }
      if (miss > CLEARLY_INFEASIBLE) continue;
      if (miss > FEASIBLE) return null; // a sliver: the simplex decides
      const f = sign * (c0 * y0 + c1 * y1 + c2 * y2);
      cf[count] = f;
      cy[3 * count] = y0;
      cy[3 * count + 1] = y1;
      cy[3 * count + 2] = y2;
      if (f < bestF) {
        bestF = f;
        best = count;
      }
      count++;
    }
  }
  const ans = ANSWER;
  const x = ans.x;
  if (best < 0) {
    x[0] = 0;
    x[1] = 0;
    x[2] = 0;
    ans.status = 'infeasible';
    ans.objective = Number.NaN;
    return ans;
  }
  const b0 = cy[3 * best]!, b1 = cy[3 * best + 1]!, b2 = cy[3 * best + 2]!;
  // A different vertex as good as the best: the simplex's pivot rules choose, not this function.
  const tie = TIE * Math.max(1, Math.abs(bestF));
  for (let q = 0; q < count; q++) {
    if (q === best || cf[q]! - bestF > tie) continue;
    const gap = Math.max(Math.abs(cy[3 * q]! - b0), Math.abs(cy[3 * q + 1]! - b1), Math.abs(cy[3 * q + 2]! - b2));
    if (gap > TIE) return null;
  }
  x[0] = b0 > PRECISION ? roundToPrecision(b0, PRECISION) : 0;
  x[1] = b1 > PRECISION ? roundToPrecision(b1, PRECISION) : 0;
  x[2] = b2 > PRECISION ? roundToPrecision(b2, PRECISION) : 0;
  ans.status = 'optimal';
  ans.objective = sign * roundToPrecision(sign * (c0 * b0 + c1 * b1 + c2 * b2), PRECISION);
  return ans;
}
