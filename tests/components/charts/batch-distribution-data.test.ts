import { describe, expect, it } from 'vitest';
import { batchDistributionData, batchDistributionFromCounts, distributionEdges } from '../../../src/components/charts/batch-distribution-data';
import { batchKv40Distribution } from '../../../src/core/qc/lot-spread';
import { countBlendedLots, monteCarloLots, blendLots } from '../../../src/core/qc/monte-carlo';

describe('batch-distribution chart data', () => {
  it('gives the same histogram from batches counted in the blending coordinate as from their ν40 values', () => {
    // Identity between two ways of binning the same simulated batches (no external value).
    const parts = [
      { massFraction: 0.45, kv40: 100, kv40RelSd: 0.03, density15: 0.88 },
      { massFraction: 0.55, kv40: 460, kv40RelSd: 0.04, density15: 0.9 },
    ];
    const dist = batchKv40Distribution(parts);
    const iso = { min: 198, max: 242 };
    const lots = monteCarloLots(parts, { samples: 4000, seed: 1 });
    const fromSamples = batchDistributionData(dist, iso, blendLots(lots, parts).samples);
    const edges = distributionEdges(dist, iso);
    expect(edges.length).toBe(41);
    const counted = countBlendedLots(lots, parts, edges, iso);
    const fromCounts = batchDistributionFromCounts(dist, edges, counted.counts, counted.samples);
    expect(fromCounts.curve).toEqual(fromSamples.curve);
    expect(fromCounts.histogram.map((p) => p.kv)).toEqual(fromSamples.histogram.map((p) => p.kv));
    // densities to rounding (the bin width is worked out from the same range in both)
    fromCounts.histogram.forEach((p, k) => expect(p.y).toBeCloseTo(fromSamples.histogram[k]!.y, 12));
    // a density: the histogram's area is the share of batches inside the range (at most 1)
    const width = (edges[40]! - edges[0]!) / 40;
    const area = fromCounts.histogram.slice(0, 40).reduce((s, p) => s + p.y * width, 0);
    expect(area).toBeGreaterThan(0.99);
    expect(area).toBeLessThanOrEqual(1 + 1e-12);
  });
});
