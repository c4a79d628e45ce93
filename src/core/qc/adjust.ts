/**
 * The lot-adjusted recipe: the saved recipe re-solved for the lots actually in the tanks (measured
 * ν40/ν100, density where known) and for the oil already in the vessel (a heel), so that the batch
 * lands at the aim ν40 with the least change from the saved shares.
 *
 * ## Formulation (a linear program in fractions of the batch mass M)
 * Unknowns fᵢ ≥ 0, the share of the batch added as stock i (the recipe's stocks only); the heel is
 * fixed at f_h = H/M (H its mass, 0 without a heel). With the mixing rule's coordinates
 * (Refutas: X = VBN, cᵢ = 1; ASTM D7152: cᵢ = 1/ρᵢ; its Wright form: cᵢ = 1/(ρᵢBᵢ), Bᵢ the slope of the oil's
 * own D341 line — `solver/coordinates.ts` basisWeight), all homogeneous and exact:
 *
 *   batch mass       Σ fᵢ = 1 − f_h
 *   at the aim       Σ cᵢfᵢ(Xᵢ − X_aim) + c_h·f_h·(X_h − X_aim) = 0
 *   additive         fₐ = r − r_h·f_h      (treat rate r in the batch; the heel holds r_h)
 *   least change     minimise Σ |fᵢ − (1 − f_h)·sᵢ| over the non-additive stocks (sᵢ the saved shares,
 *                    so the additions keep the recipe's proportions as far as the aim allows),
 *                    written with deviations eᵢ ≥ ±(fᵢ − (1 − f_h)·sᵢ).
 *
 * The LP (yalps, `solver/lp.ts`) is exact. When the aim cannot be reached with these lots, the reason
 * states the range of ν40 the stocks can reach (all the free mass on the lightest or on the heaviest
 * stock: the blend coordinate is a ratio of linear forms, so its extremes lie at those vertices).
 *
 * ## A batch ordered in litres
 * The vessel's volume at 15 °C is V = H/ρ_h + Σ mᵢ/ρᵢ (ideal mixing, volumes add: common practice, the
 * rule `blending/density.ts` uses). The lots' densities and the heel's differ from the saved recipe's, so
 * the mass that fills V is not the saved recipe's: {@link adjustRecipeToVolume} finds the batch mass M at
 * which the adjusted additions and the heel fill exactly V, by the fixed point
 * M ← H + (V − H/ρ_h)·ρ_add(M), ρ_add the additions' density at M.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError, FractionSumError, assertDensity15, assertFinite, assertKv40Kv100, assertViscosity } from '../errors';
import { VI_MIN_KV100, viscosityIndex } from '../viscosity/viscosity-index';
import { blendCoordinates } from '../solver/coordinates';
import { solveLp, type LpRow } from '../solver/lp';
import { displayWords, type NumberDisplay } from '../words/display';
import { withFieldPrefix } from './correction';

/** One stock of the recipe with the values of the lot in the tank. */
export interface AdjustStock {
  id: string;
  /** Label for messages (the stock code). */
  label: string;
  /** ν40, ν100 of the lot [mm²/s] (measured, or the library's values), ν100 below ν40. */
  kv40: number;
  kv100: number;
  /** Density of the lot at 15 °C [kg/L]. */
  density15: number;
  /** The saved recipe's mass fraction of this stock, 0–1 (the stocks' fractions sum to 1). */
  savedFraction: number;
}

/** Oil already in the vessel. */
export interface AdjustHeel {
  /** [kg], > 0 and below the batch mass. */
  massKg: number;
  kv40: number;
  kv100: number;
  density15: number;
  /** Mass fraction of the additive package the heel holds (0–1): the treat rate of the batch it came from. */
  additiveFraction: number;
}

export interface AdjustInput {
  stocks: readonly AdjustStock[];
  /** Batch mass M [kg] (heel included). */
  batchKg: number;
  /** Aim ν40 of the batch [mm²/s]. */
  aimKv40: number;
  /** The additive package (one of the stocks) at its treat rate in the batch; null → none. */
  additive: { id: string; massFraction: number } | null;
  heel?: AdjustHeel | null;
  /** Mixing rule (default 'refutas'). */
  method?: BlendMethod;
  /** How the reason writes numbers (the user's decimal separator; default "."). */
  display?: NumberDisplay;
}

