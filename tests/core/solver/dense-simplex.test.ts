/**
 * The restated simplex (src/core/solver/dense-simplex.ts) pivots exactly as yalps' own copy
 * (src/core/solver/yalps-simplex.ts) without cycle detection: same status, same objective value
 * and, after the run, the same tableau entry for entry and the same index arrays, bit for bit.
 */
import { describe, expect, it } from 'vitest';
import { phase1, type Tableau } from '../../../src/core/solver/yalps-simplex';
import {
  denseSimplex,
  simplexResult,
  SIMPLEX_CYCLED,
  SIMPLEX_INFEASIBLE,
  SIMPLEX_OPTIMAL,
  SIMPLEX_UNBOUNDED,
} from '../../../src/core/solver/dense-simplex';
import { rng } from './helpers';

const CODE = { optimal: SIMPLEX_OPTIMAL, infeasible: SIMPLEX_INFEASIBLE, unbounded: SIMPLEX_UNBOUNDED, cycled: SIMPLEX_CYCLED } as const;

/** A random yalps tableau: objective row, then [b, a] rows; some degenerate (repeated rows, zeros, b = 0). */
function randomTableau(r: () => number): Tableau {
  const n = 1 + Math.floor(r() * 7);
  const rows = Math.floor(r() * 10);
  const width = n + 1;
  const height = rows + 1;
  const matrix = new Float64Array(width * height + Math.floor(r() * 5)); // possibly longer, as a reused buffer
  for (let c = 1; c < width; c++) matrix[c] = r() < 0.15 ? 0 : 10 * r() - 5;
  for (let q = 1; q < height; q++) {
    const o = q * width;
    if (q > 1 && r() < 0.1) {
      matrix.copyWithin(o, o - width, o);
      continue;
    }
    const kind = r();
    matrix[o] = kind < 0.2 ? 0 : kind < 0.35 ? -(1 + 3 * r()) : 10 * r() - 3;
    for (let c = 1; c < width; c++) matrix[o + c] = r() < 0.2 ? 0 : r() < 0.05 ? 1e-17 : 10 * r() - 5;
  }
  const positionOfVariable = Int32Array.from({ length: width + height }, (_, i) => i);
  return { matrix, width, height, positionOfVariable, variableAtPosition: positionOfVariable.slice() };
}

function copyOf(t: Tableau): Tableau {
  return { ...t, matrix: t.matrix.slice(), positionOfVariable: t.positionOfVariable.slice(), variableAtPosition: t.variableAtPosition.slice() };
}

describe('denseSimplex', () => {
  it('pivots exactly as the copy of yalps on 20,000 random tableaus (seed 19)', () => {
    // reference library: yalps 0.6.4's simplex (its copy in yalps-simplex.ts), bit-for-bit equality
    const r = rng(19);
    const seen = { optimal: 0, infeasible: 0, unbounded: 0, cycled: 0 };
    for (let k = 0; k < 20000; k++) {
      const t = randomTableau(r);
      const mine = copyOf(t);
      const ref = copyOf(t);
      const [status, value] = phase1(ref, { precision: 1e-8, maxPivots: 8192, checkCycles: false });
      const code = denseSimplex(mine, 1e-8, 8192);
      const what = `tableau ${k}: ${JSON.stringify({ width: t.width, height: t.height, matrix: [...t.matrix] })}`;
      expect(code, what).toBe(CODE[status]);
      if (status === 'optimal') expect(Object.is(simplexResult.value, value), what).toBe(true);
      expect(Buffer.from(mine.matrix.buffer).equals(Buffer.from(ref.matrix.buffer)), what).toBe(true);
      expect([...mine.positionOfVariable], what).toEqual([...ref.positionOfVariable]);
      expect([...mine.variableAtPosition], what).toEqual([...ref.variableAtPosition]);
      seen[status]++;
    }
    expect(seen.optimal).toBeGreaterThan(3000);
    expect(seen.infeasible).toBeGreaterThan(1000);
    expect(seen.unbounded).toBeGreaterThan(1000);
  });

  it('stops at the pivot limit as the copy does', () => {
    // reference library: yalps' simplex copy with maxPivots 1 (a limit reached in phase 1 or 2)
    const r = rng(7);
    let limited = 0;
    for (let k = 0; k < 2000; k++) {
      const t = randomTableau(r);
      const mine = copyOf(t);
      const ref = copyOf(t);
      const [status] = phase1(ref, { precision: 1e-8, maxPivots: 1, checkCycles: false });
      expect(denseSimplex(mine, 1e-8, 1)).toBe(CODE[status]);
      expect(Buffer.from(mine.matrix.buffer).equals(Buffer.from(ref.matrix.buffer))).toBe(true);
      if (status === 'cycled') limited++;
    }
    expect(limited).toBeGreaterThan(100);
  });
});
