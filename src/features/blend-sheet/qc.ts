/**
 * The blend sheet's QC loop, derived from the stored entries (never stored): the recipe adjusted to
 * the lots in the tanks and the heel in the vessel, and the correction of a batch that missed.
 * Every number comes from the core (`core/qc`); this file only maps the sheet's entries onto it.
 */
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendTargets, Component, Recipe } from '../../core/formulation/model';
import { blendingViscosities } from '../../core/formulation/blend-properties';
import { notPredictedWords, unenteredStocks } from '../../core/formulation/entered-values';
import { pricePerKg } from '../../core/formulation/cost';
import { gradeBand } from '../../core/viscosity/iso-grades';
import { viscosityIndex } from '../../core/viscosity/viscosity-index';
import { adjustRecipe, adjustRecipeToVolume, type AdjustResult, type AdjustStock } from '../../core/qc/adjust';
import { CORRECTION_EDGE_MARGIN_PCT, correctBatchPlain, correctionBand, type CorrectionProblem, type CorrectionResult } from '../../core/qc/correction';
import type { QcInputs } from '../../state';
import { userMessage } from '../../state/messages';
import { displayWords, type NumberDisplay } from '../../core/words/display';

/**
 * Why a ν40/ν100 pair cannot be one oil, in the user's words, or null when ν100 is below ν40:
 * "BW-190: ν100 (31.8 mm²/s, library) must be below ν40 (20 mm²/s, lot) — …". `src` names where each
 * value comes from when the two may differ (a lot value against the library's).
 */
export function pairProblem(
  who: string,
  kv40: number,
  kv100: number,
  words: { say: (x: number) => string },
  src: { kv40?: string; kv100?: string } = {},
): string | null {
  if (!(kv100 >= kv40)) return null;
  const from = (t?: string) => (t ? `, ${t}` : '');
  return `${who}: ν100 (${words.say(kv100)} mm²/s${from(src.kv100)}) must be below ν40 (${words.say(kv40)} mm²/s${from(src.kv40)}) — a viscosity falls as the oil warms.`;
}

/** Density at 15 °C assumed for a heel whose density is not entered [kg/L] (common practice, no source). */
export const HEEL_DEFAULT_DENSITY = 0.88;

/** Default half-width of the band a correction aims into, around the aim [%] (common practice, no source). */
export const DEFAULT_CORRECTION_BAND_PCT = 2;

/** The stock and the treat rate of the recipe's additive package (its first additive line), or null. */
export function recipeAdditive(recipe: Recipe, byId: ReadonlyMap<string, Component>): { id: string; massFraction: number } | null {
  const line = recipe.lines.find((l) => l.massFraction > 0 && byId.get(l.componentId)?.category === 'additive-package');
  return line ? { id: line.componentId, massFraction: line.massFraction } : null;
}

/** The aim ν40 [mm²/s]: the entered one, else the grade mid-point. */
export function aimOf(recipe: Recipe, qc: QcInputs): number {
  if (qc.aimKv40 !== null) return qc.aimKv40;
  try {
    return gradeBand(recipe.grade).mid;
  } catch {
    return recipe.grade;
  }
}

/** Whether any lot value, a heel or an aim is entered (then the sheet charges the adjusted recipe). */
export function hasAdjustment(qc: QcInputs): boolean {
  const lot = Object.values(qc.lots).some((l) => l.kv40 !== null || l.kv100 !== null || l.density15 !== null);
  return lot || (qc.heel.massKg ?? 0) > 0 || qc.aimKv40 !== null;
}

/** A stock with the values of the lot in its tank: measured where entered, else the library's. */
export interface LotValues {
  id: string;
  code: string;
  kv40: number;
  kv100: number;
  density15: number;
  /** Which values were measured. */
  measured: { kv40: boolean; kv100: boolean; density15: boolean };
}

