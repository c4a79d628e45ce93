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
 * simplest and the fastest representation. The solver is the dense simplex of yalps (MIT licence),
 * run on a tableau written straight from the dense rows (`yalps-simplex.ts` explains why it is a
 * verbatim copy of yalps' own code; `dense-simplex.ts` restates it without allocation, pivot for
 * pivot the same, for the first try of each LP). The tableau is laid out exactly as `yalps.solve`
 * lays out the same model, so the answers are identical bit for bit
 * (tests/core/solver/yalps-simplex.test.ts, tests/core/solver/dense-simplex.test.ts).
 */
import { phase1, roundToPrecision, type SimplexOptions, type SimplexStatus, type Tableau } from './yalps-simplex';
import { denseSimplex, simplexResult, SIMPLEX_CYCLED, SIMPLEX_INFEASIBLE, SIMPLEX_OPTIMAL } from './dense-simplex';

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
/** yalps' defaults: 8192 pivots at most; cycle detection only on the retry. */
const FIRST_TRY: SimplexOptions = { precision: PRECISION, maxPivots: 8192, checkCycles: false };
const RETRY: SimplexOptions = { precision: PRECISION, maxPivots: 8192, checkCycles: true };

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

/** A dense LP exactly as given to {@link solveDenseLp} (copies of the arrays). */
export interface DenseLp {
  sense: 'minimize' | 'maximize';
  n: number;
  objective: Float64Array;
  m: number;
  a: Float64Array;
  lo: Float64Array;
  hi: Float64Array;
}

let observer: ((lp: DenseLp) => void) | null = null;

/**
 * Watch every LP that {@link solveDenseLp} solves from now on (for benchmarks and tests: the
 * benchmark hands the very same LPs to HiGHS). Pass null to stop.
 *
 * @param f - called with a copy of each LP before it is solved, or null
 * @returns the observer that was set before
 */
export function observeDenseLps(f: ((lp: DenseLp) => void) | null): ((lp: DenseLp) => void) | null {
  const prev = observer;
  observer = f;
  return prev;
}

/**
 * Whether an observer is set ({@link observeDenseLps}): an LP solved by another exact method (the
 * three-variable vertex solver, `plane-lp3.ts`) is then shown to it with {@link noteDenseLp}, as if
 * {@link solveDenseLp} had solved it.
 */
export function observingDenseLps(): boolean {
  return observer !== null;
}

/**
 * Memory for {@link solveDenseLp}, reused from one LP to the next so that a solve allocates no
 * tableau: the simplex tableau and its two index arrays (grown to the largest LP seen, never
 * shrunk) and one result vector per number of variables.
 *
 * Ownership: a solution returned with a workspace is the workspace's own answer object, valid
 * until the next solve with the same workspace; its `x` stays valid until the next solve with the
 * same workspace and the same number of variables. Copy what you keep longer. One workspace serves one solve at a time (the core is synchronous, so a module-level
 * workspace is safe as long as no caller holds an `x` across another solve).
 *
 * @example
 * const ws = new LpWorkspace();
 * for (const lp of many) { const s = solveDenseLp('minimize', n, c, m, a, lo, hi, ws); use(s.x); }
 */
export class LpWorkspace {
  private readonly tab: Tableau = {
    matrix: new Float64Array(64),
    width: 0,
    height: 0,
    positionOfVariable: new Int32Array(16),
    variableAtPosition: new Int32Array(16),
  };
  private readonly xs: Float64Array[] = [];
  /** The answer object of every solve with this workspace (overwritten by the next one). */
  readonly answer: LpSolution = { status: 'failed', x: new Float64Array(0), objective: Number.NaN };

  /**
   * A width × height tableau with identity index arrays (yalps' initial state); its matrix entries
   * are left as they are (the caller writes every one of the width·height entries).
   */
  tableau(width: number, height: number): Tableau {
    const t = this.tab;
    const size = width * height;
    if (t.matrix.length < size) t.matrix = new Float64Array(Math.max(size, 2 * t.matrix.length));
    const numVars = width + height;
    if (t.positionOfVariable.length < numVars) {
      t.positionOfVariable = new Int32Array(Math.max(numVars, 2 * t.positionOfVariable.length));
      t.variableAtPosition = new Int32Array(t.positionOfVariable.length);
    }
    const pov = t.positionOfVariable;
    const vap = t.variableAtPosition;
    for (let i = 0; i < numVars; i++) {
      pov[i] = i;
      vap[i] = i;
    }
    t.width = width;
    t.height = height;
    return t;
  }

  /** The tableau last returned by {@link tableau} (as the caller left it). */
  current(): Tableau {
    return this.tab;
  }

