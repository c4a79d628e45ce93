import { describe, expect, it } from 'vitest';
import { solveLp } from '../../../src/core/solver/lp';

describe('solveLp (interface over yalps)', () => {
  it('solves a textbook LP', () => {
    // max 3x + 5y s.t. x ≤ 4, 2y ≤ 12, 3x + 2y ≤ 18 → x = 2, y = 6, z = 36
    // (textbook example: Hillier & Lieberman, Introduction to Operations Research, the Wyndor problem)
    const r = solveLp({
      sense: 'maximize',
      numVariables: 2,
      objective: [3, 5],
      rows: [
        { coefficients: [1, 0], max: 4 },
        { coefficients: [0, 2], max: 12 },
        { coefficients: [3, 2], max: 18 },
      ],
    });
    expect(r.status).toBe('optimal');
    expect(r.objective).toBeCloseTo(36, 9);
    expect(r.x[0]).toBeCloseTo(2, 9);
    expect(r.x[1]).toBeCloseTo(6, 9);
  });

  it('handles equalities and ranged rows', () => {
    // min x + 2y, x + y = 1, 0.3 ≤ y ≤ 0.6 → y = 0.3, x = 0.7, value 1.3 (common practice (no source): by hand)
    const r = solveLp({
      sense: 'minimize',
      numVariables: 2,
      objective: [1, 2],
      rows: [
        { coefficients: [1, 1], min: 1, max: 1 },
        { coefficients: [0, 1], min: 0.3, max: 0.6 },
      ],
    });
    expect(r.status).toBe('optimal');
    expect(r.objective).toBeCloseTo(1.3, 9);
  });

  it('reports infeasible and unbounded problems', () => {
    const inf = solveLp({ sense: 'minimize', numVariables: 1, objective: [1], rows: [{ coefficients: [1], min: 2, max: 1 }] });
    expect(inf.status).toBe('infeasible');
    expect(Number.isNaN(inf.objective)).toBe(true);
    const unb = solveLp({ sense: 'maximize', numVariables: 1, objective: [1], rows: [{ coefficients: [1], min: 1 }] });
    expect(unb.status).toBe('unbounded');
  });
});
