/**
 * Solver fuzzing (issue 6): random libraries and targets never make the solver return NaN, throw
 * anything but the core's named input errors, or claim `optimal` for a recipe that fails a
 * constraint when its fractions are recomputed independently with the calculation core.
 *
 * The recomputation uses the core's published-method functions directly (Refutas / ASTM D7152,
 * D2270, ideal-mixing density, volume-basis aniline point, blending indices) and the feasibility
 * tolerances of issue 3 item 7: ν40 band 1e-4 relative, VI − 0.01, temperature limits 0.01 °C,
 * fractions and their sum 1e-6. No check value is asserted here, only constraint satisfaction.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  BlendbenchInputError,
  ISO_GRADE_NUMBERS,
  blendAnilinePoint,
  blendCostPerLitre,
  blendDensity,
  blendKv40Kv100,
  gradeBand,
  massToVolumeFractions,
  newRecipeLifecycle,
  predictBlend,
  solveBlend,
  solveBlendPlain,
  viscosityIndex,
  type BlendTargets,
  type Component,
  type ComponentCategory,
  type Recipe,
} from '../../../src/core';

const TOL = { kv40Rel: 1e-4, vi: 0.01, temp: 0.01, frac: 1e-6 } as const;
/**
 * A fixed seed keeps the suite reproducible; FUZZ_SEED=<n> explores other cases and FUZZ_SCALE=10
 * runs ten times as many (a deeper search outside the normal suite).
 */
const SEED = Number(process.env.FUZZ_SEED ?? 20_260_101);
const SCALE = Number(process.env.FUZZ_SCALE ?? 1);

/** Every number anywhere in a value (NaN must never appear). */
function numbersIn(v: unknown, out: number[] = [], depth = 0): number[] {
  if (typeof v === 'number') out.push(v);
  else if (v && typeof v === 'object' && depth < 6) for (const x of Object.values(v)) numbersIn(x, out, depth + 1);
  return out;
}

/** null with weight `nullWeight` against 1 for a value (constraints are set less often than not). */
const maybe = <T,>(arb: fc.Arbitrary<T>, nullWeight = 2) =>
  fc.oneof({ weight: nullWeight, arbitrary: fc.constant(null) }, { weight: 1, arbitrary: arb });

const logUniform = (lo: number, hi: number) =>
  fc.double({ min: Math.log(lo), max: Math.log(hi), noNaN: true }).map((x) => Math.exp(x));

/** ν40 and a ν100 below it, ≥ 2.05 mm²/s (inside ASTM D2270). */
const viscosityPair = (lo = 10, hi = 20_000) => fc
  .tuple(logUniform(lo, hi), fc.double({ min: 3.5, max: 40, noNaN: true }))
  .map(([kv40, r]) => ({ kv40, kv100: Math.min(Math.max(kv40 / r, 2.05), kv40 * 0.9) }))
  .filter((p) => p.kv100 < p.kv40 && p.kv100 >= 2.05);

// ---------------------------------------------------------------------------------------------
// solveBlendPlain

const plainComponent = (id: string) =>
  fc.record({
    v: viscosityPair(),
    density15: fc.double({ min: 0.8, max: 1.05, noNaN: true }),
    anilinePoint: fc.double({ min: -10, max: 160, noNaN: true }),
    pricePerKg: fc.oneof(fc.constant(0), fc.double({ min: 0.3, max: 12, noNaN: true })),
    bounds: fc.option(fc.tuple(fc.double({ min: 0, max: 0.5, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true })), { nil: undefined }),
  }).map((r) => ({
    id,
    kv40: r.v.kv40,
    kv100: r.v.kv100,
    density15: r.density15,
    anilinePoint: r.anilinePoint,
    pricePerKg: r.pricePerKg,
    ...(r.bounds ? { minMassFraction: Math.min(...r.bounds), maxMassFraction: Math.max(...r.bounds) } : {}),
  }));

