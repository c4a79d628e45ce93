/**
 * The numbers behind the batch-distribution chart: the model's density of batch ν40 and the seeded
 * Monte Carlo's histogram, on a common ν40 range that covers the ISO band and 99.9 % of the batches.
 */
import { kv40Density, kv40Quantile, type Kv40Distribution } from '../../core/qc/lot-spread';
import type { DensityPoint } from './live';

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
  const lo = Math.min(band.min, kv40Quantile(dist, 0.0005));
  const hi = Math.max(band.max, kv40Quantile(dist, 0.9995));
  const curve: DensityPoint[] = [];
  for (let k = 0; k <= 160; k++) {
    const kv = lo + ((hi - lo) * k) / 160;
    curve.push({ kv, y: kv40Density(dist, kv) });
  }
  const width = (hi - lo) / bins;
  const counts = new Array<number>(bins).fill(0);
  for (let i = 0; i < samples.length; i++) {
    const b = Math.floor((samples[i]! - lo) / width);
    if (b >= 0 && b < bins) counts[b]!++;
  }
  const n = Math.max(1, samples.length);
  const histogram: DensityPoint[] = counts.map((c, b) => ({ kv: lo + b * width, y: c / (n * width) }));
  histogram.push({ kv: hi, y: 0 });
  return { curve, histogram };
}
