import { beforeAll, describe, expect, it } from 'vitest';
import { planLinePlain, type PlainLineProblem } from '../../../src/core/lineplan/plain';
import { solveBlendPlain } from '../../../src/core/solver/plain';
import { BlendbenchInputError, InvalidNumberError, ViscosityOrderError } from '../../../src/core/errors';
import { refutasHeavyFraction } from '../../../src/core/blending/refutas';
import { rng } from '../../../bench/fixtures/random-problems';
import { randomLinePlan } from '../../../bench/fixtures/random-line-plans';
import { checkLinePlan, gridLinePlan, highsLineModel } from './helpers';

type Highs = { solve(lp: string, options?: Record<string, unknown>): { Status: string; ObjectiveValue: number } };
let highs: Highs;
beforeAll(async () => {
  const mod = (await import('highs')) as unknown as { default: () => Promise<Highs> };
  highs = await mod.default();
});

// Invented stocks; properties are generic typicals (from memory, tests/reference/base-stock-typicals.md).
const LIGHT = { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 };
const HEAVY = { id: 'heavy', kv40: 460, kv100: 31, density15: 0.9, anilinePoint: 125, pricePerKg: 1.5 };
const PAO = { id: 'pao', kv40: 395, kv100: 39.5, density15: 0.85, anilinePoint: 145, pricePerKg: 4.6 };
const THIN = { id: 'thin', kv40: 30, kv100: 5.1, density15: 0.868, anilinePoint: 98, pricePerKg: 0.9 };

