/**
 * Test helpers for the line plan: an independent HiGHS model of a plain line plan (LP or, with a
 * tank limit, MILP), the recomputed feasibility of a plan with the core's own functions, and a
 * brute-force grid over the allocation of one limited stock.
 */
import type { PlainLineProblem, PlainLineResult } from '../../../src/core/lineplan/plain';
import { refutasVbn, kvFromRefutasVbn } from '../../../src/core/blending/refutas';
import { viscosityIndex } from '../../../src/core/viscosity/viscosity-index';
import { checkPlain } from '../solver/helpers';
import { inBandProbabilityPlain } from '../../../src/core/qc/probability-plain';

const num = (x: number): string => (x >= 0 ? `+ ${x.toPrecision(17)}` : `- ${(-x).toPrecision(17)}`);

/**
 * The plain line plan written independently in HiGHS' LP format: variables w_g_i (mass fractions),
 * Σ_i w_g_i = 1, Refutas band rows Σ VBN40_i·w ∈ [VBN(lo), VBN(hi)] (mass basis), the aniline row
 * Σ (w/ρ)(AP − max) ≤ 0 (volume basis), bounds, supply rows Σ_g D_g·w_g_i ≤ S_i and, with a tank
 * limit, binaries y_i with w_g_i ≤ y_i and Σ y_i ≤ K. No VI floors (they are not linear).
 */
export function highsLineModel(p: PlainLineProblem): string {
  const w = (g: number, i: number) => `w_${g}_${i}`;
  const obj: string[] = [];
  const rows: string[] = [];
  const bounds: string[] = [];
  p.grades.forEach((g, k) => {
    const A = refutasVbn(g.targetKv40 * (1 - g.tolerancePct / 100));
    const B = refutasVbn(g.targetKv40 * (1 + g.tolerancePct / 100));
    const terms = (f: (i: number) => number) => p.components.map((_, i) => `${num(f(i))} ${w(k, i)}`).join(' ');
    obj.push(terms((i) => g.demandKg * p.components[i]!.pricePerKg));
    rows.push(`sum_${k}: ${terms(() => 1)} = 1`);
    rows.push(`vlo_${k}: ${terms((i) => refutasVbn(p.components[i]!.kv40))} >= ${A}`);
    rows.push(`vhi_${k}: ${terms((i) => refutasVbn(p.components[i]!.kv40))} <= ${B}`);
    if (g.maxAnilinePoint !== undefined) {
      rows.push(`ap_${k}: ${terms((i) => (p.components[i]!.anilinePoint - g.maxAnilinePoint!) / p.components[i]!.density15)} <= 0`);
    }
    p.components.forEach((c, i) => bounds.push(`${c.minMassFraction ?? 0} <= ${w(k, i)} <= ${c.maxMassFraction ?? 1}`));
  });
  p.components.forEach((c, i) => {
    if (c.supplyKg !== undefined) rows.push(`sup_${i}: ${p.grades.map((g, k) => `${num(g.demandKg)} ${w(k, i)}`).join(' ')} <= ${c.supplyKg}`);
  });
  let binary = '';
  if (p.maxStocks !== undefined) {
    p.components.forEach((_, i) => p.grades.forEach((__, k) => rows.push(`link_${k}_${i}: ${w(k, i)} - y_${i} <= 0`)));
    rows.push(`tank: ${p.components.map((_, i) => `+ y_${i}`).join(' ')} <= ${p.maxStocks}`);
    binary = `Binary\n ${p.components.map((_, i) => `y_${i}`).join(' ')}\n`;
  }
  return `Minimize\n obj: ${obj.join(' ')}\nSubject To\n ${rows.join('\n ')}\nBounds\n ${bounds.join('\n ')}\n${binary}End\n`;
}

/**
 * Recompute a plan with the core: each grade's feasibility (band to 1e-4 relative, VI ≥ min − 0.01,
 * aniline ≤ max + 0.01 °C, bounds and Σ = 1 to 1e-6 — `checkPlain`), the supplies (to 1e-6 relative
 * + 1 g), the tank limit (ids above 1e-6 in some grade), and the total cost. Returns the failures.
 */