/** Lot values of the recipe's stocks (library values where nothing was measured). */
export function lotValues(recipe: Recipe, byId: ReadonlyMap<string, Component>, qc: QcInputs): LotValues[] {
  return recipe.lines
    .filter((l) => l.massFraction > 0)
    .map((l) => {
      const c = byId.get(l.componentId);
      if (!c) throw new Error(`the recipe names a stock that is no longer in the library (${l.componentId})`);
      const own = blendingViscosities(c);
      const lot = qc.lots[c.id];
      return {
        id: c.id,
        code: c.code,
        kv40: lot?.kv40 ?? own.kv40,
        kv100: lot?.kv100 ?? own.kv100,
        density15: lot?.density15 ?? c.density15,
        measured: { kv40: lot?.kv40 != null, kv100: lot?.kv100 != null, density15: lot?.density15 != null },
      };
    });
}

/** The first lot whose ν100 is not below its ν40 (lot or library values), in words, or null. */
function lotPairProblem(lots: readonly LotValues[], words: { say: (x: number) => string }): string | null {
  for (const l of lots) {
    const src = (measured: boolean) => (measured ? 'lot' : 'library');
    const p = pairProblem(l.code, l.kv40, l.kv100, words, { kv40: src(l.measured.kv40), kv100: src(l.measured.kv100) });
    if (p) return p;
  }
  return null;
}

/** The adjusted recipe, or why there is none. */
export type Adjusted = { result: AdjustResult; lots: LotValues[]; aim: number; heelKg: number } | { error: string };

/**
 * The recipe re-solved for the lots, the heel and the aim (least change from the saved shares).
 *
 * @param batch - the batch, heel included: its mass `{ kg }` [kg], or `{ litres }` at 15 °C [L] — then the
 *   mass is the one that the heel and the adjusted additions fill exactly (lot densities, `adjustRecipeToVolume`)
 * @returns null when nothing is entered; else the core's answer or the message why it cannot be worked out
 */
export function adjustedRecipe(
  recipe: Recipe,
  components: readonly Component[],
  qc: QcInputs,
  batch: { kg: number } | { litres: number },
  method: BlendMethod,
  display?: NumberDisplay,
): Adjusted | null {
  if (!hasAdjustment(qc)) return null;
  const words = displayWords(display);
  const byId = new Map(components.map((c) => [c.id, c]));
  // A stock whose measured values are not yet entered: its placeholders are never solved with.
  const unentered = unenteredStocks(recipe.lines, components);
  if (unentered.length > 0) {
    return { error: `${notPredictedWords(unentered)}: the recipe is not adjusted to the lots until the values are entered on Stocks.` };
  }
  try {
    const lots = lotValues(recipe, byId, qc);
    const lotPair = lotPairProblem(lots, words);
    if (lotPair) return { error: lotPair };
    const aim = aimOf(recipe, qc);
    const additive = recipeAdditive(recipe, byId);
    const h = qc.heel;
    const heelKg = h.massKg ?? 0;
    let heel = null;
    if (heelKg > 0) {
      if (h.kv40 === null || h.kv100 === null) return { error: 'Enter the heel’s ν40 and ν100 (measured, or from the recipe it was made to).' };
      const heelPair = pairProblem('Heel', h.kv40, h.kv100, words);
      if (heelPair) return { error: heelPair };
      heel = {
        massKg: heelKg,
        kv40: h.kv40,
        kv100: h.kv100,
        density15: h.density15 ?? HEEL_DEFAULT_DENSITY,
        additiveFraction: h.additiveFraction ?? additive?.massFraction ?? 0,
      };
    }
    const stocks: AdjustStock[] = lots.map((l) => ({
      id: l.id,
      label: l.code,
      kv40: l.kv40,
      kv100: l.kv100,
      density15: l.density15,
      savedFraction: recipe.lines.find((x) => x.componentId === l.id)!.massFraction,
    }));
    const sum = stocks.reduce((s, x) => s + x.savedFraction, 0);
    stocks.forEach((x) => (x.savedFraction /= sum));
    const common = { stocks, aimKv40: aim, additive, heel, method, ...(display ? { display } : {}) };
    const result = 'kg' in batch ? adjustRecipe({ ...common, batchKg: batch.kg }) : adjustRecipeToVolume({ ...common, batchLitres: batch.litres });
    return { result, lots, aim, heelKg };
  } catch (e) {
    return { error: userMessage(e, { components, words }) };
  }
}

