/**
 * The minimum-VI condition in the solver's blending coordinates, and its linear relaxations.
 *
 * ASTM D2270: at fixed Y = ν100 the viscosity index falls as U = ν40 rises (procedure A is linear
 * and decreasing in U; in procedure B, N = (log H − log U)/log Y decreases in U), and both
 * procedures meet at VI = 100 when U = H. Hence, for a minimum VI m,
 *
 *   VI(U, Y) ≥ m   ⇔   U ≤ U_max(Y),
 *   U_max(Y) = L − (m/100)·(L − H)                      for m ≤ 100 (procedure A solved for U)
 *   U_max(Y) = H / Y^N,  N = log₁₀(1 + 0.00715·(m − 100))   for m > 100 (procedure B solved for U)
 *
 * with L(Y), H(Y) from Table 1 / the D2270 equations (`referenceViscosities`). U_max rises with Y,
 * so in blending coordinates X (see `coordinates.ts`) the condition is
 *
 *   X40 ≤ g(X100) = X(U_max(ν(X100)))   ⇔   X100 ≥ h(X40) = g⁻¹(X40).
 *
 * X40 and X100 of a blend are linear (Refutas) or linear-fractional (D7152) in the mass fractions,
 * but h is not linear: over the whole viscosity range it is concave, with small convex stretches
 * between the rows of Table 1 (linear interpolation there). The feasible set is therefore not
 * convex and the condition cannot be one LP row. The solver handles it exactly by a
 * one-dimensional branch and bound on X40 (see `engine.ts`): on an interval [a, b] of X40 the chord
 * of h through (a, h(a)) and (b, h(b)), lowered by the largest amount δ by which it exceeds h on
 * [a, b], is a valid linear under-estimator of h:
 *
 *   X100 ≥ h(a) − δ + β·(X40 − a),   β = (h(b) − h(a))/(b − a),
 *
 * so the LP with that row is a relaxation (its optimum is a bound on the true optimum), and the gap
 * between chord and curve shrinks with the square of the interval width as intervals are split.
 *
 * @see ASTM D2270 §7–§8 (procedures A and B), Table 1.
 */
import { D2270_KV100 as TABLE_KV100, D2270_L as TABLE_L, D2270_H as TABLE_H } from '../viscosity/d2270-table1';
import { VI_MIN_KV100, referenceViscositiesInto } from '../viscosity/viscosity-index';
import type { BlendCoordinates } from './coordinates';

/** A linear lower bound X100 ≥ alpha + beta·X40 valid on an interval of X40. */
export interface ViChord {
  alpha: number;
  beta: number;
}

// Local references to the Table 1 columns (one property look-up here, not one per access in the
// inner loops — module bindings can compile to getters under some loaders).
const D2270_KV100: Float64Array = TABLE_KV100;
const D2270_L: Float64Array = TABLE_L;
const D2270_H: Float64Array = TABLE_H;
const KV100_FLOOR: number = VI_MIN_KV100;

/**
 * L and H at Y without checks or allocation: `referenceViscositiesInto` of the D2270 module, the
 * one Table 1 look-up in the project (tests/core/solver/vi-boundary.test.ts checks it equals
 * `referenceViscosities` exactly).
 */
export const referenceLH = referenceViscositiesInto;

/** ln of the Table 1 columns Y and H (the row search of h for VI > 100). */
const LN_KV100 = D2270_KV100.map(Math.log);
const LN_H = D2270_H.map(Math.log);

/** L and H of one {@link ViBoundary.uMax} (module scratch memory: the core is synchronous). */
const LH = { L: 0, H: 0 };

/** X100 of ν100 = 2.0 mm²/s, per coordinate system. */
const FLOOR_X100 = new Map<BlendCoordinates, number>();

/** ln Y at the Table 1 rows and the quarter points between them (index 4r + q, as below). */
const QUARTER_LN_Y = new Float64Array(4 * (D2270_KV100.length - 1));
for (let r = 0; r < D2270_KV100.length - 1; r++) {
  const y0 = D2270_KV100[r] as number;
  const y1 = D2270_KV100[r + 1] as number;
  for (let q = 0; q < 4; q++) QUARTER_LN_Y[4 * r + q] = Math.log(y0 + 0.25 * q * (y1 - y0));
}