export function checkLinePlan(p: PlainLineProblem, r: PlainLineResult & { status: 'optimal' }): { failures: string[]; totalCost: number } {
  const failures: string[] = [];
  const use = new Map<string, number>(p.components.map((c) => [c.id, 0]));
  const inUse = new Set<string>();
  let totalCost = 0;
  p.grades.forEach((g, k) => {
    const res = r.grades[k]!;
    if (res.id !== g.id) failures.push(`grade order ${res.id} ≠ ${g.id}`);
    const w = p.components.map((c) => res.massFractions[c.id]!);
    const chk = checkPlain(
      {
        components: p.components,
        targetKv40: g.targetKv40,
        tolerancePct: g.tolerancePct,
        objective: 'cost',
        ...(g.minVi === undefined ? {} : { minVi: g.minVi }),
        ...(g.maxAnilinePoint === undefined ? {} : { maxAnilinePoint: g.maxAnilinePoint }),
      },
      w,
    );
    for (const f of chk.failures) failures.push(`${g.id}: ${f}`);
    if (g.minInBandProbability !== undefined) {
      const q = inBandProbabilityPlain({ components: p.components, targetKv40: g.targetKv40, tolerancePct: g.tolerancePct, objective: 'cost' }, res.massFractions);
      if (q < g.minInBandProbability) failures.push(`${g.id}: probability in band ${q} < ${g.minInBandProbability}`);
      if (res.inBandProbability === undefined || Math.abs(res.inBandProbability - q) > 1e-12) failures.push(`${g.id}: inBandProbability ${res.inBandProbability} ≠ ${q}`);
    }
    p.components.forEach((c, i) => {
      use.set(c.id, use.get(c.id)! + g.demandKg * w[i]!);
      totalCost += g.demandKg * w[i]! * c.pricePerKg;
      if (w[i]! > 1e-6) inUse.add(c.id);
    });
  });
  for (const c of p.components) {
    if (c.supplyKg !== undefined && use.get(c.id)! > c.supplyKg * (1 + 1e-6) + 1e-3) failures.push(`supply ${c.id}: ${use.get(c.id)} > ${c.supplyKg}`);
    if (Math.abs(use.get(c.id)! - r.stockUseKg[c.id]!) > 1e-6 * (1 + use.get(c.id)!)) failures.push(`stockUseKg ${c.id}`);
  }
  if (p.maxStocks !== undefined && inUse.size > p.maxStocks) failures.push(`tank: ${inUse.size} stocks > ${p.maxStocks}`);
  if ([...inUse].sort().join() !== [...r.stocksUsed].sort().join()) failures.push(`stocksUsed ${r.stocksUsed} ≠ ${[...inUse]}`);
  if (Math.abs(totalCost - r.totalCost) > 1e-9 * totalCost) failures.push(`totalCost ${r.totalCost} ≠ ${totalCost}`);
  return { failures, totalCost };
}

/**
 * Brute force over the allocation of one limited stock between two grades: every blend of each
 * grade on a grid of 1/steps in every fraction, checked exactly (band, VI, aniline point; strict
 * limits, no tolerance) with the core's Refutas and D2270 functions, and the probability in band where
 * the grade asks for one (`inBandProbabilityPlain`); then the cheapest pair whose
 * use of the limited stock fits its supply. Returns the least total cost, or null.
 */
export function gridLinePlan(p: PlainLineProblem, limited: number, steps: number): number | null {
  if (p.grades.length !== 2) throw new Error('gridLinePlan: two grades');
  const n = p.components.length;
  const v40 = p.components.map((c) => refutasVbn(c.kv40));
  const v100 = p.components.map((c) => refutasVbn(c.kv100));
  const inv = p.components.map((c) => 1 / c.density15);
  const S = p.components[limited]!.supplyKg ?? Number.POSITIVE_INFINITY;
  // Per grade: feasible points as (use of the limited stock per kg, cost per kg).
  const frontier = p.grades.map((g) => {
    const A = refutasVbn(g.targetKv40 * (1 - g.tolerancePct / 100));
    const B = refutasVbn(g.targetKv40 * (1 + g.tolerancePct / 100));
    const pts: [number, number][] = [];
    const w = new Array<number>(n).fill(0);
    const visit = (): void => {
      let x40 = 0;
      let x100 = 0;
      let sv = 0;
      let sa = 0;
      let cost = 0;
      for (let i = 0; i < n; i++) {
        const c = p.components[i]!;
        if (w[i]! < (c.minMassFraction ?? 0) || w[i]! > (c.maxMassFraction ?? 1)) return;
        x40 += w[i]! * v40[i]!;
        x100 += w[i]! * v100[i]!;
        sv += w[i]! * inv[i]!;
        sa += w[i]! * inv[i]! * c.anilinePoint;
        cost += w[i]! * c.pricePerKg;
      }
      if (x40 < A || x40 > B) return;
      if (g.maxAnilinePoint !== undefined && sa / sv > g.maxAnilinePoint) return;
      if (g.minVi !== undefined) {
        const kv100 = kvFromRefutasVbn(x100);
        if (kv100 < 2 || viscosityIndex(kvFromRefutasVbn(x40), kv100) < g.minVi) return;
      }
      if (g.minInBandProbability !== undefined) {
        const f: Record<string, number> = {};
        p.components.forEach((c, i) => (f[c.id] = w[i]!));
        const q = inBandProbabilityPlain({ components: p.components, targetKv40: g.targetKv40, tolerancePct: g.tolerancePct, objective: 'cost' }, f);
        if (q < g.minInBandProbability) return;
      }
      pts.push([w[limited]!, cost]);
    };
    const rec = (i: number, left: number): void => {
      if (i === n - 1) {
        w[i] = left / steps;
        visit();
        return;
      }
      for (let k = 0; k <= left; k++) {
        w[i] = k / steps;
        rec(i + 1, left - k);
      }
    };
    rec(0, steps);
    return pts;
  });
  const [D1, D2] = [p.grades[0]!.demandKg, p.grades[1]!.demandKg];
  // Grade 2's points by use, with the least cost among those using at most that much.
  const second = [...frontier[1]!].sort((a, b) => a[0] - b[0]);
  const prefixMin: number[] = [];
  for (const [, c] of second) prefixMin.push(Math.min(c, prefixMin[prefixMin.length - 1] ?? Number.POSITIVE_INFINITY));
  let best: number | null = null;
  for (const [u1, c1] of frontier[0]!) {
    const room = (S - D1 * u1) / D2; // largest use per kg of grade 2 that still fits
    let lo = -1;
    let hi = second.length; // last index with use ≤ room
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (second[mid]![0] <= room) lo = mid;
      else hi = mid;
    }
    if (lo < 0) continue;
    const total = D1 * c1 + D2 * prefixMin[lo]!;
    if (best === null || total < best) best = total;
  }
  return best;
}
