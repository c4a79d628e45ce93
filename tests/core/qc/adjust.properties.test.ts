/**
 * Property-based checks of the lot-adjusted recipe and the heel (`qc/adjust.ts`): thousands of random
 * plant situations (lots, heels, treat rates, aims, batch sizes) against the module's own contract.
 * Every check is an invariant of the contract, not a number; the seeds are fixed so CI is deterministic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { adjustRecipe, adjustRecipeToVolume, type AdjustInput, type AdjustResult, type AdjustStock } from '../../../src/core/qc/adjust';
import { BlendbenchInputError } from '../../../src/core/errors';
import { blendCoordinates } from '../../../src/core/solver/coordinates';
import { isClose } from '../../helpers/tolerance';

const NUM_RUNS = Number(process.env.PROP_RUNS ?? 300);

/** A stock's lot: ν40 20–1500 mm²/s, ν100 a plausible 1/5–1/25 of it (≥ 2), density 0.82–0.98 kg/L. */
const lotArb = fc.record({
  kv40: fc.double({ min: 20, max: 1500, noNaN: true }),
  ratio: fc.double({ min: 5, max: 25, noNaN: true }),
  density15: fc.double({ min: 0.82, max: 0.98, noNaN: true }),
  weight: fc.double({ min: 0.01, max: 1, noNaN: true }),
});

const situationArb = fc.record({
  lots: fc.array(lotArb, { minLength: 1, maxLength: 5 }),
  withAdditive: fc.boolean(),
  treatRate: fc.double({ min: 0, max: 0.12, noNaN: true }),
  batchKg: fc.double({ min: 5, max: 200_000, noNaN: true }),
  /** The aim between the lightest and heaviest lot (geometric position; beyond 0–1: outside them). */
  aimT: fc.double({ min: -0.15, max: 1.15, noNaN: true }),
  heel: fc.option(
    fc.record({
      share: fc.double({ min: 0.001, max: 0.95, noNaN: true }),
      /** The heel's ν40 as a factor on the aim (1: a heel of the same grade). */
      kv40Factor: fc.oneof(fc.constant(1), fc.double({ min: 0.3, max: 3, noNaN: true })),
      ratio: fc.double({ min: 5, max: 25, noNaN: true }),
      density15: fc.double({ min: 0.82, max: 0.98, noNaN: true }),
      sameRecipe: fc.boolean(),
      additiveFraction: fc.double({ min: 0, max: 0.12, noNaN: true }),
    }),
    { nil: null },
  ),
  method: fc.constantFrom('refutas' as const, 'astm-d7152' as const, 'd7152-wright' as const),
});

type Situation = typeof situationArb extends fc.Arbitrary<infer T> ? T : never;

function inputOf(s: Situation): AdjustInput {
  const stocks: AdjustStock[] = s.lots.map((l, i) => ({
    id: `s${i}`,
    label: `BW-${i}`,
    kv40: l.kv40,
    kv100: Math.max(2, l.kv40 / l.ratio),
    density15: l.density15,
    savedFraction: 0,
  }));
  // The additive is the last stock, at its treat rate in the saved recipe; the rest share the remainder.
  const additive = s.withAdditive && stocks.length > 1 ? { id: stocks[stocks.length - 1]!.id, massFraction: s.treatRate } : null;
  const base = additive ? s.lots.slice(0, -1) : s.lots;
  const wSum = base.reduce((t, l) => t + l.weight, 0);
  stocks.forEach((k, i) => {
    k.savedFraction = additive && i === stocks.length - 1 ? s.treatRate : ((additive ? 1 - s.treatRate : 1) * s.lots[i]!.weight) / wSum;
  });
  const kv = stocks.map((k) => k.kv40);
  const lo = Math.min(...kv);
  const hi = Math.max(...kv);
  const aimKv40 = lo * (hi / lo) ** s.aimT;
  const heelKv40 = s.heel ? aimKv40 * s.heel.kv40Factor : 0;
  const heel = s.heel
    ? {
        massKg: s.heel.share * s.batchKg,
        kv40: heelKv40,
        kv100: Math.max(2, heelKv40 / s.heel.ratio),
        density15: s.heel.density15,
        additiveFraction: s.heel.sameRecipe && additive ? additive.massFraction : s.heel.additiveFraction,
      }
    : null;
  return { stocks, batchKg: s.batchKg, aimKv40, additive, heel, method: s.method };
}

