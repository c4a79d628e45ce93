import { beforeAll, describe, expect, it } from 'vitest';
import { solveBlendPlain, plainBlendProperties, type PlainProblem } from '../../../src/core/solver/plain';
import {
  BlendbenchInputError,
  FractionSumError,
  ImplausibleDensityError,
  NonPositiveViscosityError,
  ViscosityOrderError,
  ViscosityOutOfRangeError,
} from '../../../src/core/errors';
import { checkPlain, gridBest, randomPlainProblem, rng } from './helpers';

const fractionsOf = (p: PlainProblem, m: Record<string, number>): number[] => p.components.map((c) => m[c.id]!);

describe('solveBlendPlain — worked cases', () => {
  it('two stocks to an exact target: the Refutas linear inverse', () => {
    // ν 100 + ν 460 reaching 220: heavy mass fraction 0.55126 ± 1e-4 (tests/reference/check-values.md B3)
    const r = solveBlendPlain({
      components: [
        { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 },
        { id: 'heavy', kv40: 460, kv100: 31, density15: 0.9, anilinePoint: 125, pricePerKg: 1.5 },
      ],
      targetKv40: 220,
      tolerancePct: 0,
      objective: 'cost',
    });
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(r.massFractions.heavy).toBeCloseTo(0.55126, 4);
    expect(r.kv40).toBeCloseTo(220, 3);
  });

  it('returns every id, zeros included, and numbers equal to the core recomputation', () => {
    const p: PlainProblem = {
      components: [
        { id: 'a', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.1 },
        { id: 'b', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.2 },
        { id: 'c', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6 },
        { id: 'pricey', kv40: 395, kv100: 39.5, density15: 0.85, anilinePoint: 145, pricePerKg: 9 },
      ],
      targetKv40: 220,
      tolerancePct: 5,
      objective: 'cost',
    };
    const r = solveBlendPlain(p);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(Object.keys(r.massFractions).sort()).toEqual(['a', 'b', 'c', 'pricey']);
    expect(r.massFractions.pricey).toBe(0); // invented fixture: at 9 per kg the pricey stock never pays
    const core = plainBlendProperties(p.components, fractionsOf(p, r.massFractions));
    // identity: the engine's numbers are the core's equations (Refutas, D2270, ideal mixing)
    for (const k of ['kv40', 'kv100', 'vi', 'density15', 'anilinePoint', 'costPerLitre'] as const) {
      expect(r[k]).toBeCloseTo(core[k], 9);
    }
    // cost per litre = density × Σ wᵢ·priceᵢ (tests/reference/check-values.md D2)
    const perKg = p.components.reduce((s, c) => s + r.massFractions[c.id]! * c.pricePerKg, 0);
    expect(r.costPerLitre).toBeCloseTo(r.density15 * perKg, 12);
  });

  it('solvency objective finds the lowest aniline point', () => {
    const p: PlainProblem = {
      components: [
        { id: 'g2', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.2 },
        { id: 'hvy', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6 },
        { id: 'an', kv40: 109, kv100: 12.4, density15: 0.89, anilinePoint: 90, pricePerKg: 4.2 },
      ],
      targetKv40: 220,
      tolerancePct: 5,
      objective: 'solvency',
    };
    const r = solveBlendPlain(p);
    const c = solveBlendPlain({ ...p, objective: 'cost' });
    expect(r.status).toBe('optimal');
    expect(c.status).toBe('optimal');
    if (r.status !== 'optimal' || c.status !== 'optimal') return;
    // property: the solvency optimum is at least as solvent as the cost optimum, and uses the
    // alkylated-naphthalene-like stock fully instead of the Group II neutral
    expect(r.anilinePoint).toBeLessThan(c.anilinePoint);
    expect(r.massFractions.g2).toBe(0);
    expect(gridBest(p, 100)! - r.anilinePoint).toBeGreaterThanOrEqual(-1e-9);
  });

  it('says why when nothing fits, from the achievable range', () => {
    const r = solveBlendPlain({
      components: [
        { id: 'light', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.1 },
        { id: 'heavy', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.2 },
      ],
      targetKv40: 220,
      tolerancePct: 5,
      objective: 'cost',
    });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.reason).toContain('heavy');
    expect(r.reason).toContain('110 mm²/s');
    expect(r.reason).toContain('209 mm²/s');
  });

  it('minimum fractions adding up to more than 100 % are infeasible, with the reason', () => {
    const r = solveBlendPlain({
      components: [
        { id: 'a', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.1, minMassFraction: 0.7 },
        { id: 'b', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6, minMassFraction: 0.4 },
      ],
      targetKv40: 220,
      tolerancePct: 5,
      objective: 'cost',
    });
    expect(r).toMatchObject({ status: 'infeasible' });
    if (r.status === 'infeasible') expect(r.reason).toContain('110.0 %');
  });

  it('throws the core’s named errors for impossible input', () => {
    const ok = { id: 'a', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.1 };
    const base: PlainProblem = { components: [ok], targetKv40: 42, tolerancePct: 5, objective: 'cost' };
    const bad = (over: Partial<PlainProblem>) => () => solveBlendPlain({ ...base, ...over });
    expect(bad({ components: [{ ...ok, kv40: 0 }] })).toThrow(NonPositiveViscosityError);
    expect(bad({ components: [{ ...ok, kv100: 50 }] })).toThrow(ViscosityOrderError);
    expect(bad({ components: [{ ...ok, kv100: 1.9 }] })).toThrow(ViscosityOutOfRangeError);
    expect(bad({ components: [{ ...ok, density15: 862 }] })).toThrow(ImplausibleDensityError);
    expect(bad({ components: [{ ...ok, minMassFraction: 0.6, maxMassFraction: 0.5 }] })).toThrow(FractionSumError);
    expect(bad({ components: [{ ...ok, maxMassFraction: 1.5 }] })).toThrow(FractionSumError);
    expect(bad({ components: [ok, ok] })).toThrow(BlendbenchInputError);
    expect(bad({ components: [] })).toThrow(BlendbenchInputError);
    expect(bad({ targetKv40: -5 })).toThrow(NonPositiveViscosityError);
    expect(bad({ tolerancePct: -1 })).toThrow(BlendbenchInputError);
    expect(bad({ minVi: Number.NaN })).toThrow(BlendbenchInputError);
    expect(bad({ objective: 'speed' as 'cost' })).toThrow(BlendbenchInputError);
    try {
      solveBlendPlain({ ...base, components: [ok, { ...ok, id: 'b', kv40: -1 }] });
    } catch (e) {
      expect((e as BlendbenchInputError).field).toBe('components[1].kv40');
    }
  });
});