export type AdjustResult =
  | {
      status: 'optimal';
      /** kg to charge of each stock, by id (zeros included). */
      addKg: Record<string, number>;
      /** Mass fractions of the additions alone (what the sheet's shares become), by id. */
      addedFractions: Record<string, number>;
      /**
       * The batch (heel + additions): mass [kg], volume at 15 °C [L] (H/ρ_h + Σ mᵢ/ρᵢ), ν40, ν100 [mm²/s],
       * unrounded VI (null below ν100 2.0).
       */
      batch: { massKg: number; litres15: number; kv40: number; kv100: number; vi: number | null };
      /** Half the sum of |share change| of the additions against the saved shares [%]: how much moved. */
      changePct: number;
    }
  | {
      status: 'infeasible';
      reason: string;
      /** ν40 range the batch can reach with these lots [mm²/s] (null when the additive alone is impossible). */
      reachable: { min: number; max: number } | null;
    };

/**
 * Re-solve a recipe for the lots in the tanks and an optional heel, to land at the aim ν40 with the
 * least change from the saved shares (see the module notes for the LP).
 *
 * @param input - stocks with their lot values and saved fractions, batch mass [kg], aim ν40 [mm²/s],
 *   the additive's treat rate, an optional heel, the mixing rule
 * @returns kg per stock, the new shares and the batch's properties, or the reason (with the ν40 range
 *   these lots can reach) when the aim is out of reach
 * @throws BlendbenchInputError and its subclasses, naming the field
 * @example adjustRecipe({ stocks: [ν40 100 and ν40 460 lots], batchKg: 10000, aimKv40: 220, additive: null })
 *   // → { status: 'optimal', addKg: { light: 4487.4, heavy: 5512.6 }, … batch: { kv40: 220, … } } (check value B3)
 */
