import { describe, expect, it } from 'vitest';
import { solveBlend, prepareComponents, solvePrepared, type SolveResult, type SolveOptimal } from '../../../src/core/solver/solve-blend';
import type { Component, Recipe } from '../../../src/core/formulation/model';
import { newRecipeLifecycle } from '../../../src/core/formulation/model';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import {
  AN_12,
  AN_5,
  EP_PACKAGE,
  G1_BRIGHT,
  G1_HEAVY_NEUTRAL,
  G2_HEAVY,
  G2_HVY_STOCK,
  G2_LIGHT,
  G2_MEDIUM,
  G3_6,
  LIBRARY,
  PAO_40,
  PAO_6,
  PIB,
  stock,
  targets,
} from './fixtures';

function optimal(r: SolveResult): SolveOptimal {
  if (r.status !== 'optimal') throw new Error(`expected optimal, got ${JSON.stringify(r)}`);
  return r;
}
const frac = (r: SolveOptimal, id: string): number => r.lines.find((l) => l.componentId === id)?.massFraction ?? 0;

const G2_NEUTRALS = [G2_LIGHT, G2_MEDIUM, G2_HEAVY, EP_PACKAGE];

describe('solveBlend — facts of the trade (tests/reference/check-values.md §6, common practice)', () => {
  // Stocks: generic typicals, from memory, tests/reference/base-stock-typicals.md.
  it('Group II neutrals alone cannot make VG 220, and the reason names the heaviest stock', () => {
    // §6: hydroprocessed Group II neutrals top out around VG 100 at 40 °C
    const r = solveBlend({ components: G2_NEUTRALS, targets: targets({ grade: 220, tolerancePct: 10 }) });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.binding).toBe('kv40-min');
    expect(r.reason).toContain('G2H');
    expect(r.reason).toContain('110 mm²/s');
    expect(r.reason).toContain('VG 220 needs at least 198 mm²/s');
    expect(r.suggestion).toMatch(/heavier stock|thickening polymer/);
  });

  it('a heavy stock or a thickener can make VG 220', () => {
    // §6: it needs a heavy stock (high-viscosity Group II heavy stock), a high-viscosity PAO or a polymer
    for (const heavy of [G2_HVY_STOCK, PAO_40, PIB, G1_BRIGHT_AVAILABLE()]) {
      const r = optimal(solveBlend({ components: [...G2_NEUTRALS, heavy], targets: targets({ grade: 220 }) }));
      expect(frac(r, heavy.id)).toBeGreaterThan(0);
      expect(r.checks.every((c) => c.ok)).toBe(true);
      expect(r.properties.grade).toBe(220); // the requested grade (ISO 3448 band), no calculated check value
    }
  });

  it('a withdrawn bright stock is never used', () => {
    const r = optimal(solveBlend({ components: LIBRARY, targets: targets({ grade: 460 }) }));
    // rule of the solver, not a check value: a withdrawn stock's fraction is 0
    expect(frac(r, G1_BRIGHT.id)).toBe(0);
  });
});

function G1_BRIGHT_AVAILABLE(): Component {
  return { ...G1_BRIGHT, availability: 'available' };
}

describe('solveBlend — every constraint holds when the recipe is recomputed by the core', () => {
  const cases = [
    targets({ grade: 150 }),
    targets({ grade: 220, minVi: 100 }),
    targets({ grade: 320, minVi: 110, maxPolymerFraction: 0.15 }),
    targets({ grade: 460, maxAnilinePoint: 118 }),
    targets({ grade: 680, minVi: 95, maxPolymerFraction: 0.2, maxPourPoint: -12 }),
    targets({ grade: 1000, tolerancePct: 8, minFlashPoint: 240 }),
    targets({ grade: 320, bounds: { g2x: { max: 0.3 }, an12: { min: 0.05 } }, minVi: 100 }),
    targets({ grade: 220, targetKv40: 230, tolerancePct: 3, objective: 'solvency', maxPolymerFraction: 0.1 }),
    targets({ grade: 460, objective: 'oxidation', minVi: 120 }),
  ];
  for (const method of ['refutas', 'astm-d7152', 'd7152-wright'] as const) {
    it(`(${method})`, () => {
      for (const t of cases) {
        const r = optimal(solveBlend({ components: LIBRARY, targets: t, method }));
        expect(r.checks.filter((c) => !c.ok), JSON.stringify(t)).toEqual([]);
        // recompute independently from the lines alone; no check value, only the targets and
        // feasibility tolerances (ν40 1e-4 relative, VI − 0.01, 0.01 °C), common practice (no source)
        const p = predictBlend(LIBRARY, r.lines, { method });
        const lo = Math.max(t.targetKv40 ?? t.grade, 0);
        expect(p.kv40).toBeGreaterThanOrEqual(r.band.min * (1 - 1e-4));
        expect(p.kv40).toBeLessThanOrEqual(r.band.max * (1 + 1e-4));
        expect(lo).toBeGreaterThan(0);
        if (t.minVi !== null) expect(p.vi!).toBeGreaterThanOrEqual(t.minVi - 0.01);
        if (t.maxAnilinePoint !== null) expect(p.anilinePoint!.value).toBeLessThanOrEqual(t.maxAnilinePoint + 0.01);
        if (t.maxPolymerFraction !== null) expect(p.polymerFraction).toBeLessThanOrEqual(t.maxPolymerFraction + 1e-6);
        if (t.maxPourPoint !== null) expect(p.pourPoint!).toBeLessThanOrEqual(t.maxPourPoint + 0.01);
        if (t.minFlashPoint !== null) expect(p.flashPoint!).toBeGreaterThanOrEqual(t.minFlashPoint - 0.01);
        expect(frac(r, 'ep')).toBeCloseTo(0.02, 6); // fixed treat rate
        expect(r.lines.reduce((s, l) => s + l.massFraction, 0)).toBeCloseTo(1, 9);
      }
    });
  }
});

