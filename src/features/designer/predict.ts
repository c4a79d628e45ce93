/** Predicted properties of the draft, recomputed by the core on every change (never stored). */
import { displayWords, type NumberDisplay } from '../../core/words/display';
import type { Component, RecipeLine } from '../../core/formulation/model';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { D341Form } from '../../core/viscosity/viscosity-temperature';
import { predictBlend, type BlendProperties } from '../../core/formulation/blend-properties';
import { assessDeposit, type DepositAssessment } from '../../core/scoring/deposit';
import { blendAfterShear, type BlendAfterShear } from '../../core/formulation/shear-blend';
import { recipeInBand, type RecipeInBand } from '../../core/qc/recipe-spread';
import { userMessage } from '../../state/messages';
import { notPredictedWords, unenteredStocks } from '../../core/formulation/entered-values';

export type Prediction =
  | {
      ok: true;
      props: BlendProperties;
      deposit: DepositAssessment | null;
      /** ν40 after permanent (KRL) shear of the polymers and the grade check; an error message when it cannot be assessed. */
      shear: BlendAfterShear | { error: string };
      kv40: number;
      kv100: number;
      /** Blend aniline point [°C], or null when unknown. */
      anilinePoint: number | null;
      /** Oxidation-stability rating 1–5 (Blendbench scale); 1 when the blend has no base fluid. */
      oxidationRating: number;
      /** Stock code by component id (for labels). */
      codes: ReadonlyMap<string, string>;
      /**
       * Probability of landing in the solve band and in the ISO band under the stocks' lot spread
       * (`core/qc`); null without a grade and band, or when it cannot be assessed.
       */
      inBand: RecipeInBand | null;
    }
  | { ok: false; message: string };

/**
 * Predicts a recipe's properties; never throws (a recipe being edited may be incomplete).
 * Lines at 0 % are dropped first so an added-but-unused stock cannot disturb the result. A recipe
 * using a stock whose measured values are not yet entered is not predicted (its placeholders are
 * not data): the message names the stock and the values.
 */
export function predictRecipe(
  lines: readonly RecipeLine[],
  components: readonly Component[],
  method: BlendMethod,
  temps: {
    operatingTempC?: number;
    coldTempC?: number;
    deliveryTempC?: number;
    /** Form of the D341 line for ν at the operating and cold-start temperatures (Settings). */
    d341Form?: D341Form;
    grade?: number;
    band?: { min: number; max: number };
    /** How the prediction's warnings and notes write numbers (the user's settings). */
    display?: NumberDisplay;
  } = {},
): Prediction {
  const used = lines.filter((l) => l.massFraction > 0);
  const words = displayWords(temps.display);
  if (used.length === 0) return { ok: false, message: 'The recipe is empty: add stocks or solve.' };
  // A stock whose measured values are not yet entered holds placeholders: never predicted with.
  const unentered = unenteredStocks(used, components);
  if (unentered.length > 0) {
    return { ok: false, message: `${notPredictedWords(unentered)}. Enter the values on Stocks, or set ${unentered.length === 1 ? 'its share' : 'their shares'} to 0.` };
  }
  try {
    const { grade, band, ...at } = temps;
    const props = predictBlend(components, used, { method, ...at });
    let deposit: DepositAssessment | null = null;
    try {
      deposit = assessDeposit(components, used);
    } catch {
      deposit = null;
    }
    let shear: BlendAfterShear | { error: string };
    try {
      shear = blendAfterShear(components, used, { method, ...(grade === undefined ? {} : { grade }) });
    } catch (e) {
      shear = { error: userMessage(e, { components, words }) };
    }
    return {
      ok: true,
      props,
      deposit,
      shear,
      kv40: props.kv40,
      kv100: props.kv100,
      anilinePoint: props.anilinePoint?.value ?? null,
      oxidationRating: props.oxidationRating ?? 1,
      codes: new Map(used.map((l) => [l.componentId, components.find((c) => c.id === l.componentId)?.code ?? l.componentId])),
      inBand: inBandOf(components, used, method, grade, band),
    };
  } catch (e) {
    return { ok: false, message: userMessage(e, { components, words }) };
  }
}

/** The lot-spread probabilities of a recipe; null when there is no band or they cannot be assessed. */
function inBandOf(
  components: readonly Component[],
  used: readonly RecipeLine[],
  method: BlendMethod,
  grade: number | undefined,
  band: { min: number; max: number } | undefined,
): RecipeInBand | null {
  if (grade === undefined || band === undefined) return null;
  try {
    const total = used.reduce((s, l) => s + l.massFraction, 0);
    if (Math.abs(total - 1) > 1e-6) return null;
    return recipeInBand(components, used, grade, band, method);
  } catch {
    return null;
  }
}
