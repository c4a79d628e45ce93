/**
 * Lot-to-lot spread of the stocks' ν40 and the probability that a batch lands in a ν40 band.
 *
 * ## Model
 * Each lot of stock i has ν40ᵢ·(1 + εᵢ), with εᵢ ~ N(0, sᵢ²) independent (sᵢ the relative standard
 * deviation of the stock's ν40 from lot to lot). The blend is made at the recipe's mass fractions wᵢ.
 * The mixing rule is linear in a transformed viscosity X (Refutas: X = VBN, mass fractions; ASTM D7152:
 * X = log log(ν + 0.7), volume fractions; see `solver/coordinates.ts`), and each stock's X is
 * linearised in εᵢ:  X(ν40ᵢ(1 + εᵢ)) ≈ Xᵢ + X′(ν40ᵢ)·ν40ᵢ·εᵢ. So the batch's X is normal with
 *
 *   μ = Σ cᵢwᵢXᵢ / Σ cᵢwᵢ,    σ = √Σ (cᵢwᵢ·gᵢ)² / Σ cᵢwᵢ,    gᵢ = X′(ν40ᵢ)·ν40ᵢ·sᵢ
 *
 * (cᵢ = 1 for Refutas, so μ = Σ wᵢ·VBNᵢ and σ = √Σ (wᵢ·VBN′(ν40ᵢ)·ν40ᵢ·sᵢ)²; cᵢ = 1/ρᵢ for D7152), and
 *
 *   P(ν_a ≤ ν40 ≤ ν_b) = Φ((b − μ)/σ) − Φ((a − μ)/σ),    a = X(ν_a), b = X(ν_b)
 *
 * (X is increasing in ν, so the band in ν maps to [a, b] exactly). With σ = 0 the batch is certain:
 * P = 1 inside the band, 0 outside. The linearisation is checked against a Monte Carlo of the exact
 * rule in the tests (`monte-carlo.ts`); it holds to about 0.01 for spreads up to 5–10 %.
 *
 * The defaults per category are Blendbench's own common-practice figures (no published source):
 * the user should replace them with the plant's own lot records.
 */
import type { ComponentCategory } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError, ViscosityOrderError, assertDensity15, assertFinite, assertViscosity } from '../errors';
import { blendCoordinates } from '../solver/coordinates';
import { normalCdfRaw, normalPdfRaw, standardNormalQuantile } from './normal';

/**
 * Default lot-to-lot relative standard deviation of ν40 per category [%] — common practice, no
 * published source: hydroprocessed and synthetic stocks are made to tight viscosity windows; solvent
 * refined heavy stocks, Group V specialities, polymers and additive packages vary more.
 */
export const DEFAULT_KV40_LOT_SPREAD_PCT: Readonly<Record<ComponentCategory, number>> = {
  'group-i': 2.5,
  'group-ii': 1.5,
  'group-iii': 1.5,
  'group-iv': 1.0,
  'group-v': 2.0,
  polymer: 3.0,
  'additive-package': 3.0,
};

/** Largest lot spread Blendbench accepts [%]: beyond it ν40·(1 + ε) may turn negative (4σ at 25 %). */
export const MAX_KV40_LOT_SPREAD_PCT = 25;

/**
 * A stock's lot-to-lot spread of ν40: its own value, or the category's common-practice default.
 *
 * @param c - `category`, and `kv40LotSpreadPct` [%] (null or absent → the default)
 * @returns relative standard deviation of ν40 [%]
 * @example kv40LotSpreadPct({ category: 'group-ii', kv40LotSpreadPct: null }) // → 1.5
 */
export function kv40LotSpreadPct(c: { category: ComponentCategory; kv40LotSpreadPct?: number | null }): number {
  return c.kv40LotSpreadPct ?? DEFAULT_KV40_LOT_SPREAD_PCT[c.category];
}

/** One part of a batch for the spread model. */
export interface SpreadPart {
  /** Mass fraction wᵢ, 0–1 (the parts sum to 1). */
  massFraction: number;
  /** ν40 used for blending [mm²/s] (the effective value of a calibrated stock). */
  kv40: number;
  /** Lot-to-lot relative standard deviation of ν40, as a FRACTION (0.02 = 2 %), 0–0.25. */
  kv40RelSd: number;
  /** Density at 15 °C [kg/L] (used by the volume-basis rules only). */
  density15: number;
  /**
   * ν100 [mm²/s] (below kv40): the D7152 Wright rule weighs each part by 1/(ρ·B), B the slope of its own
   * D341 line, so it needs ν100 as well. Absent → the part is weighed by 1/ρ (the plain ASTM rule).
   */
  kv100?: number;
}