describe('solveBlend — objectives', () => {
  const t = targets({ grade: 320, maxPolymerFraction: 0.1 });
  const cost = optimal(solveBlend({ components: LIBRARY, targets: t }));
  it('least cost per litre is exact, not the per-kg proxy', () => {
    // A stock that is cheap per kg but dense costs more per litre; the optimum must be the per-litre one.
    const dense = stock('dense', 'group-v', 460, 31, 1.2, 100, 1.45);
    const light = stock('lite', 'group-ii', 460, 31, 0.8, 127, 1.1);
    const mid = stock('mid', 'group-ii', 110, 12, 0.872, 121, 1.2);
    // per kg: dense 1.45 > lite 1.1 → per kg proxy picks lite anyway; make per-kg favour dense:
    const dense2 = { ...dense, price: { ...dense.price, amount: 1.05 } }; // 1.05/kg × 1.2 kg/L = 1.26/L
    const light2 = { ...light, price: { ...light.price, amount: 1.3 } }; // 1.3/kg × 0.8 kg/L = 1.04/L
    const r = optimal(solveBlend({ components: [dense2, light2, mid], targets: targets({ grade: 320, additive: null }) }));
    // common practice (no source): cost per litre = ρ × cost per kg, so the lighter stock wins per litre
    expect(frac(r, 'lite')).toBeGreaterThan(0);
    expect(frac(r, 'dense')).toBe(0);
  });
  it('least cost per kg: its per-kg cost is the lowest, its objective value the blend cost per kg', () => {
    // comparison of two optima (no external source): per kg the cost-kg optimum cannot be beaten, per
    // litre the cost optimum cannot; identity of the objective value with the predicted cost per kg
    const kg = optimal(solveBlend({ components: LIBRARY, targets: { ...t, objective: 'cost-kg' } }));
    expect(kg.properties.costPerKg!).toBeLessThanOrEqual(cost.properties.costPerKg! + 1e-9);
    expect(cost.properties.costPerLitre!).toBeLessThanOrEqual(kg.properties.costPerLitre! + 1e-9);
    expect(kg.objectiveValue).toBeCloseTo(kg.properties.costPerKg!, 9);
    // the per-kg objective prefers the dense stock that the per-litre objective rejects (see above)
    const dense = { ...stock('dense', 'group-v', 460, 31, 1.2, 100, 1.45), price: { amount: 1.05, basis: 'per-kg' as const, currency: 'EUR' } };
    const light = { ...stock('lite', 'group-ii', 460, 31, 0.8, 127, 1.1), price: { amount: 1.3, basis: 'per-kg' as const, currency: 'EUR' } };
    const mid = stock('mid', 'group-ii', 110, 12, 0.872, 121, 1.2);
    const rk = optimal(solveBlend({ components: [dense, light, mid], targets: targets({ grade: 320, additive: null, objective: 'cost-kg' }) }));
    expect(frac(rk, 'dense')).toBeGreaterThan(0);
    expect(frac(rk, 'lite')).toBe(0);
  });
  it('best solvency has a lower aniline point than least cost, and costs no less', () => {
    const s = optimal(solveBlend({ components: LIBRARY, targets: { ...t, objective: 'solvency' } }));
    // comparison of two optima (no external source): least cost cannot be beaten on cost, and the
    // solvency objective value is the blend's aniline point itself (identity)
    expect(s.properties.anilinePoint!.value).toBeLessThan(cost.properties.anilinePoint!.value);
    expect(s.properties.costPerLitre!).toBeGreaterThanOrEqual(cost.properties.costPerLitre! - 1e-9);
    expect(s.objectiveValue).toBeCloseTo(s.properties.anilinePoint!.value, 9);
  });
  it('highest oxidation rating is at least that of least cost', () => {
    const o = optimal(solveBlend({ components: LIBRARY, targets: { ...t, objective: 'oxidation' } }));
    expect(o.properties.oxidationRating!).toBeGreaterThanOrEqual(cost.properties.oxidationRating! - 1e-9);
    expect(o.properties.oxidationRating!).toBeCloseTo(5, 6); // PAO and Group III are rated 5 (oxidation.ts)
  });
  it('closest to a reference recipe reproduces the reference when its stocks are available', () => {
    const ref: Recipe = {
      id: 'r',
      name: 'reference',
      grade: 320,
      lines: [
        { componentId: 'g2x', massFraction: 0.76 },
        { componentId: 'g1h', massFraction: 0.22 },
        { componentId: 'ep', massFraction: 0.02 },
      ],
      revision: 1,
      isReference: true,
      notes: '',
      updatedAt: '2024-01-01T00:00:00Z',
      ...newRecipeLifecycle(),
    };
    const refProps = predictBlend(LIBRARY, ref.lines);
    const tc = targets({ grade: 320, targetKv40: refProps.kv40, tolerancePct: 5, objective: 'closest' });
    const r = optimal(solveBlend({ components: LIBRARY, targets: tc, reference: ref }));
    expect(r.objectiveValue).toBeLessThan(1e-6); // distance 0: the reference itself is feasible
    expect(r.properties.kv100).toBeCloseTo(refProps.kv100, 4);
    expect(r.properties.anilinePoint!.value).toBeCloseTo(refProps.anilinePoint!.value, 3);
    // with the heavy stock withdrawn, the closest substitute keeps ν100 and aniline point near
    const lib2 = LIBRARY.map((c) => (c.id === 'g2x' ? { ...c, availability: 'withdrawn' as const } : c));
    const s = optimal(solveBlend({ components: lib2, targets: tc, reference: ref }));
    const sCost = optimal(solveBlend({ components: lib2, targets: { ...tc, objective: 'cost' } }));
    const dist = (p: typeof s.properties) =>
      Math.abs(p.kv100 / refProps.kv100 - 1) * 100 + Math.abs(p.anilinePoint!.value - refProps.anilinePoint!.value);
    expect(dist(s.properties)).toBeLessThanOrEqual(dist(sCost.properties) + 1e-6);
  });
});

