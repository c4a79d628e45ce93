/**
 * A small interface to a linear-programming solver — the only module that imports `yalps`.
 *
 * Problem form (dense, small):
 *
 *   minimise (or maximise)  c·x
 *   subject to              lᵣ ≤ aᵣ·x ≤ uᵣ   for every row r (either side may be absent)
 *                           x ≥ 0
 *
 * Blending problems have a handful of variables and rows, so dense coefficient arrays are both the
 * simplest and the fastest representation. The solver is a dense simplex (yalps, MIT licence); no
 * simplex is written by hand here.
 */
import { solve, type Coefficients, type Constraint } from 'yalps';

/** One linear row lᵣ ≤ aᵣ·x ≤ uᵣ; give `min`, `max` or both (equal → an equality). */
export interface LpRow {
  /** aᵣ: one coefficient per variable (dense; zeros allowed). */
  readonly coefficients: ArrayLike<number>;
  /** lᵣ, lower bound of the row; omitted → −∞. */
  readonly min?: number;
  /** uᵣ, upper bound of the row; omitted → +∞. */
  readonly max?: number;
}

export interface LinearProgram {
  readonly sense: 'minimize' | 'maximize';
  /** Number of variables n; every variable is ≥ 0. */
  readonly numVariables: number;
  /** c: objective coefficient per variable (length n). */
  readonly objective: ArrayLike<number>;
  readonly rows: readonly LpRow[];
}

export type LpStatus = 'optimal' | 'infeasible' | 'unbounded' | 'failed';

export interface LpSolution {
  status: LpStatus;
  /** Values of the variables (length n); all zeros unless `status` is 'optimal'. */
  x: Float64Array;
  /** c·x at the optimum; NaN unless optimal. */
  objective: number;
}

/** Numbers of magnitude ≤ this are zero to the simplex (yalps' own default). */
const PRECISION = 1e-8;
/** Key of the objective among the row keys (rows are 0 … m−1). */
const OBJECTIVE_KEY = -1;

/**
 * Solve a linear program.
 *
 * @param lp - the problem; coefficients should be scaled to order 1 (the simplex treats |a| ≤ 1e-8 as 0)
 * @returns status and, when optimal, the variables and objective value. A simplex that cycles
 *   (rare on degenerate problems) is retried once with cycle detection; if it still fails the status
 *   is 'failed'.
 * @example
 * solveLp({ sense: 'minimize', numVariables: 2, objective: [1, 2],
 *           rows: [{ coefficients: [1, 1], min: 1 }] }) // → { status: 'optimal', x: [1, 0], objective: 1 }
 */
export function solveLp(lp: LinearProgram): LpSolution {
  const n = lp.numVariables;
  const m = lp.rows.length;
  const a = new Float64Array(m * n);
  const lo = new Float64Array(m);
  const hi = new Float64Array(m);
  for (let r = 0; r < m; r++) {
    const row = lp.rows[r]!;
    for (let j = 0; j < n; j++) a[r * n + j] = row.coefficients[j] ?? 0;
    lo[r] = row.min ?? Number.NEGATIVE_INFINITY;
    hi[r] = row.max ?? Number.POSITIVE_INFINITY;
  }
  const c = new Float64Array(n);
  for (let j = 0; j < n; j++) c[j] = lp.objective[j] ?? 0;
  return solveDenseLp(lp.sense, n, c, m, a, lo, hi);
}

/**
 * Solve a linear program given as dense arrays — the same problem form and the same simplex model
 * as {@link solveLp}, without per-row objects (the engine's hot path).
 *
 * @param sense - 'minimize' or 'maximize'
 * @param n - number of variables (all ≥ 0)
 * @param objective - c, length ≥ n
 * @param m - number of rows
 * @param a - row-major coefficients: row r is a[r·n … r·n + n)
 * @param lo - lᵣ per row; −Infinity = no lower bound
 * @param hi - uᵣ per row; +Infinity = no upper bound (lᵣ = uᵣ → an equality)
 * @returns as {@link solveLp}
 */
export function solveDenseLp(
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
    if (hasLo && hasHi) {
      constraints.push([r, l === u ? { equal: l } : { min: l, max: u }]);
    } else if (hasLo) {
      constraints.push([r, { min: l }]);
    } else if (hasHi) {
      constraints.push([r, { max: u }]);
    }
  }
  const variables: [number, Coefficients<number>][] = new Array(n);
  for (let j = 0; j < n; j++) {
    const coefs: [number, number][] = [];
    const c = objective[j]!;
    if (c !== 0) coefs.push([OBJECTIVE_KEY, c]);
    for (let r = 0; r < m; r++) {
      const v = a[r * n + j]!;
      if (v !== 0) coefs.push([r, v]);
    }
    variables[j] = [j, coefs];
  }
  const model = {
    direction: sense,
    objective: OBJECTIVE_KEY,
    constraints,
    variables,
  } as const;
  let sol = solve<number, number>(model, { precision: PRECISION });
  if (sol.status === 'cycled') sol = solve<number, number>(model, { precision: PRECISION, checkCycles: true });
  const x = new Float64Array(n);
  if (sol.status !== 'optimal') {
    const status: LpStatus =
      sol.status === 'infeasible' ? 'infeasible' : sol.status === 'unbounded' ? 'unbounded' : 'failed';
    return { status, x, objective: Number.NaN };
  }
  for (const [j, v] of sol.variables) x[j] = v;
  return { status: 'optimal', x, objective: sol.result };
}
