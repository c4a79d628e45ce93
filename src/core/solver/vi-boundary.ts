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
import { blendCoordinates, type BlendCoordinates } from './coordinates';

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

/** Least number of sample triplets over an interval (more where Table 1 rows cut it). */
const GAP_TRIPLETS = 8;

/**
 * Curve samples of one {@link ViBoundary.relaxation} call (X100, X40, margin μ), module scratch
 * memory: the ends and the floor point, plus 2·(GAP_TRIPLETS + pieces) at most, one piece per
 * Table 1 row interval and one above the table.
 */
const SAMPLE_X100 = new Float64Array(4 + 2 * (GAP_TRIPLETS + D2270_KV100.length + 1));
const SAMPLE_X40 = new Float64Array(SAMPLE_X100.length);
const SAMPLE_MU = new Float64Array(SAMPLE_X100.length);
/** The triplets of one relaxation call: index of the first point and margin μ of each. */
const TRIPLET_K = new Int32Array(SAMPLE_X100.length);
const TRIPLET_MU = new Float64Array(SAMPLE_X100.length);
/** Excess of one line at each sample (scratch). */
const SAMPLE_E = new Float64Array(SAMPLE_X100.length);
let tripletCount = 0;

/**
 * Refutas (blending/refutas.ts): X(ν) = A·ln(ln(ν + C)) + B, hence with s = ν + C, ℓ = ln s > 0
 * (ν > 0.2 mm²/s):  X'(ν) = A/(s·ℓ) > 0 and X''(ν) = −A·(ℓ + 1)/(s²·ℓ²) < 0, both falling in
 * magnitude as ν rises (the facts the closed-form bounds of `relaxationInTable` rest on).
 */
const VBN_A = 14.534;
const VBN_B = 10.975;
const VBN_C = 0.8;
const ROWS = D2270_KV100.length;
const REFUTAS = blendCoordinates('refutas');
/** Refutas X100 of each Table 1 row (toXRaw, so identical to every other X of a row). */
const REFUTAS_ROW_X100: Float64Array = D2270_KV100.map((y) => REFUTAS.toXRaw(y));
/** Refutas X'(Y) and |X''(Y)| at each Table 1 row Y [per mm²/s, per (mm²/s)²]. */
const REFUTAS_ROW_DX = new Float64Array(ROWS);
const REFUTAS_ROW_DDX = new Float64Array(ROWS);
for (let r = 0; r < ROWS; r++) {
  const sy = (D2270_KV100[r] as number) + VBN_C;
  const ly = Math.log(sy);
  REFUTAS_ROW_DX[r] = VBN_A / (sy * ly);
  REFUTAS_ROW_DDX[r] = (VBN_A * (ly + 1)) / (sy * sy * ly * ly);
}
/**
 * Scratch of one `relaxationInTable` call (module memory: the core is synchronous): per Table 1
 * row from the one below the interval to the one above it, U_max, its X, 1/X'(U_max), |X''(U_max)|
 * and Y^−N; the curve points (the interval's ends and the rows inside); per piece between
 * consecutive points, bounds on h'' and h'.
 */
const ROW_U = new Float64Array(ROWS);
const ROW_X40 = new Float64Array(ROWS);
const ROW_DDXU = new Float64Array(ROWS);
/** 1/X'(U_max) at each row of the call [mm²/s]. */
const ROW_PU = new Float64Array(ROWS);
const ROW_YN = new Float64Array(ROWS);
const POINT_X40 = new Float64Array(ROWS + 2);
const POINT_X100 = new Float64Array(ROWS + 2);
const PIECE_H2_LO = new Float64Array(ROWS + 1);
const PIECE_H2_HI = new Float64Array(ROWS + 1);
const PIECE_H1_LO = new Float64Array(ROWS + 1);
const PIECE_H1_HI = new Float64Array(ROWS + 1);

/**
 * The largest amount by which a line can exceed h on piece k of the module's point buffer
 * (−(lower bound of h − line), the bounds of `relaxationInTable`); ≤ 0 where it cannot. When the
 * bound below the chord of φ already shows a deficit of −`enough` or less, that is returned without
 * the two Taylor bounds (they could only lower it further, and the caller does nothing with a
 * deficit below −enough).
 */