const plainProblem = fc
  .integer({ min: 1, max: 6 })
  .chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => plainComponent(`c${i}`))))
  .chain((components) => {
    const kvs = components.map((c) => c.kv40);
    return fc.record({
      components: fc.constant(components),
      // Mostly inside the reachable range, sometimes outside it (an infeasible answer is fine).
      targetKv40: fc.oneof(
        { weight: 4, arbitrary: logUniform(Math.min(...kvs), Math.max(...kvs)) },
        { weight: 1, arbitrary: logUniform(5, 30_000) },
      ),
      tolerancePct: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 15, noNaN: true })),
      minVi: fc.option(fc.double({ min: 40, max: 180, noNaN: true }), { nil: undefined, freq: 2 }),
      maxAnilinePoint: fc.option(fc.double({ min: 60, max: 150, noNaN: true }), { nil: undefined, freq: 2 }),
      objective: fc.constantFrom('cost' as const, 'solvency' as const),
    });
  })
  .map((p) => {
    const out: Parameters<typeof solveBlendPlain>[0] = {
      components: p.components,
      targetKv40: p.targetKv40,
      tolerancePct: p.tolerancePct,
      objective: p.objective,
    };
    if (p.minVi !== undefined) out.minVi = p.minVi;
    if (p.maxAnilinePoint !== undefined) out.maxAnilinePoint = p.maxAnilinePoint;
    return out;
  });

describe('solver fuzzing: solveBlendPlain', () => {
  it('never NaN, never an unnamed throw, and every optimal blend recomputes feasible', () => {
    let optimal = 0;
    let infeasible = 0;
    fc.assert(
      fc.property(plainProblem, (p) => {
        let r: ReturnType<typeof solveBlendPlain>;
        try {
          r = solveBlendPlain(p);
        } catch (e) {
          // Impossible input (e.g. bounds whose minima sum above 1) must be a named core error.
          expect(e).toBeInstanceOf(BlendbenchInputError);
          return;
        }
        if (r.status === 'infeasible') {
          infeasible++;
          expect(r.reason.length).toBeGreaterThan(10);
          expect(r.reason).not.toMatch(/NaN|undefined|Infinity/);
          return;
        }
        expect(r.status).toBe('optimal');
        optimal++;
        for (const x of numbersIn(r)) expect(Number.isNaN(x)).toBe(false);
        const w = p.components.map((c) => r.massFractions[c.id]!);
        expect(Object.keys(r.massFractions).sort()).toEqual(p.components.map((c) => c.id).sort());
        // Fractions: within bounds and summing to 1.
        expect(Math.abs(w.reduce((s, x) => s + x, 0) - 1)).toBeLessThanOrEqual(TOL.frac);
        p.components.forEach((c, i) => {
          expect(w[i]!).toBeGreaterThanOrEqual((c.minMassFraction ?? 0) - TOL.frac);
          expect(w[i]!).toBeLessThanOrEqual((c.maxMassFraction ?? 1) + TOL.frac);
        });
        // Recompute with the core (clamping round-off below zero, renormalising the sum).
        const wc = w.map((x) => Math.max(0, x));
        const sum = wc.reduce((s, x) => s + x, 0);
        const parts = p.components.map((c, i) => ({ massFraction: wc[i]! / sum, density15: c.density15, kv40: c.kv40, kv100: c.kv100 }));
        const { kv40, kv100 } = blendKv40Kv100('refutas', parts);
        const lo = p.targetKv40 * (1 - p.tolerancePct / 100);
        const hi = p.targetKv40 * (1 + p.tolerancePct / 100);
        expect(kv40).toBeGreaterThanOrEqual(lo * (1 - TOL.kv40Rel));
        expect(kv40).toBeLessThanOrEqual(hi * (1 + TOL.kv40Rel));
        const vi = viscosityIndex(kv40, kv100);
        if (p.minVi !== undefined) expect(vi).toBeGreaterThanOrEqual(p.minVi - TOL.vi);
        const phi = massToVolumeFractions(parts);
        const ap = blendAnilinePoint(p.components.map((c, i) => ({ volumeFraction: phi[i]!, anilinePoint: c.anilinePoint }))).value;
        if (p.maxAnilinePoint !== undefined) expect(ap).toBeLessThanOrEqual(p.maxAnilinePoint + TOL.temp);
        // The reported properties are the recomputed ones.
        expect(r.kv40).toBeCloseTo(kv40, 6);
        expect(r.vi).toBeCloseTo(vi, 4);
        expect(r.anilinePoint).toBeCloseTo(ap, 6);
        expect(r.density15).toBeCloseTo(blendDensity(parts), 9);
        const cost = blendCostPerLitre(p.components.map((c, i) => ({ massFraction: parts[i]!.massFraction, density15: c.density15, pricePerKg: c.pricePerKg })));
        expect(Math.abs(r.costPerLitre - cost)).toBeLessThanOrEqual(1e-6 * Math.max(1, cost));
      }),
      { numRuns: 600 * SCALE, seed: SEED },
    );
    // The generator must exercise both outcomes.
    expect(optimal).toBeGreaterThan(50);
    expect(infeasible).toBeGreaterThan(20);
  });
});

