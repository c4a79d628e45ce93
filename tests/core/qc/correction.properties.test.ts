/**
 * Property-based checks of the batch correction (`qc/correction.ts`): random vessels, stocks on hand,
 * bands, vessel limits, heels and treat rates against the module's contract (README "Batch correction"
 * and the plain API: ν40 in band to 1e-4 relative, additive fraction to 1e-5, masses to 1e-3 kg).
 * Every check is an invariant, not a number; seeds are fixed so CI is deterministic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { correctBatchPlain, correctionBand, type CorrectionProblem, type CorrectionResult } from '../../../src/core/qc/correction';
import { refutasVbn, kvFromRefutasVbn } from '../../../src/core/blending/refutas';
import { blendViscosityAt, type BlendMethod } from '../../../src/core/blending/blend-viscosity';

const NUM_RUNS = Number(process.env.PROP_RUNS ?? 500);

const oilArb = fc.record({
  kv40: fc.double({ min: 25, max: 1500, noNaN: true }),
  ratio: fc.double({ min: 6, max: 22, noNaN: true }),
  density15: fc.double({ min: 0.83, max: 0.97, noNaN: true }),
});

const problemArb = fc.record({
  vessel: fc.record({ oil: oilArb, massKg: fc.double({ min: 50, max: 50_000, noNaN: true }) }),
  stocks: fc.array(
    fc.record({
      oil: oilArb,
      price: fc.double({ min: 0.5, max: 6, noNaN: true }),
      /** kg on hand as a share of the vessel's mass; null = unlimited. */
      onHand: fc.option(fc.oneof(fc.constant(0), fc.double({ min: 0.01, max: 2, noNaN: true })), { nil: null, freq: 2 }),
    }),
    { minLength: 1, maxLength: 4 },
  ),
  /** Target as a factor on the vessel's ν40. */
  targetFactor: fc.double({ min: 0.6, max: 1.6, noNaN: true }),
  tolerancePct: fc.double({ min: 0.5, max: 10, noNaN: true }),
  additive: fc.option(fc.record({ oil: oilArb, r: fc.double({ min: 0, max: 0.1, noNaN: true }), onHand: fc.option(fc.oneof(fc.constant(0), fc.double({ min: 0.001, max: 0.2, noNaN: true })), { nil: null, freq: 2 }) }), { nil: null }),
  room: fc.oneof(
    fc.constant({ kind: 'none' as const, f: 0 }),
    fc.record({ kind: fc.constant('max' as const), f: fc.double({ min: 1, max: 2.5, noNaN: true }) }),
    fc.record({ kind: fc.constant('exact' as const), f: fc.double({ min: 1, max: 2.5, noNaN: true }) }),
  ),
  minVi: fc.option(fc.double({ min: 60, max: 110, noNaN: true }), { nil: null, freq: 3 }),
  objective: fc.constantFrom('cost' as const, 'mass' as const),
});

type Gen = typeof problemArb extends fc.Arbitrary<infer T> ? T : never;

const kv100Of = (o: { kv40: number; ratio: number }) => Math.max(2, o.kv40 / o.ratio);

function problemOf(g: Gen): CorrectionProblem {
  const Mv = g.vessel.massKg;
  const components: CorrectionProblem['components'] = g.stocks.map((s, i) => ({
    id: `BW-${100 + i}`,
    kv40: s.oil.kv40,
    kv100: kv100Of(s.oil),
    density15: s.oil.density15,
    anilinePoint: 110,
    pricePerKg: s.price,
    ...(s.onHand === null ? {} : { maxAddKg: s.onHand * Mv }),
  }));
  if (g.additive) {
    components.push({
      id: 'PKG-1',
      kv40: g.additive.oil.kv40,
      kv100: kv100Of(g.additive.oil),
      density15: g.additive.oil.density15,
      anilinePoint: 0,
      pricePerKg: 8,
      ...(g.additive.onHand === null ? {} : { maxAddKg: g.additive.onHand * Mv }),
    });
  }
  return {
    vessel: { massKg: Mv, kv40: g.vessel.oil.kv40, kv100: kv100Of(g.vessel.oil), density15: g.vessel.oil.density15, anilinePoint: 110 },
    components,
    targetKv40: g.vessel.oil.kv40 * g.targetFactor,
    tolerancePct: g.tolerancePct,
    ...(g.additive ? { additive: { id: 'PKG-1', massFraction: g.additive.r } } : {}),
    ...(g.room.kind === 'max' ? { maxFinalMassKg: Mv * g.room.f } : {}),
    ...(g.room.kind === 'exact' ? { finalMassKg: Mv * g.room.f } : {}),
    ...(g.minVi === null ? {} : { minVi: g.minVi }),
    objective: g.objective,
  };
}

/** The finished batch recomputed here (Refutas on mass fractions, the plain API's rule). */
function recompute(c: CorrectionProblem, addKg: Record<string, number>): { massKg: number; kv40: number } {
  let m = c.vessel.massKg;
  let x = m * refutasVbn(c.vessel.kv40);
  for (const k of c.components) {
    m += addKg[k.id]!;
    x += addKg[k.id]! * refutasVbn(k.kv40);
  }
  return { massKg: m, kv40: kvFromRefutasVbn(x / m) };
}