/** X of the Table 1 rows and the quarter points between them, per coordinate function (see below). */
const QUARTER_X = new Map<(kv: number) => number, Float64Array>();

/**
 * toXRaw(y) at y = y_r + (q/4)·(y_{r+1} − y_r) for every Table 1 row r and q = 0…3, at index 4r + q:
 * constants of the table and the mixing rule, computed once per coordinate function (not per
 * problem) with the same arithmetic as `relaxation`'s row loop, so the values are identical.
 */
function tableQuarterX(toXRaw: (kv: number) => number): Float64Array {
  let t = QUARTER_X.get(toXRaw);
  if (!t) {
    const rows = D2270_KV100.length;
    t = new Float64Array(4 * (rows - 1));
    for (let r = 0; r < rows - 1; r++) {
      const y0 = D2270_KV100[r] as number;
      const y1 = D2270_KV100[r + 1] as number;
      for (let q = 0; q < 4; q++) t[4 * r + q] = toXRaw(y0 + 0.25 * q * (y1 - y0));
    }
    QUARTER_X.set(toXRaw, t);
  }
  return t;
}

/** Number of evenly spaced curve samples (besides the Table 1 rows) used to bound the chord gap. */
const GAP_SAMPLES = 16;

/**
 * Curve samples of one {@link ViBoundary.relaxation} call (X100, X40), module scratch memory: at
 * most GAP_SAMPLES − 1 even samples plus four per Table 1 row interval.
 */
const SAMPLE_X100 = new Float64Array(GAP_SAMPLES + 4 * D2270_KV100.length);
const SAMPLE_X40 = new Float64Array(SAMPLE_X100.length);

export class ViBoundary {
  readonly minVi: number;
  readonly coords: BlendCoordinates;
  /** X100 of ν100 = 2.0 mm²/s, below which D2270 defines no VI. */
  readonly x100Min: number;
  /** g(x100Min): below this X40 only the ν100 ≥ 2.0 floor binds. */
  private readonly x40AtFloor: number;
  private readonly procedureBExponent: number;

  constructor(minVi: number, coords: BlendCoordinates) {
    this.minVi = minVi;
    this.coords = coords;
    let x100Min = FLOOR_X100.get(coords);
    if (x100Min === undefined) FLOOR_X100.set(coords, (x100Min = coords.toX(VI_MIN_KV100)));
    this.x100Min = x100Min;
    this.procedureBExponent = minVi > 100 ? Math.log10(1 + 0.00715 * (minVi - 100)) : 0;
    // g at the floor: U_max at Y = 2.0 mm²/s, the first row of Table 1.
    this.x40AtFloor = coords.toXRaw(this.uMaxRow(0));
  }

  /**
   * U_max(Y): the highest ν40 [mm²/s] that still gives VI ≥ minVi at ν100 = Y [mm²/s].
   * Procedure A or B solved for U (see the module comment).
   */
  uMax(kv100: number): number {
    referenceLH(kv100, LH);
    return this.uMaxOf(kv100, LH.L, LH.H);
  }

  /** U_max at Y = kv100 [mm²/s] from the reference viscosities L and H at that Y [mm²/s]. */
  private uMaxOf(kv100: number, L: number, H: number): number {
    const m = this.minVi;
    if (m <= 100) return L - (m / 100) * (L - H);
    // H / Y^N as H·exp(−N·ln Y): the same value to rounding, a third of the cost of a power.
    return H * Math.exp(-this.procedureBExponent * Math.log(kv100));
  }

  /** {@link uMaxOf} with ln Y given (Table 1 quarter points, whose logarithms are constants). */
  private uMaxOfLn(lnKv100: number, L: number, H: number): number {
    const m = this.minVi;
    if (m <= 100) return L - (m / 100) * (L - H);
    return H * Math.exp(-this.procedureBExponent * lnKv100);
  }