// ---------------------------------------------------------------------------------------------
// solveBlend (library components, ISO grades, every constraint kind)

const CATEGORIES: ComponentCategory[] = ['group-i', 'group-ii', 'group-iii', 'group-iv', 'group-v', 'polymer', 'additive-package'];

const libraryComponent = (i: number, currency: fc.Arbitrary<string>, grade: number) =>
  fc.record({
    category: fc.constantFrom(...CATEGORIES),
    v: viscosityPair(Math.max(10, grade / 15), Math.min(20_000, grade * 15)),
    density15: fc.double({ min: 0.8, max: 1.08, noNaN: true }),
    anilinePoint: fc.option(fc.double({ min: 0, max: 160, noNaN: true }), { nil: null, freq: 8 }),
    pourPoint: fc.option(fc.double({ min: -60, max: 5, noNaN: true }), { nil: null, freq: 4 }),
    flashPoint: fc.option(fc.double({ min: 140, max: 320, noNaN: true }), { nil: null, freq: 4 }),
    amount: fc.double({ min: 0, max: 3000, noNaN: true }),
    basis: fc.constantFrom('per-kg' as const, 'per-litre' as const, 'per-tonne' as const),
    currency,
    availability: fc.constantFrom('available' as const, 'available' as const, 'available' as const, 'limited' as const, 'withdrawn' as const),
    oxidationRating: fc.option(fc.integer({ min: 1, max: 5 }), { nil: null, freq: 3 }),
    shearLossPct: fc.option(fc.double({ min: 0, max: 40, noNaN: true }), { nil: null }),
  }).map(
    (r): Component => ({
      id: `k${i}`,
      code: `FZ-${i}`,
      name: `invented fuzz stock ${i}`,
      category: r.category,
      viscosityPoints: [
        { tempC: 40, kv: r.v.kv40 },
        { tempC: 100, kv: r.v.kv100 },
      ],
      density15: r.density15,
      anilinePoint: r.category === 'additive-package' ? null : r.anilinePoint,
      pourPoint: r.pourPoint,
      flashPoint: r.flashPoint,
      sulfurPct: null,
      saturatesPct: null,
      price: { amount: r.basis === 'per-tonne' ? r.amount : r.amount / 300, basis: r.basis, currency: r.currency },
      availability: r.availability,
      oxidationRating: r.oxidationRating,
      shearLossPct: r.category === 'polymer' ? r.shearLossPct : null,
      kv40LotSpreadPct: null,
      calibration: null,
      source: 'invented fuzz data',
      sourceDate: '2024-01-01',
      notes: '',
    }),
  );

const GRADES = ISO_GRADE_NUMBERS.filter((g) => g >= 22 && g <= 1500);