function checkOptimal(c: CorrectionProblem, r: Extract<CorrectionResult, { status: 'optimal' }>): void {
  const lo = c.targetKv40 * (1 - c.tolerancePct / 100);
  const hi = c.targetKv40 * (1 + c.tolerancePct / 100);
  let sum = 0;
  let cost = 0;
  for (const k of c.components) {
    const m = r.addKg[k.id];
    expect(m !== undefined && Number.isFinite(m), `addKg[${k.id}] = ${m}`).toBe(true);
    // a correction never removes oil
    expect(m!, `addKg[${k.id}]`).toBeGreaterThanOrEqual(0);
    if (k.maxAddKg !== undefined) expect(m!, `${k.id} beyond the ${k.maxAddKg} kg on hand`).toBeLessThanOrEqual(k.maxAddKg + 1e-3);
    sum += m!;
    cost += m! * k.pricePerKg;
  }
  expect(Math.abs(r.addedKg - sum)).toBeLessThanOrEqual(1e-6 * Math.max(1, sum));
  expect(Math.abs(r.addedCost - cost)).toBeLessThanOrEqual(1e-6 * Math.max(1, cost));
  expect(Math.abs(r.massKg - (c.vessel.massKg + sum))).toBeLessThanOrEqual(1e-3);
  const b = recompute(c, r.addKg);
  // "correctable": the predicted ν40 lands in the band (1e-4 relative)
  expect(b.kv40, `ν40 ${b.kv40} below the band ${lo}`).toBeGreaterThanOrEqual(lo * (1 - 1e-4));
  expect(b.kv40, `ν40 ${b.kv40} above the band ${hi}`).toBeLessThanOrEqual(hi * (1 + 1e-4));
  expect(Math.abs(r.kv40 - b.kv40)).toBeLessThanOrEqual(1e-6 * b.kv40);
  // the vessel's limit, or a heel's exact batch
  if (c.maxFinalMassKg !== undefined) expect(r.massKg, `batch above the vessel limit ${c.maxFinalMassKg}`).toBeLessThanOrEqual(c.maxFinalMassKg + 1e-3);
  if (c.finalMassKg !== undefined) expect(Math.abs(r.massKg - c.finalMassKg), `batch ${r.massKg} ≠ ${c.finalMassKg}`).toBeLessThanOrEqual(1e-3);
  // the additive at its treat rate in the whole batch
  if (c.additive) {
    const total = c.vessel.massKg * c.additive.massFraction + r.addKg[c.additive.id]!;
    expect(Math.abs(total / r.massKg - c.additive.massFraction), 'treat rate').toBeLessThanOrEqual(1e-5);
  }
  if (c.minVi !== undefined) expect(r.vi, `VI ${r.vi} below ${c.minVi}`).toBeGreaterThanOrEqual(c.minVi - 0.005);
}

