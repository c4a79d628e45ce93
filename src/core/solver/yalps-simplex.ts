/**
 * The dense simplex of yalps 0.6.4 (its `src/simplex.ts`: `pivot`, `phase1`, `phase2`, `hasCycle`,
 * and `roundToPrecision` from `src/util.ts`), copied verbatim so that it can run on a tableau the
 * caller owns and reuses. Nothing here is written anew: only types were added.
 *
 * Why a copy: yalps exports only `solve(model)`, which turns a model object (a Map of constraints,
 * an array of coefficient pairs per variable) into a fresh tableau on every call and a solution
 * object back — about 1.6 µs of the 2.4 µs a small blending LP takes, and most of the garbage of
 * the substitute search; its simplex itself takes about 0.5 µs. The package's `exports` map allows
 * no deep import, so its internal functions are reachable only this way.
 *
 * Kept honest by tests/core/solver/yalps-simplex.test.ts: the installed yalps must be 0.6.4 with
 * the same `src/simplex.ts` section in its build (SHA-256 of that text), and `solveDenseLp` (which
 * runs this copy) must return exactly what `yalps.solve` returns — status, every variable and the
 * objective, bit for bit — on thousands of random, degenerate, infeasible and unbounded LPs.
 *
 * Tableau (yalps' layout): row 0 holds the objective (reduced costs, c₀ = current value), rows
 * 1…height−1 the constraints `a·x ≤ b` as [b, a₁ … aₙ]; `matrix[row·width + col]`, width = n + 1.
 * `positionOfVariable[v]` / `variableAtPosition[p]`: variables 1…n are the structural ones, the
 * rest the slacks; a position ≥ width means "basic, in row position − width".
 *
 * yalps — MIT License, Copyright (c) 2022-2023 Ian Manske. Permission is hereby granted, free of
 * charge, to any person obtaining a copy of this software and associated documentation files (the
 * "Software"), to deal in the Software without restriction, including without limitation the rights
 * to use, copy, modify, merge, publish, distribute, sublicense, and/or sell copies of the Software,
 * and to permit persons to whom the Software is furnished to do so, subject to the following
 * conditions: The above copyright notice and this permission notice shall be included in all
 * copies or substantial portions of the Software. THE SOFTWARE IS PROVIDED "AS IS", WITHOUT
 * WARRANTY OF ANY KIND, EXPRESS OR IMPLIED, INCLUDING BUT NOT LIMITED TO THE WARRANTIES OF
 * MERCHANTABILITY, FITNESS FOR A PARTICULAR PURPOSE AND NONINFRINGEMENT. IN NO EVENT SHALL THE
 * AUTHORS OR COPYRIGHT HOLDERS BE LIABLE FOR ANY CLAIM, DAMAGES OR OTHER LIABILITY, WHETHER IN AN
 * ACTION OF CONTRACT, TORT OR OTHERWISE, ARISING FROM, OUT OF OR IN CONNECTION WITH THE SOFTWARE OR
 * THE USE OR OTHER DEALINGS IN THE SOFTWARE.
 */

/** yalps' tableau. `matrix` may be longer than width·height (a reused buffer). */
export interface Tableau {
  matrix: Float64Array;
  width: number;
  height: number;
  positionOfVariable: Int32Array;
  variableAtPosition: Int32Array;
}

/** yalps' simplex options (the subset the simplex reads). */
export interface SimplexOptions {
  precision: number;
  maxPivots: number;
  checkCycles: boolean;
}

export type SimplexStatus = 'optimal' | 'infeasible' | 'unbounded' | 'cycled';

// src/tableau.ts
const index = (tableau: Tableau, row: number, col: number): number => tableau.matrix[Math.imul(row, tableau.width) + col]!;
const update = (tableau: Tableau, row: number, col: number, value: number): void => {
  tableau.matrix[Math.imul(row, tableau.width) + col] = value;
};

// src/util.ts
/** yalps' rounding of results to its precision. */
export const roundToPrecision = (num: number, precision: number): number => {
  const rounding = Math.round(1 / precision);
  return Math.round((num + Number.EPSILON) * rounding) / rounding;
};