describe('planLinePlain — worked cases', () => {
  it('one grade, no limits: the same recipe as solveBlendPlain would give by cost per kg', () => {
    // Two stocks to an exact target: heavy mass fraction 0.55126 ± 1e-4 (tests/reference/check-values.md B3, Refutas)
    const r = planLinePlain({
      components: [LIGHT, HEAVY],
      grades: [{ id: 'VG 220', targetKv40: 220, tolerancePct: 0, demandKg: 100_000 }],
    });
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(r.grades[0]!.massFractions.heavy).toBeCloseTo(0.55126, 4);
    // total = demand × Σ w·p = 100 000 × (0.44874 × 1.0 + 0.55126 × 1.5) (arithmetic on B3's fractions)
    expect(r.totalCost).toBeCloseTo(100_000 * (0.44874 + 0.55126 * 1.5), -1);
    expect(r.stocksUsed).toEqual(['light', 'heavy']);
  });

  it('a short supply moves the limited stock to the grade where it saves most', () => {
    // Two grades, the cheap heavy stock capped; the dearer PAO replaces it where it costs least.
    const p: PlainLineProblem = {
      components: [LIGHT, { ...HEAVY, supplyKg: 60_000 }, PAO],
      grades: [
        { id: 'VG 220', targetKv40: 220, tolerancePct: 3, demandKg: 100_000 },
        { id: 'VG 320', targetKv40: 320, tolerancePct: 3, demandKg: 50_000 },
      ],
    };
    const r = planLinePlain(p);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    // The cap binds (recomputed; supply to 1e-6 — common practice (no source) for a rounded LP row).
    expect(r.stockUseKg.heavy).toBeGreaterThan(60_000 * (1 - 1e-6));
    expect(checkLinePlan(p, r).failures).toEqual([]);
  });

  it('names the grade that cannot be made, and why', () => {
    const r = planLinePlain({
      components: [LIGHT, HEAVY],
      grades: [
        { id: 'VG 220', targetKv40: 220, tolerancePct: 5, demandKg: 10_000 },
        { id: 'VG 1000', targetKv40: 1000, tolerancePct: 10, demandKg: 10_000 },
      ],
    });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.reason).toContain('Grade "VG 1000" cannot be made');
    expect(r.reason).toContain('460'); // the heaviest stock's ν40 (the input) is quoted
  });

  it('names the short supply and the tonnes missing', () => {
    // One grade made only of light + heavy at ν40 exactly 300: heavy fraction f from the Refutas
    // inverse (check-values §3, formula); demand 100 t needs 100·f t of heavy; 40 t are on offer.
    const f = refutasHeavyFraction(100, 460, 300);
    const r = planLinePlain({
      components: [LIGHT, { ...HEAVY, supplyKg: 40_000 }],
      grades: [{ id: 'VG 320', targetKv40: 300, tolerancePct: 0, demandKg: 100_000 }],
    });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    const shortT = 100 * f - 40;
    expect(shortT).toBeGreaterThan(10);
    expect(r.reason).toContain(`heavy is short by ${Math.round(shortT)} t`);
    expect(r.reason).toContain('40 t on offer');
  });

  it('says how many stocks the line needs when the tank limit is too tight', () => {
    // Two grades that share no stock: a light pair and a heavy pair (4 stocks); limit 3.
    const r = planLinePlain({
      components: [
        { ...THIN, maxMassFraction: 0.6 },
        { ...LIGHT, id: 'light', maxMassFraction: 0.6 },
        { ...HEAVY, id: 'heavy', maxMassFraction: 0.6 },
        { ...PAO, id: 'pao', maxMassFraction: 0.6 },
      ],
      grades: [
        { id: 'VG 46', targetKv40: 46, tolerancePct: 5, demandKg: 10_000 },
        { id: 'VG 460', targetKv40: 430, tolerancePct: 5, demandKg: 10_000 },
      ],
      maxStocks: 3,
    });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.reason).toContain('cannot be made from 3 distinct stocks: it needs at least 4');
  });

  it('throws the core’s named errors naming the field', () => {
    const base: PlainLineProblem = { components: [LIGHT, HEAVY], grades: [{ id: 'a', targetKv40: 220, tolerancePct: 5, demandKg: 1000 }] };
    const err = (p: unknown): BlendbenchInputError => {
      try {
        planLinePlain(p as PlainLineProblem);
      } catch (e) {
        return e as BlendbenchInputError;
      }
      throw new Error('no error');
    };
    expect(err({ ...base, grades: [] }).field).toBe('grades');
    expect(err({ ...base, grades: [{ ...base.grades[0]!, demandKg: 0 }] }).field).toBe('grades[0].demandKg');
    const nan = err({ ...base, grades: [{ ...base.grades[0]!, demandKg: Number.NaN }] });
    expect(nan).toBeInstanceOf(InvalidNumberError);
    expect(nan.field).toBe('grades[0].demandKg');
    expect(err({ ...base, grades: [base.grades[0]!, base.grades[0]!] }).field).toBe('grades[1].id');
    expect(err({ ...base, grades: [{ ...base.grades[0]!, tolerancePct: -1 }] }).field).toBe('grades[0].tolerancePct');
    expect(err({ ...base, grades: [{ ...base.grades[0]!, targetKv40: -5 }] }).field).toBe('grades[0].targetKv40');
    expect(err({ ...base, components: [{ ...LIGHT, supplyKg: -1 }, HEAVY] }).field).toBe('components[0].supplyKg');
    const order = err({ ...base, components: [{ ...LIGHT, kv100: 200 }, HEAVY] });
    expect(order).toBeInstanceOf(ViscosityOrderError);
    expect(order.field).toBe('components[0].kv100');
    expect(err({ ...base, maxStocks: 2.5 }).field).toBe('maxStocks');
    expect(err({ ...base, maxStocks: 0 }).field).toBe('maxStocks');
  });
});

