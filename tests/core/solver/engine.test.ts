import { describe, expect, it } from 'vitest';
import { preparePlain, type PlainProblem } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';

// A three-stock least-cost blend (invented stocks; the values matter only for being solvable).
const problem: PlainProblem = {
  components: [
    { id: 'a', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.1 },
    { id: 'b', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.2 },
    { id: 'c', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6 },
  ],
  targetKv40: 220,
  tolerancePct: 5,
  objective: 'cost',
};

describe('solvePrepared — each answer owns its fractions', () => {
  it('two solves of one prepared problem give two arrays with the same fractions', () => {
    const P = preparePlain(problem);
    const one = solvePrepared(P);
    const two = solvePrepared(P);
    expect(one.status).toBe('optimal');
    expect(two.status).toBe('optimal');
    if (one.status !== 'optimal' || two.status !== 'optimal') return;
    expect(two.massFractions).not.toBe(one.massFractions);
    expect([...two.massFractions]).toEqual([...one.massFractions]);
    // Σ w = 1 (common practice (no source)); writing into one answer leaves the other as it was.
    expect(one.massFractions.reduce((s, w) => s + w, 0)).toBeCloseTo(1, 12);
    const kept = [...two.massFractions];
    one.massFractions.fill(0);
    expect([...two.massFractions]).toEqual(kept);
  });

  it('a subset solve returns fractions aligned with every component, zeros for the unused', () => {
    const P = preparePlain(problem);
    const r = solvePrepared(P, [0, 2]);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(r.massFractions.length).toBe(3);
    expect(r.massFractions[1]).toBe(0);
    expect(r.massFractions[0]! + r.massFractions[2]!).toBeCloseTo(1, 12);
  });
});