function pieceDeficit(line: ViChord, k: number, enough: number): number {
  const x0 = POINT_X40[k] as number;
  const x1 = POINT_X40[k + 1] as number;
  const f0 = (POINT_X100[k] as number) - (line.alpha + line.beta * x0);
  const f1 = (POINT_X100[k + 1] as number) - (line.alpha + line.beta * x1);
  const w = x1 - x0;
  const mHi = PIECE_H2_HI[k] as number;
  const mLo = PIECE_H2_LO[k] as number;
  let lb = Math.min(f0, f1) - (mHi > 0 ? (mHi * w * w) / 8 : 0);
  if (lb >= enough) return -lb;
  const left = quadraticMin(f0, (PIECE_H1_LO[k] as number) - line.beta, mLo, w);
  if (left > lb) lb = left;
  const right = quadraticMin(f1, line.beta - (PIECE_H1_HI[k] as number), mLo, w);
  if (right > lb) lb = right;
  return -lb;
}

/** The result of {@link extremeSecants} (module scratch). */
const SLOPES = { a: 0, b: 0 };

/**
 * The least secant slope from (a, ha) and the largest to (b, hb) over the points from…to − 1 of
 * a point buffer (each X100 lowered by its margin when `mu` is given), starting from `startA` and
 * `startB`; written to {@link SLOPES}.
 */
function extremeSecants(
  x40s: Float64Array,
  x100s: Float64Array,
  mu: Float64Array | null,
  from: number,
  to: number,
  a: number,
  ha: number,
  b: number,
  hb: number,
  startA: number,
  startB: number,
): void {
  let slopeA = startA;
  let slopeB = startB;
  for (let k = from; k < to; k++) {
    const x40 = x40s[k] as number;
    const x100 = (x100s[k] as number) - (mu ? (mu[k] as number) : 0);
    if (x40 > a) {
      const sa = (x100 - ha) / (x40 - a);
      if (sa < slopeA) slopeA = sa;
    }
    if (x40 < b) {
      const sb = (hb - x100) / (b - x40);
      if (sb > slopeB) slopeB = sb;
    }
  }
  SLOPES.a = slopeA;
  SLOPES.b = slopeB;
}

/** min over t ∈ [0, w] of f + d·t + m·t²/2. */
function quadraticMin(f: number, d: number, m: number, w: number): number {
  let v = Math.min(f, f + d * w + 0.5 * m * w * w);
  if (m > 0) {
    const t = -d / m;
    if (t > 0 && t < w) v = Math.min(v, f + 0.5 * d * t);
  }
  return v;
}

export class ViBoundary {
  readonly minVi: number;
  readonly coords: BlendCoordinates;
  /** X100 of ν100 = 2.0 mm²/s, below which D2270 defines no VI. */
  readonly x100Min: number;
  /** g(x100Min), computed on first use (NaN until then): see {@link x40AtFloor}. */
  private floorX40 = Number.NaN;
  private readonly procedureBExponent: number;
  /** Refutas coordinates: {@link relaxation} bounds h'' in closed form inside Table 1. */
  private readonly refutas: boolean;

  constructor(minVi: number, coords: BlendCoordinates) {
    this.minVi = minVi;
    this.coords = coords;
    let x100Min = FLOOR_X100.get(coords);
    if (x100Min === undefined) FLOOR_X100.set(coords, (x100Min = coords.toX(VI_MIN_KV100)));
    this.x100Min = x100Min;
    this.procedureBExponent = minVi > 100 ? Math.log10(1 + 0.00715 * (minVi - 100)) : 0;
    this.refutas = coords.method === 'refutas';
  }