/** The batch's ν40 distribution in blending coordinates (normal in X). */
export interface Kv40Distribution {
  method: BlendMethod;
  /** μ, mean blending coordinate X of the batch. */
  meanX: number;
  /** σ, standard deviation of the batch's X (0 when no part varies). */
  sdX: number;
  /** ν40 at μ [mm²/s] — the median batch (the nominal prediction of the recipe). */
  medianKv40: number;
}

/**
 * Per-part numbers of the model: cᵢ (basis weight), Xᵢ and gᵢ = X′(ν40ᵢ)·ν40ᵢ·sᵢ.
 * X′(ν)·ν is the coordinates' change of X per unit relative change of ν (`perPct` × 100).
 * cᵢ is the rule's basis weight (`solver/coordinates.ts`): 1 (Refutas), 1/ρ (ASTM D7152), 1/(ρ·B)
 * (D7152 Wright, when ν100 is given; 1/ρ without it), the weights the solver and the prediction use.
 */
export function spreadCoefficients(
  method: BlendMethod,
  kv40: number,
  kv40RelSd: number,
  density15: number,
  kv100?: number,
): { c: number; x: number; g: number } {
  const co = blendCoordinates(method);
  return { c: partWeight(method, kv40, density15, kv100), x: co.toX(kv40), g: co.perPct(kv40) * 100 * kv40RelSd };
}

/** The basis weight cᵢ of a part under a rule: 1, 1/ρ, or Wright's 1/(ρ·B) when ν100 is known. */
export function partWeight(method: BlendMethod, kv40: number, density15: number, kv100?: number): number {
  const co = blendCoordinates(method);
  if (co.massBasis) return 1;
  return kv100 === undefined ? 1 / density15 : co.basisWeight(kv40, kv100, density15);
}

/** Throws unless a relative standard deviation is a finite fraction from 0 to 0.25. */
export function assertRelSd(fn: string, field: string, s: unknown): asserts s is number {
  assertFinite(fn, field, s);
  if (s < 0 || s > MAX_KV40_LOT_SPREAD_PCT / 100) {
    throw new BlendbenchInputError(
      field,
      s,
      `${fn}: ${field} = ${s}; a lot spread is a fraction from 0 to ${MAX_KV40_LOT_SPREAD_PCT / 100} (0.02 = 2 %)`,
    );
  }
}

/**
 * Distribution of a batch's ν40 under lot-to-lot spread of its stocks (see the model above).
 *
 *   μ = Σ cᵢwᵢXᵢ / Σ cᵢwᵢ,  σ = √Σ (cᵢwᵢgᵢ)² / Σ cᵢwᵢ,  gᵢ = X′(ν40ᵢ)·ν40ᵢ·sᵢ
 *
 * @param parts - the batch's parts ({@link SpreadPart}); mass fractions summing to 1 within 1e-6
 * @param method - mixing rule: 'refutas' (default, mass basis) or 'astm-d7152' (volume basis)
 * @returns μ, σ in blending coordinates and the median batch ν40 [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, ImplausibleDensityError, BlendbenchInputError
 *   (a fraction outside 0–1, fractions not summing to 1, a spread outside 0–0.25)
 * @example batchKv40Distribution([{ massFraction: 1, kv40: 100, kv40RelSd: 0.02, density15: 0.88 }])
 *   // → { meanX: 33.1962, sdX: 0.0625, medianKv40: 100 } (σ = 0.02 × 14.534·100/(100.8·ln 100.8))
 */
export function batchKv40Distribution(parts: readonly SpreadPart[], method: BlendMethod = 'refutas'): Kv40Distribution {
  const fn = 'batchKv40Distribution';
  if (!Array.isArray(parts) || parts.length === 0) throw new BlendbenchInputError('parts', parts, `${fn}: parts must be a non-empty list`);
  let sum = 0;
  let sc = 0;
  let sx = 0;
  let sg = 0;
  parts.forEach((p, i) => {
    assertFinite(fn, `parts[${i}].massFraction`, p.massFraction);
    if (p.massFraction < 0 || p.massFraction > 1) {
      throw new BlendbenchInputError(`parts[${i}].massFraction`, p.massFraction, `${fn}: parts[${i}].massFraction = ${p.massFraction}; a fraction must lie between 0 and 1`);
    }
    assertViscosity(fn, `parts[${i}].kv40`, p.kv40);
    assertRelSd(fn, `parts[${i}].kv40RelSd`, p.kv40RelSd);
    assertDensity15(fn, `parts[${i}].density15`, p.density15);
    if (p.kv100 !== undefined) {
      assertViscosity(fn, `parts[${i}].kv100`, p.kv100);
      if (p.kv100 >= p.kv40) throw new ViscosityOrderError(`parts[${i}].kv100`, p.kv100, `${fn}: parts[${i}].kv100 = ${p.kv100} mm²/s is not below parts[${i}].kv40 = ${p.kv40} mm²/s`);
    }
    sum += p.massFraction;
    if (p.massFraction === 0) return;
    const k = spreadCoefficients(method, p.kv40, p.kv40RelSd, p.density15, p.kv100);
    const cw = k.c * p.massFraction;
    sc += cw;
    sx += cw * k.x;
    sg += (cw * k.g) ** 2;
  });
  if (Math.abs(sum - 1) > 1e-6) {
    throw new BlendbenchInputError('parts', sum, `${fn}: the mass fractions add up to ${sum}, not 1`);
  }
  const meanX = sx / sc;
  return { method, meanX, sdX: Math.sqrt(sg) / sc, medianKv40: blendCoordinates(method).toKv(meanX) };
}