const blendProblem = fc
  .tuple(fc.integer({ min: 1, max: 7 }), fc.integer({ min: 0, max: 9 }), fc.constantFrom(...GRADES))
  .chain(([n, currencyMix, grade]) => {
    const currency = currencyMix > 0 ? fc.constant('EUR') : fc.constantFrom('EUR', 'EUR', 'EUR', 'EUR', 'EUR', 'EUR', 'USD');
    return fc.tuple(fc.constant(grade), fc.tuple(...Array.from({ length: n }, (_, i) => libraryComponent(i, currency, grade))));
  })
  .chain(([grade, components]) => {
    const ids = components.map((c) => c.id);
    const additives = components.filter((c) => c.category === 'additive-package' && c.availability !== 'withdrawn');
    return fc.record({
      components: fc.constant(components),
      grade: fc.constant(grade),
      targetPos: maybe(fc.double({ min: 0, max: 1, noNaN: true }), 1),
      tolerancePct: fc.double({ min: 0, max: 12, noNaN: true }),
      minVi: maybe(fc.double({ min: 40, max: 170, noNaN: true })),
      maxAnilinePoint: maybe(fc.double({ min: 60, max: 150, noNaN: true })),
      maxPolymerFraction: maybe(fc.double({ min: 0, max: 0.4, noNaN: true })),
      maxPourPoint: maybe(fc.double({ min: -40, max: 0, noNaN: true }), 4),
      minFlashPoint: maybe(fc.double({ min: 150, max: 260, noNaN: true }), 4),
      additive: additives.length
        ? maybe(fc.record({ componentId: fc.constantFrom(...additives.map((a) => a.id)), massFraction: fc.double({ min: 0.005, max: 0.06, noNaN: true }) }), 1)
        : fc.constant(null),
      bounds: fc.dictionary(
        fc.constantFrom(...ids),
        fc.tuple(fc.double({ min: 0, max: 0.4, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), fc.constantFrom('min', 'max', 'both')).map(([a, b, which]) => {
          const lo = Math.min(a, b);
          const hi = Math.max(a, b);
          return which === 'min' ? { min: lo } : which === 'max' ? { max: hi } : { min: lo, max: hi };
        }),
        { maxKeys: 2 },
      ),
      objective: fc.constantFrom('cost' as const, 'cost-kg' as const, 'solvency' as const, 'oxidation' as const, 'closest' as const),
      referenceWeights: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: components.length, maxLength: components.length }),
      method: fc.constantFrom('refutas' as const, 'astm-d7152' as const, 'd7152-wright' as const),
    });
  });