describe('solveBlendPlain against brute force (random small problems)', () => {
  // Brute force: every 1 % (3 components) or 2 % (4 components) grid point, checked exactly with
  // the core's functions. The solver may never be costlier than a feasible grid point by > 0.5 %
  // (issue 3), and every answer must pass the feasibility check recomputed by the core.
  const cases: { p: PlainProblem; steps: number }[] = [];
  const r = rng(20240601);
  for (let i = 0; i < 40; i++) cases.push({ p: randomPlainProblem(r, { k: 3, vi: 0.6, aniline: 0.3, bounds: 0.2 }), steps: 100 });
  for (let i = 0; i < 12; i++) cases.push({ p: randomPlainProblem(r, { k: 4, vi: 0.6, aniline: 0.3, bounds: 0.2 }), steps: 50 });
  for (let i = 0; i < 12; i++) cases.push({ p: randomPlainProblem(r, { k: 3, vi: 0.5, aniline: 0.3, objective: 'solvency' }), steps: 100 });

  it('is feasible whenever a grid point is, never worse by more than 0.5 %, and always feasible when recomputed', () => {
    let feasible = 0;
    let viActive = 0;
    for (const { p, steps } of cases) {
      const res = solveBlendPlain(p);
      const grid = gridBest(p, steps);
      if (grid !== null) expect(res.status, JSON.stringify(p)).toBe('optimal');
      if (res.status !== 'optimal') continue;
      feasible++;
      const chk = checkPlain(p, fractionsOf(p, res.massFractions));
      expect(chk.failures, JSON.stringify(p)).toEqual([]);
      const value = p.objective === 'cost' ? chk.costPerLitre : chk.anilinePoint;
      if (grid !== null) expect(value, JSON.stringify(p)).toBeLessThanOrEqual(grid * 1.005 + 1e-9);
      if (p.minVi !== undefined && chk.vi < p.minVi + 0.05) viActive++;
    }
    expect(feasible).toBeGreaterThan(cases.length / 2);
    expect(viActive).toBeGreaterThan(3); // the VI condition binds in a good share of the cases
  });
});