// src/simplex.ts
const pivot = (tableau: Tableau, row: number, col: number): void => {
  const quotient = index(tableau, row, col);
  const leaving = tableau.variableAtPosition[tableau.width + row]!;
  const entering = tableau.variableAtPosition[col]!;
  tableau.variableAtPosition[tableau.width + row] = entering;
  tableau.variableAtPosition[col] = leaving;
  tableau.positionOfVariable[leaving] = col;
  tableau.positionOfVariable[entering] = tableau.width + row;
  const nonZeroColumns: number[] = [];
  for (let c = 0; c < tableau.width; c++) {
    const value = index(tableau, row, c);
    if (Math.abs(value) > 1e-16) {
      update(tableau, row, c, value / quotient);
      nonZeroColumns.push(c);
    } else {
      update(tableau, row, c, 0);
    }
  }
  update(tableau, row, col, 1 / quotient);
  for (let r = 0; r < tableau.height; r++) {
    if (r === row) continue;
    const coef = index(tableau, r, col);
    if (Math.abs(coef) > 1e-16) {
      for (let i = 0; i < nonZeroColumns.length; i++) {
        const c = nonZeroColumns[i]!;
        update(tableau, r, c, index(tableau, r, c) - coef * index(tableau, row, c));
      }
      update(tableau, r, col, -coef / quotient);
    }
  }
};

const hasCycle = (history: [number, number][], tableau: Tableau, row: number, col: number): boolean => {
  history.push([tableau.variableAtPosition[tableau.width + row]!, tableau.variableAtPosition[col]!]);
  for (let length = 6; length <= Math.trunc(history.length / 2); length++) {
    let cycle = true;
    for (let i = 0; i < length; i++) {
      const item = history.length - 1 - i;
      const [row1, col1] = history[item]!;
      const [row2, col2] = history[item - length]!;
      if (row1 !== row2 || col1 !== col2) {
        cycle = false;
        break;
      }
    }
    if (cycle) return true;
  }
  return false;
};

const phase2 = (tableau: Tableau, options: SimplexOptions): [SimplexStatus, number] => {
  const pivotHistory: [number, number][] = [];
  const { precision, maxPivots, checkCycles } = options;
  for (let iter = 0; iter < maxPivots; iter++) {
    let col = 0;
    let value = precision;
    for (let c = 1; c < tableau.width; c++) {
      const reducedCost = index(tableau, 0, c);
      if (reducedCost > value) {
        value = reducedCost;
        col = c;
      }
    }
    if (col === 0) return ['optimal', roundToPrecision(index(tableau, 0, 0), precision)];
    let row = 0;
    let minRatio = Infinity;
    for (let r = 1; r < tableau.height; r++) {
      const value2 = index(tableau, r, col);
      if (value2 <= precision) continue;
      const rhs = index(tableau, r, 0);
      const ratio = rhs / value2;
      if (ratio < minRatio) {
        row = r;
        minRatio = ratio;
        if (ratio <= precision) break;
      }
    }
    if (row === 0) return ['unbounded', col];
    if (checkCycles && hasCycle(pivotHistory, tableau, row, col)) return ['cycled', NaN];
    pivot(tableau, row, col);
  }
  return ['cycled', NaN];
};

/**
 * yalps' two-phase simplex on `tableau` (modified in place): phase 1 restores a feasible basis
 * (dual-ratio pivots on the most negative right-hand side), phase 2 improves the objective.
 *
 * @returns ['optimal', value] (value = tableau objective, rounded to `precision`), ['infeasible', NaN],
 *   ['unbounded', column], or ['cycled', NaN] (maxPivots reached, or a cycle found with checkCycles)
 */
export const phase1 = (tableau: Tableau, options: SimplexOptions): [SimplexStatus, number] => {
  const pivotHistory: [number, number][] = [];
  const { precision, maxPivots, checkCycles } = options;
  for (let iter = 0; iter < maxPivots; iter++) {
    let row = 0;
    let rhs = -precision;
    for (let r = 1; r < tableau.height; r++) {
      const value = index(tableau, r, 0);
      if (value < rhs) {
        rhs = value;
        row = r;
      }
    }
    if (row === 0) return phase2(tableau, options);
    let col = 0;
    let maxRatio = -Infinity;
    for (let c = 1; c < tableau.width; c++) {
      const coefficient = index(tableau, row, c);
      if (coefficient < -precision) {
        const ratio = -index(tableau, 0, c) / coefficient;
        if (ratio > maxRatio) {
          maxRatio = ratio;
          col = c;
        }
      }
    }
    if (col === 0) return ['infeasible', NaN];
    if (checkCycles && hasCycle(pivotHistory, tableau, row, col)) return ['cycled', NaN];
    pivot(tableau, row, col);
  }
  return ['cycled', NaN];
};