/** ν100 at which a batch of measured ν40 keeps the VI `vi` (bisection on ASTM D2270; null if none). */
export function kv100AtVi(kv40: number, vi: number): number | null {
  let lo = 2.0;
  let hi = kv40 * 0.999;
  const f = (kv100: number) => viscosityIndex(kv40, kv100) - vi;
  try {
    if (f(lo) > 0 || f(hi) < 0) return null;
    for (let k = 0; k < 80; k++) {
      const mid = (lo + hi) / 2;
      if (f(mid) < 0) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  } catch {
    return null;
  }
}

/** The correction worked out, with the problem it solved (for the printed sheet). */
export type Correction =
  | {
      problem: CorrectionProblem;
      result: CorrectionResult;
      /** The band aimed into: the aim ± its half-width, CORRECTION_EDGE_MARGIN_PCT inside each release limit. */
      band: { min: number; max: number };
      /** The release band it lies in. */
      releaseBand: { min: number; max: number };
      kv100Estimated: boolean;
      codes: ReadonlyMap<string, string>;
    }
  | { error: string };

/**
 * The correction of a batch that missed: the additions that bring it into the band around the aim
 * (within the release band) at least cost or least added mass, the additive topped up in proportion.
 *
 * @param releaseBand - the sheet's ν40 release band [mm²/s]
 * @param predicted - the recipe's predicted ν40 and VI (a missing ν100 is estimated at this VI)
 * @param batchKg - the batch size [kg] (the mass in the vessel when none is entered)
 * @returns null until a measured ν40 is entered
 */
export function correctionFor(
  recipe: Recipe,
  components: readonly Component[],
  qc: QcInputs,
  opts: {
    releaseBand: { min: number; max: number };
    predictedVi: number | null;
    batchKg: number | null;
    targets: BlendTargets | null;
    method: BlendMethod;
    /** The user's number style for the reasons (default ".", °C). */
    display?: NumberDisplay;
  },
): Correction | null {
  const c = qc.correction;
  const words = displayWords(opts.display);
  if (c.kv40 === null) return null;
  const byId = new Map(components.map((x) => [x.id, x]));
  // The batch's stocks and those allowed for the correction: none may be one whose measured values
  // are not yet entered (its placeholders are never solved with).
  const candidates = [...recipe.lines, ...c.stockIds.map((componentId) => ({ componentId, massFraction: 1 }))];
  const unentered = unenteredStocks(candidates, components);
  if (unentered.length > 0) {
    return { error: `${notPredictedWords(unentered)}: no correction is worked out until the values are entered on Stocks${c.stockIds.some((x) => unentered.some((u) => u.id === x)) ? ' (or the stock is removed from those allowed)' : ''}.` };
  }
  try {
    const massKg = c.massKg ?? opts.batchKg;
    if (massKg === null || !(massKg > 0)) return { error: 'Enter the mass of the batch in the vessel.' };
    if (c.vesselLimitKg !== null && c.vesselLimitKg < massKg) {
      return { error: `The vessel limit (${words.say(c.vesselLimitKg)} kg) is below the ${words.say(massKg)} kg already in it.` };
    }
    let kv100 = c.kv100;
    const kv100Estimated = kv100 === null;
    if (kv100 === null) {
      kv100 = opts.predictedVi === null ? null : kv100AtVi(c.kv40, opts.predictedVi);
      if (kv100 === null) return { error: 'Enter the batch’s measured ν100 as well (it cannot be estimated from the recipe’s VI).' };
    } else {
      const batchPair = pairProblem('The batch', c.kv40, kv100, words);
      if (batchPair) return { error: batchPair };
    }
    const aim = aimOf(recipe, qc);
    const bPct = c.bandPct ?? DEFAULT_CORRECTION_BAND_PCT;
    // Aimed at least CORRECTION_EDGE_MARGIN_PCT inside each release limit: a least-cost correction
    // lands on the edge of the band it is given, never on the release limit itself.
    const band = correctionBand(aim, bPct, opts.releaseBand);
    if (!band) {
      return {
        error:
          `The aim ${words.say(aim)} mm²/s ± ${words.say(bPct)} % does not reach inside the release band ${words.say(opts.releaseBand.min)}–${words.say(opts.releaseBand.max)} mm²/s ` +
          `with the correction’s margin of ${words.say(CORRECTION_EDGE_MARGIN_PCT)} % inside each limit: set an aim further inside the band.`,
      };
    }
    const lo = band.min;
    const hi = band.max;
    const lotList = lotValues(recipe, byId, qc);
    const lotPair = lotPairProblem(lotList, words);
    if (lotPair) return { error: lotPair };
    const lots = new Map(lotList.map((l) => [l.id, l]));
    const ids = [...new Set([...recipe.lines.filter((l) => l.massFraction > 0).map((l) => l.componentId), ...c.stockIds])];
    const additive = recipeAdditive(recipe, byId);
    const codes = new Map<string, string>();
    const stocks = ids.flatMap((id) => {
      const k = byId.get(id);
      if (!k) return [];
      const own = blendingViscosities(k);
      const lot = lots.get(id);
      codes.set(k.code, id);
      const onHand = c.onHandKg[id];
      return [
        {
          id: k.code,
          kv40: lot?.kv40 ?? own.kv40,
          kv100: lot?.kv100 ?? own.kv100,
          density15: lot?.density15 ?? k.density15,
          anilinePoint: k.anilinePoint ?? 0,
          pricePerKg: pricePerKg(k.price, k.density15),
          ...(onHand === null || onHand === undefined ? {} : { maxAddKg: onHand }),
        },
      ];
    });
    const problem: CorrectionProblem = {
      vessel: { massKg, kv40: c.kv40, kv100, density15: recipe.lines.length ? densityOf(recipe, byId) : 0.88, anilinePoint: 0 },
      components: stocks,
      targetKv40: (lo + hi) / 2,
      tolerancePct: hi + lo > 0 ? ((hi - lo) / (hi + lo)) * 100 : 0,
      objective: c.objective,
      ...(additive ? { additive: { id: byId.get(additive.id)!.code, massFraction: additive.massFraction } } : {}),
      ...(c.vesselLimitKg === null ? {} : { maxFinalMassKg: c.vesselLimitKg }),
      ...(minViOf(recipe, opts.targets) === null ? {} : { minVi: minViOf(recipe, opts.targets)! }),
      ...(opts.display ? { display: opts.display } : {}),
    };
    return { problem, result: correctBatchPlain(problem, opts.method), band: { min: lo, max: hi }, releaseBand: { ...opts.releaseBand }, kv100Estimated, codes };
  } catch (e) {
    return { error: userMessage(e, { components, words }) };
  }
}

/**
 * The least VI a correction may leave: the stricter of the recipe's solve constraint and its product
 * specification's release minimum (a correction that lands below the specification cannot be released).
 */
function minViOf(recipe: Recipe, targets: BlendTargets | null): number | null {
  const limits = [targets?.minVi ?? null, recipe.specification.viMin].filter((v): v is number => v !== null);
  return limits.length === 0 ? null : Math.max(...limits);
}

/** Blend density of the recipe by ideal mixing [kg/L]. */
function densityOf(recipe: Recipe, byId: ReadonlyMap<string, Component>): number {
  let v = 0;
  let m = 0;
  for (const l of recipe.lines) {
    const c = byId.get(l.componentId);
    if (!c || l.massFraction <= 0) continue;
    m += l.massFraction;
    v += l.massFraction / c.density15;
  }
  return v > 0 ? m / v : 0.88;
}
