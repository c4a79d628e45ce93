/**
 * Robust recipes: "the batch lands in the ν40 band with probability at least p" as an exact
 * condition of the solver, under the lot-spread model of `lot-spread.ts`.
 *
 * ## The condition
 * With fractions w (basis weights cᵢ, S = Σ cᵢwᵢ) the batch's blending coordinate is normal with
 * μ(w) = Σ cᵢwᵢXᵢ / S and σ(w) = ‖Dw‖ / S, D = diag(cᵢgᵢ). Let [a, b] be the band in X, m = (a + b)/2
 * its centre and h = (b − a)/2 its half-width. The probability in band
 *
 *   P = Φ((b − μ)/σ) − Φ((a − μ)/σ)
 *
 * depends only on d = |μ − m| and σ, and falls as d grows, so P ≥ p ⇔ d ≤ δ_p(σ), where δ_p(σ) is the
 * deviation at which P = p, i.e. the root of Φ((d − h)/σ) + Φ(−(h + d)/σ) = 1 − p. δ_p falls from h
 * (σ → 0, for p ≥ ½) to 0 at σ_max = h / Φ⁻¹((1 + p)/2) and is CONCAVE (checked on a fine grid in the
 * tests for p from 0.5 to 0.9999; with p < ½ it first rises above h, and together with the band rows
 * d ≤ h the allowed deviation min(h, δ_p) is again concave and non-increasing). So the set
 * {w : d(w) ≤ δ_p(σ(w))} is convex (σ is a norm, δ_p concave non-increasing) and is the intersection of
 * its tangent half-spaces. A tangent half-space at a point ŵ is, for the side s = sign(μ̂ − m):
 *
 *   s·(μ(w) − m) ≤ δ̂ + δ̂′·(L(w)/S − σ̂),   L(w) = ⟨Dŵ, Dw⟩ / ‖Dŵ‖ ≤ ‖Dw‖   (Cauchy–Schwarz)
 *
 * with δ̂ = δ_p(σ̂), δ̂′ = δ_p′(σ̂) ≤ 0 at σ̂ = σ(ŵ) (concavity: the tangent of δ_p lies above it; and
 * δ̂′·σ ≤ δ̂′·L/S since δ̂′ ≤ 0). Multiplied by S it is the HOMOGENEOUS linear row
 *
 *   Σᵢ wᵢ·[ s·cᵢ(Xᵢ − m) − (δ̂ − δ̂′σ̂)·cᵢ − δ̂′·(cᵢgᵢ)²ŵᵢ/‖Dŵ‖ ] ≤ 0,
 *
 * the form of every solver row; where σ̂ ≥ σ_max the cut is σ ≤ σ_max: Σ wᵢ[(cᵢgᵢ)²ŵᵢ/‖Dŵ‖ − σ_max·cᵢ] ≤ 0.
 *
 * ## What is solved exactly
 * The engine's branch and bound asks this condition of every node solution (`LazyConstraint`): a
 * solution that fails it gets a tangent cut at itself (Kelley's cutting-plane method, an outer
 * approximation, so each node LP stays a relaxation) and the node is solved again. A solution is
 * accepted when its recomputed probability is ≥ p + ¼·κ(1 − p); cuts are drawn for the slightly
 * stricter level p + κ(1 − p), κ = 10⁻³, so the iterates cross into the accepted set after finitely
 * many cuts. The returned recipe therefore meets P ≥ p exactly when recomputed. Its cost is certified
 * by a lower bound: the same problem solved with cuts for level p itself (valid for the true set) —
 * the gap is reported and is far below 0.5 % (tests compare with a fine grid).
 */
import type { PreparedProblem } from '../solver/prepared';
import type { ExtraRow } from '../solver/objectives';
import type { LazyConstraint } from '../solver/branch-and-bound';
import { BlendbenchInputError, assertFinite } from '../errors';
import { normalCdfRaw, normalPdfRaw, standardNormalQuantile } from './normal';
import { probabilityInInterval } from './lot-spread';

/** Cuts are drawn for p + κ(1 − p) (see the module notes). */
export const ROBUST_CUT_MARGIN = 1e-3;
/** Solutions are accepted at p + ACCEPT·κ(1 − p). */
const ACCEPT_SHARE = 0.25;