  /** g(X100) = X(U_max(ν(X100))): the largest blend X40 allowed at a blend X100. */
  g(x100: number): number {
    const y = Math.max(KV100_FLOOR, this.coords.toKvRaw(x100));
    return this.coords.toXRaw(this.uMax(y));
  }

  /**
   * h(X40) = g⁻¹(X40): the smallest blend X100 that satisfies the VI condition at X40.
   *
   * Explicit within ASTM D2270 Table 1 (ν100 ≤ 70 mm²/s): U_max is increasing in Y, so the row
   * interval [y_r, y_r+1] with U_max(y_r) ≤ U < U_max(y_r+1) is found by a binary search on the
   * rows (U = ν(X40)); inside it L and H are linear in Y (§7 interpolation), so for m ≤ 100
   * U_max = L − (m/100)(L − H) is linear in Y and Y follows directly; for m > 100,
   * H(Y) = U·Y^N is solved by Newton's method from that linear estimate (Y^N is smooth across a
   * row; two or three steps reach rounding). Above the table, m ≤ 100 makes U_max a quadratic in Y
   * (the D2270 equations), solved in closed form; m > 100 there falls back to a bracketed search.
   *
   * @param x40 - blend X40 (blending coordinate of ν40)
   * @returns X100 = X(Y) with VI(ν(X40), Y) = minVi, or X(2.0 mm²/s) where the ν100 floor binds
   */
  h(x40: number, below?: number): number {
    if (x40 <= this.x40AtFloor) return this.x100Min;
    const U = this.coords.toKvRaw(x40);
    const y = this.yForUMax(U);
    if (y > 0) return this.coords.toXRaw(y);
    return this.hSearch(x40, below);
  }

  /** U_max at Table 1 row r [mm²/s] (the row's own L and H). */
  private uMaxRow(r: number): number {
    const m = this.minVi;
    const L = D2270_L[r] as number;
    const H = D2270_H[r] as number;
    if (m <= 100) return L - (m / 100) * (L - H);
    return H * Math.exp(-this.procedureBExponent * (LN_KV100[r] as number));
  }