describe('solveBlend — infeasibility reasons (crafted cases)', () => {
  it('VG 320 from stocks that reach only 268 mm²/s', () => {
    // the issue's own example wording: a heaviest stock at 268 mm²/s cannot reach VG 320 (≥ 288)
    const h268 = stock('h268', 'group-ii', 268, 22, 0.88, 125, 1.5);
    const r = solveBlend({ components: [G2_MEDIUM, h268], targets: targets({ grade: 320, tolerancePct: 10, additive: null }) });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'kv40-min' });
    if (r.status === 'infeasible') {
      expect(r.reason).toContain('268 mm²/s at 40 °C');
      expect(r.reason).toContain('VG 320 needs at least 288 mm²/s');
      expect(r.reason).toContain('add a heavier stock or a thickener');
    }
  });
  it('a VI the stocks cannot reach: quotes the best reachable VI', () => {
    const r = solveBlend({ components: [G2_MEDIUM, G2_HEAVY, G2_HVY_STOCK, EP_PACKAGE], targets: targets({ grade: 320, minVi: 110 }) });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'min-vi' });
    if (r.status === 'infeasible') {
      const best = Number(/is (\d+\.\d)/.exec(r.reason)![1]);
      // property: the quoted VI is reachable and a little more is not
      const ok = solveBlend({ components: [G2_MEDIUM, G2_HEAVY, G2_HVY_STOCK, EP_PACKAGE], targets: targets({ grade: 320, minVi: best - 0.1 }) });
      const no = solveBlend({ components: [G2_MEDIUM, G2_HEAVY, G2_HVY_STOCK, EP_PACKAGE], targets: targets({ grade: 320, minVi: best + 0.2 }) });
      expect(ok.status).toBe('optimal');
      expect(no.status).toBe('infeasible');
      expect(r.suggestion).toMatch(/higher-VI stock/);
    }
  });
  it('an aniline limit below reach: quotes the lowest reachable aniline point', () => {
    const r = solveBlend({ components: LIBRARY, targets: targets({ grade: 320, maxAnilinePoint: 60 }) });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'max-aniline' });
    if (r.status === 'infeasible') expect(r.suggestion).toMatch(/solvency booster/);
  });
  it('a polymer cap too tight for light stocks', () => {
    const r = solveBlend({ components: [G2_LIGHT, G2_MEDIUM, PIB, EP_PACKAGE], targets: targets({ grade: 460, maxPolymerFraction: 0.05 }) });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'max-polymer' });
    if (r.status === 'infeasible') expect(r.reason).toMatch(/needs at least \d+\.\d % polymer; the cap is 5\.0 %/);
  });
  it('bounds that cannot add up, and a component limit that blocks the grade', () => {
    const r = solveBlend({ components: LIBRARY, targets: targets({ bounds: { g2l: { min: 0.6 }, g2m: { min: 0.5 } } }) });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'bounds' });
    const r2 = solveBlend({
      components: [G2_MEDIUM, G2_HVY_STOCK, EP_PACKAGE],
      targets: targets({ grade: 320, bounds: { g2x: { max: 0.5 } } }),
    });
    expect(r2).toMatchObject({ status: 'infeasible' });
    if (r2.status === 'infeasible') expect(r2.reason).toContain('G2X');
  });
  it('all stocks withdrawn', () => {
    const r = solveBlend({
      components: [{ ...G2_HEAVY, availability: 'withdrawn' }],
      targets: targets({ additive: null }),
    });
    expect(r).toMatchObject({ status: 'infeasible', binding: 'components' });
  });
});