/** Throws unless p is a probability from 0 to below 1. */
export function assertProbability(fn: string, field: string, p: unknown): asserts p is number {
  assertFinite(fn, field, p);
  if (p < 0 || p >= 1) {
    throw new BlendbenchInputError(field, p, `${fn}: ${field} = ${p}; a probability in band must be from 0 to below 1 (0.99 = 99 %)`);
  }
}

/**
 * Largest batch standard deviation σ (in blending coordinates) at which a batch centred in a band of
 * half-width h still lands in it with probability p:  σ_max = h / Φ⁻¹((1 + p)/2).
 *
 * @param halfWidth - h, half-width of the band in blending coordinates, > 0
 * @param p - probability, 0 < p < 1
 * @returns σ_max (same coordinates as h)
 * @example maxSdForProbability(1, 0.95) // → 0.5102 (h / 1.959964)
 */
export function maxSdForProbability(halfWidth: number, p: number): number {
  return halfWidth / standardNormalQuantile((1 + p) / 2);
}

/**
 * Largest deviation d = |μ − m| of the batch mean from the band centre at which the batch still
 * lands in the band [m − h, m + h] with probability p, for a batch standard deviation σ:
 * the root δ of Φ((δ − h)/σ) + Φ(−(h + δ)/σ) = 1 − p, and its slope dδ/dσ (implicit differentiation:
 * δ′ = −G_σ/G_δ with G_δ = [φ((δ − h)/σ) − φ((δ + h)/σ)]/σ and
 * G_σ = [(h − δ)φ((h − δ)/σ) + (h + δ)φ((h + δ)/σ)]/σ²).
 *
 * @param sigma - σ > 0, below {@link maxSdForProbability}(h, p)
 * @param halfWidth - h > 0
 * @param p - probability, 0 < p < 1
 * @returns `delta` (0 ≤ δ) and `slope` (δ′ ≤ 0 where δ ≤ h); null when σ ≥ σ_max (no deviation will do)
 * @example allowedDeviation(0.1, 1, 0.99) // → { delta: 0.76737, slope: −2.3263 } (one tail: h − Φ⁻¹(p)·σ)
 */
export function allowedDeviation(sigma: number, halfWidth: number, p: number): { delta: number; slope: number } | null {
  const h = halfWidth;
  const q = 1 - p;
  const G = (d: number): number => normalCdfRaw((d - h) / sigma) + normalCdfRaw(-(h + d) / sigma) - q;
  if (!(G(0) < 0)) return null;
  let lo = 0;
  let hi = h + 40 * sigma;
  // First guess: one tail only, d = h − Φ⁻¹(p)·σ (exact when the far tail is negligible).
  let d = Math.min(hi, Math.max(lo, h - standardNormalQuantile(p) * sigma));
  for (let k = 0; k < 200; k++) {
    const g = G(d);
    if (g > 0) hi = d;
    else lo = d;
    const gd = (normalPdfRaw((d - h) / sigma) - normalPdfRaw((d + h) / sigma)) / sigma;
    let next = gd > 0 ? d - g / gd : (lo + hi) / 2;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    const done = Math.abs(next - d) <= 1e-15 * Math.max(h, 1e-300) || hi - lo <= 1e-15 * h;
    d = next;
    if (done) break;
  }
  const gd = (normalPdfRaw((d - h) / sigma) - normalPdfRaw((d + h) / sigma)) / sigma;
  const gs = ((h - d) * normalPdfRaw((h - d) / sigma) + (h + d) * normalPdfRaw((h + d) / sigma)) / (sigma * sigma);
  let slope = gd > 0 ? -gs / gd : Number.NEGATIVE_INFINITY;
  // δ_p is non-increasing wherever δ ≤ h; a slope of +1e-15 there is rounding.
  if (slope > 0 && d <= h * (1 + 1e-9)) slope = 0;
  return { delta: d, slope };
}

/** The lot-spread model of a prepared problem, per component (aligned with P.components). */
export interface InBandModel {
  /** gᵢ = X′(ν40ᵢ)·ν40ᵢ·sᵢ (blending coordinate per lot standard deviation). */
  g: Float64Array;
  /** True when some component has a spread (otherwise every in-band blend is certain). */
  any: boolean;
}