describe('solver fuzzing: solveBlend', () => {
  it('never NaN, never a throw, and every optimal recipe meets every constraint when recomputed', () => {
    const seen = { optimal: 0, infeasible: 0, 'invalid-input': 0 };
    fc.assert(
      fc.property(blendProblem, (g) => {
        const band = gradeBand(g.grade);
        const targets: BlendTargets = {
          grade: g.grade,
          targetKv40: g.targetPos === null ? null : band.min + g.targetPos * (band.max - band.min),
          tolerancePct: g.tolerancePct,
          minVi: g.minVi,
          maxAnilinePoint: g.maxAnilinePoint,
          maxPolymerFraction: g.maxPolymerFraction,
          maxPourPoint: g.maxPourPoint,
          minFlashPoint: g.minFlashPoint,
          additive: g.additive,
          bounds: g.bounds,
          objective: g.objective,
          referenceRecipeId: g.objective === 'closest' ? 'ref' : null,
          minInBandProbability: null,
        };
        const wsum = g.referenceWeights.reduce((s, x) => s + x, 0);
        const reference: Recipe = {
          id: 'ref',
          name: 'invented reference',
          grade: g.grade,
          lines: g.components.map((c, i) => ({ componentId: c.id, massFraction: wsum > 0 ? g.referenceWeights[i]! / wsum : 1 / g.components.length })),
          revision: 1,
          isReference: true,
          notes: '',
          updatedAt: '2024-01-01T00:00:00Z',
          ...newRecipeLifecycle(),
        };
        // solveBlend never throws: impossible input comes back as 'invalid-input' naming the field.
        const r = solveBlend({ components: g.components, targets, reference, method: g.method });
        seen[r.status]++;
        for (const x of numbersIn(r)) expect(Number.isNaN(x)).toBe(false);
        if (r.status === 'invalid-input') {
          expect(r.field.length).toBeGreaterThan(0);
          expect(r.message.length).toBeGreaterThan(10);
          return;
        }
        if (r.status === 'infeasible') {
          expect(r.reason.length).toBeGreaterThan(10);
          expect(`${r.reason} ${r.suggestion}`).not.toMatch(/NaN|undefined/);
          return;
        }
        // Optimal: the solver's own checks all pass …
        for (const c of r.checks) expect(c, c.constraint).toMatchObject({ ok: true });
        expect(Number.isFinite(r.objectiveValue)).toBe(true);
        // … and an independent recomputation by the core agrees.
        const byId = new Map(g.components.map((c) => [c.id, c]));
        const w = new Map(r.lines.map((l) => [l.componentId, l.massFraction]));
        const sum = r.lines.reduce((s, l) => s + l.massFraction, 0);
        expect(Math.abs(sum - 1)).toBeLessThanOrEqual(TOL.frac);
        for (const l of r.lines) {
          expect(byId.has(l.componentId)).toBe(true);
          expect(l.massFraction).toBeGreaterThan(0);
          expect(l.massFraction).toBeLessThanOrEqual(1 + TOL.frac);
        }
        const p = predictBlend(g.components, r.lines, { method: g.method });
        const target = targets.targetKv40 ?? band.mid;
        const lo = Math.max(target * (1 - targets.tolerancePct / 100), band.min);
        const hi = Math.min(target * (1 + targets.tolerancePct / 100), band.max);
        expect(p.kv40).toBeGreaterThanOrEqual(lo * (1 - TOL.kv40Rel));
        expect(p.kv40).toBeLessThanOrEqual(hi * (1 + TOL.kv40Rel));
        if (targets.minVi !== null) {
          expect(p.vi).not.toBeNull();
          expect(p.vi!).toBeGreaterThanOrEqual(targets.minVi - TOL.vi);
        }
        if (targets.maxAnilinePoint !== null) {
          expect(p.anilinePoint).not.toBeNull();
          expect(p.anilinePoint!.value).toBeLessThanOrEqual(targets.maxAnilinePoint + TOL.temp);
        }
        const polymer = r.lines.filter((l) => byId.get(l.componentId)!.category === 'polymer').reduce((s, l) => s + l.massFraction, 0);
        if (targets.maxPolymerFraction !== null) expect(polymer).toBeLessThanOrEqual(targets.maxPolymerFraction + TOL.frac);
        if (targets.maxPourPoint !== null) {
          expect(p.pourPoint).not.toBeNull();
          expect(p.pourPoint!).toBeLessThanOrEqual(targets.maxPourPoint + TOL.temp);
        }
        if (targets.minFlashPoint !== null) {
          expect(p.flashPoint).not.toBeNull();
          expect(p.flashPoint!).toBeGreaterThanOrEqual(targets.minFlashPoint - TOL.temp);
        }
        for (const c of g.components) {
          const x = w.get(c.id) ?? 0;
          if (c.availability === 'withdrawn') expect(x, `${c.code} is withdrawn`).toBe(0);
          if (targets.additive?.componentId === c.id) {
            expect(Math.abs(x - targets.additive.massFraction)).toBeLessThanOrEqual(TOL.frac);
            continue;
          }
          if (c.category === 'additive-package' && !(c.id in targets.bounds)) expect(x, `${c.code} is an unrequested additive`).toBe(0);
          const b = targets.bounds[c.id];
          if (b && c.availability !== 'withdrawn') {
            if (b.min !== undefined) expect(x).toBeGreaterThanOrEqual(b.min - TOL.frac);
            if (b.max !== undefined) expect(x).toBeLessThanOrEqual(b.max + TOL.frac);
          }
        }
      }),
      { numRuns: 500 * SCALE, seed: SEED },
    );
    expect(seen.optimal).toBeGreaterThan(30);
    expect(seen.infeasible).toBeGreaterThan(30);
  });
});