describe('planLinePlain against HiGHS (no VI floors: LPs, and MILPs with a tank limit)', () => {
  // HiGHS (test-only oracle) solves the same plan written independently (helpers.highsLineModel).
  // Same status; the same optimum to 1e-6 relative (issue 11's tolerance); the plan recomputed by the core.
  const compare = (p: PlainLineProblem): 'optimal' | 'infeasible' => {
    const mine = planLinePlain(p);
    const ref = highs.solve(highsLineModel(p), { mip_rel_gap: 1e-10, mip_abs_gap: 1e-9 });
    expect(['Optimal', 'Infeasible']).toContain(ref.Status);
    expect(mine.status, JSON.stringify(p)).toBe(ref.Status === 'Optimal' ? 'optimal' : 'infeasible');
    if (mine.status === 'optimal') {
      expect(Math.abs(mine.totalCost - ref.ObjectiveValue) / ref.ObjectiveValue, JSON.stringify(p)).toBeLessThan(1e-6);
      expect(checkLinePlan(p, mine).failures, JSON.stringify(p)).toEqual([]);
    }
    return mine.status;
  };

  it('LPs: random plans with supply caps, aniline limits and bounds', () => {
    const r = rng(1101);
    const seen = { optimal: 0, infeasible: 0 };
    for (let k = 0; k < 60; k++) {
      const p = randomLinePlan(r, { stocks: 5 + (k % 5), grades: 2 + (k % 3), caps: 1 + (k % 2), aniline: 0.3, bounds: 0.3 });
      seen[compare(p)]++;
    }
    expect(seen.optimal).toBeGreaterThan(30);
    expect(seen.infeasible).toBeGreaterThan(2);
  });

  it('MILPs: the same with a tank limit', () => {
    const r = rng(1102);
    const seen = { optimal: 0, infeasible: 0 };
    for (let k = 0; k < 40; k++) {
      const p = randomLinePlan(r, { stocks: 6 + (k % 4), grades: 3 + (k % 2), caps: 1 + (k % 2), aniline: 0.2, bounds: 0.3, maxStocks: 2 + (k % 3) });
      seen[compare(p)]++;
    }
    expect(seen.optimal).toBeGreaterThan(12);
    expect(seen.infeasible).toBeGreaterThan(2);
  });
});

/** Whether some grade of the plan sits on its VI floor (within 0.05), so the floor shaped the plan. */
function viFloorBinds(p: PlainLineProblem, plan: { grades: { vi: number }[] }): boolean {
  return plan.grades.some((g, i) => p.grades[i]!.minVi !== undefined && g.vi < p.grades[i]!.minVi! + 0.05);
}

describe('planLinePlain with VI floors and no supply caps against solveBlendPlain grade by grade', () => {
  it('costs the sum of the single-grade optima, within 0.5 %', () => {
    // Without supply caps or a tank limit the grades do not interact, so the line's optimum is the sum
    // over grades of demand × the grade's own least cost per kg. With every density equal, least cost
    // per litre (solveBlendPlain's objective) is least cost per kg (arithmetic). solveBlendPlain is the
    // single-grade engine, optimal within 0.5 % (README, Plain API); issue 11 asks the same of the plan.
    // (Measured when written: 22 plans compared, 10 with a VI floor binding, agreement within 4e-9.)
    const r = rng(1104);
    let compared = 0;
    let viBinding = 0;
    for (let k = 0; k < 24; k++) {
      const p0 = randomLinePlan(r, { stocks: 5 + (k % 4), grades: 2 + (k % 3), caps: 0, vi: 0.8, aniline: 0.2, bounds: 0.2, pool: [0, 2, 9, 5, 6], viRange: [92, 106] });
      const p: PlainLineProblem = { ...p0, components: p0.components.map((c) => ({ ...c, density15: 0.88 })) };
      const mine = planLinePlain(p);
      const singles = p.grades.map((g) => solveBlendPlain({ components: p.components, ...g, objective: 'cost' }));
      const allMade = singles.every((s) => s.status === 'optimal');
      expect(mine.status, JSON.stringify(p)).toBe(allMade ? 'optimal' : 'infeasible');
      if (mine.status !== 'optimal' || !allMade) continue;
      expect(checkLinePlan(p, mine).failures, JSON.stringify(p)).toEqual([]);
      const sum = singles.reduce((s, x, g) => s + (x.status === 'optimal' ? (p.grades[g]!.demandKg * x.costPerLitre) / 0.88 : 0), 0);
      expect(Math.abs(mine.totalCost - sum) / sum, JSON.stringify(p)).toBeLessThan(0.005);
      compared++;
      if (viFloorBinds(p, mine)) viBinding++;
    }
    expect(compared).toBeGreaterThan(10);
    expect(viBinding).toBeGreaterThan(3);
  });
});