  /** The workspace's zeroed result vector of length n. */
  x(n: number): Float64Array {
    // (No read past the end of the list: that would cost the compiled code a deoptimisation.)
    let x = n < this.xs.length ? this.xs[n] : undefined;
    if (!x) this.xs[n] = x = new Float64Array(n);
    else for (let j = 0; j < n; j++) x[j] = 0;
    return x;
  }
}

/**
 * Solve a linear program given as dense arrays — the same problem form as {@link solveLp}, without
 * per-row objects (the engine's hot path).
 *
 * The tableau is written as yalps writes it for the equivalent model (objective row first, then
 * for each row with a bound, in order: `a·x ≤ u` as [u, a] and `a·x ≥ l` as [−l, −a]; an equality
 * gives both), then yalps' two-phase simplex runs on it; results are read back and rounded to 1e-8
 * as yalps does.
 *
 * @param sense - 'minimize' or 'maximize'
 * @param n - number of variables (all ≥ 0)
 * @param objective - c, length ≥ n
 * @param m - number of rows
 * @param a - row-major coefficients: row r is a[r·n … r·n + n)
 * @param lo - lᵣ per row; −Infinity = no lower bound
 * @param hi - uᵣ per row; +Infinity = no upper bound (lᵣ = uᵣ → an equality)
 * @param ws - optional workspace: no tableau is allocated, and the returned answer and its `x`
 *   belong to `ws` (the answer is valid until its next solve; `x` until its next solve with n
 *   variables); without it, both are fresh
 * @returns as {@link solveLp}; a simplex that cycles is retried once with cycle detection, then 'failed'
 */
export function solveDenseLp(
  sense: 'minimize' | 'maximize',
  n: number,
  objective: ArrayLike<number>,
  m: number,
  a: ArrayLike<number>,
  lo: ArrayLike<number>,
  hi: ArrayLike<number>,
  ws?: LpWorkspace,
): LpSolution {
  if (observer !== null) noteDenseLp(sense, n, objective, m, a, lo, hi);
  const work = ws ?? new LpWorkspace();
  const sign = sense === 'minimize' ? -1 : 1;
  let tableau = writeTableau(work, sign, n, objective, m, a, lo, hi);
  // yalps' simplex: first without cycle detection (its default, restated allocation-free in
  // dense-simplex.ts, pivot for pivot the same); after the pivot limit, once more on yalps' own
  // copy with cycle detection.
  const code = denseSimplex(tableau, PRECISION, FIRST_TRY.maxPivots);
  let status: SimplexStatus;
  let value = Number.NaN;
  if (code === SIMPLEX_OPTIMAL) {
    status = 'optimal';
    value = simplexResult.value;
  } else if (code === SIMPLEX_CYCLED) {
    tableau = writeTableau(work, sign, n, objective, m, a, lo, hi);
    [status, value] = phase1(tableau, RETRY);
  } else status = code === SIMPLEX_INFEASIBLE ? 'infeasible' : 'unbounded';
  const x = ws ? ws.x(n) : new Float64Array(n);
  if (status !== 'optimal') {
    return answer(ws, status === 'infeasible' ? 'infeasible' : status === 'unbounded' ? 'unbounded' : 'failed', x, Number.NaN);
  }
  const { matrix, width, positionOfVariable } = tableau;
  for (let j = 0; j < n; j++) {
    const row = positionOfVariable[j + 1]! - width;
    const v = row >= 0 ? matrix[row * width]! : 0;
    if (v > PRECISION) x[j] = roundToPrecision(v, PRECISION);
  }
  return answer(ws, 'optimal', x, -sign * value);
}

/** The answer of a solve: the workspace's own answer object when there is one, else a new one. */
/**
 * Start a tableau written by the caller instead of from dense rows (`rows.ts` writes a node's rows
 * straight into it): a (n + 1) × height tableau of `ws`, identity index arrays, the objective row
 * written (c ≠ 0 as sign·c with sign = −1 when minimising, +1 when maximising, and +0 for a zero
 * coefficient, as {@link solveDenseLp} writes it). The caller then writes rows 1 … height − 1 in
 * the same form as `writeTableau`: a row with an upper bound u as [u, a₁ … aₙ], one with a lower
 * bound l as [−l, −a₁ … −aₙ] (each zero coefficient as +0), upper before lower for a row with both,
 * rows in their order; then {@link solveWrittenTableau} solves.
 *
 * @returns the tableau's matrix (row r at offset r·(n + 1))
 */