/** The contract of an optimal answer (adjust.ts module notes and AdjustResult). */
function checkOptimal(input: AdjustInput, r: Extract<AdjustResult, { status: 'optimal' }>, M: number): void {
  const heelKg = input.heel?.massKg ?? 0;
  let added = 0;
  for (const k of input.stocks) {
    const m = r.addKg[k.id]!;
    expect(Number.isFinite(m), `addKg[${k.id}] = ${m}`).toBe(true);
    expect(m, `addKg[${k.id}] must not be negative`).toBeGreaterThanOrEqual(0);
    added += m;
  }
  // heel + additions = the batch (the LP's rounding: about 1e-9 of the batch)
  expect(isClose(heelKg + added, M, 1e-7), `heel ${heelKg} + additions ${added} ≠ batch ${M}`).toBe(true);
  expect(isClose(r.batch.massKg, M, 1e-12)).toBe(true);
  // at the aim ν40 (an equality row of the LP), and so by the mixing rule recomputed here:
  // X = Σ cᵢmᵢXᵢ / Σ cᵢmᵢ over heel and additions, cᵢ the rule's basis weight (1, 1/ρ, or Wright's 1/(ρB))
  expect(isClose(r.batch.kv40, input.aimKv40, 1e-6), `batch ν40 ${r.batch.kv40} ≠ aim ${input.aimKv40}`).toBe(true);
  const co = blendCoordinates(input.method ?? 'refutas');
  let sc = 0;
  let sx = 0;
  const parts = [...input.stocks.map((k) => ({ ...k, m: r.addKg[k.id]! })), ...(input.heel ? [{ ...input.heel, m: input.heel.massKg }] : [])];
  for (const p of parts) {
    const c = co.basisWeight(p.kv40, p.kv100, p.density15) * p.m;
    sc += c;
    sx += c * co.toX(p.kv40);
  }
  const kv40 = co.toKv(sx / sc);
  expect(isClose(kv40, input.aimKv40, 1e-6), `by the ${co.method} rule the batch is at ${kv40}, not the aim ${input.aimKv40}`).toBe(true);
  // the additive at the recipe's treat rate in the whole batch, the heel's own additive counted
  if (input.additive) {
    const inHeel = input.heel ? input.heel.additiveFraction * input.heel.massKg : 0;
    const rate = (r.addKg[input.additive.id]! + inHeel) / M;
    expect(isClose(rate, input.additive.massFraction, 1e-8, 1e-12), `treat rate ${rate} ≠ ${input.additive.massFraction}`).toBe(true);
  }
  // the shares printed on the sheet add up to 1, each within 0–1
  const shares = Object.values(r.addedFractions);
  shares.forEach((f) => expect(f >= 0 && f <= 1).toBe(true));
  if (added > 0) expect(isClose(shares.reduce((a, b) => a + b, 0), 1, 1e-12)).toBe(true);
  expect(Number.isFinite(r.batch.kv100) && r.batch.kv100 > 0).toBe(true);
  expect(r.changePct >= 0 && r.changePct <= 100 + 1e-9).toBe(true);
  // volume at 15 °C: H/ρ_h + Σ mᵢ/ρᵢ
  const litres = input.stocks.reduce((v, k) => v + r.addKg[k.id]! / k.density15, input.heel ? input.heel.massKg / input.heel.density15 : 0);
  expect(isClose(r.batch.litres15, litres, 1e-12)).toBe(true);
}

function checkInfeasible(input: AdjustInput, r: Extract<AdjustResult, { status: 'infeasible' }>): void {
  expect(r.reason.length).toBeGreaterThan(20);
  expect(/\d/.test(r.reason), `a reason in numbers: ${r.reason}`).toBe(true);
  if (r.reachable) {
    // "cannot be reached": the aim lies outside the range the lots can reach (to the LP's tolerance)
    const inside = input.aimKv40 > r.reachable.min * (1 + 1e-6) && input.aimKv40 < r.reachable.max * (1 - 1e-6);
    expect(inside, `aim ${input.aimKv40} is inside the reachable ${r.reachable.min}–${r.reachable.max} yet refused: ${r.reason}`).toBe(false);
    expect(r.reachable.min <= r.reachable.max).toBe(true);
  }
}