export function adjustRecipe(input: AdjustInput): AdjustResult {
  const fn = 'adjustRecipe';
  const words = displayWords({ thousandsGrouping: true, ...input.display });
  const method = input.method ?? 'refutas';
  const co = blendCoordinates(method);
  const stocks = input.stocks;
  if (!Array.isArray(stocks) || stocks.length === 0) throw new BlendbenchInputError('stocks', stocks, `${fn}: stocks must be a non-empty list`);
  assertFinite(fn, 'batchKg', input.batchKg);
  if (input.batchKg <= 0) throw new BlendbenchInputError('batchKg', input.batchKg, `${fn}: batchKg = ${input.batchKg}; a batch must weigh more than 0 kg`);
  assertViscosity(fn, 'aimKv40', input.aimKv40);
  let savedSum = 0;
  stocks.forEach((s, i) => {
    withFieldPrefix(`stocks[${i}].`, () => assertKv40Kv100(fn, s.kv40, s.kv100));
    assertDensity15(fn, `stocks[${i}].density15`, s.density15);
    assertFinite(fn, `stocks[${i}].savedFraction`, s.savedFraction);
    if (s.savedFraction < 0 || s.savedFraction > 1) throw new FractionSumError(`stocks[${i}].savedFraction`, s.savedFraction, `${fn}: stocks[${i}].savedFraction = ${s.savedFraction}; a fraction must lie between 0 and 1`);
    savedSum += s.savedFraction;
  });
  if (Math.abs(savedSum - 1) > 1e-6) throw new FractionSumError('stocks', savedSum, `${fn}: the saved fractions add up to ${savedSum}, not 1`);
  const M = input.batchKg;
  const heel = input.heel ?? null;
  let fh = 0;
  if (heel) {
    assertFinite(fn, 'heel.massKg', heel.massKg);
    if (heel.massKg <= 0 || heel.massKg >= M) {
      throw new BlendbenchInputError('heel.massKg', heel.massKg, `${fn}: heel.massKg = ${heel.massKg}; a heel must weigh more than 0 kg and less than the batch (${M} kg)`);
    }
    withFieldPrefix('heel.', () => assertKv40Kv100(fn, heel.kv40, heel.kv100));
    assertDensity15(fn, 'heel.density15', heel.density15);
    assertFinite(fn, 'heel.additiveFraction', heel.additiveFraction);
    if (heel.additiveFraction < 0 || heel.additiveFraction >= 1) {
      throw new FractionSumError('heel.additiveFraction', heel.additiveFraction, `${fn}: heel.additiveFraction = ${heel.additiveFraction}; a treat rate is from 0 to below 1`);
    }
    fh = heel.massKg / M;
  }
  const n = stocks.length;
  let a = -1;
  let fa = 0;
  if (input.additive) {
    a = stocks.findIndex((s) => s.id === input.additive!.id);
    if (a < 0) throw new BlendbenchInputError('additive.id', input.additive.id, `${fn}: the additive "${input.additive.id}" is not one of the stocks`);
    const r = input.additive.massFraction;
    assertFinite(fn, 'additive.massFraction', r);
    if (r < 0 || r >= 1) throw new FractionSumError('additive.massFraction', r, `${fn}: additive.massFraction = ${r}; a treat rate is from 0 to below 1`);
    fa = r - (heel ? heel.additiveFraction * fh : 0);
    if (fa < -1e-12) {
      return {
        status: 'infeasible',
        reason: `The heel (${words.kg(heel!.massKg)} at ${words.pct(heel!.additiveFraction, 2)} additive) already carries more additive than a ${words.kg(M)} batch at ${words.pct(r, 2)} needs. Make a larger batch, or lower the heel.`,
        reachable: null,
      };
    }
    fa = Math.max(0, fa);
  }
  const free = 1 - fh - fa;
  if (free < -1e-12) {
    return { status: 'infeasible', reason: `The heel and the additive leave no room for base stocks in a ${Math.round(M)} kg batch.`, reachable: null };
  }
  // The rule's basis weights: 1 (Refutas), 1/ρ (ASTM D7152), 1/(ρ·B) (D7152 Wright: B of each oil's own line).
  const c = stocks.map((s) => co.basisWeight(s.kv40, s.kv100, s.density15));
  const x = stocks.map((s) => co.toX(s.kv40));
  const xAim = co.toX(input.aimKv40);
  const ch = heel ? co.basisWeight(heel.kv40, heel.kv100, heel.density15) : 0;
  const xh = heel ? co.toX(heel.kv40) : 0;
  // Saved shares of the non-additive stocks, renormalised over them.
  const baseSum = stocks.reduce((s, k, i) => (i === a ? s : s + k.savedFraction), 0);
  const target = stocks.map((k, i) => (i === a ? fa : baseSum > 0 ? (free * k.savedFraction) / baseSum : 0));

  // Variables: f₀ … f_{n−1}, then e₀ … e_{n−1}.
  const nv = 2 * n;
  const rows: LpRow[] = [];
  const vec = (f: (j: number) => number): number[] => Array.from({ length: nv }, (_, j) => f(j));
  rows.push({ coefficients: vec((j) => (j < n ? 1 : 0)), min: 1 - fh, max: 1 - fh });
  const s = co.rowScale;
  const rhs = -ch * fh * (xh - xAim) * s;
  rows.push({ coefficients: vec((j) => (j < n ? c[j]! * (x[j]! - xAim) * s : 0)), min: rhs, max: rhs });
  if (a >= 0) rows.push({ coefficients: vec((j) => (j === a ? 1 : 0)), min: fa, max: fa });
  for (let i = 0; i < n; i++) {
    if (i === a) continue;
    rows.push({ coefficients: vec((j) => (j === n + i ? 1 : j === i ? -1 : 0)), min: -target[i]! });
    rows.push({ coefficients: vec((j) => (j === n + i ? 1 : j === i ? 1 : 0)), min: target[i]! });
  }
  const sol = solveLp({ sense: 'minimize', numVariables: nv, objective: vec((j) => (j >= n && j - n !== a ? 1 : 0)), rows });
  if (sol.status !== 'optimal') {
    // Reachable range: all the free mass on one stock (vertices of the feasible set).
    let lo = Number.POSITIVE_INFINITY;
    let hi = Number.NEGATIVE_INFINITY;
    for (let i = 0; i < n; i++) {
      if (i === a && n > 1) continue;
      const f = stocks.map((_, j) => (j === a ? fa : 0));
      f[i] = f[i]! + free;
      const kv = blendKv(f);
      lo = Math.min(lo, kv);
      hi = Math.max(hi, kv);
    }
    const side = input.aimKv40 > hi ? `the heaviest batch these lots make reaches only ${words.kv(hi)} mm²/s` : `the lightest batch these lots make is ${words.kv(lo)} mm²/s`;
    return {
      status: 'infeasible',
      reason: `The aim ν40 ${words.kv(input.aimKv40)} mm²/s cannot be reached with these lots${heel ? ' and this heel' : ''}: ${side} (reachable ${words.kv(lo)}–${words.kv(hi)} mm²/s). Choose an aim in that range, or add a ${input.aimKv40 > hi ? 'heavier' : 'lighter'} stock to the recipe.`,
      reachable: { min: lo, max: hi },
    };
  }
  const f = Array.from(sol.x.subarray(0, n), (v) => (v > 1e-9 ? v : 0));
  if (a >= 0) f[a] = fa;
  const addKg: Record<string, number> = {};
  const addedFractions: Record<string, number> = {};
  const addedTotal = f.reduce((t, v) => t + v, 0);
  let moved = 0;
  stocks.forEach((k, i) => {
    addKg[k.id] = f[i]! * M;
    addedFractions[k.id] = addedTotal > 0 ? f[i]! / addedTotal : 0;
    moved += Math.abs(addedFractions[k.id]! - k.savedFraction);
  });
  const kv40 = blendKv(f);
  const kv100 = blendKv(f, true);
  const litres15 = stocks.reduce((v, k) => v + addKg[k.id]! / k.density15, heel ? heel.massKg / heel.density15 : 0);
  return {
    status: 'optimal',
    addKg,
    addedFractions,
    batch: { massKg: M, litres15, kv40, kv100, vi: kv100 >= VI_MIN_KV100 && kv100 < kv40 ? viscosityIndex(kv40, kv100) : null },
    changePct: 50 * moved,
  };

  /** ν of the batch with additions f (fractions of M) and the heel, at 40 °C or 100 °C. */
  function blendKv(fr: readonly number[], at100 = false): number {
    let sc = heel ? ch * fh : 0;
    let sx = heel ? ch * fh * co.toX(at100 ? heel.kv100 : heel.kv40) : 0;
    fr.forEach((v, i) => {
      sc += c[i]! * v;
      sx += c[i]! * v * co.toX(at100 ? stocks[i]!.kv100 : stocks[i]!.kv40);
    });
    return co.toKv(sx / sc);
  }
}

