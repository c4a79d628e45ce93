/**
 * A seeded Monte Carlo of batch ν40 under lot-to-lot spread — the check of the linearised model in
 * `lot-spread.ts`. Each sample draws every stock's lot ν40ᵢ·(1 + εᵢ), εᵢ ~ N(0, sᵢ²), and blends the
 * lots with the EXACT mixing rule (Refutas on mass fractions, or ASTM D7152 on volume fractions), with
 * no linearisation.
 *
 * Pure: the random numbers come from a deterministic generator that is a function of the seed only
 * (the same seed gives the same samples on every machine), so the core stays free of randomness.
 *
 * Generator: mulberry32 (a 32-bit multiply–xorshift generator, public domain; period 2³²), with
 * normal deviates by the Box–Muller transform (Box & Muller 1958, Ann. Math. Statist. 29:610).
 * Good enough for a visual check and a 10⁵-sample agreement test; not for cryptography.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError, assertFinite } from '../errors';
import { blendCoordinates } from '../solver/coordinates';
import { batchKv40Distribution, partWeight, type SpreadPart } from './lot-spread';

/**
 * A deterministic stream of uniform numbers in [0, 1) from a 32-bit seed (mulberry32).
 *
 * @param seed - any integer (taken modulo 2³²)
 * @returns a function returning the next number of the stream
 * @example const u = seededUniform(42); u(); u(); // the same two numbers for seed 42, every time
 */
export function seededUniform(seed: number): () => number {
  assertFinite('seededUniform', 'seed', seed);
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A deterministic stream of standard normal deviates (Box–Muller on {@link seededUniform}).
 *
 * @param seed - any integer
 * @returns a function returning the next N(0, 1) deviate
 */
export function seededNormal(seed: number): () => number {
  const u = seededUniform(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u1 = u();
    while (u1 <= 0) u1 = u();
    const r = Math.sqrt(-2 * Math.log(u1));
    const th = 2 * Math.PI * u();
    spare = r * Math.sin(th);
    return r * Math.cos(th);
  };
}

/** Result of {@link monteCarloKv40}. */
export interface MonteCarloKv40 {
  /** ν40 of each simulated batch [mm²/s], in the order drawn. */
  samples: Float64Array;
  /** The seed used (repeat it to get the same samples). */
  seed: number;
}

/** The checks and set-up shared by the simulations: the method, the sample count and the used parts. */
function simulation(fn: string, parts: readonly SpreadPart[], options: { samples?: number; seed?: number; method?: BlendMethod }) {
  const method = options.method ?? 'refutas';
  batchKv40Distribution(parts, method); // validation
  const n = options.samples ?? 10_000;
  if (!Number.isInteger(n) || n < 1 || n > 10_000_000) {
    throw new BlendbenchInputError('samples', n, `${fn}: samples = ${n}; give a whole number from 1 to 10,000,000`);
  }
  const co = blendCoordinates(method);
  const used = parts.filter((p) => p.massFraction > 0);
  // Blending weights: mass fractions (Refutas), w/ρ (D7152: volume fractions) or Wright's w/(ρB), normalised below by their sum.
  const cw = used.map((p) => partWeight(method, p.kv40, p.density15, p.kv100) * p.massFraction);
  return { method, n, seed: options.seed ?? 1, co, used, cw, sc: cw.reduce((s, v) => s + v, 0) };
}

/**
 * Draws the lots of `n` batches in order (batch by batch, stock by stock) and hands each lot's blending
 * coordinate X(ν40ᵢ·(1 + εᵢ)) to `take`. One stream for {@link monteCarloKv40} and {@link monteCarloLots},
 * so both draw the very same lots from a seed.
 */
function drawLots(used: readonly SpreadPart[], n: number, seed: number, toX: (kv: number) => number, take: (k: number, i: number, x: number) => void): void {
  const normal = seededNormal(seed);
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < used.length; i++) {
      const p = used[i]!;
      let kv = p.kv40 * (1 + p.kv40RelSd * normal());
      while (!(kv > 0.3)) kv = p.kv40 * (1 + p.kv40RelSd * normal());
      take(k, i, toX(kv));
    }
  }
}

