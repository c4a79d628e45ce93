/**
 * The numbers behind the batch-distribution chart: the model's density of batch ν40 and the seeded
 * Monte Carlo's histogram, on a common ν40 range that covers the ISO band and 99.9 % of the batches.
 */
import { kv40Density, kv40Quantile, type Kv40Distribution } from '../../core/qc/lot-spread';
import type { DensityPoint } from './live';

/**
 * The histogram's bin edges: `bins` equal steps over the range that covers the band and the model's
 * 0.05–99.95 % quantiles of batch ν40 [mm²/s].
 *
 * @param dist - the batch's ν40 distribution (σ > 0)
 * @param band - a band that must stay in view [mm²/s] (the ISO band)
 * @param bins - histogram bins across the range (default 40)
 * @returns bins + 1 ascending edges [mm²/s]
 */
export function distributionEdges(dist: Kv40Distribution, band: { min: number; max: number }, bins = 40): number[] {
  const lo = Math.min(band.min, kv40Quantile(dist, 0.0005));
  const hi = Math.max(band.max, kv40Quantile(dist, 0.9995));
  const width = (hi - lo) / bins;
  const edges: number[] = [];
  for (let b = 0; b < bins; b++) edges.push(lo + b * width);
  edges.push(hi);
  return edges;
}

/**
 * Curve and histogram for {@link BatchDistributionChart} from batches already counted per bin (e.g.
 * by `countBlendedLots` over {@link distributionEdges}).
 *
 * @param dist - the batch's ν40 distribution (σ > 0)
 * @param edges - the bins' edges [mm²/s] (from {@link distributionEdges})
 * @param counts - batches per bin (one fewer than the edges)
 * @param total - batches simulated (those outside the range included)
 * @returns the density curve (160 points over the range) and the histogram outline, both per mm²/s
 */
export function batchDistributionFromCounts(
  dist: Kv40Distribution,
  edges: readonly number[],
  counts: ArrayLike<number>,
  total: number,
): { curve: DensityPoint[]; histogram: DensityPoint[] } {
  const lo = edges[0]!;
  const hi = edges[edges.length - 1]!;
  const curve: DensityPoint[] = [];
  for (let k = 0; k <= 160; k++) {
    const kv = lo + ((hi - lo) * k) / 160;
    curve.push({ kv, y: kv40Density(dist, kv) });
  }
  const width = (hi - lo) / counts.length;
  const n = Math.max(1, total);
  const histogram: DensityPoint[] = [];
  for (let b = 0; b < counts.length; b++) histogram.push({ kv: edges[b]!, y: counts[b]! / (n * width) });
  histogram.push({ kv: hi, y: 0 });
  return { curve, histogram };
}

/**
 * Curve and histogram for {@link BatchDistributionChart}.
 *
 * @param dist - the batch's ν40 distribution (σ > 0)
 * @param band - a band that must stay in view [mm²/s] (the ISO band)
 * @param samples - simulated batch ν40 values [mm²/s]
 * @param bins - histogram bins across the range (default 40)
 * @returns the density curve (160 points) and the histogram outline, both per mm²/s
 */
export function batchDistributionData(
  dist: Kv40Distribution,
  band: { min: number; max: number },
  samples: ArrayLike<number>,
  bins = 40,
): { curve: DensityPoint[]; histogram: DensityPoint[] } {
  const edges = distributionEdges(dist, band, bins);
  const lo = edges[0]!;
  const width = (edges[bins]! - lo) / bins;
  const counts = new Array<number>(bins).fill(0);
  for (let i = 0; i < samples.length; i++) {
    const b = Math.floor((samples[i]! - lo) / width);
    if (b >= 0 && b < bins) counts[b]!++;
  }
  return batchDistributionFromCounts(dist, edges, counts, samples.length);
}
