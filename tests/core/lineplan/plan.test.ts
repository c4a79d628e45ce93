import { describe, expect, it } from 'vitest';
import { planLine, planLineScenarios, MARGINAL_STEP_KG, type LinePlanInput } from '../../../src/core/lineplan/plan';
import { solveBlend } from '../../../src/core/solver/solve-blend';
import { demoComponentId, demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';

// The invented demo plant (src/state/demo.ts): reference recipes VG 220–680 on bright stock BW-190.
const components = demoComponents();
const targets = demoTargets();
const DEMAND_T: Record<number, number> = { 220: 300, 320: 400, 460: 250, 680: 150 }; // invented demands
const BS = demoComponentId('BW-190');

function demoInput(extra: Partial<LinePlanInput> = {}): LinePlanInput {
  return {
    components,
    grades: demoRecipes().map((r) => ({
      id: r.id,
      label: `VG ${r.grade}`,
      targets: targets[r.id]!,
      demandKg: DEMAND_T[r.grade]! * 1000,
      current: r.lines,
    })),
    ...extra,
  };
}

const ok = <T extends { status: string }>(r: T): Extract<T, { status: 'optimal' }> => {
  expect(r.status, JSON.stringify((r as { reason?: string }).reason ?? r)).toBe('optimal');
  return r as Extract<T, { status: 'optimal' }>;
};

describe('planLine on the invented demo plant', () => {
  const free = ok(planLine(demoInput()));
  const capped = ok(planLine(demoInput({ supplyKg: { [BS]: 250_000 } })));

  it('every recipe recomputed by the core meets its grade; supplies hold; totals add up', () => {
    for (const p of [free, capped]) {
      for (const g of p.grades) {
        expect(g.checks.filter((c) => !c.ok)).toEqual([]);
        // Σ lines = 1 (fractions; tolerance 1e-9 as the core's fraction checks — common practice (no source))
        expect(Math.abs(g.lines.reduce((s, l) => s + l.massFraction, 0) - 1)).toBeLessThan(1e-9);
        expect(g.cost).toBeCloseTo(g.costPerKg * g.demandKg, 6);
      }
      expect(p.limitChecks.filter((c) => !c.ok)).toEqual([]);
      const sum = p.grades.reduce((s, g) => s + g.cost, 0);
      expect(Math.abs(p.totalCost - sum)).toBeLessThan(1e-6 * sum);
    }
    const bs = capped.stockUse.find((u) => u.id === BS);
    expect(bs!.useKg).toBeLessThanOrEqual(250_000 * (1 + 1e-6));
  });

  it('without limits each grade is at least as cheap per kg as the single-grade least-cost-per-litre recipe', () => {
    // The per-litre optimum is a feasible recipe for the per-kg objective (same constraints).
    for (const g of free.grades) {
      const single = solveBlend({ components, targets: targets[g.id]! });
      expect(single.status).toBe('optimal');
      if (single.status !== 'optimal') continue;
      expect(g.costPerKg).toBeLessThanOrEqual(single.properties.costPerKg! * (1 + 1e-9));
    }
  });

  it('a binding supply costs money; the plan after the stock is gone costs more still', () => {
    expect(capped.totalCost).toBeGreaterThanOrEqual(free.totalCost);
    const s = planLineScenarios(demoInput({ supplyKg: { [BS]: 250_000 } }), [BS]);
    const lasting = ok(s.lasting);
    const after = ok(s.after);
    expect(lasting.totalCost).toBeCloseTo(capped.totalCost, 6);
    expect(after.stocksUsed).not.toContain(BS);
    expect(s.withdrawalCost).toBeCloseTo(after.totalCost - lasting.totalCost, 6);
    expect(s.withdrawalCost!).toBeGreaterThan(0);
    expect(after.stocksNoLongerNeeded).toContain(BS);
    // Marginal value: re-solving with one more tonne gives the same saving.
    const m = s.marginal.find((x) => x.id === BS)!;
    expect(m.binding).toBe(true);
    const more = ok(planLine(demoInput({ supplyKg: { [BS]: 250_000 + MARGINAL_STEP_KG } })));
    expect(m.savingPerTonne!).toBeCloseTo(lasting.totalCost - more.totalCost, 6);
    expect(m.savingPerTonne!).toBeGreaterThan(0);
    // …and at most the withdrawal's cost per tonne lost: an LP's optimum is convex and falling in a
    // right-hand side, so the last tonne saves least (LP sensitivity analysis, common practice (no source)).
    expect(m.savingPerTonne!).toBeLessThanOrEqual(s.withdrawalCost! / 250 + 1e-6);
  });

  it('a supply the plan does not use up has no marginal value', () => {
    const s = planLineScenarios(demoInput({ supplyKg: { [BS]: 5_000_000 } }), [BS]);
    const m = s.marginal.find((x) => x.id === BS)!;
    expect(m.binding).toBe(false);
    expect(m.savingPerTonne).toBe(0);
  });

  it('compares with the current recipes', () => {
    expect(capped.currentTotalCost).not.toBeNull();
    for (const g of capped.grades) expect(g.current).not.toBeNull();
    // The demo's current recipes use BW-160, which the least-cost plan replaces.
    expect(capped.stocksNoLongerNeeded.length + capped.stocksNewlyNeeded.length).toBeGreaterThan(0);
  });

  it('the tank limit holds and costs what it costs', () => {
    // The additive package is a stock in use like any other: it takes a tank and counts.
    expect(free.stocksUsed).toContain(demoComponentId('BW-901'));
    const k = free.stocksUsed.length - 1;
    const r = planLine(demoInput({ maxStocks: k }));
    if (r.status === 'optimal') {
      expect(r.stocksUsed.length).toBeLessThanOrEqual(k);
      expect(r.totalCost).toBeGreaterThanOrEqual(free.totalCost * (1 - 1e-9));
    } else {
      expect(r.status).toBe('infeasible');
      if (r.status === 'infeasible') expect(r.kind).toBe('tanks');
    }
  });

  it('a stock that must stay in use is used at least as much as asked', () => {
    const keep = demoComponentId('BW-220');
    const r = ok(planLine(demoInput({ keepKg: { [keep]: 50_000 } })));
    expect(r.stockUse.find((u) => u.id === keep)!.useKg).toBeGreaterThanOrEqual(50_000 * (1 - 1e-6));
    expect(r.totalCost).toBeGreaterThanOrEqual(free.totalCost * (1 - 1e-9));
  });
});

describe('planLine and a minimum probability in band', () => {
  it('plans the grade to its band and reports the planned recipe’s probability beside the minimum', () => {
    const input = demoInput({ supplyKg: { [BS]: 250_000 } });
    const grades = input.grades.map((g) => (g.label === 'VG 320' ? { ...g, targets: { ...g.targets, minInBandProbability: 0.99 } } : g));
    const r = ok(planLine({ ...input, grades }));
    const vg320 = r.grades.find((g) => g.label === 'VG 320')!;
    expect(vg320.inBand?.minimum).toBe(0.99);
    expect(vg320.inBand!.probability).toBeGreaterThanOrEqual(0);
    expect(vg320.inBand!.probability).toBeLessThanOrEqual(1);
    expect(r.grades.filter((g) => g.label !== 'VG 320').every((g) => g.inBand === null)).toBe(true);
    expect(vg320.checks.filter((c) => !c.ok)).toEqual([]);
  });
});

describe('planLine — infeasible plans in words, and bad input', () => {
  it('names the grade that cannot be made', () => {
    const input = demoInput();
    const grades = input.grades.map((g) => (g.label === 'VG 680' ? { ...g, targets: { ...g.targets, minVi: 160 } } : g));
    const r = planLine({ ...input, grades });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.kind).toBe('grade');
    expect(r.gradeId).toBe('demo-vg680');
    expect(r.reason).toMatch(/^VG 680 cannot be made/);
  });

  it('names the short supply, by how many tonnes, and the grade that needs it', () => {
    // VG 680's saved limits hold at least 50 % BW-190; 150 t of VG 680 need at least 75 t of it, and
    // 10 t are on offer: short by 65 t (arithmetic on the invented demand; no other grade must use it).
    const input = demoInput({ supplyKg: { [BS]: 10_000 } });
    const grades = input.grades.map((g) =>
      g.label === 'VG 680' ? { ...g, targets: { ...g.targets, bounds: { ...g.targets.bounds, [BS]: { min: 0.5 } } } } : g,
    );
    const r = planLine({ ...input, grades });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.kind).toBe('supply');
    expect(r.short).toEqual([{ id: BS, code: 'BW-190', tonnes: expect.closeTo(65, 3) as number }]);
    expect(r.reason).toMatch(/BW-190 is short by 65(\.0)? t \(10(\.0)? t on offer; the plan needs at least 75(\.0)? t for VG 680\)/);
  });

  it('names the stock that cannot be used as much as it must stay in use', () => {
    const keep = demoComponentId('BW-220');
    const r = planLine(demoInput({ keepKg: { [keep]: 5_000_000 } }));
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.kind).toBe('min-use');
    expect(r.reason).toContain('BW-220');
  });

  it('reports bad input at the field', () => {
    const zero = planLine({ ...demoInput(), grades: demoInput().grades.map((g, i) => (i === 1 ? { ...g, demandKg: 0 } : g)) });
    expect(zero.status).toBe('invalid-input');
    if (zero.status === 'invalid-input') {
      expect(zero.field).toBe('grades[1].demandKg');
      expect(zero.message).toContain('VG 320');
    }
    const gone = planLine(demoInput({ keepKg: { [demoComponentId('BW-191')]: 0 } }));
    expect(gone.status).toBe('invalid-input');
    if (gone.status === 'invalid-input') expect(gone.message).toContain('BW-191 is withdrawn');
    const neg = planLine(demoInput({ supplyKg: { [BS]: -1 } }));
    expect(neg.status).toBe('invalid-input');
    if (neg.status === 'invalid-input') expect(neg.field).toBe(`supplyKg.${BS}`);
  });
});