/**
 * Simulate batches of a recipe: each stock's lot ν40ᵢ·(1 + εᵢ) with εᵢ ~ N(0, sᵢ²), blended by the
 * exact rule. A lot whose drawn ν40 would not be above 0.3 mm²/s (ε < −1 + …, impossible at the
 * spreads accepted, ≤ 25 %) is drawn again.
 *
 * @param parts - the recipe's parts (as for `batchKv40Distribution`; validated the same way)
 * @param options - `samples` (1–10⁷, default 10 000), `seed` (default 1), `method` (default 'refutas')
 * @returns the simulated batch ν40 values [mm²/s]
 * @throws the errors of `batchKv40Distribution`; BlendbenchInputError for a bad sample count
 */
export function monteCarloKv40(
  parts: readonly SpreadPart[],
  options: { samples?: number; seed?: number; method?: BlendMethod } = {},
): MonteCarloKv40 {
  const { n, seed, co, used, cw, sc } = simulation('monteCarloKv40', parts, options);
  const samples = new Float64Array(n);
  const last = used.length - 1;
  let x = 0;
  drawLots(used, n, seed, co.toXRaw, (k, i, xi) => {
    x += cw[i]! * xi;
    if (i === last) {
      samples[k] = co.toKvRaw(x / sc);
      x = 0;
    }
  });
  return { samples, seed };
}

/**
 * The drawn lots of a simulation, kept so that the same batches can be blended again at other
 * fractions of the same stocks (a recipe being edited) without drawing again: see {@link blendLots}.
 */
export interface MonteCarloLots {
  /** The blending coordinate X of every drawn lot, batch by batch: `x[k·parts + i]` is stock i of batch k. */
  x: Float64Array;
  /** Batches drawn. */
  samples: number;
  /** Stocks per batch (the parts with a mass fraction above 0, in the order given). */
  parts: number;
  seed: number;
  method: BlendMethod;
}

/**
 * Draws the lots of a simulation (the same lots, from the same seed, as {@link monteCarloKv40}) and
 * keeps each lot's blending coordinate X (Refutas: VBN; ASTM D7152: log log(ν + 0.7)). The lots
 * depend on the stocks (ν40ᵢ, sᵢ), the seed and the method, not on the fractions.
 *
 * @param parts - the recipe's parts (validated as for `batchKv40Distribution`); parts at 0 % draw no lot
 * @param options - `samples` (1–10⁷, default 10 000), `seed` (default 1), `method` (default 'refutas')
 * @returns the drawn lots, samples × used parts coordinates (8 bytes each)
 * @throws as {@link monteCarloKv40}
 */
export function monteCarloLots(
  parts: readonly SpreadPart[],
  options: { samples?: number; seed?: number; method?: BlendMethod } = {},
): MonteCarloLots {
  const { method, n, seed, co, used } = simulation('monteCarloLots', parts, options);
  const m = used.length;
  const x = new Float64Array(n * m);
  drawLots(used, n, seed, co.toXRaw, (k, i, xi) => {
    x[k * m + i] = xi;
  });
  return { x, samples: n, parts: m, seed, method };
}

/**
 * Blends drawn lots at a recipe's fractions by the exact rule: batch k's ν40 = X⁻¹(Σ cᵢXₖᵢ / Σ cᵢ),
 * cᵢ = wᵢ (Refutas) or wᵢ/ρᵢ (D7152). With the fractions the lots were drawn for, the result equals
 * {@link monteCarloKv40}'s to the last bit (same lots, same sums in the same order).
 *
 * @param lots - from {@link monteCarloLots}, drawn for the same stocks in the same order
 * @param parts - the recipe's parts at the fractions wanted (the parts above 0 % must be the stocks the lots were drawn for)
 * @returns the simulated batch ν40 values [mm²/s]
 * @throws the errors of `batchKv40Distribution`; BlendbenchInputError when the stocks above 0 % do not match the lots
 */
export function blendLots(lots: MonteCarloLots, parts: readonly SpreadPart[]): MonteCarloKv40 {
  const { co, used, cw, sc } = simulation('blendLots', parts, { samples: lots.samples, seed: lots.seed, method: lots.method });
  const m = used.length;
  if (m !== lots.parts) {
    throw new BlendbenchInputError('parts', m, `blendLots: ${m} stocks above 0 %, but the lots were drawn for ${lots.parts}; draw the lots again`);
  }
  const { x, samples: n } = lots;
  const samples = new Float64Array(n);
  for (let k = 0, o = 0; k < n; k++, o += m) {
    let s = 0;
    for (let i = 0; i < m; i++) s += cw[i]! * x[o + i]!;
    samples[k] = co.toKvRaw(s / sc);
  }
  return { samples, seed: lots.seed };
}