describe('planLinePlain with VI floors against a grid over the limited stock’s allocation', () => {
  it('is never worse than the best grid plan, and feasible when recomputed', () => {
    // Brute force: every blend of each grade on a 2 % grid (4 stocks), checked exactly, then the
    // cheapest pair of blends whose use of the limited stock fits its supply (helpers.gridLinePlan).
    const r = rng(1103);
    let compared = 0;
    let viBinding = 0;
    for (let k = 0; k < 14; k++) {
      // Light and heavy Group I, PAO 40 and a Group II heavy neutral (typicals 0, 2, 9, 5): VI floors
      // of 90–105 bind; the cheapest stock is capped.
      const p = randomLinePlan(r, { stocks: 4, grades: 2, caps: 1, vi: 1, pool: [0, 2, 9, 5], viRange: [90, 105], supplyShare: [0.1, 0.5] });
      const limited = p.components.findIndex((c) => c.supplyKg !== undefined);
      const mine = planLinePlain(p);
      const grid = gridLinePlan(p, limited, 50);
      if (grid !== null) expect(mine.status, JSON.stringify(p)).toBe('optimal');
      if (mine.status !== 'optimal') continue;
      const chk = checkLinePlan(p, mine);
      expect(chk.failures, JSON.stringify(p)).toEqual([]);
      if (grid === null) continue;
      compared++;
      expect(mine.totalCost, JSON.stringify(p)).toBeLessThanOrEqual(grid * (1 + 1e-9));
      if (viFloorBinds(p, mine)) viBinding++;
    }
    expect(compared).toBeGreaterThan(6);
    expect(viBinding).toBeGreaterThan(1);
  });
});

describe('planLinePlain with minimum probabilities in band against a grid', () => {
  it('meets every probability when recomputed and is never worse than the best grid plan by more than 0.5 %', () => {
    // Same brute force as above (2 % grid, helpers.gridLinePlan) with each grade's probability in band
    // recomputed by inBandProbabilityPlain. The plan meets p + ¼·10⁻³(1 − p) (qc/robust.ts), so a
    // grid point just below that may be cheaper: the issue allows 0.5 %.
    const r = rng(2207);
    let compared = 0;
    let binding = 0;
    for (let k = 0; k < 12; k++) {
      const base = randomLinePlan(r, { stocks: 4, grades: 2, caps: 1, vi: k % 3 === 0 ? 1 : 0, pool: [0, 2, 9, 5], viRange: [90, 100], supplyShare: [0.2, 0.6] });
      const p: PlainLineProblem = {
        ...base,
        // Lot spreads of 1–3 % (common practice (no source) for base stocks) and 90–99 % asked.
        components: base.components.map((c, i) => ({ ...c, kv40RelSd: 0.01 + 0.01 * ((i + k) % 3) })),
        grades: base.grades.map((g, i) => ({ ...g, minInBandProbability: [0.9, 0.95, 0.99][(i + k) % 3]! })),
      };
      const limited = p.components.findIndex((c) => c.supplyKg !== undefined);
      const mine = planLinePlain(p);
      const grid = gridLinePlan(p, limited, 50);
      if (grid !== null) expect(mine.status, JSON.stringify(p)).toBe('optimal');
      if (mine.status !== 'optimal') continue;
      const chk = checkLinePlan(p, mine);
      expect(chk.failures, JSON.stringify(p)).toEqual([]);
      if (mine.grades.some((g, i) => g.inBandProbability! < p.grades[i]!.minInBandProbability! + 1e-3)) binding++;
      if (grid === null) continue;
      compared++;
      expect(mine.totalCost, JSON.stringify(p)).toBeLessThanOrEqual(grid * 1.005);
    }
    expect(compared).toBeGreaterThan(5);
    expect(binding).toBeGreaterThan(3);
  });
});