describe('adjustRecipe — properties over random lots, heels and aims', () => {
  it('an optimal answer charges the batch exactly, never a negative addition, at the aim and the treat rate; a refusal gives its reason in numbers', () => {
    fc.assert(
      fc.property(situationArb, (s) => {
        const input = inputOf(s);
        const r = adjustRecipe(input);
        if (r.status === 'optimal') checkOptimal(input, r, input.batchKg);
        else checkInfeasible(input, r);
      }),
      { seed: 25_001, numRuns: NUM_RUNS },
    );
  });

  it('an aim between the lightest and the heaviest lot is reached when there is no heel and no additive', () => {
    fc.assert(
      fc.property(situationArb, fc.double({ min: 0.02, max: 0.98, noNaN: true }), (s, t) => {
        const input = inputOf({ ...s, withAdditive: false, heel: null });
        const kv = input.stocks.map((k) => k.kv40);
        const lo = Math.min(...kv);
        const hi = Math.max(...kv);
        fc.pre(hi > lo * 1.01);
        // geometric interpolation keeps the aim strictly inside (X is monotone in ν)
        const aim = lo * (hi / lo) ** t;
        const r = adjustRecipe({ ...input, aimKv40: aim });
        expect(r.status, r.status === 'infeasible' ? r.reason : '').toBe('optimal');
        if (r.status === 'optimal') checkOptimal({ ...input, aimKv40: aim }, r, input.batchKg);
      }),
      { seed: 25_002, numRuns: NUM_RUNS },
    );
  });

  it('a heel not lighter than the batch is refused naming heel.massKg, never a negative addition', () => {
    fc.assert(
      fc.property(situationArb, fc.double({ min: 1, max: 3, noNaN: true }), (s, k) => {
        const input = inputOf({ ...s, heel: s.heel ?? { share: 0.5, kv40Factor: 1, ratio: 13, density15: 0.9, sameRecipe: true, additiveFraction: 0 } });
        const heel = { ...input.heel!, massKg: input.batchKg * k };
        let err: unknown = null;
        try {
          adjustRecipe({ ...input, heel });
        } catch (e) {
          err = e;
        }
        expect(err).toBeInstanceOf(BlendbenchInputError);
        expect((err as BlendbenchInputError).field).toBe('heel.massKg');
      }),
      { seed: 25_003, numRuns: 100 },
    );
  });
});

describe('adjustRecipe — nothing to adjust leaves the saved recipe', () => {
  it('lots at the library values, the aim the saved recipe’s own ν40 and a heel of the same batch: the additions are the saved shares', () => {
    fc.assert(
      fc.property(situationArb, fc.double({ min: 0.001, max: 0.9, noNaN: true }), (s, share) => {
        const input = inputOf({ ...s, heel: null });
        const co = blendCoordinates(input.method ?? 'refutas');
        // the saved recipe's own ν40 (and ν100) by the mixing rule: Σ cᵢwᵢXᵢ / Σ cᵢwᵢ (cᵢ the rule's basis
        // weight; for Wright's the heel's own 1/(ρB) then equals Σ wᵢcᵢ, so a heel of the batch mixes as its parts)
        const blend = (at100: boolean) => {
          let sc = 0;
          let sx = 0;
          for (const k of input.stocks) {
            const c = co.basisWeight(k.kv40, k.kv100, k.density15);
            sc += c * k.savedFraction;
            sx += c * k.savedFraction * co.toX(at100 ? k.kv100 : k.kv40);
          }
          return co.toKv(sx / sc);
        };
        const rho = 1 / input.stocks.reduce((t, k) => t + k.savedFraction / k.density15, 0);
        const aim = blend(false);
        const heel = {
          massKg: share * input.batchKg,
          kv40: aim,
          kv100: blend(true),
          density15: rho,
          additiveFraction: input.additive?.massFraction ?? 0,
        };
        const r = adjustRecipe({ ...input, aimKv40: aim, heel });
        expect(r.status, r.status === 'infeasible' ? r.reason : '').toBe('optimal');
        if (r.status !== 'optimal') return;
        for (const k of input.stocks) {
          const want = k.savedFraction * (input.batchKg - heel.massKg);
          expect(Math.abs(r.addKg[k.id]! - want), `${k.id}: ${r.addKg[k.id]} kg, saved share gives ${want}`).toBeLessThanOrEqual(1e-6 * input.batchKg);
        }
        expect(r.changePct).toBeLessThanOrEqual(1e-4);
      }),
      { seed: 25_005, numRuns: NUM_RUNS },
    );
  });
});

describe('adjustRecipeToVolume — properties', () => {
  it('heel and additions fill the litres ordered at 15 °C (1e-6 relative, the documented tolerance), with the contract of adjustRecipe', () => {
    fc.assert(
      fc.property(situationArb, fc.double({ min: 5, max: 200_000, noNaN: true }), (s, V) => {
        const input = inputOf(s);
        const { batchKg: _drop, ...rest } = input;
        // the heel given as a share of the volume
        const heel = input.heel ? { ...input.heel, massKg: s.heel!.share * V * input.heel.density15 } : null;
        const r = adjustRecipeToVolume({ ...rest, heel, batchLitres: V });
        if (r.status === 'optimal') {
          expect(isClose(r.batch.litres15, V, 1e-6), `litres ${r.batch.litres15} ≠ ordered ${V}`).toBe(true);
          checkOptimal({ ...input, heel }, r, r.batch.massKg);
        } else checkInfeasible({ ...input, heel }, r);
      }),
      { seed: 25_004, numRuns: NUM_RUNS },
    );
  });
});
