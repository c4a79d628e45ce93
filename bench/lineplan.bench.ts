/**
 * Bench: the line plan (issue 11) in Node — six grades (VG 150, 220, 320, 460, 680, 1000) planned
 * together over an invented 30-stock library (29 stocks of bench/fixtures/invented-library-40.ts and
 * the additive package at 2 % in every grade), each grade with a minimum VI and a polymer cap, two
 * stocks on a short supply (the cheapest heavy ones, so the caps bind), least total cost over the
 * period; then the same with a tank limit of 6 stocks (the additive package counts).
 *
 * Lines: wall time of `planLine` (validation, preparation, the exact branch and bound, recomputation
 * and checks by the core) — the fastest of three runs — with goals ≤ 200 ms and ≤ 2 s. The note
 * gives every run, the LPs and nodes, whether the limits bind and the stocks in use.
 */
import { performance } from 'node:perf_hooks';
import { planLine, type LinePlanInput, type LinePlanResult } from '../src/core/lineplan/plan';
import type { BlendTargets } from '../src/core/formulation/model';
import { inventedAdditive, inventedLibrary40 } from './fixtures/invented-library-40';
import type { BenchLine } from './types';

/** Invented demands [t over the period] and minimum VIs of the six grades. */
const GRADES: [grade: number, demandT: number, minVi: number][] = [
  [150, 180, 95],
  [220, 420, 95],
  [320, 520, 92],
  [460, 300, 92],
  [680, 160, 90],
  [1000, 60, 90],
];

/** The bench's plan; `maxStocks` null → no tank limit. */
export function benchLinePlan(maxStocks: number | null): LinePlanInput {
  const additive = inventedAdditive();
  const components = [...inventedLibrary40().slice(0, 29), additive];
  const targets = (grade: number, minVi: number): BlendTargets => ({
    grade,
    targetKv40: null,
    tolerancePct: 5,
    minVi,
    maxAnilinePoint: null,
    maxPolymerFraction: 0.1,
    maxPourPoint: null,
    minFlashPoint: null,
    additive: { componentId: additive.id, massFraction: 0.02 },
    bounds: {},
    objective: 'cost',
    referenceRecipeId: null,
  });
  // The two cheapest heavy stocks (ν40 above 300 mm²/s) on a short supply.
  const heavy = components
    .filter((c) => c.category !== 'additive-package' && c.category !== 'polymer' && c.viscosityPoints[0]!.kv > 300)
    .sort((a, b) => a.price.amount - b.price.amount)
    .slice(0, 2);
  return {
    components,
    grades: GRADES.map(([grade, demandT, minVi]) => ({
      id: `vg${grade}`,
      label: `VG ${grade}`,
      targets: targets(grade, minVi),
      demandKg: demandT * 1000,
      current: null,
    })),
    supplyKg: { [heavy[0]!.id]: 250_000, [heavy[1]!.id]: 120_000 },
    maxStocks,
  };
}

function timed(input: LinePlanInput): { ms: number[]; r: LinePlanResult } {
  const ms: number[] = [];
  let r: LinePlanResult | null = null;
  for (let rep = 0; rep < 3; rep++) {
    const t0 = performance.now();
    r = planLine(input);
    ms.push(performance.now() - t0);
  }
  return { ms, r: r! };
}

function describe(input: LinePlanInput, r: LinePlanResult, ms: number[]): string {
  const runs = `runs ${ms.map((t) => t.toFixed(0)).join(', ')} ms`;
  if (r.status !== 'optimal') return `${runs}; ${r.status}: ${'reason' in r ? r.reason : r.message}`;
  const binding = r.stockUse.filter((u) => u.supplyKg !== null && u.useKg >= u.supplyKg - 1).map((u) => u.code);
  return (
    `${runs}; ${r.lpCount} LPs, ${r.nodeCount} nodes; ${r.stocksUsed.length} stocks in use` +
    `${input.maxStocks ? ` (limit ${input.maxStocks})` : ''}; supplies binding: ${binding.join(', ') || 'none'}; ` +
    `total ${r.totalCost.toFixed(0)} EUR`
  );
}

export async function run(): Promise<BenchLine[]> {
  const free = benchLinePlan(null);
  const a = timed(free);
  const tank = benchLinePlan(6);
  const b = timed(tank);
  const unlimitedStocks = a.r.status === 'optimal' ? a.r.stocksUsed.length : Number.NaN;
  return [
    {
      name: 'line plan 6 grades x 30 stocks, 2 supply caps, VI floors (Node)',
      measured: Math.min(...a.ms),
      unit: 'ms',
      op: '<=',
      goal: 200,
      note: describe(free, a.r, a.ms),
    },
    {
      name: 'line plan, the same with a tank limit of 6 stocks (Node)',
      measured: Math.min(...b.ms) / 1000,
      unit: 's',
      op: '<=',
      goal: 2,
      note: `${describe(tank, b.r, b.ms)}; without the limit ${unlimitedStocks} stocks`,
    },
  ];
}