/** Result of {@link countBlendedLots}. */
export interface BlendedLotCounts {
  /** Batches per ν40 interval [edgesₖ, edgesₖ₊₁) (one fewer than the edges). */
  counts: Float64Array;
  /** Batches with ν40 inside the band [min, max] (inclusive). */
  inBand: number;
  /** Batches blended. */
  samples: number;
}

/**
 * Blends drawn lots at a recipe's fractions, as {@link blendLots} does, and counts the batches per ν40
 * interval and inside a band WITHOUT turning each batch back into ν40: the blending coordinate X is
 * increasing in ν for both rules (Refutas: VBN = 14.534 ln ln(ν + 0.8) + 10.975; ASTM D7152:
 * log₁₀ log₁₀ Z(ν)), so ν ∈ [a, b) ⇔ X ∈ [X(a), X(b)). The edges are turned into X once, and each batch's
 * X̄ = Σ cᵢXₖᵢ / Σ cᵢ is placed by a binary search over them: no exponential (Refutas) or inverse
 * iteration (D7152) per batch. The counts equal binning {@link blendLots}'s ν40 values except for a batch
 * within rounding (about 1e-15 relative) of an edge.
 *
 * @param lots - from {@link monteCarloLots}, drawn for the same stocks in the same order
 * @param parts - the recipe's parts at the fractions wanted (as for {@link blendLots})
 * @param edges - ascending ν40 interval edges [mm²/s]; an edge the rule cannot take (at or below its
 *   lowest ν) counts as −∞
 * @param band - `min`, `max` [mm²/s], counted inclusive of both ends (as {@link shareInBand})
 * @returns counts per interval and in the band, and the number of batches
 * @throws as {@link blendLots}; BlendbenchInputError when the edges are not ascending
 */
export function countBlendedLots(
  lots: MonteCarloLots,
  parts: readonly SpreadPart[],
  edges: readonly number[],
  band: { min: number; max: number },
): BlendedLotCounts {
  const { co, used, cw, sc } = simulation('countBlendedLots', parts, { samples: lots.samples, seed: lots.seed, method: lots.method });
  const m = used.length;
  if (m !== lots.parts) {
    throw new BlendbenchInputError('parts', m, `countBlendedLots: ${m} stocks above 0 %, but the lots were drawn for ${lots.parts}; draw the lots again`);
  }
  const toX = (kv: number) => (co.acceptsKv(kv) ? co.toXRaw(kv) : Number.NEGATIVE_INFINITY);
  const ex = edges.map((e, k) => {
    assertFinite('countBlendedLots', 'edges', e);
    if (k > 0 && !(e > edges[k - 1]!)) throw new BlendbenchInputError('edges', e, `countBlendedLots: edge ${k} (${e}) is not above the one before; give ascending ν40 edges`);
    return toX(e);
  });
  const bMin = toX(band.min);
  const bMax = toX(band.max);
  const bins = Math.max(0, ex.length - 1);
  const counts = new Float64Array(bins);
  const { x, samples: n } = lots;
  // The same sums in the same order as blendLots, so X̄ is the very number blendLots turns into ν40.
  let inBand = 0;
  for (let k = 0, o = 0; k < n; k++, o += m) {
    let s = 0;
    for (let i = 0; i < m; i++) s += cw[i]! * x[o + i]!;
    const v = s / sc;
    if (v >= bMin && v <= bMax) inBand++;
    if (bins === 0 || !(v >= ex[0]!) || !(v < ex[bins]!)) continue;
    // The last edge at or below v: ex[lo] ≤ v < ex[hi].
    let lo = 0;
    let hi = bins;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (v >= ex[mid]!) lo = mid;
      else hi = mid;
    }
    counts[lo]!++;
  }
  return { counts, inBand, samples: n };
}

/**
 * Share of simulated batches inside a band [min, max] (inclusive).
 *
 * @param samples - from {@link monteCarloKv40}
 * @param band - `min`, `max` [mm²/s]
 * @returns fraction 0–1
 */
export function shareInBand(samples: ArrayLike<number>, band: { min: number; max: number }): number {
  let k = 0;
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i]!;
    if (v >= band.min && v <= band.max) k++;
  }
  return samples.length === 0 ? 0 : k / samples.length;
}
