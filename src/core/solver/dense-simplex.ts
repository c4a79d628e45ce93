/**
 * yalps' two-phase dense simplex (the copy in `yalps-simplex.ts`) restated for the solver's hot
 * path: the same pivot rules, the same tableau and the same floating-point operations in the same
 * order, so every pivot, every tableau entry and every answer is identical bit for bit — without
 * the per-call costs of the copy (a new array of non-zero columns at every pivot, a pair array for
 * every answer, an accessor call per tableau entry).
 *
 * Rules (yalps 0.6.4, `src/simplex.ts`): phase 1 picks the row with the most negative right-hand
 * side (below −precision) and, in it, the column with the largest ratio −c_j / a_rj over
 * a_rj < −precision (first one on ties); phase 2 picks the column with the largest reduced cost
 * above precision and the row with the least ratio b_r / a_rc over a_rc > precision (first one on
 * ties, stopping early at a ratio ≤ precision). A pivot divides the pivot row by the pivot element
 * (entries of magnitude ≤ 1e-16 set to 0), then subtracts multiples of it from every other row with
 * a column entry of magnitude > 1e-16.
 *
 * Only the first try runs here, without cycle detection (yalps' default); a solve that reaches
 * the pivot limit is retried by the caller on yalps' own copy with cycle detection.
 * tests/core/solver/dense-simplex.test.ts checks this function against that copy on thousands of
 * random tableaus (every entry, both index arrays and the answer), and
 * tests/core/solver/yalps-simplex.test.ts checks `solveDenseLp` against `yalps.solve` itself.
 */
import type { Tableau } from './yalps-simplex';

/** Status codes of {@link denseSimplex}. */
export const SIMPLEX_OPTIMAL = 0;
export const SIMPLEX_INFEASIBLE = 1;
export const SIMPLEX_UNBOUNDED = 2;
/** The pivot limit was reached (the caller retries with cycle detection). */
export const SIMPLEX_CYCLED = 3;

/**
 * Column indices of the pivot row's non-zero entries (module scratch memory: the core is
 * synchronous), grown to the widest tableau seen.
 */
let nonZero = new Int32Array(64);

/**
 * Pivot on (row, col), exactly as yalps' `pivot`.
 *
 * @param t - the tableau (modified in place)
 */
function pivotFast(t: Tableau, row: number, col: number): void {
  const mat = t.matrix;
  const width = t.width;
  const height = t.height;
  const ro = row * width;
  const quotient = mat[ro + col]!;
  const vap = t.variableAtPosition;
  const pov = t.positionOfVariable;
  const leaving = vap[width + row]!;
  const entering = vap[col]!;
  vap[width + row] = entering;
  vap[col] = leaving;
  pov[leaving] = col;
  pov[entering] = width + row;
  if (nonZero.length < width) nonZero = new Int32Array(2 * width);
  const nz = nonZero;
  let count = 0;
  for (let c = 0; c < width; c++) {
    const value = mat[ro + c]!;
    if (Math.abs(value) > 1e-16) {
      mat[ro + c] = value / quotient;
      nz[count++] = c;
    } else {
      mat[ro + c] = 0;
    }
  }
  mat[ro + col] = 1 / quotient;
  for (let r = 0; r < height; r++) {
    if (r === row) continue;
    const o = r * width;
    const coef = mat[o + col]!;
    if (Math.abs(coef) > 1e-16) {
      for (let i = 0; i < count; i++) {
        const c = nz[i]!;
        mat[o + c] = mat[o + c]! - coef * mat[ro + c]!;
      }
      mat[o + col] = -coef / quotient;
    }
  }
}

/** The objective value of the last optimal {@link denseSimplex} (rounded to its precision, as yalps). */
export const simplexResult = { value: Number.NaN };

/**
 * yalps' two-phase simplex without cycle detection on `t` (modified in place), pivot for pivot.
 *
 * @param t - yalps' tableau (row 0 the objective, rows 1… the constraints [b, a]; see `yalps-simplex.ts`)
 * @param precision - numbers of magnitude ≤ this are zero (yalps' `precision`)
 * @param maxPivots - pivot limit of each phase
 * @returns a status code; when optimal, the objective value (tableau entry (0, 0) rounded to
 *   precision as yalps' `roundToPrecision`) is in {@link simplexResult}
 */
export function denseSimplex(t: Tableau, precision: number, maxPivots: number): number {
  const width = t.width;
  const height = t.height;
  const mat = t.matrix;
  // Phase 1: restore a feasible basis (dual-ratio pivots on the most negative right-hand side).
  let phase2 = false;
  for (let iter = 0; iter < maxPivots; iter++) {
    let row = 0;
    let rhs = -precision;
    for (let r = 1; r < height; r++) {
      const value = mat[r * width]!;
      if (value < rhs) {
        rhs = value;
        row = r;
      }
    }
    if (row === 0) {
      phase2 = true;
      break;
    }
    const ro = row * width;
    let col = 0;
    let maxRatio = -Infinity;
    for (let c = 1; c < width; c++) {
      const coefficient = mat[ro + c]!;
      if (coefficient < -precision) {
        const ratio = -mat[c]! / coefficient;
        if (ratio > maxRatio) {
          maxRatio = ratio;
          col = c;
        }
      }
    }
    if (col === 0) return SIMPLEX_INFEASIBLE;
    pivotFast(t, row, col);
  }
  if (!phase2) return SIMPLEX_CYCLED;
  // Phase 2: improve the objective (largest reduced cost, least ratio).
  for (let iter = 0; iter < maxPivots; iter++) {
    let col = 0;
    let value = precision;
    for (let c = 1; c < width; c++) {
      const reducedCost = mat[c]!;
      if (reducedCost > value) {
        value = reducedCost;
        col = c;
      }
    }
    if (col === 0) {
      // yalps' roundToPrecision(tableau[0][0], precision).
      const rounding = Math.round(1 / precision);
      simplexResult.value = Math.round((mat[0]! + Number.EPSILON) * rounding) / rounding;
      return SIMPLEX_OPTIMAL;
    }
    let row = 0;
    let minRatio = Infinity;
    for (let r = 1; r < height; r++) {
      const o = r * width;
      const value2 = mat[o + col]!;
      if (value2 <= precision) continue;
      const ratio = mat[o]! / value2;
      if (ratio < minRatio) {
        row = r;
        minRatio = ratio;
        if (ratio <= precision) break;
      }
    }
    if (row === 0) return SIMPLEX_UNBOUNDED;
    pivotFast(t, row, col);
  }
  return SIMPLEX_CYCLED;
}