  /**
   * g(x100Min): below this X40 only the ν100 ≥ 2.0 floor binds — g at the floor, U_max at
   * Y = 2.0 mm²/s (the first row of Table 1); computed on first use (h itself does not need it).
   */
  private get x40AtFloor(): number {
    if (Number.isNaN(this.floorX40)) this.floorX40 = this.coords.toXRaw(this.uMaxRow(0));
    return this.floorX40;
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
    // (Where the floor binds, U ≤ U_max(2.0) and yForUMax returns 2.0 itself, so h = x100Min.)
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
   * Y [mm²/s] with U_max(Y) = U [mm²/s], for U_max(2.0) ≤ U (2.0 itself below that, where the
   * ν100 floor binds); −1 when the answer needs the search (m > 100 above Table 1).
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
   * 1. the chord through (a, h(a)) and (b, h(b)), lowered by the largest excess of the chord
   *    over h on [a, b];
   * 2. the steepest line through (a, h(a)) that stays below h on [a, b] — exact at a up to the
   *    curvature margin below;
   * 3. the flattest line through (b, h(b)) that stays below h on [a, b] — likewise at b.
   *
   * The curve is sampled on pieces on which h is smooth: the interval is cut at every Table 1 row
   * inside it (the kinks of the interpolated L and H) and at 70 mm²/s (the seam between Table 1
   * and the D2270 equations, where h's slope jumps), and each piece is sampled in triplets
   * (x₀, x₁, x₂) — at least {@link GAP_TRIPLETS} over the interval, at least one per piece. h's
   * curvature may change sign inside a piece, so a chord or a secant is not by itself an outer
   * bound between samples; on a triplet the excess e = line − h is bounded by
   *
   *   max e ≤ max(e(x₀), e(x₁), e(x₂)) + μ,   μ = (x₂ − x₀)²·|h[x₀, x₁, x₂]| / 4,
   *
   * i.e. the largest rise of a function with |e''| ≤ 2·|h[x₀,x₁,x₂]| (the second divided difference)
   * above its samples, taken in full although the middle sample already catches most of it (a
   * fourfold reserve over a quadratic e, which covers the change of curvature across a triplet).
   * Every line is finally lowered by its largest bounded excess over all triplets, so the feasible
   * set of the relaxation contains the true one. Near the ends the lines are exact to μ, which
   * shrinks with the square of the interval width.
   */
  relaxation(a: number, ha: number, b: number, hb: number): ViChord[] {
    if (!(b - a > 1e-12)) return [{ alpha: Math.min(ha, hb), beta: 0 }];
    if (this.refutas && ha > this.x100Min && hb > ha && hb <= REFUTAS_ROW_X100[D2270_KV100.length - 1]!) {
      const lines = this.relaxationInTable(a, ha, b, hb);
      if (lines) return lines;
    }
    const beta = (hb - ha) / (b - a);
    const lo = Math.min(ha, hb);
    const hi = Math.max(ha, hb);
    const { toXRaw } = this.coords;
    // Sample points (X40, X100) in order of X40, with a margin μ each (the largest μ of the
    // triplets the point belongs to): first the interval's start.
    let ns = 0;
    tripletCount = 0;
    SAMPLE_X40[ns] = a;
    SAMPLE_X100[ns] = ha;
    SAMPLE_MU[ns++] = 0;
    if (hi > lo) {
      // Below X40 = g(floor) h is flat at the ν100 floor (exact, a straight piece).
      if (ha <= this.x100Min && a < this.x40AtFloor) {
        SAMPLE_X40[ns] = this.x40AtFloor;
        SAMPLE_X100[ns] = this.x100Min;
        SAMPLE_MU[ns++] = 0;
      }
      const yLo = Math.max(KV100_FLOOR, this.coords.toKvRaw(lo));
      const yHi = this.coords.toKvRaw(hi);
      const last = D2270_KV100.length - 1;
      const perX100 = GAP_TRIPLETS / (hi - lo);
      // First Table 1 row strictly above yLo.
      let r = 0;
      if (yLo < (D2270_KV100[last] as number)) {
        let i = 0;
        let j = last;
        while (j - i > 1) {
          const mid = (i + j) >> 1;
          if ((D2270_KV100[mid] as number) <= yLo) i = mid;
          else j = mid;
        }
        r = (D2270_KV100[i] as number) > yLo ? i : j;
      } else r = last + 1;
      const rowX = tableQuarterX(toXRaw);
      let y0 = yLo;
      let x0 = lo;
      // Pieces inside Table 1: from y0 to the next row (or to yHi), with L and H interpolated
      // linearly between rows r − 1 and r (the arithmetic of referenceLH).
      while (r <= last && y0 < yHi) {
        const yr = D2270_KV100[r] as number;
        const endsAtRow = yr < yHi;
        const y1 = endsAtRow ? yr : yHi;
        const x1 = endsAtRow ? (r < last ? (rowX[4 * r] as number) : toXRaw(yr)) : hi;
        const n = Math.max(1, Math.ceil((x1 - x0) * perX100));
        const yA = D2270_KV100[r - 1] as number;
        const LA = D2270_L[r - 1] as number;
        const HA = D2270_H[r - 1] as number;
        const dy = yr - yA;
        const dL = (D2270_L[r] as number) - LA;
        const dH = (D2270_H[r] as number) - HA;
        for (let k = 1; k <= 2 * n; k++) {
          if (k === 2 * n) {
            if (endsAtRow) {
              SAMPLE_X100[ns] = x1;
              SAMPLE_X40[ns] = toXRaw(this.uMaxRow(r));
            } else {
              SAMPLE_X100[ns] = hb;
              SAMPLE_X40[ns] = b;
            }
          } else {
            const y = y0 + ((y1 - y0) * k) / (2 * n);
            const f = (y - yA) / dy;
            SAMPLE_X100[ns] = toXRaw(y);
            SAMPLE_X40[ns] = toXRaw(this.uMaxOf(y, LA + f * dL, HA + f * dH));
          }
          SAMPLE_MU[ns++] = 0;
        }
        markTriplets(ns - 2 * n - 1, ns);
        y0 = y1;
        x0 = x1;
        r++;
      }
      // Above Table 1 (the D2270 equations, smooth): one piece sampled evenly in X100.
      if (y0 < yHi) {
        const n = Math.max(1, Math.ceil((hi - x0) * perX100));
        for (let k = 1; k <= 2 * n; k++) {
          if (k === 2 * n) {
            SAMPLE_X100[ns] = hb;
            SAMPLE_X40[ns] = b;
          } else {
            const x100 = x0 + ((hi - x0) * k) / (2 * n);
            SAMPLE_X100[ns] = x100;
            SAMPLE_X40[ns] = this.g(x100);
          }
          SAMPLE_MU[ns++] = 0;
        }
        markTriplets(ns - 2 * n - 1, ns);
      }
    }
    if (SAMPLE_X40[ns - 1] !== b) {
      SAMPLE_X40[ns] = b;
      SAMPLE_X100[ns] = hb;
      SAMPLE_MU[ns++] = 0;
    }
    // The extreme secant slopes from each end to the samples lowered by their margins.
    extremeSecants(SAMPLE_X40, SAMPLE_X100, SAMPLE_MU, 0, ns, a, ha, b, hb, beta, beta);
    let slopeA = SLOPES.a;
    let slopeB = SLOPES.b;
    // h's one-sided slopes at the ends (the smallest secant slope from a is at most its
    // right-hand derivative there).
    const eps = 1e-7 * Math.max(1, Math.abs(hi - lo));
    const dA = this.g(ha + eps) - a; // Δx40 for Δx100 = eps at a
    const derivA = dA > 0 ? eps / dA : beta;
    slopeA = Math.min(slopeA, derivA);
    const dB = b - this.g(hb - eps);
    const derivB = dB > 0 ? eps / dB : beta;
    slopeB = Math.max(slopeB, derivB);
    // On the triplet that starts at a, a line through (a, h(a)) is valid while its slope stays
    // below the secant slope σ(x) = (h(x) − h(a))/(x − a) everywhere on it: σ is sampled at a
    // (h's one-sided derivative) and the triplet's two other points, and lowered by its own
    // curvature margin (as μ for h). Likewise at b. So these lines stay exact at their end.
    const floorA = tripletCount > 0 && TRIPLET_K[0] === 0 ? secantFloor(a, ha, derivA, 1, 2, 1) : NaN;
    const last = tripletCount - 1;
    const floorB = last >= 0 && (TRIPLET_K[last] as number) + 2 === ns - 1 ? secantFloor(b, hb, derivB, ns - 2, ns - 3, -1) : NaN;
    // (NaN: no triplet at that end, or one too narrow to divide by — the check below covers it.)
    const first = floorA === floorA;
    const lastT = floorB === floorB;
    if (first) slopeA = Math.min(slopeA, floorA);
    if (lastT) slopeB = Math.max(slopeB, floorB);
    const lines: ViChord[] = [{ alpha: ha - beta * a, beta }];
    if (slopeA < beta || slopeB > beta) {
      lines.push({ alpha: ha - slopeA * a, beta: slopeA });
      lines.push({ alpha: hb - slopeB * b, beta: slopeB });
    }
    // Lower every line by its largest bounded excess (over every sample, and over every triplet
    // by its samples' largest excess plus μ; the end lines skip the triplet at their own end,
    // covered above), plus h's own accuracy at the ends (the root search of `hSearch` stops at
    // 1e-12 relative, on the high side) and the rounding of the sums.
    const round = 1.1e-12 * Math.max(1, Math.abs(lo), Math.abs(hi));
    for (let l = 0; l < lines.length; l++) {
      const line = lines[l] as ViChord;
      let excess = -Infinity;
      for (let k = 0; k < ns; k++) {
        const e = line.alpha + line.beta * (SAMPLE_X40[k] as number) - (SAMPLE_X100[k] as number);
        SAMPLE_E[k] = e;
        if (e > excess) excess = e;
      }
      for (let t = 0; t < tripletCount; t++) {
        if ((l === 1 && t === 0 && first) || (l === 2 && t === last && lastT)) continue;
        const k = TRIPLET_K[t] as number;
        const e = Math.max(SAMPLE_E[k] as number, SAMPLE_E[k + 1] as number, SAMPLE_E[k + 2] as number) + (TRIPLET_MU[t] as number);
        if (e > excess) excess = e;
      }
      if (excess + round > 0) line.alpha -= excess + round;
    }
    return lines;
  }
  /**
   * {@link relaxation} for Refutas coordinates with ν100 inside Table 1 on the whole interval
   * (h(a) above the 2.0 mm²/s floor, h(b) ≤ X(70 mm²/s)): h is sampled only at the Table 1 rows
   * inside [a, b] (two logarithms a row) and bounded between them in closed form, so the lines are
   * valid without sampling inside the pieces.
   *
   * Between two consecutive rows Y_r < Y_{r+1}, U = U_max(Y) is smooth: linear in Y for m ≤ 100
   * (u' = (U_{r+1} − U_r)/(Y_{r+1} − Y_r), u'' = 0), and H(Y)·Y^−N with H linear for m > 100
   * (u' = Y^−N·(H' − N·H/Y), u'' = N·Y^−N·((N + 1)·H/Y² − 2H'/Y)). With x = X40 = X(U) and
   * h(x) = X(Y):
   *
   *   h'  = X'(Y) / (X'(U)·u'),
   *   h'' = −|X''(Y)| / (u'²·X'(U)²) − X'(Y)·u'' / (u'³·X'(U)²) + X'(Y)·|X''(U)| / (u'·X'(U)³),
   *
   * and every factor is monotone in Y or U on the row interval, so interval arithmetic on the two
   * rows' values bounds h' and h'' on the whole row interval (hence on any piece of it). For a line
   * ℓ and φ = h − ℓ on a piece [x₀, x₁] of width w (φ'' = h'' ∈ [m_lo, m_hi], φ' at the ends
   * bounded through h'), min φ is at least the largest of
   *
   *   min(φ(x₀), φ(x₁)) − max(m_hi, 0)·w²/8                       (below the chord of φ),
   *   min_t φ(x₀) + (h'_lo − β)·t + m_lo·t²/2,  t ∈ [0, w]         (from the left end),
   *   min_t φ(x₁) − (h'_hi − β)·t + m_lo·t²/2,  t ∈ [0, w]         (from the right end),
   *
   * and each line is lowered by the largest deficit over the pieces plus the rounding allowance.
   * The three lines are those of the sampled form: the chord, the steepest line through (a, h(a))
   * and the flattest through (b, h(b)) (slopes also bounded by h' on the end pieces, so they are
   * exact at their end where h is convex there).
   *
   * @returns the lines, or null where a bound cannot be formed (U_max not rising; then the sampled
   *   form is used)
   */
  private relaxationInTable(a: number, ha: number, b: number, hb: number): ViChord[] | null {
    const X100 = REFUTAS_ROW_X100;
    const last = ROWS - 1;
    // Rows strictly inside (ha, hb): rA … rB (X100 of row 0 = x100Min < ha < hb ≤ X100 of the last).
    let i = 0;
    let j = last;
    while (j - i > 1) {
      const mid = (i + j) >> 1;
      if ((X100[mid] as number) <= ha) i = mid;
      else j = mid;
    }
    const rA = j;
    i = rA - 1;
    j = last;
    while (j - i > 1) {
      const mid = (i + j) >> 1;
      if ((X100[mid] as number) < hb) i = mid;
      else j = mid;
    }
    const rB = i;
    // Row data from rA − 1 to rB + 1, at index r − r0 (U_max exactly as uMaxRow computes it).
    const r0 = rA - 1;
    const r1 = rB + 1;
    const m = this.minVi;
    const N = this.procedureBExponent;
    const procB = m > 100;
    for (let r = r0; r <= r1; r++) {
      const q = r - r0;
      let U: number;
      let yN = 1;
      if (procB) {
        yN = Math.exp(-N * (LN_KV100[r] as number));
        U = (D2270_H[r] as number) * yN;
      } else U = this.uMaxRow(r);
      const su = U + VBN_C;
      const lu = Math.log(su);
      const inv = 1 / (su * lu);
      ROW_U[q] = U;
      // X40 of the rows inside only (the two bracketing rows bound the end pieces, no point there).
      if (r !== r0 && r !== r1) ROW_X40[q] = VBN_A * Math.log(lu) + VBN_B;
      ROW_PU[q] = (su * lu) / VBN_A;
      ROW_DDXU[q] = VBN_A * (lu + 1) * inv * inv;
      ROW_YN[q] = yN;
    }
    // Curve points: a, the rows inside, b.
    let np = 0;
    POINT_X40[np] = a;
    POINT_X100[np++] = ha;
    for (let r = rA; r <= rB; r++) {
      POINT_X40[np] = ROW_X40[r - r0] as number;
      POINT_X100[np++] = X100[r] as number;
    }
    POINT_X40[np] = b;
    POINT_X100[np++] = hb;
    // Bounds of h'' and h' on each piece k, from its row interval [r0 + k, r0 + k + 1].
    for (let k = 0; k < np - 1; k++) {
      if (!((POINT_X40[k + 1] as number) >= (POINT_X40[k] as number))) return null;
      const r = r0 + k;
      const y0 = D2270_KV100[r] as number;
      const y1 = D2270_KV100[r + 1] as number;
      const U0 = ROW_U[k] as number;
      const U1 = ROW_U[k + 1] as number;
      if (!(U1 > U0)) return null;
      let upLo: number;
      let upHi: number;
      let uppLo = 0;
      let uppHi = 0;
      if (!procB) {
        const slope = (U1 - U0) / (y1 - y0);
        upLo = slope;
        upHi = slope;
      } else {
        const H0 = D2270_H[r] as number;
        const H1 = D2270_H[r + 1] as number;
        const dH = (H1 - H0) / (y1 - y0);
        const hMin = Math.min(H0, H1);
        const hMax = Math.max(H0, H1);
        const iLo = dH - (N * hMax) / y0;
        const iHi = dH - (N * hMin) / y1;
        if (!(iLo > 0)) return null;
        const yN0 = ROW_YN[k] as number; // Y^−N falls with Y
        const yN1 = ROW_YN[k + 1] as number;
        upLo = yN1 * iLo;
        upHi = yN0 * iHi;
        const jLo = (dH >= 0 ? (-2 * dH) / y0 : (-2 * dH) / y1) + ((N + 1) * hMin) / (y1 * y1);
        const jHi = (dH >= 0 ? (-2 * dH) / y1 : (-2 * dH) / y0) + ((N + 1) * hMax) / (y0 * y0);
        uppLo = N * (jLo < 0 ? yN0 : yN1) * jLo;
        uppHi = N * (jHi > 0 ? yN0 : yN1) * jHi;
      }
      // A relative allowance for the rounding of the slopes.
      upLo *= 1 - 1e-12;
      upHi *= 1 + 1e-12;
      const dxY0 = REFUTAS_ROW_DX[r] as number; // X'(Y) ∈ [dxY1, dxY0]
      const dxY1 = REFUTAS_ROW_DX[r + 1] as number;
      const ddY0 = REFUTAS_ROW_DDX[r] as number; // |X''(Y)| ∈ [ddY1, ddY0]
      const ddY1 = REFUTAS_ROW_DDX[r + 1] as number;
      const pU0 = ROW_PU[k] as number; // 1/X'(U) ∈ [pU0, pU1]
      const pU1 = ROW_PU[k + 1] as number;
      const ddU0 = ROW_DDXU[k] as number; // |X''(U)| ∈ [ddU1, ddU0]
      const ddU1 = ROW_DDXU[k + 1] as number;
      const iLo = 1 / upLo; // 1/u' ∈ [iHi, iLo]
      const iHi = 1 / upHi;
      const t1Lo = -ddY0 * iLo * iLo * pU1 * pU1;
      const t1Hi = -ddY1 * iHi * iHi * pU0 * pU0;
      const t3Lo = dxY1 * ddU1 * iHi * pU0 * pU0 * pU0;
      const t3Hi = dxY0 * ddU0 * iLo * pU1 * pU1 * pU1;
      const gLo = dxY1 * iHi * iHi * iHi * pU0 * pU0;
      const gHi = dxY0 * iLo * iLo * iLo * pU1 * pU1;
      const t2Lo = uppHi > 0 ? -uppHi * gHi : -uppHi * gLo;
      const t2Hi = uppLo < 0 ? -uppLo * gHi : -uppLo * gLo;
      PIECE_H2_LO[k] = t1Lo + t2Lo + t3Lo;
      PIECE_H2_HI[k] = t1Hi + t2Hi + t3Hi;
      PIECE_H1_LO[k] = dxY1 * pU0 * iHi;
      PIECE_H1_HI[k] = dxY0 * pU1 * iLo;
    }
    // Slopes: the chord; the least secant from a (and h' on the first piece); the largest secant
    // to b (and h' on the last piece).
    const beta = (hb - ha) / (b - a);
    extremeSecants(POINT_X40, POINT_X100, null, 1, np - 1, a, ha, b, hb, Math.min(beta, PIECE_H1_LO[0] as number), Math.max(beta, PIECE_H1_HI[np - 2] as number));
    const slopeA = SLOPES.a;
    const slopeB = SLOPES.b;
    const lines: ViChord[] = [{ alpha: ha - beta * a, beta }];
    if (slopeA < beta || slopeB > beta) {
      lines.push({ alpha: ha - slopeA * a, beta: slopeA });
      lines.push({ alpha: hb - slopeB * b, beta: slopeB });
    }
    // The end lines are first turned about their end until every piece but the one at that end
    // is covered (the line drops by at least (slope change)·(distance from the end) on a piece),
    // so they stay exact at their end; then every line is lowered by its remaining deficit.
    // Deficits of the end lines on the pieces they are turned for: the largest over those pieces
    // (≤ 0 when no turn is needed), and 0 after a turn (those pieces are then covered exactly,
    // to rounding); only the end piece is checked again below.
    // Deficits at or below −round change nothing (a line is lowered by deficit + round only when
    // that is positive), so each piece's bound stops there.
    const round = 1.1e-12 * Math.max(1, Math.abs(ha), Math.abs(hb));
    let coveredA = -Infinity;
    let coveredB = -Infinity;
    if (lines.length === 3) {
      let turnA = 0;
      let turnB = 0;
      for (let k = 0; k < np - 1; k++) {
        if (k > 0) {
          const d = pieceDeficit(lines[1] as ViChord, k, round);
          if (d > coveredA) coveredA = d;
          const t = d / ((POINT_X40[k] as number) - a);
          if (t > turnA) turnA = t;
        }
        if (k < np - 2) {
          const d = pieceDeficit(lines[2] as ViChord, k, round);
          if (d > coveredB) coveredB = d;
          const t = d / (b - (POINT_X40[k + 1] as number));
          if (t > turnB) turnB = t;
        }
      }
      if (turnA > 0) {
        const s = slopeA - turnA;
        lines[1] = { alpha: ha - s * a, beta: s };
        coveredA = 0;
      }
      if (turnB > 0) {
        const s = slopeB + turnB;
        lines[2] = { alpha: hb - s * b, beta: s };
        coveredB = 0;
      }
    }
    for (let l = 0; l < lines.length; l++) {
      const line = lines[l] as ViChord;
      let deficit = l === 1 ? coveredA : l === 2 ? coveredB : -Infinity;
      const from = l === 2 ? np - 2 : 0;
      const to = l === 1 ? 1 : np - 1;
      for (let k = from; k < to; k++) {
        const d = pieceDeficit(line, k, round);
        if (d > deficit) deficit = d;
      }
      if (deficit + round > 0) line.alpha -= deficit + round;
    }
    return lines;
  }
}

/**
 * The least secant slope from an end (x_e, h_e) over the triplet at that end, lowered by its
 * curvature margin: σ at the end is h's one-sided derivative `deriv`, at the triplet's other two
 * points (indices i1, i2 of the sample buffer) the secant slope; the result is
 * min σ − sign·(x₂ − x_e)²·|σ[x_e, x₁, x₂]|/4 for the end at a (sign 1), max σ + … at b (sign −1).
 */
function secantFloor(xe: number, he: number, deriv: number, i1: number, i2: number, sign: 1 | -1): number {
  const x1 = SAMPLE_X40[i1] as number;
  const x2 = SAMPLE_X40[i2] as number;
  const s1 = ((SAMPLE_X100[i1] as number) - he) / (x1 - xe);
  const s2 = ((SAMPLE_X100[i2] as number) - he) / (x2 - xe);
  const w = x2 - xe;
  const dd = ((s2 - s1) / (x2 - x1) - (s1 - deriv) / (x1 - xe)) / w;
  const margin = (w * w * Math.abs(dd)) / 4;
  if (!Number.isFinite(margin) || !Number.isFinite(s1) || !Number.isFinite(s2)) return NaN;
  return sign > 0 ? Math.min(deriv, s1, s2) - margin : Math.max(deriv, s1, s2) + margin;
}

/**
 * The curvature margin μ of each triplet (k, k+1, k+2), k = from, from + 2, …, < to − 2, of the
 * module's sample buffer, kept as the largest μ at each of the triplet's three points.
 */
function markTriplets(from: number, to: number): void {
  for (let k = from; k + 2 < to; k += 2) {
    const x0 = SAMPLE_X40[k] as number;
    const x1 = SAMPLE_X40[k + 1] as number;
    const x2 = SAMPLE_X40[k + 2] as number;
    if (!(x1 > x0 && x2 > x1)) {
      // Points that coincide to rounding: bound the piece by its rise in X100 (h increasing).
      const rise = Math.abs((SAMPLE_X100[k + 2] as number) - (SAMPLE_X100[k] as number));
      TRIPLET_K[tripletCount] = k;
      TRIPLET_MU[tripletCount++] = rise;
      for (let q = k; q <= k + 2; q++) if (rise > (SAMPLE_MU[q] as number)) SAMPLE_MU[q] = rise;
      continue;
    }
    const h0 = SAMPLE_X100[k] as number;
    const h1 = SAMPLE_X100[k + 1] as number;
    const h2 = SAMPLE_X100[k + 2] as number;
    const dd = ((h2 - h1) / (x2 - x1) - (h1 - h0) / (x1 - x0)) / (x2 - x0);
    const mu = ((x2 - x0) * (x2 - x0) * Math.abs(dd)) / 4;
    TRIPLET_K[tripletCount] = k;
    TRIPLET_MU[tripletCount++] = mu;
    for (let q = k; q <= k + 2; q++) if (mu > (SAMPLE_MU[q] as number)) SAMPLE_MU[q] = mu;
  }
}
