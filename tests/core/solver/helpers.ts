/**
 * Test helpers for the solver: a seeded random generator, random plain problems, an independent
 * brute-force grid search, and the feasibility check of issue 3 item 7 done with the core's own
 * functions (never with the solver's engine).
 */
import { blendKv40Kv100 } from '../../../src/core/blending/blend-viscosity';
import { refutasVbn, kvFromRefutasVbn } from '../../../src/core/blending/refutas';
import { viscosityIndex } from '../../../src/core/viscosity/viscosity-index';
import { blendDensity, massToVolumeFractions } from '../../../src/core/blending/density';
import { blendAnilinePoint } from '../../../src/core/blending/aniline';
import { blendCostPerLitre } from '../../../src/core/formulation/cost';
import type { PlainComponent, PlainProblem } from '../../../src/core/solver/plain';
import { rng, typicalsAt } from '../../../bench/fixtures/random-problems';

export { rng };

// All 13 rows of the shared typicals: the selection these seeds were drawn from.
const TYPICALS = typicalsAt([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);

export interface RandomOptions {
  k: number;
  vi?: number; // probability of a minimum VI
  aniline?: number; // probability of a maximum aniline point
  bounds?: number; // probability of per-component bounds
  objective?: 'cost' | 'solvency';
}

/** A random plain problem around the typicals (seeded by `r`). */
export function randomPlainProblem(r: () => number, o: RandomOptions): PlainProblem {
  for (;;) {
    const picks = new Set<number>();
    while (picks.size < o.k) picks.add(Math.floor(r() * TYPICALS.length));
    const components: PlainComponent[] = [...picks].map((t, i) => {
      const [kv40, kv100, rho, ap] = TYPICALS[t]!;
      const f = 0.9 + 0.2 * r();
      const c: PlainComponent = {
        id: `c${i}`,
        kv40: kv40 * f,
        kv100: kv100 * (0.95 + 0.1 * r()) * f ** 0.6,
        density15: rho * (0.98 + 0.04 * r()),
        anilinePoint: ap + 10 * (r() - 0.5),
        pricePerKg: 0.8 + 4 * r(),
      };
      if (r() < (o.bounds ?? 0)) {
        if (r() < 0.5) c.maxMassFraction = 0.2 + 0.6 * r();
        else c.minMassFraction = 0.05 + 0.2 * r();
      }
      return c;
    });
    const lo = Math.min(...components.map((c) => c.kv40));
    const hi = Math.max(...components.map((c) => c.kv40));
    if (hi / lo < 1.5) continue;
    const target = Math.exp(Math.log(lo) + (0.15 + 0.7 * r()) * (Math.log(hi) - Math.log(lo)));
    const p: PlainProblem = {
      components,
      targetKv40: target,
      tolerancePct: 2 + 8 * r(),
      objective: o.objective ?? 'cost',
    };
    if (r() < (o.vi ?? 0)) p.minVi = 85 + 45 * r();
    if (r() < (o.aniline ?? 0)) p.maxAnilinePoint = 105 + 25 * r();
    return p;
  }
}

/** Objective value of fractions `w` (cost per litre or aniline point), by the core; null if infeasible. */
export function evaluate(p: PlainProblem, w: readonly number[]): { feasible: boolean; objective: number } {
  const c = checkPlain(p, w);
  return { feasible: c.ok, objective: p.objective === 'cost' ? c.costPerLitre : c.anilinePoint };
}

/**
 * Issue 3 item 7 feasibility, recomputed by the core from the fractions: ν40 inside the band to
 * 1e-4 relative, VI ≥ minVi − 0.01, aniline ≤ max + 0.01 °C, bounds and Σ = 1 to 1e-6.
 */
export function checkPlain(
  p: PlainProblem,
  w: readonly number[],
): { ok: boolean; failures: string[]; kv40: number; kv100: number; vi: number; anilinePoint: number; costPerLitre: number; density15: number } {
  const failures: string[] = [];
  const sum = w.reduce((s, x) => s + x, 0);
  if (Math.abs(sum - 1) > 1e-6) failures.push(`sum ${sum}`);
  p.components.forEach((c, i) => {
    const x = w[i]!;
    if (x < (c.minMassFraction ?? 0) - 1e-6 || x > (c.maxMassFraction ?? 1) + 1e-6 || x < -1e-12) failures.push(`bounds ${c.id} ${x}`);
  });
  // The core's fraction checks want Σ = 1 within 1e-9: renormalise tiny rounding.
  const wn = w.map((x) => Math.max(0, x) / w.reduce((s, y) => s + Math.max(0, y), 0));
  const parts = p.components.map((c, i) => ({ massFraction: wn[i]!, density15: c.density15, kv40: c.kv40, kv100: c.kv100 }));
  const { kv40, kv100 } = blendKv40Kv100('refutas', parts);
  const vi = viscosityIndex(kv40, kv100);
  const phi = massToVolumeFractions(parts);
  const anilinePoint = blendAnilinePoint(p.components.map((c, i) => ({ volumeFraction: phi[i]!, anilinePoint: c.anilinePoint }))).value;
  const costPerLitre = blendCostPerLitre(p.components.map((c, i) => ({ massFraction: wn[i]!, density15: c.density15, pricePerKg: c.pricePerKg })));
  const density15 = blendDensity(parts);
  const lo = p.targetKv40 * (1 - p.tolerancePct / 100);
  const hi = p.targetKv40 * (1 + p.tolerancePct / 100);
  if (kv40 < lo * (1 - 1e-4) || kv40 > hi * (1 + 1e-4)) failures.push(`kv40 ${kv40} outside ${lo}–${hi}`);
  if (p.minVi !== undefined && vi < p.minVi - 0.01) failures.push(`vi ${vi} < ${p.minVi}`);
  if (p.maxAnilinePoint !== undefined && anilinePoint > p.maxAnilinePoint + 0.01) failures.push(`aniline ${anilinePoint} > ${p.maxAnilinePoint}`);
  return { ok: failures.length === 0, failures, kv40, kv100, vi, anilinePoint, costPerLitre, density15 };
}

/**
 * Brute force: every grid point with fractions in steps of 1/steps, checked exactly (strict limits,
 * no tolerance) with blending numbers precomputed by the core's Refutas and D2270 functions.
 * Returns the best objective among feasible points, or null.
 */
export function gridBest(p: PlainProblem, steps: number): number | null {
  const n = p.components.length;
  const v40 = p.components.map((c) => refutasVbn(c.kv40));
  const v100 = p.components.map((c) => refutasVbn(c.kv100));
  const inv = p.components.map((c) => 1 / c.density15);
  const A = refutasVbn(p.targetKv40 * (1 - p.tolerancePct / 100));
  const B = refutasVbn(p.targetKv40 * (1 + p.tolerancePct / 100));
  let best = Number.POSITIVE_INFINITY;
  const w = new Array<number>(n).fill(0);
  const visit = (): void => {
    for (let i = 0; i < n; i++) {
      const c = p.components[i]!;
      if (w[i]! < (c.minMassFraction ?? 0) || w[i]! > (c.maxMassFraction ?? 1)) return;
    }
    let x40 = 0;
    let x100 = 0;
    let sv = 0;
    let sp = 0;
    let sa = 0;
    for (let i = 0; i < n; i++) {
      x40 += w[i]! * v40[i]!;
      x100 += w[i]! * v100[i]!;
      sv += w[i]! * inv[i]!;
      sp += w[i]! * p.components[i]!.pricePerKg;
      sa += w[i]! * inv[i]! * p.components[i]!.anilinePoint;
    }
    if (x40 < A || x40 > B) return;
    const ap = sa / sv;
    if (p.maxAnilinePoint !== undefined && ap > p.maxAnilinePoint) return;
    const obj = p.objective === 'cost' ? sp / sv : ap;
    if (obj >= best) return;
    if (p.minVi !== undefined) {
      const kv100 = kvFromRefutasVbn(x100);
      if (kv100 < 2 || viscosityIndex(kvFromRefutasVbn(x40), kv100) < p.minVi) return;
    }
    best = obj;
  };
  const rec = (i: number, left: number): void => {
    if (i === n - 1) {
      w[i] = left / steps;
      visit();
      return;
    }
    for (let s = 0; s <= left; s++) {
      w[i] = s / steps;
      rec(i + 1, left - s);
    }
  };
  rec(0, steps);
  return Number.isFinite(best) ? best : null;
}