/** Relative miss of the volume at which the fixed point stops (the LP's rounding is about 1e-8). */
const VOLUME_SETTLED = 1e-9;
/** Relative miss accepted after {@link VOLUME_ROUNDS} rounds: 1e-6 of 5 000 L is 5 mL, far below the sheet's 0.1 L. */
const VOLUME_ACCEPTED = 1e-6;
/** Rounds at most: the bracket halves at least every other round, so 60 reach the LP's own rounding. */
const VOLUME_ROUNDS = 60;

/** {@link AdjustInput} with the batch given as a volume at 15 °C instead of a mass. */
export type AdjustVolumeInput = Omit<AdjustInput, 'batchKg'> & {
  /** Volume of the whole batch (heel included) at 15 °C [L], > 0. */
  batchLitres: number;
};

/**
 * The lot-adjusted recipe for a batch ordered as a volume: the batch mass M is chosen so that the heel
 * and the adjusted additions fill exactly `batchLitres` at 15 °C (module notes: volumes add, ideal
 * mixing, common practice): the root of F(M) = V₁₅(M) − V, started from the saved shares' density by
 * the fixed point M ← H + (V − H/ρ_h)·ρ_add(M), then by secant steps kept inside a bracket that every
 * round narrows (bisection when a step leaves it). The root lies in [H + (V − H/ρ_h)·ρ_min,
 * H + (V − H/ρ_h)·ρ_max] (the additions' density is a weighted harmonic mean of the stocks'). A large
 * heel whose share swings the additions between light and dense stocks made the plain fixed point
 * oscillate without settling (s25 property hunt); usually two or three rounds reach the LP's own rounding
 * (about 1e-8 of V; the closest round is kept and must be within 1e-6 of V).
 *
 * @param input - as {@link adjustRecipe}, with `batchLitres` [L at 15 °C] in place of `batchKg`
 * @returns as {@link adjustRecipe}; `batch.massKg` is the mass that fills the volume and `batch.litres15`
 *   equals `batchLitres` to 1e-6 relative (in practice about 1e-8)
 * @throws BlendbenchInputError when the heel's own volume (H/ρ_h) is not less than the batch's, or the
 *   fixed point does not settle (not seen in practice)
 */