  /**
   * Y [mm²/s] with U_max(Y) = U [mm²/s], for U_max(2.0) ≤ U; −1 when the answer needs the search
   * (m > 100 above Table 1).
   */
  private yForUMax(U: number): number {
    const last = D2270_KV100.length - 1;
    const m = this.minVi;
    let uHi = this.uMaxRow(last);
    if (U > uHi) {
      if (m > 100) return -1;
      // U_max = A·Y² + B·Y + C with L, H the D2270 equations above 70 mm²/s (procedure A, k = m/100).
      const k = m / 100;
      const A = 0.8353 - k * (0.8353 - 0.1684);
      const B = 14.67 - k * (14.67 - 11.85);
      const C = -216 - k * (-216 + 97);
      const d = U - C;
      return Math.max(D2270_KV100[last] as number, (2 * d) / (B + Math.sqrt(B * B + 4 * A * d)));
    }
    // Largest row r with U_max(y_r) ≤ U (r < last).
    let lo = 0;
    let hi = last;
    let uLo = this.uMaxRow(0);
    if (U <= uLo) return KV100_FLOOR;
    if (m <= 100) {
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        const u = this.uMaxRow(mid);
        if (u <= U) {
          lo = mid;
          uLo = u;
        } else {
          hi = mid;
          uHi = u;
        }
      }
    } else {
      // U_max(y_r) ≤ U ⇔ ln H_r − N·ln y_r ≤ ln U: no power per probe.
      const lnU = Math.log(U);
      const N = this.procedureBExponent;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if ((LN_H[mid] as number) - N * (LN_KV100[mid] as number) <= lnU) lo = mid;
        else hi = mid;
      }
      uLo = this.uMaxRow(lo);
      uHi = this.uMaxRow(hi);
    }
    const y0 = D2270_KV100[lo] as number;
    const dy = (D2270_KV100[hi] as number) - y0;
    let f = (U - uLo) / (uHi - uLo);
    if (m > 100) {
      // Newton on F(f) = H0 + f·dH − U·(y0 + f·dy)^N, F' = dH − U·N·dy·Y^(N−1).
      const N = this.procedureBExponent;
      const H0 = D2270_H[lo] as number;
      const dH = (D2270_H[hi] as number) - H0;
      for (let k = 0; k < 6; k++) {
        const y = y0 + f * dy;
        const yn = Math.exp(N * Math.log(y));
        const step = (H0 + f * dH - U * yn) / (dH - (U * N * dy * yn) / y);
        f -= step;
        if (!(Math.abs(step) > 1e-15)) break;
      }
    }
    if (!(f >= 0)) f = 0;
    else if (f > 1) f = 1;
    return y0 + f * dy;
  }

  /**
   * h by a bracketed root search on g (Illinois, to 1e-12 relative): the fallback of {@link h}
   * above Table 1 for m > 100, and the reference the explicit form is tested against.
   *
   * @param below - optional X100 known to satisfy g(below) ≤ x40 (a warm start)
   */
  hSearch(x40: number, below?: number): number {
    if (x40 <= this.x40AtFloor) return this.x100Min;
    // Bracket [lo, hi] with g(lo) < x40 ≤ g(hi); g is increasing (ν100 up to ~1e6 mm²/s at most).
    // `below`, when given, is a known X100 with g(below) ≤ x40 (e.g. h at a smaller X40).
    let lo = this.x100Min;
    let flo = this.x40AtFloor - x40;
    let step = 1;
    if (below !== undefined && below > lo) {
      const f = this.g(below) - x40;
      if (f <= 0) {
        if (f === 0) return below;
        lo = below;
        flo = f;
        step = 0.25;
      }
    }
    let hi = lo + step;
    let fhi = this.g(hi) - x40;
    for (let k = 0; k < 60 && fhi < 0; k++) {
      lo = hi;
      flo = fhi;
      step *= 2;
      hi = lo + step;
      fhi = this.g(hi) - x40;
    }
    // Illinois (modified regula falsi): superlinear, always bracketed.
    let side = 0;
    for (let k = 0; k < 100 && hi - lo > 1e-12 * Math.max(1, Math.abs(hi)); k++) {
      let x = (lo * fhi - hi * flo) / (fhi - flo);
      if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
      const fx = this.g(x) - x40;
      if (fx === 0) return x;
      if (fx < 0) {
        lo = x;
        flo = fx;
        if (side === -1) fhi /= 2;
        side = -1;
      } else {
        hi = x;
        fhi = fx;
        if (side === 1) flo /= 2;
        side = 1;
      }
    }
    return hi;
  }

  /**
   * Linear under-estimators of h on [a, b] (X40 coordinates), given h(a) and h(b): lines
   * X100 ≥ alpha + beta·X40, each valid for every X40 in [a, b]:
   *
   * 1. the chord through (a, h(a)) and (b, h(b)), lowered by δ, the largest excess of the chord
   *    over h on [a, b];
   * 2. the steepest line through (a, h(a)) that stays below h on [a, b] — exact at a;
   * 3. the flattest line through (b, h(b)) that stays below h on [a, b] — exact at b.
   *
   * The excess and the slopes are taken over the curve at the Table 1 rows inside the interval
   * (where h has kinks) and at {@link GAP_SAMPLES} evenly spaced points; a small extra margin covers
   * the curvature between samples. Exactness at the ends means that a relaxed optimum at an end of
   * its interval already satisfies the VI condition.
   */
  relaxation(a: number, ha: number, b: number, hb: number): ViChord[] {
    if (!(b - a > 1e-12)) return [{ alpha: Math.min(ha, hb), beta: 0 }];
    const beta = (hb - ha) / (b - a);
    // Curve points (X100, X40) into the module's sample buffer, then one pass over them.
    const lo = Math.min(ha, hb);
    const hi = Math.max(ha, hb);
    let ns = 0;
    const yLo = this.coords.toKvRaw(lo);
    const yHi = this.coords.toKvRaw(hi);
    if (yLo < 70.0) {
      // Rows of Table 1 are the kinks of the interpolated L and H (binary search for the first);
      // h is convex between rows, so the chord's largest excess lies inside a row interval:
      // sample each row and the quarter points between rows.
      let i = 0;
      let j = D2270_KV100.length - 1;
      while (j - i > 1) {
        const mid = (i + j) >> 1;
        if ((D2270_KV100[mid] as number) <= yLo) i = mid;
        else j = mid;
      }
      // Within a row interval L and H are the linear interpolation of the two rows (the same
      // arithmetic as referenceLH), so the curve point is computed from Y directly.
      const { toXRaw } = this.coords;
      const rowX = tableQuarterX(toXRaw);
      for (let r = i; r < D2270_KV100.length - 1; r++) {
        const y0 = D2270_KV100[r] as number;
        if (y0 > yHi) break;
        const y1 = D2270_KV100[r + 1] as number;
        const L0 = D2270_L[r] as number;
        const H0 = D2270_H[r] as number;
        const dL = (D2270_L[r + 1] as number) - L0;
        const dH = (D2270_H[r + 1] as number) - H0;
        for (let q = 0; q < 4; q++) {
          const f = 0.25 * q;
          const y = y0 + f * (y1 - y0);
          if (!(y > yLo && y < yHi) || y < KV100_FLOOR) continue;
          SAMPLE_X100[ns] = rowX[4 * r + q] as number;
          SAMPLE_X40[ns++] = toXRaw(this.uMaxOfLn(QUARTER_LN_Y[4 * r + q] as number, L0 + f * dL, H0 + f * dH));
        }
      }
    }
    if (ns < GAP_SAMPLES) {
      // Few Table 1 rows inside (or none, above 70 mm²/s): evenly spaced samples as well.
      for (let k = 1; k < GAP_SAMPLES; k++) {
        const x100 = lo + ((hi - lo) * k) / GAP_SAMPLES;
        SAMPLE_X100[ns] = x100;
        SAMPLE_X40[ns++] = this.g(x100);
      }
    }
    // The chord's largest excess over the curve, and the extreme secant slopes from each end.
    let delta = 0;
    let slopeA = beta;
    let slopeB = beta;
    for (let k = 0; k < ns; k++) {
      const x40 = SAMPLE_X40[k] as number;
      if (!(x40 > a && x40 < b)) continue;
      const x100 = SAMPLE_X100[k] as number;
      const excess = ha + beta * (x40 - a) - x100;
      if (excess > delta) delta = excess;
      const sa = (x100 - ha) / (x40 - a);
      if (sa < slopeA) slopeA = sa;
      const sb = (hb - x100) / (b - x40);
      if (sb > slopeB) slopeB = sb;
    }
    // The end lines must also respect h's one-sided slopes at the ends (h is convex just inside
    // a row interval, so the smallest secant slope from a is its right-hand derivative there).
    const eps = 1e-7 * Math.max(1, Math.abs(hi - lo));
    const dA = this.g(ha + eps) - a; // Δx40 for Δx100 = eps at a
    if (dA > 0) slopeA = Math.min(slopeA, eps / dA);
    const dB = b - this.g(hb - eps);
    if (dB > 0) slopeB = Math.max(slopeB, eps / dB);
    // Margins for the curvature between samples: 5 % more excess, slopes eased by 1 %.
    const lines: ViChord[] = [{ alpha: ha - beta * a - delta * 1.05, beta }];
    if (delta > 0 || slopeA < beta || slopeB > beta) {
      const sA = slopeA - 0.01 * Math.abs(beta - slopeA);
      const sB = slopeB + 0.01 * Math.abs(slopeB - beta);
      lines.push({ alpha: ha - sA * a, beta: sA });
      lines.push({ alpha: hb - sB * b, beta: sB });
    }
    return lines;
  }
}