/**
 * Whether some component of a prepared problem has a lot spread (`kv40RelSd` > 0): the `any` of
 * {@link inBandModel}, without building the model when it is not cached yet (a plain solve asks
 * once per prepared problem).
 */
export function hasLotSpread(P: PreparedProblem): boolean {
  const cached = (P.cache as { inBand?: InBandModel }).inBand;
  if (cached !== undefined) return cached.any;
  const comps = P.components;
  for (let i = 0; i < comps.length; i++) if ((comps[i]!.kv40RelSd ?? 0) > 0) return true;
  return false;
}

/** gᵢ of every component of a prepared problem (cached on the problem). */
export function inBandModel(P: PreparedProblem): InBandModel {
  const cache = P.cache as { inBand?: InBandModel };
  if (cache.inBand === undefined) {
    const g = new Float64Array(P.n);
    let any = false;
    for (let i = 0; i < P.n; i++) {
      const s = P.components[i]!.kv40RelSd ?? 0;
      if (s > 0) any = true;
      g[i] = P.coords.perPct(P.components[i]!.kv40) * 100 * s;
    }
    cache.inBand = { g, any };
  }
  return cache.inBand;
}

/**
 * Probability that a batch of fractions w (aligned with `vars`, indices into P) lands in the
 * problem's ν40 band under the lot-spread model. No input checks (the solver's inner loop).
 */
export function probabilityOfFractions(P: PreparedProblem, vars: readonly number[], w: ArrayLike<number>): number {
  const { g } = inBandModel(P);
  let sc = 0;
  let sx = 0;
  let sg = 0;
  for (let j = 0; j < vars.length; j++) {
    const i = vars[j]!;
    const cw = P.c[i]! * w[j]!;
    sc += cw;
    sx += cw * P.x40[i]!;
    sg += (cw * g[i]!) ** 2;
  }
  return probabilityInInterval(sx / sc, Math.sqrt(sg) / sc, P.bandA, P.bandB);
}

/** The probability condition as a lazy constraint, with the rows of its certificate. */
export interface InBandSeparator extends LazyConstraint {
  /** Target p. */
  readonly p: number;
  /** Accepted level p + ¼κ(1 − p). */
  readonly accept: number;
  /**
   * The same lifted model with its tangents drawn for level p itself (valid for every blend that
   * meets p), frozen: solving with it gives the certificate's lower bound.
   */
  certificate(): LazyConstraint;
}

/** Cuts at one level (the solve's stricter level, or p itself for the certificate). */
interface Level {
  p: number;
  /** σ_max in scaled coordinates. */
  sMax: number;
  rows: ExtraRow[];
}

/**
 * The condition "probability in band ≥ p" for the engine's branch and bound, as a lifted outer
 * approximation (see the module notes):
 *
 * - lifted variables ρ ≥ ‖Dy‖ and uᵢ ≥ (dᵢyᵢ)²/ρ with Σ uᵢ ≤ ρ (the rotated-cone form of the norm,
 *   each term outer-approximated by its own tangents uᵢ ≥ dᵢ²(2t·yᵢ − t²·ρ), valid for every t);
 * - the allowed deviation by tangents of the perspective S·δ_p(ρ/S): s·Σ cᵢyᵢ(Xᵢ − m) ≤ α·S + β·ρ with
 *   α = δ̂ − σ̂δ̂′, β = δ̂′ ≤ 0 (valid since δ_p is concave and non-increasing, and ρ ≥ σ·S);
 * - ρ ≤ σ_max·S.
 *
 * Every row is homogeneous in the Charnes–Cooper variables y and uses scaled coordinates
 * (X × rowScale, so the simplex sees coefficients of order 1). Each separation adds tangents where the
 * node solution shows the approximation to be loose; each term is one-dimensional, so few are needed.
 *
 * @param P - the prepared problem (its ν40 band is the band; `kv40RelSd` on its components)
 * @param p - probability, 0 ≤ p < 1
 * @returns the separator (one per solve: it keeps its cuts for the tie-break stage and the certificate)
 */