export function adjustRecipeToVolume(input: AdjustVolumeInput): AdjustResult {
  const fn = 'adjustRecipeToVolume';
  const { batchLitres: V, ...rest } = input;
  assertFinite(fn, 'batchLitres', V);
  if (V <= 0) throw new BlendbenchInputError('batchLitres', V, `${fn}: batchLitres = ${V}; a batch must hold more than 0 L`);
  const heel = input.heel ?? null;
  const heelKg = heel ? heel.massKg : 0;
  let heelLitres = 0;
  if (heel) {
    assertFinite(fn, 'heel.massKg', heel.massKg);
    assertDensity15(fn, 'heel.density15', heel.density15);
    heelLitres = heel.massKg / heel.density15;
    if (!(heelLitres < V)) {
      throw new BlendbenchInputError('heel.massKg', heel.massKg, `${fn}: the heel (${heel.massKg} kg, ${heelLitres} L at 15 °C) must fill less than the batch (${V} L)`);
    }
  }
  // Start from the saved shares' density (1/ρ = Σ wᵢ/ρᵢ) for the additions.
  const savedSpecific = input.stocks.reduce((t, k) => t + (Number.isFinite(k.savedFraction) && Number.isFinite(k.density15) && k.density15 > 0 ? k.savedFraction / k.density15 : 0), 0);
  const rhoStart = savedSpecific > 0 ? 1 / savedSpecific : 0.88;
  // The bracket of the root (the additions' density lies between the stocks' extremes).
  const densities = input.stocks.map((k) => k.density15).filter((d) => Number.isFinite(d) && d > 0);
  const room = V - heelLitres;
  let lo = heelKg + room * Math.min(rhoStart, ...densities);
  let hi = heelKg + room * Math.max(rhoStart, ...densities);
  // The LP's own rounding (about 1e-8 of the batch) is the floor; the closest round is kept.
  let best: AdjustResult | null = null;
  let bestMiss = Number.POSITIVE_INFINITY;
  let M = heelKg + room * rhoStart;
  let prev: { M: number; F: number } | null = null;
  // The heel's share H/M moves with M, and with it the ν40 the lots can reach: an aim near the edge of
  // reach can be out of reach at the starting mass yet reached at the mass that fills V. An infeasible
  // round then moves towards a mass known to be feasible (the bracket's ends, then seven masses between
  // them, tried once).
  let refused: AdjustResult | null = null;
  let feasibleAt: number | null = null;
  for (let round = 0; round < VOLUME_ROUNDS; round++) {
    const result = adjustRecipe({ ...rest, batchKg: M });
    if (result.status !== 'optimal') {
      refused ??= result;
      if (feasibleAt === null) {
        const tries = [lo, hi, ...Array.from({ length: 7 }, (_, k) => lo + ((hi - lo) * (k + 1)) / 8)];
        const found = tries.find((m) => m !== M && adjustRecipe({ ...rest, batchKg: m }).status === 'optimal');
        if (found === undefined) return result;
        feasibleAt = found;
      }
      if (feasibleAt > M) lo = M;
      else hi = M;
      M = (lo + hi) / 2;
      prev = null;
      continue;
    }
    feasibleAt = M;
    const F = result.batch.litres15 - V;
    const miss = Math.abs(F);
    if (miss < bestMiss) {
      best = result;
      bestMiss = miss;
    }
    if (miss <= VOLUME_SETTLED * V) return result;
    // More mass fills more litres: a short batch raises the lower end, a full one lowers the upper.
    if (F < 0) lo = Math.max(lo, M);
    else hi = Math.min(hi, M);
    // The fixed-point step M ← H + (V − H/ρ_h)·ρ_add(M); the secant through the last two rounds once
    // there are two; bisection when the step leaves the bracket.
    let next = heelKg + (room * (M - heelKg)) / (result.batch.litres15 - heelLitres);
    if (prev && F !== prev.F) next = M - (F * (M - prev.M)) / (F - prev.F);
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    prev = { M, F };
    M = next;
  }
  if (best && bestMiss <= VOLUME_ACCEPTED * V) return best;
  // The masses the aim can be reached at do not fill V: the aim is out of reach for this volume.
  if (refused) return refused;
  throw new BlendbenchInputError('batchLitres', V, `${fn}: the batch mass for ${V} L did not settle`);
}