/** "Not correctable" comes with a reason in numbers, and what it states is true of the problem. */
function checkInfeasible(c: CorrectionProblem, r: Extract<CorrectionResult, { status: 'infeasible' }>): void {
  expect(/\d/.test(r.reason), r.reason).toBe(true);
  // the why itself is in numbers, not only the batch and band it restates
  expect(/\d/.test(r.reason.slice(r.reason.indexOf(': ') + 2)), r.reason).toBe(true);
  const heaviest = /the heaviest, (\S+), has ([\d.,]+) mm²\/s/.exec(r.reason);
  if (heaviest) {
    // "no stock on hand is heavy enough": then indeed none is heavier than the band's lower edge
    const lo = c.targetKv40 * (1 - c.tolerancePct / 100);
    const heavier = c.components.filter((k) => k.id !== c.additive?.id && k.kv40 > lo);
    expect(heavier.map((k) => k.id), `${r.reason} — yet ${heavier.map((k) => `${k.id} at ${k.kv40}`).join(', ')} is heavier than ${lo}`).toEqual([]);
  }
  const pkg = /every addition carries the additive package (\S+) .* the (heaviest|thinnest) addition, (\S+) \(/.exec(r.reason);
  if (pkg) {
    // the additive is the reason: the stock alone would reach the band, its mix with the additive at r does not
    const a = c.components.find((k) => k.id === pkg[1])!;
    const k = c.components.find((x) => x.id === pkg[3])!;
    const r0 = c.additive!.massFraction;
    const mix = kvFromRefutasVbn((1 - r0) * refutasVbn(k.kv40) + r0 * refutasVbn(a.kv40));
    const lo = c.targetKv40 * (1 - c.tolerancePct / 100);
    const hi = c.targetKv40 * (1 + c.tolerancePct / 100);
    if (pkg[2] === 'heaviest') expect(k.kv40 >= lo && mix < lo, r.reason).toBe(true);
    else expect(k.kv40 <= hi && mix > hi, r.reason).toBe(true);
    // and no other stock's mix does better
    for (const o of c.components) {
      if (o.id === a.id) continue;
      const m = kvFromRefutasVbn((1 - r0) * refutasVbn(o.kv40) + r0 * refutasVbn(a.kv40));
      expect(pkg[2] === 'heaviest' ? m < lo : m > hi, `${o.id} with the additive reaches ${m}: ${r.reason}`).toBe(true);
    }
  }
  const thinnest = /the thinnest, (\S+), has ([\d.,]+) mm²\/s/.exec(r.reason);
  if (thinnest) {
    const hi = c.targetKv40 * (1 + c.tolerancePct / 100);
    const thinner = c.components.filter((k) => k.id !== c.additive?.id && k.kv40 < hi);
    expect(thinner.map((k) => k.id), `${r.reason} — yet ${thinner.map((k) => `${k.id} at ${k.kv40}`).join(', ')} is thinner than ${hi}`).toEqual([]);
  }
}

describe('correctBatchPlain — properties over random vessels, stocks, bands and limits', () => {
  it('a correction never removes oil, lands in the band, fits the vessel and the stock on hand, keeps the treat rate; a refusal says why in numbers, truly', () => {
    fc.assert(
      fc.property(problemArb, (g) => {
        const c = problemOf(g);
        const r = correctBatchPlain(c);
        if (r.status === 'optimal') checkOptimal(c, r);
        else checkInfeasible(c, r);
      }),
      { seed: 25_101, numRuns: NUM_RUNS },
    );
  });

  it('a batch already in its band, with room for nothing more, needs no addition', () => {
    fc.assert(
      fc.property(problemArb, fc.double({ min: -0.95, max: 0.95, noNaN: true }), (g, pos) => {
        const c = problemOf({ ...g, minVi: null });
        // the target placed so that the vessel's ν40 lies inside the band
        const t = c.vessel.kv40 / (1 + (pos * c.tolerancePct) / 100);
        const { finalMassKg: _f, ...rest } = c;
        const r = correctBatchPlain({ ...rest, targetKv40: t, objective: 'mass' });
        expect(r.status).toBe('optimal');
        if (r.status === 'optimal') expect(r.addedKg).toBeLessThanOrEqual(1e-3);
      }),
      { seed: 25_102, numRuns: NUM_RUNS },
    );
  });
});

describe('correctBatchPlain under each mixing rule (property)', () => {
  it('the corrected batch is in band by the rule’s own blend of vessel and additions (blendViscosityAt)', () => {
    fc.assert(
      fc.property(problemArb, fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'), (g, method) => {
        const c = problemOf({ ...g, minVi: null });
        const r = correctBatchPlain(c, method);
        if (r.status !== 'optimal') return;
        const parts = [
          { m: c.vessel.massKg, kv40: c.vessel.kv40, kv100: c.vessel.kv100, density15: c.vessel.density15 },
          ...c.components.map((k) => ({ m: r.addKg[k.id]!, kv40: k.kv40, kv100: k.kv100, density15: k.density15 })),
        ].filter((p) => p.m > 0);
        const M = parts.reduce((t, p) => t + p.m, 0);
        const kv = blendViscosityAt(method, parts.map((p) => ({ massFraction: p.m / M, kv40: p.kv40, kv100: p.kv100, density15: p.density15 })), 40).kv;
        const lo = c.targetKv40 * (1 - c.tolerancePct / 100);
        const hi = c.targetKv40 * (1 + c.tolerancePct / 100);
        expect(kv >= lo * (1 - 1e-4) && kv <= hi * (1 + 1e-4), `${method}: ${kv} outside ${lo}–${hi} (correction says ${r.kv40})`).toBe(true);
        expect(Math.abs(r.kv40 / kv - 1)).toBeLessThanOrEqual(1e-6);
      }),
      { seed: 25_104, numRuns: NUM_RUNS },
    );
  });
});

describe('correctionBand — properties', () => {
  it('lies inside the aim’s band and at least the margin inside each release limit, or is null only when they cannot meet', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 1500, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        fc.double({ min: 0.8, max: 1.2, noNaN: true }),
        fc.double({ min: 1.001, max: 1.4, noNaN: true }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        (aim, b, loF, widthF, m) => {
          const release = { min: aim * loF, max: aim * loF * widthF };
          const band = correctionBand(aim, b, release, m);
          const lo = Math.max(aim * (1 - b / 100), release.min * (1 + m / 100));
          const hi = Math.min(aim * (1 + b / 100), release.max * (1 - m / 100));
          if (band === null) expect(hi < lo).toBe(true);
          else {
            expect(band.min <= band.max).toBe(true);
            expect(band.min >= release.min * (1 + m / 100) * (1 - 1e-15)).toBe(true);
            expect(band.max <= release.max * (1 - m / 100) * (1 + 1e-15)).toBe(true);
            expect(band.min >= aim * (1 - b / 100) * (1 - 1e-15) && band.max <= aim * (1 + b / 100) * (1 + 1e-15)).toBe(true);
          }
        },
      ),
      { seed: 25_103, numRuns: 2000 },
    );
  });
});
