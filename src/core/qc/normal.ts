/**
 * The standard normal distribution: density φ, cumulative Φ and its inverse, through the
 * complementary error function.
 *
 *   φ(z) = exp(−z²/2)/√(2π),   Φ(z) = ½·erfc(−z/√2),   Φ⁻¹(p): Φ(z) = p
 *
 * erfc is computed to about 1e-15 relative: by the Maclaurin series of erf for |x| < 2.5
 * (Abramowitz & Stegun 1964, eq. 7.1.5) and by the continued fraction of erfc above (A&S eq. 7.1.14,
 * evaluated by the modified Lentz method), so Φ keeps its relative accuracy deep in the lower tail —
 * the probabilities of missing a band at 99.9 % need it.
 *
 * @see M. Abramowitz and I. A. Stegun (eds.), Handbook of Mathematical Functions, NBS 1964, ch. 7 and 26.
 */
import { BlendbenchInputError, assertFinite } from '../errors';

const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI);
const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

/** erfc(x) for x ≥ 0 without input checks (the inner loop of the probability). */
function erfcNonNegative(x: number): number {
  if (x < 2.5) {
    // erf(x) = 2/√π Σ (−1)ⁿ x^(2n+1) / (n! (2n+1))   (A&S 7.1.5); at most about 60 terms below 2.5.
    const x2 = x * x;
    let term = x;
    let sum = x;
    for (let n = 1; n < 120; n++) {
      term *= -x2 / n;
      const add = term / (2 * n + 1);
      sum += add;
      if (Math.abs(add) <= 1e-17 * Math.abs(sum)) break;
    }
    return 1 - TWO_OVER_SQRT_PI * sum;
  }
  if (x > 27) return 0; // exp(−x²) underflows a double
  // erfc(x) = exp(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …)))))   (A&S 7.1.14),
  // by the modified Lentz method: f = x + K(aₙ/x) with aₙ = n/2.
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let n = 1; n < 500; n++) {
    const a = n / 2;
    d = x + a * d;
    if (Math.abs(d) < tiny) d = tiny;
    d = 1 / d;
    c = x + a / c;
    if (Math.abs(c) < tiny) c = tiny;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return (Math.exp(-x * x) * INV_SQRT_PI) / f;
}

/**
 * Complementary error function erfc(x) = 1 − erf(x) = (2/√π)∫ₓ^∞ exp(−t²) dt.
 *
 * @param x - any finite number (erfc(−x) = 2 − erfc(x))
 * @returns erfc(x), 0–2, about 1e-15 relative
 * @throws InvalidNumberError if x is not finite
 * @example erfc(1) // → 0.157299207050285 (1 − erf(1), A&S Table 7.1)
 */
export function erfc(x: number): number {
  assertFinite('erfc', 'x', x);
  return x >= 0 ? erfcNonNegative(x) : 2 - erfcNonNegative(-x);
}

/** Φ(z) without input checks; ±Infinity allowed (Φ(−∞) = 0, Φ(∞) = 1). */
export function normalCdfRaw(z: number): number {
  if (z === Number.POSITIVE_INFINITY) return 1;
  if (z === Number.NEGATIVE_INFINITY) return 0;
  const x = -z / Math.SQRT2;
  return 0.5 * (x >= 0 ? erfcNonNegative(x) : 2 - erfcNonNegative(-x));
}

/** φ(z) without input checks. */
export function normalPdfRaw(z: number): number {
  return INV_SQRT_2PI * Math.exp(-0.5 * z * z);
}

/**
 * Standard normal cumulative distribution Φ(z) = ½·erfc(−z/√2).
 *
 * @param z - standard score [dimensionless], any number; ±Infinity give 0 and 1
 * @returns Φ(z), 0–1
 * @throws InvalidNumberError if z is NaN
 * @example standardNormalCdf(1.959963984540054) // → 0.975 (A&S Table 26.1)
 */
export function standardNormalCdf(z: number): number {
  if (Number.isNaN(z) || typeof z !== 'number') assertFinite('standardNormalCdf', 'z', z);
  return normalCdfRaw(z);
}

/**
 * Standard normal density φ(z) = exp(−z²/2)/√(2π).
 *
 * @param z - standard score [dimensionless]
 * @returns φ(z) [per unit z]
 * @throws InvalidNumberError if z is not finite
 * @example standardNormalPdf(0) // → 0.3989422804014327
 */
export function standardNormalPdf(z: number): number {
  assertFinite('standardNormalPdf', 'z', z);
  return normalPdfRaw(z);
}

/**
 * Standard normal quantile Φ⁻¹(p): the z with Φ(z) = p, solved by Newton's method on Φ from a
 * logistic first guess, finished by bisection safeguards (to about 1e-14 in z).
 *
 * @param p - probability, strictly between 0 and 1
 * @returns z [dimensionless]
 * @throws BlendbenchInputError unless 0 < p < 1
 * @example standardNormalQuantile(0.99) // → 2.326347874 (A&S Table 26.1)
 */
export function standardNormalQuantile(p: number): number {
  assertFinite('standardNormalQuantile', 'p', p);
  if (!(p > 0 && p < 1)) {
    throw new BlendbenchInputError('p', p, `standardNormalQuantile: p = ${p}; it must lie strictly between 0 and 1`);
  }
  // Work on the lower half for accuracy (Φ⁻¹(p) = −Φ⁻¹(1 − p)).
  if (p > 0.5) return -lowerQuantile(1 - p);
  return lowerQuantile(p);
}

/** Φ⁻¹(q) for 0 < q ≤ 0.5 (result ≤ 0). */
function lowerQuantile(q: number): number {
  if (q === 0.5) return 0;
  // Bracket [lo, hi] with Φ(lo) ≤ q ≤ Φ(hi); Newton steps kept inside it.
  let lo = -40;
  let hi = 0;
  let z = Math.max(lo, -Math.sqrt(-2 * Math.log(q)) + 0.7); // rough first guess
  for (let k = 0; k < 100; k++) {
    const f = normalCdfRaw(z) - q;
    if (f > 0) hi = z;
    else lo = z;
    const pdf = normalPdfRaw(z);
    let next = pdf > 0 ? z - f / pdf : (lo + hi) / 2;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - z) <= 1e-14 * Math.max(1, Math.abs(z))) return next;
    z = next;
  }
  return z;
}