export function inBandSeparator(P: PreparedProblem, p: number): InBandSeparator {
  const model = inBandModel(P);
  const rs = P.coords.rowScale;
  const a = P.bandA * rs;
  const b = P.bandB * rs;
  const m = (a + b) / 2;
  const h = (b - a) / 2;
  const level = (q: number): Level => ({
    p: q,
    // A point band (h = 0) is met only by a batch without spread: σ_max = 0.
    sMax: q <= 0 ? Number.POSITIVE_INFINITY : h > 0 ? maxSdForProbability(h, q) : 0,
    rows: [],
  });
  const cutLevel = level(p + ROBUST_CUT_MARGIN * (1 - p));
  const trueLevel = level(p);
  const accept = p + ACCEPT_SHARE * ROBUST_CUT_MARGIN * (1 - p);
  /** Cone rows (the same for both levels). */
  const cone: ExtraRow[] = [];
  let liftOf: Int32Array | null = null;
  let nLift = 0;
  let started: readonly number[] | null = null;

  const d = (i: number): number => rs * P.c[i]! * model.g[i]!;
  const row = (): { coef: Float64Array; lift: Float64Array } => ({ coef: new Float64Array(P.n), lift: new Float64Array(nLift) });

  /** uᵢ ≥ dᵢ²(2t·yᵢ − t²·ρ), for the component at position j. */
  const coneTangent = (vars: readonly number[], j: number, t: number): ExtraRow => {
    const i = vars[j]!;
    const di = d(i);
    const r = row();
    r.coef[i] = 2 * t * di * di;
    r.lift[0] = -t * t * di * di;
    r.lift[liftOf![j]!] = -1;
    return normalised({ coef: r.coef, aux: 0, sense: 'le', lift: r.lift });
  };
  /** s·Σ cᵢyᵢ(Xᵢ − m) ≤ α·S + β·ρ at σ̂, or ρ ≤ σ_max·S where σ̂ ≥ σ_max; null where δ > h (the band rows cover it). */
  const deviationTangent = (vars: readonly number[], lv: Level, side: number, sigmaHat: number): ExtraRow | null => {
    const r = row();
    const dev = sigmaHat < lv.sMax * (1 - 1e-9) ? allowedDeviation(sigmaHat, h, lv.p) : null;
    if (dev && dev.slope > 0) return null;
    if (!dev || !Number.isFinite(dev.slope)) {
      for (const i of vars) r.coef[i] = -lv.sMax * P.c[i]!;
      r.lift[0] = 1;
    } else {
      const alpha = dev.delta - sigmaHat * dev.slope;
      for (const i of vars) r.coef[i] = P.c[i]! * (side * (rs * P.x40[i]! - m) - alpha);
      r.lift[0] = -dev.slope;
    }
    return normalised({ coef: r.coef, aux: 0, sense: 'le', lift: r.lift });
  };
  const addDeviation = (vars: readonly number[], side: number, sigmaHat: number, out: ExtraRow[] | null): void => {
    for (const lv of [cutLevel, trueLevel]) {
      const t = deviationTangent(vars, lv, side, sigmaHat);
      if (!t) continue;
      lv.rows.push(t);
      if (lv === cutLevel && out) out.push(t);
    }
  };

  const begin = (vars: readonly number[]): { lift: number; rows: ExtraRow[] } => {
    if (started && (started.length !== vars.length || started.some((v, j) => vars[j] !== v))) {
      throw new Error('inBandSeparator: one separator serves one set of variables');
    }
    if (!started) {
      started = vars.slice();
      liftOf = new Int32Array(vars.length).fill(-1);
      nLift = 1;
      vars.forEach((i, j) => {
        if (d(i) > 0) liftOf![j] = nLift++;
      });
      const nU = nLift - 1;
      // Σ uᵢ − ρ ≤ 0.
      const link = row();
      link.lift[0] = -1;
      for (let k = 1; k < nLift; k++) link.lift[k] = 1;
      cone.push({ coef: link.coef, aux: 0, sense: 'le', lift: link.lift });
      // One tangent per term at the equal-share ratio dᵢyᵢ/ρ = 1/√n.
      vars.forEach((i, j) => {
        if (liftOf![j]! > 0) cone.push(coneTangent(vars, j, 1 / (d(i) * Math.sqrt(nU))));
      });
      // ρ ≤ σ_max·S and two tangents of the allowed deviation on each side.
      for (const lv of [cutLevel, trueLevel]) {
        const t = deviationTangent(vars, lv, 1, lv.sMax);
        if (t) lv.rows.push(t);
      }
      if (Number.isFinite(cutLevel.sMax) && cutLevel.sMax > 0) {
        for (const share of [0.5, 0.85]) for (const side of [1, -1]) addDeviation(vars, side, share * cutLevel.sMax, null);
      }
    }
    return { lift: nLift, rows: [...cone, ...cutLevel.rows] };
  };

  const separate = (vars: readonly number[], w: Float64Array, x: Float64Array, off: number): ExtraRow[] | null => {
    if (p <= 0 || !model.any) return null;
    if (probabilityOfFractions(P, vars, w) >= accept) return null;
    const out: ExtraRow[] = [];
    let S = 0;
    let L = 0;
    let r2 = 0;
    for (let j = 0; j < vars.length; j++) {
      const i = vars[j]!;
      const y = x[j]! > 0 ? x[j]! : 0;
      S += P.c[i]! * y;
      L += P.c[i]! * y * (rs * P.x40[i]! - m);
      r2 += (d(i) * y) ** 2;
    }
    const rho = Math.max(0, x[off]!);
    const side = L >= 0 ? 1 : -1;
    // Cone terms the LP underestimates.
    for (let j = 0; j < vars.length; j++) {
      const k = liftOf![j]!;
      if (k < 0) continue;
      const y = x[j]! > 0 ? x[j]! : 0;
      const u = Math.max(0, x[off + k]!);
      const dy = d(vars[j]!) * y;
      if (dy * dy > u * rho * (1 + 1e-9) + 1e-18 * S * S) {
        const t = y / Math.max(rho, 1e-12 * S);
        const c = coneTangent(vars, j, t);
        cone.push(c);
        out.push(c);
      }
    }
    // The allowed deviation at the LP's σ̂ = ρ/S, and at the blend's true σ.
    if (S > 0) {
      const sHat = rho / S;
      const dev = sHat < cutLevel.sMax ? allowedDeviation(sHat, h, cutLevel.p) : null;
      if (!dev || side * L > S * dev.delta * (1 + 1e-12) + 1e-15 * S * h) addDeviation(vars, side, sHat, out);
      // At the cap σ̂ ≥ σ_max the tangent there is vertical (δ_p′ → −∞) and only restates ρ ≤ σ_max·S;
      // a point off centre there is cut by the tangent at the largest σ₁ = σ_max(1 − 2⁻ᵏ) whose line
      // passes at most halfway to it, δ(σ₁) + δ′(σ₁)(σ̂ − σ₁) ≤ d̂/2 (the line falls as σ₁ grows, since
      // δ_p is concave; without it Kelley's iterates stall at the cap).
      const dHat = (side * L) / S;
      if (!dev && dHat > 1e-12 * h) {
        for (let k = 1; k <= 60; k++) {
          const s1 = cutLevel.sMax * (1 - Math.pow(2, -k));
          const t = allowedDeviation(s1, h, cutLevel.p);
          if (t && Number.isFinite(t.slope) && t.delta + t.slope * (sHat - s1) <= dHat / 2) {
            addDeviation(vars, side, s1, out);
            break;
          }
        }
      }
      const sTrue = Math.sqrt(r2) / S;
      if (Math.abs(sTrue - sHat) > 1e-9 * sTrue) addDeviation(vars, side, sTrue, out);
    }
    return out.length > 0 ? out : null;
  };

  return {
    p,
    accept,
    begin,
    separate,
    certificate: () => ({
      begin: (vars) => {
        begin(vars);
        return { lift: nLift, rows: [...cone, ...trueLevel.rows] };
      },
      separate: () => null,
    }),
  };
}

/** Scale a row to a largest coefficient of 1 (a positive factor leaves a homogeneous row unchanged). */
function normalised(r: ExtraRow): ExtraRow {
  let big = 0;
  for (let i = 0; i < r.coef.length; i++) big = Math.max(big, Math.abs(r.coef[i]!));
  if (r.lift) for (let i = 0; i < r.lift.length; i++) big = Math.max(big, Math.abs(r.lift[i]!));
  if (!(big > 0)) return r;
  for (let i = 0; i < r.coef.length; i++) r.coef[i] = r.coef[i]! / big;
  const lift = r.lift ? Float64Array.from(r.lift, (v) => v / big) : undefined;
  return lift ? { ...r, lift } : r;
}
