/**
 * Property-based checks of the lot-spread probability and the robust solve (`qc/normal.ts`,
 * `qc/lot-spread.ts`, `qc/robust.ts`): a probability lies in [0, 1], grows as the band widens, tends
 * to the deterministic answer as the spread vanishes, and a robust recipe meets the probability asked.
 * Invariants only (no check values); seeds fixed so CI is deterministic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { standardNormalCdf, standardNormalQuantile } from '../../../src/core/qc/normal';
import { batchKv40Distribution, kv40InBandProbability, kv40Quantile, probabilityInInterval, type SpreadPart } from '../../../src/core/qc/lot-spread';
import { allowedDeviation, maxSdForProbability } from '../../../src/core/qc/robust';
import { inBandProbabilityPlain } from '../../../src/core/qc/probability-plain';
import { solveBlendPlain, type PlainProblem } from '../../../src/core/solver/plain';
import { blendViscosityAt } from '../../../src/core/blending/blend-viscosity';
import { monteCarloKv40 } from '../../../src/core/qc/monte-carlo';

const NUM_RUNS = Number(process.env.PROP_RUNS ?? 500);

const partsArb = fc
  .array(
    fc.record({
      weight: fc.double({ min: 0.01, max: 1, noNaN: true }),
      kv40: fc.double({ min: 10, max: 2000, noNaN: true }),
      kv40RelSd: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.25, noNaN: true })),
      density15: fc.double({ min: 0.82, max: 1.05, noNaN: true }),
    }),
    { minLength: 1, maxLength: 6 },
  )
  .map((ps): SpreadPart[] => {
    const w = ps.reduce((t, p) => t + p.weight, 0);
    return ps.map((p) => ({ massFraction: p.weight / w, kv40: p.kv40, kv40RelSd: p.kv40RelSd, density15: p.density15 }));
  });
const methodArb = fc.constantFrom('refutas' as const, 'astm-d7152' as const);

describe('normal distribution — properties', () => {
  it('Φ is non-decreasing, in [0, 1], and Φ⁻¹(Φ(z)) = z where Φ keeps its digits', () => {
    fc.assert(
      fc.property(fc.double({ min: -37, max: 8, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }), (z, dz) => {
        const p = standardNormalCdf(z);
        expect(p >= 0 && p <= 1).toBe(true);
        expect(standardNormalCdf(z + dz)).toBeGreaterThanOrEqual(p);
        if (p > 1e-300 && p < 1 - 1e-12) expect(Math.abs(standardNormalQuantile(p) - z)).toBeLessThanOrEqual(1e-7 * Math.max(1, Math.abs(z)));
      }),
      { seed: 25_301, numRuns: 3000 },
    );
  });
});

describe('the spread model is centred on the prediction, under every mixing rule', () => {
  it('the median batch ν40 is the nominal ν40 of blendViscosityAt (Refutas, ASTM D7152 and its Wright form), and the Monte Carlo draws centre on it', () => {
    fc.assert(
      fc.property(partsArb, fc.constantFrom('refutas' as const, 'astm-d7152' as const, 'd7152-wright' as const), fc.array(fc.double({ min: 6, max: 20, noNaN: true }), { minLength: 6, maxLength: 6 }), (parts0, method, ratios) => {
        const parts = parts0.map((p, i) => ({ ...p, kv100: Math.max(2.1, p.kv40 / ratios[i]!) }));
        fc.pre(parts.every((p) => p.kv100 < p.kv40));
        const nominal = blendViscosityAt(method, parts, 40).kv;
        const d = batchKv40Distribution(parts, method);
        expect(Math.abs(d.medianKv40 / nominal - 1), `${method}: median ${d.medianKv40} vs prediction ${nominal}`).toBeLessThanOrEqual(1e-9);
        // without spread every simulated batch is the prediction
        const mc = monteCarloKv40(parts.map((p) => ({ ...p, kv40RelSd: 0 })), { samples: 3, seed: 1, method });
        mc.samples.forEach((kv) => expect(Math.abs(kv / nominal - 1)).toBeLessThanOrEqual(1e-9));
      }),
      { seed: 25_306, numRuns: NUM_RUNS },
    );
  });
});

describe('probability in band — properties', () => {
  it('lies in [0, 1], grows as the band widens on either side, and is the deterministic answer without spread', () => {
    fc.assert(
      fc.property(partsArb, methodArb, fc.double({ min: 0.5, max: 1.5, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true }), fc.double({ min: 0, max: 0.2, noNaN: true }), fc.double({ min: 0, max: 0.2, noNaN: true }), (parts, method, centre, half, widenLo, widenHi) => {
        const d = batchKv40Distribution(parts, method);
        const mid = d.medianKv40 * centre;
        const band = { min: mid * (1 - half), max: mid * (1 + half) };
        const p = kv40InBandProbability(d, band);
        expect(p >= 0 && p <= 1, `p = ${p}`).toBe(true);
        const wider = kv40InBandProbability(d, { min: band.min * (1 - widenLo), max: band.max * (1 + widenHi) });
        expect(wider).toBeGreaterThanOrEqual(p - 1e-15);
        // without spread: 1 inside the band, 0 outside
        const sure = batchKv40Distribution(parts.map((x) => ({ ...x, kv40RelSd: 0 })), method);
        const inside = sure.medianKv40 >= band.min && sure.medianKv40 <= band.max;
        expect(kv40InBandProbability(sure, band)).toBe(inside ? 1 : 0);
        // a vanishing spread tends to it (away from the edges)
        const edge = Math.min(Math.abs(sure.medianKv40 / band.min - 1), Math.abs(sure.medianKv40 / band.max - 1));
        if (edge > 1e-3) {
          const tiny = batchKv40Distribution(parts.map((x) => ({ ...x, kv40RelSd: x.kv40RelSd * 1e-6 })), method);
          expect(Math.abs(kv40InBandProbability(tiny, band) - (inside ? 1 : 0))).toBeLessThanOrEqual(1e-9);
        }
        // the median is the 0.5 quantile, and quantiles are ordered
        expect(Math.abs(kv40Quantile(d, 0.5) / d.medianKv40 - 1)).toBeLessThanOrEqual(1e-12);
        expect(kv40Quantile(d, 0.05)).toBeLessThanOrEqual(kv40Quantile(d, 0.95));
      }),
      { seed: 25_302, numRuns: NUM_RUNS },
    );
  });

  it('probabilityInInterval: symmetric in the mean about the centre, non-increasing as the mean leaves it', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 10, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true }), fc.double({ min: 0, max: 20, noNaN: true }), fc.double({ min: 0, max: 5, noNaN: true }), (sd, h, dev, more) => {
        const p = probabilityInInterval(dev, sd, -h, h);
        expect(p >= 0 && p <= 1).toBe(true);
        expect(Math.abs(probabilityInInterval(-dev, sd, -h, h) - p)).toBeLessThanOrEqual(1e-15);
        expect(probabilityInInterval(dev + more, sd, -h, h)).toBeLessThanOrEqual(p + 1e-15);
      }),
      { seed: 25_303, numRuns: 3000 },
    );
  });

  it('allowedDeviation: the batch at δ_p(σ) lands in band with probability p, and no deviation will do beyond σ_max', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 0.9999, noNaN: true }), fc.double({ min: 0.01, max: 0.999, noNaN: true }), fc.double({ min: 0.01, max: 100, noNaN: true }), (p, share, h) => {
        const sMax = maxSdForProbability(h, p);
        const sigma = share * sMax;
        const r = allowedDeviation(sigma, h, p);
        expect(r).not.toBeNull();
        expect(r!.delta).toBeGreaterThanOrEqual(0);
        expect(r!.delta).toBeLessThanOrEqual(h * (1 + 1e-12));
        expect(Math.abs(probabilityInInterval(r!.delta, sigma, -h, h) - p)).toBeLessThanOrEqual(1e-9);
        expect(r!.slope).toBeLessThanOrEqual(0);
        expect(allowedDeviation(sMax * 1.001, h, p)).toBeNull();
      }),
      { seed: 25_304, numRuns: 2000 },
    );
  });
});

describe('robust solve — a robust recipe meets the probability asked (property)', () => {
  it('solveBlendPlain with minInBandProbability p: an optimal recipe has probability ≥ p when recomputed', () => {
    const stockArb = fc.record({
      kv40: fc.double({ min: 30, max: 1500, noNaN: true }),
      ratio: fc.double({ min: 7, max: 20, noNaN: true }),
      price: fc.double({ min: 0.8, max: 5, noNaN: true }),
      sd: fc.double({ min: 0.002, max: 0.05, noNaN: true }),
    });
    let solved = 0;
    let tried = 0;
    fc.assert(
      fc.property(fc.array(stockArb, { minLength: 2, maxLength: 3 }), fc.double({ min: 0.3, max: 0.9, noNaN: true }), fc.double({ min: 2, max: 10, noNaN: true }), fc.double({ min: 0.5, max: 0.995, noNaN: true }), (ks, t, tol, p) => {
        const kv = ks.map((k) => k.kv40);
        const lo = Math.min(...kv);
        const hi = Math.max(...kv);
        fc.pre(hi > lo * 1.2);
        const problem: PlainProblem = {
          components: ks.map((k, i) => ({ id: `BW-${i}`, kv40: k.kv40, kv100: Math.max(2, k.kv40 / k.ratio), density15: 0.88, anilinePoint: 110, pricePerKg: k.price, kv40RelSd: k.sd })),
          targetKv40: lo * (hi / lo) ** t,
          tolerancePct: tol,
          minInBandProbability: p,
          objective: 'cost',
        };
        const r = solveBlendPlain(problem);
        tried++;
        if (r.status !== 'optimal') return;
        solved++;
        const got = inBandProbabilityPlain(problem, r.massFractions);
        expect(got, `asked ${p}, got ${got}`).toBeGreaterThanOrEqual(p - 1e-9);
        expect(Math.abs((r.inBandProbability ?? -1) - got)).toBeLessThanOrEqual(1e-9);
      }),
      { seed: 25_305, numRuns: Number(process.env.ROBUST_RUNS ?? 100) },
    );
    // not vacuous: most random problems have a robust recipe
    expect(solved).toBeGreaterThan(tried / 4);
  });
});
