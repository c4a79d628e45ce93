import { describe, expect, it } from 'vitest';
import { preparePlain, type PlainProblem } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';
import { blendViscosityRefutas } from '../../../src/core/blending/refutas';
import { viscosityIndex } from '../../../src/core/viscosity/viscosity-index';

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

describe('solvePrepared — ν40, ν100 and VI of the answer, computed when first read', () => {
  // The answer computes them from its fractions on first read; they must be the core's numbers
  // (Refutas blend, ASTM D2270 VI) whatever is read first, and a JSON copy must carry them.
  const withVi: PlainProblem = { ...problem, minVi: 95 };
  for (const [name, p] of [['without a minimum VI', problem], ['with a minimum VI', withVi]] as const) {
    it(`equal the core's Refutas ν and D2270 VI of the fractions, ${name}`, () => {
      const r = solvePrepared(preparePlain(p));
      expect(r.status).toBe('optimal');
      if (r.status !== 'optimal') return;
      const parts = (t: 'kv40' | 'kv100') => p.components.map((c, i) => ({ massFraction: r.massFractions[i]!, kv: c[t] }));
      // The core itself is the reference (Refutas and ASTM D2270 as implemented in src/core).
      const kv40 = blendViscosityRefutas(parts('kv40'));
      const kv100 = blendViscosityRefutas(parts('kv100'));
      // VI read first, then ν: same numbers as ν read first (a second solve).
      const vi = r.vi!;
      expect(vi).toBeCloseTo(viscosityIndex(kv40, kv100), 9);
      expect(r.kv40).toBeCloseTo(kv40, 9);
      expect(r.kv100).toBeCloseTo(kv100, 9);
      const again = solvePrepared(preparePlain(p));
      if (again.status !== 'optimal') throw new Error('second solve');
      expect(again.kv40).toBe(r.kv40);
      expect(again.kv100).toBe(r.kv100);
      expect(again.vi).toBe(vi);
      const copy = JSON.parse(JSON.stringify(r)) as Record<string, unknown>;
      expect(copy.kv40).toBe(r.kv40);
      expect(copy.kv100).toBe(r.kv100);
      expect(copy.vi).toBe(vi);
      expect(copy.costPerLitre).toBe(r.costPerLitre);
    });
  }
});