describe('solveBlend — invalid input names the field', () => {
  const cases: [string, Parameters<typeof solveBlend>[0]][] = [
    ['targets.grade', { components: LIBRARY, targets: targets({ grade: 333 }) }],
    ['targets.tolerancePct', { components: LIBRARY, targets: targets({ tolerancePct: -2 }) }],
    ['targets.targetKv40', { components: LIBRARY, targets: targets({ targetKv40: 500, tolerancePct: 5 }) }],
    ['targets.additive.componentId', { components: LIBRARY, targets: targets({ additive: { componentId: 'nope', massFraction: 0.02 } }) }],
    ['reference', { components: LIBRARY, targets: targets({ objective: 'closest' }) }],
    ['components[0].density15', { components: [{ ...G2_HEAVY, density15: 872 }], targets: targets({ additive: null }) }],
    ['components.price.currency', { components: [G2_HEAVY, { ...G2_HVY_STOCK, price: { ...G2_HVY_STOCK.price, currency: 'USD' } }], targets: targets({ additive: null }) }],
  ];
  for (const [field, input] of cases) {
    it(field, () => {
      const r = solveBlend(input);
      expect(r.status).toBe('invalid-input');
      if (r.status === 'invalid-input') expect(r.field).toBe(field);
    });
  }
});

describe('fast path: prepareComponents + solvePrepared', () => {
  it('agrees with solveBlend on subsets, and skips withdrawn indices', () => {
    const t = targets({ grade: 320, minVi: 100 });
    const P = prepareComponents(LIBRARY, t);
    const idx = (id: string) => LIBRARY.findIndex((c) => c.id === id);
    const subsets = [
      ['g2m', 'g2x'],
      ['g2m', 'g3', 'pao40'],
      ['g2h', 'pib', 'an12', 'g3'],
      ['bs', 'g2m'], // bs withdrawn → only g2m (+ additive) → infeasible
    ];
    for (const s of subsets) {
      // agreement of two code paths (no external source); 0.02 is the invented fixture's treat rate
      const fast = solvePrepared(P, s.map(idx));
      const lib = LIBRARY.filter((c) => s.includes(c.id) || c.id === 'ep');
      const slow = solveBlend({ components: lib, targets: t });
      expect(fast.status).toBe(slow.status);
      if (fast.status === 'optimal' && slow.status === 'optimal') {
        expect(fast.costPerLitre).toBeCloseTo(slow.properties.costPerLitre!, 9);
        expect(fast.massFractions[idx('ep')]).toBeCloseTo(0.02, 7); // additive added automatically
        expect(fast.vi!).toBeGreaterThanOrEqual(100 - 0.01);
      }
    }
  });
  it('unused stocks do not matter: AN_5, PAO_6 and G3_6 are in the library', () => {
    expect([AN_5, PAO_6, G3_6, AN_12, G1_HEAVY_NEUTRAL].every((c) => LIBRARY.includes(c))).toBe(true);
  });
});