export function beginWrittenTableau(
  ws: LpWorkspace,
  sense: 'minimize' | 'maximize',
  n: number,
  height: number,
  objective: ArrayLike<number>,
): Float64Array {
  const t = ws.tableau(n + 1, height);
  const mat = t.matrix;
  const sign = sense === 'minimize' ? -1 : 1;
  mat[0] = 0;
  for (let j = 0; j < n; j++) {
    const c = objective[j]!;
    mat[j + 1] = c !== 0 ? sign * c : 0;
  }
  return mat;
}

/**
 * Solve the tableau written since {@link beginWrittenTableau} as {@link solveDenseLp} solves its own
 * (the same simplex, the same rounding of the answer), or null when the first try reaches the
 * pivot limit: the caller then solves the LP from its dense rows, whose retry rewrites the tableau.
 *
 * @returns the workspace's answer object (overwritten by the next solve), or null
 */
export function solveWrittenTableau(ws: LpWorkspace, sense: 'minimize' | 'maximize', n: number): LpSolution | null {
  const tableau = ws.current();
  const code = denseSimplex(tableau, PRECISION, FIRST_TRY.maxPivots);
  if (code === SIMPLEX_CYCLED) return null;
  const x = ws.x(n);
  if (code !== SIMPLEX_OPTIMAL) return answer(ws, code === SIMPLEX_INFEASIBLE ? 'infeasible' : 'unbounded', x, Number.NaN);
  const sign = sense === 'minimize' ? -1 : 1;
  const { matrix, width, positionOfVariable } = tableau;
  for (let j = 0; j < n; j++) {
    const row = positionOfVariable[j + 1]! - width;
    const v = row >= 0 ? matrix[row * width]! : 0;
    if (v > PRECISION) x[j] = roundToPrecision(v, PRECISION);
  }
  return answer(ws, 'optimal', x, -sign * simplexResult.value);
}

function answer(ws: LpWorkspace | undefined, status: LpStatus, x: Float64Array, objective: number): LpSolution {
  if (!ws) return { status, x, objective };
  const a = ws.answer;
  a.status = status;
  a.x = x;
  a.objective = objective;
  return a;
}

/**
 * Hand a copy of one LP to the observer (a function of its own, so that the solve's compiled code
 * does not depend on which observer is set); `noteDenseLp` for an LP another exact method solved.
 */
export function noteDenseLp(...[sense, n, objective, m, a, lo, hi]: Parameters<typeof solveDenseLp>): void {
  observer?.({
    sense,
    n,
    objective: Float64Array.from({ length: n }, (_, j) => objective[j]!),
    m,
    a: Float64Array.from({ length: m * n }, (_, q) => a[q]!),
    lo: Float64Array.from({ length: m }, (_, r) => lo[r]!),
    hi: Float64Array.from({ length: m }, (_, r) => hi[r]!),
  });
}

/** yalps' tableau of the dense LP (see `tableauModel` in yalps' src/tableau.ts), in the workspace. */
function writeTableau(
  ws: LpWorkspace,
  sign: number,
  n: number,
  objective: ArrayLike<number>,
  m: number,
  a: ArrayLike<number>,
  lo: ArrayLike<number>,
  hi: ArrayLike<number>,
): Tableau {
  // Rows of the tableau: 1 for the objective, then one per finite bound of each row.
  let height = 1;
  for (let r = 0; r < m; r++) {
    if (lo[r]! > Number.NEGATIVE_INFINITY) height++;
    if (hi[r]! < Number.POSITIVE_INFINITY) height++;
  }
  const width = n + 1;
  const t = ws.tableau(width, height);
  const mat = t.matrix;
  // Every entry is written (no separate clearing pass); an absent coefficient is +0, as in yalps'
  // tableau (never −0: zeros are not negated).
  mat[0] = 0;
  for (let j = 0; j < n; j++) {
    const c = objective[j]!;
    mat[j + 1] = c !== 0 ? sign * c : 0;
  }
  let row = 1;
  for (let r = 0; r < m; r++) {
    const l = lo[r]!;
    const u = hi[r]!;
    const hasLo = l > Number.NEGATIVE_INFINITY;
    const hasHi = u < Number.POSITIVE_INFINITY;
    if (!hasLo && !hasHi) continue;
    const src = r * n;
    if (hasHi) {
      const o = row * width;
      mat[o] = u;
      for (let j = 0; j < n; j++) {
        const v = a[src + j]!;
        mat[o + 1 + j] = v !== 0 ? v : 0;
      }
      row++;
    }
    if (hasLo) {
      const o = row * width;
      mat[o] = -l;
      for (let j = 0; j < n; j++) {
        const v = a[src + j]!;
        mat[o + 1 + j] = v !== 0 ? -v : 0;
      }
      row++;
    }
  }
  return t;
}