/**
 * Probability that a normal X with mean μ and standard deviation σ lies in [a, b]:
 * Φ((b − μ)/σ) − Φ((a − μ)/σ); for σ = 0, 1 if a ≤ μ ≤ b, else 0. No input checks (hot path).
 *
 * @param meanX - μ
 * @param sdX - σ ≥ 0
 * @param a - lower end, b - upper end (a ≤ b), same coordinates as μ
 * @returns probability 0–1
 */
export function probabilityInInterval(meanX: number, sdX: number, a: number, b: number): number {
  if (!(sdX > 0)) return meanX >= a && meanX <= b ? 1 : 0;
  // Φ(β) − Φ(α) computed on the side of the smaller tails, so a probability near 1 keeps its digits.
  const alpha = (a - meanX) / sdX;
  const beta = (b - meanX) / sdX;
  if (alpha > 0) return normalCdfRaw(-alpha) - normalCdfRaw(-beta);
  if (beta < 0) return normalCdfRaw(beta) - normalCdfRaw(alpha);
  return 1 - normalCdfRaw(alpha) - normalCdfRaw(-beta);
}

/**
 * Probability that a batch's ν40 lands in a band (the model above).
 *
 * @param dist - from {@link batchKv40Distribution}
 * @param band - `min`, `max` [mm²/s], min ≤ max (e.g. the ISO 3448 band, or the plant's aim ± tolerance)
 * @returns P(min ≤ ν40 ≤ max), 0–1
 * @throws InvalidNumberError, NonPositiveViscosityError; BlendbenchInputError when min > max
 * @example kv40InBandProbability(batchKv40Distribution([{ massFraction: 1, kv40: 100, kv40RelSd: 0.02, density15: 0.88 }]),
 *   { min: 90, max: 110 }) // → 0.9999 (the band is ±10 %, about ±5σ in X)
 */
export function kv40InBandProbability(dist: Kv40Distribution, band: { min: number; max: number }): number {
  const fn = 'kv40InBandProbability';
  assertViscosity(fn, 'band.min', band.min);
  assertViscosity(fn, 'band.max', band.max);
  if (band.min > band.max) throw new BlendbenchInputError('band', band, `${fn}: band.min = ${band.min} is above band.max = ${band.max}`);
  const co = blendCoordinates(dist.method);
  return probabilityInInterval(dist.meanX, dist.sdX, co.toX(band.min), co.toX(band.max));
}

/**
 * The q-quantile of the batch's ν40 [mm²/s]: ν(μ + Φ⁻¹(q)·σ) (X is increasing in ν, so quantiles map).
 *
 * @param dist - from {@link batchKv40Distribution}
 * @param q - probability, strictly between 0 and 1
 * @returns ν40 [mm²/s] below which a fraction q of batches fall
 * @example kv40Quantile(dist, 0.5) // → dist.medianKv40
 */
export function kv40Quantile(dist: Kv40Distribution, q: number): number {
  const co = blendCoordinates(dist.method);
  return co.toKv(dist.meanX + standardNormalQuantile(q) * dist.sdX);
}

/**
 * Probability density of the batch's ν40 [per mm²/s] at ν: φ((X(ν) − μ)/σ)/σ · X′(ν)
 * (the change of variable from X to ν). Zero everywhere when σ = 0.
 *
 * @param dist - from {@link batchKv40Distribution}
 * @param kv - ν40 [mm²/s], > 0
 * @returns density [1/(mm²/s)]
 */
export function kv40Density(dist: Kv40Distribution, kv: number): number {
  if (!(dist.sdX > 0)) return 0;
  const co = blendCoordinates(dist.method);
  const z = (co.toX(kv) - dist.meanX) / dist.sdX;
  const dXdNu = co.perPct(kv) * 100 / kv;
  return (normalPdfRaw(z) / dist.sdX) * dXdNu;
}