describe('solveBlendPlain against HiGHS (plain LPs: no VI condition)', () => {
  // HiGHS (WebAssembly build, test-only oracle) solves the same problem written independently in
  // the textbook Charnes–Cooper form: variables yᵢ = t·wᵢ and t; Σyᵢ − t = 0; the objective's
  // denominator Σ yᵢ/ρᵢ (cost) or Σ yᵢ/ρᵢ (solvency: every component has an aniline point) = 1;
  // each constraint a·w ≤ b becomes a·y − b·t ≤ 0. Same status; optimum to 1e-6 relative.
  let highs: { solve(lp: string): { Status: string; ObjectiveValue: number } };
  beforeAll(async () => {
    const mod = (await import('highs')) as unknown as { default: () => Promise<typeof highs> };
    highs = await mod.default();
  });

  const num = (x: number): string => (x >= 0 ? `+ ${x.toPrecision(17)}` : `- ${(-x).toPrecision(17)}`);
  function lpText(p: PlainProblem): string {
    const n = p.components.length;
    const vbn = (kv: number) => 14.534 * Math.log(Math.log(kv + 0.8)) + 10.975; // Refutas (check-values §3)
    const A = vbn(p.targetKv40 * (1 - p.tolerancePct / 100));
    const B = vbn(p.targetKv40 * (1 + p.tolerancePct / 100));
    const y = (i: number) => `y${i}`;
    const sum = (f: (i: number) => number) => Array.from({ length: n }, (_, i) => `${num(f(i))} ${y(i)}`).join(' ');
    const objCoef = (i: number) => (p.objective === 'cost' ? p.components[i]!.pricePerKg : p.components[i]!.anilinePoint / p.components[i]!.density15);
    const rows = [
      `norm: ${sum((i) => 1 / p.components[i]!.density15)} = 1`,
      `tdef: ${sum(() => 1)} - t = 0`,
      `vlo: ${sum((i) => vbn(p.components[i]!.kv40))} ${num(-A)} t >= 0`,
      `vhi: ${sum((i) => vbn(p.components[i]!.kv40))} ${num(-B)} t <= 0`,
    ];
    if (p.maxAnilinePoint !== undefined) {
      rows.push(`ap: ${sum((i) => (p.components[i]!.anilinePoint - p.maxAnilinePoint!) / p.components[i]!.density15)} <= 0`);
    }
    p.components.forEach((c, i) => {
      if (c.minMassFraction) rows.push(`lo${i}: ${y(i)} ${num(-c.minMassFraction)} t >= 0`);
      if (c.maxMassFraction !== undefined && c.maxMassFraction < 1) rows.push(`hi${i}: ${y(i)} ${num(-c.maxMassFraction)} t <= 0`);
    });
    return `Minimize\n obj: ${sum(objCoef)}\nSubject To\n ${rows.join('\n ')}\nEnd\n`;
  }

  it('matches status and optimum on random problems with bounds and an aniline limit', () => {
    const r = rng(77);
    let optimal = 0;
    let infeasible = 0;
    for (let i = 0; i < 90; i++) {
      const p = randomPlainProblem(r, { k: 3 + (i % 4), vi: 0, aniline: 0.4, bounds: 0.3, objective: i % 3 === 0 ? 'solvency' : 'cost' });
      const mine = solveBlendPlain(p);
      const ref = highs.solve(lpText(p));
      expect(['Optimal', 'Infeasible']).toContain(ref.Status);
      expect(mine.status, JSON.stringify(p)).toBe(ref.Status === 'Optimal' ? 'optimal' : 'infeasible');
      if (mine.status === 'optimal') {
        optimal++;
        const v = p.objective === 'cost' ? mine.costPerLitre : mine.anilinePoint;
        expect(Math.abs(v - ref.ObjectiveValue) / Math.abs(ref.ObjectiveValue)).toBeLessThan(1e-6);
      } else infeasible++;
    }
    expect(optimal).toBeGreaterThan(30);
    expect(infeasible).toBeGreaterThan(3);
  });
});
