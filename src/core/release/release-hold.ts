/**
 * The release hold of a blend sheet: every reason a plant copy must not be used to make product for
 * release, collected in one place so the screen (before printing) and the printed sheet say the same.
 *
 * A recipe is held ("HOLD — not for release") when any of these holds:
 * - it is not an approved, current recipe (a draft, a superseded revision, or archived);
 * - its product specification was written for another grade, or for a grade not known (the sheet
 *   then prints no limit of it: `specification-grade.ts`);
 * - it names a stock that is withdrawn or no longer in the library;
 * - it uses a stock whose measured values (ν40, ν100, density) are not yet entered: its prediction
 *   rests on placeholders, not data (`formulation/entered-values.ts`), so the checks below are not made;
 * - its properties cannot be predicted;
 * - the prediction misses one of the recipe's own constraints (its solve targets: ν40 band, minimum
 *   VI, maximum aniline point, polymer cap, pour and flash limits, per-stock limits, treat rate),
 *   rechecked with the solver's own tolerances (`checkConstraints`);
 * - the prediction misses a release limit of the QC table (the plant's ν40 aim inside the ISO 3448
 *   band, or a limit of the product specification).
 * Common practice (no source): a sheet that cannot be expected to pass, or whose recipe nobody has
 * approved, is not a production document. Predictions remain estimates either way: a sheet without
 * a hold still needs the laboratory's release.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import type { BlendProperties } from '../formulation/blend-properties';
import type { BlendTargets, Component, Recipe } from '../formulation/model';
import { RECIPE_STATUS_LABEL } from '../formulation/model';
import { entryFieldsInWords, notEnteredFields } from '../formulation/entered-values';
import { checkConstraints, checkInWords, prepareComponents } from '../solver/solve-blend';
import { formatFixed, type NumberDisplay } from '../words/display';
import { predictBlend } from '../formulation/blend-properties';
import { printableSpecification, specificationGradeIssue, specificationGradeMessage } from '../recipes/specification-grade';
import { qcReleaseTargets, sheetPrediction, type QcRow, type SheetTemperatureUnit } from '../sheet/blend-sheet';

/**
 * What kind of reason holds a sheet. `batch-adjustment`: lots, a heel or an aim were entered for the
 * batch but the recipe could not be adjusted to them, so the printed table would not match the vessel.
 */
export type HoldKind =
  | 'status'
  | 'archived'
  | 'specification'
  | 'withdrawn-stock'
  | 'missing-stock'
  | 'unentered-stock'
  | 'no-prediction'
  | 'constraint'
  | 'release-limit'
  | 'batch-adjustment';

/** One reason, in the user's words. */
export interface HoldReason {
  kind: HoldKind;
  message: string;
}

/** The name of the state, as printed and shown on the Print button. */
export const RELEASE_HOLD_LABEL = 'HOLD — not for release';

export interface ReleaseHoldInput {
  recipe: Recipe;
  /** The library (withdrawn stocks included). */
  components: readonly Component[];
  /** The recipe's own solve targets; null → none stored (no constraint reasons). */
  targets: BlendTargets | null;
  /** The prediction, or the message of the error that stopped it; null → not given (constraints not rechecked). */
  prediction: BlendProperties | { error: string } | null;
  /** The QC rows printed on the sheet (their `predictedOutsideTarget` verdicts), or null. */
  qcRows: readonly QcRow[] | null;
  /** Mixing rule the prediction used (for re-checking the constraints). */
  method: BlendMethod;
  /** The recipe that supersedes this one, when there is one (for the message). */
  supersededBy?: Recipe | null;
  /** How the reasons write numbers and temperatures (the user's decimal separator and unit; default ".", °C). */
  display?: NumberDisplay;
}

/**
 * Every reason the recipe's sheet is not for release; empty → no hold (laboratory release still
 * required).
 *
 * @param input - recipe, library, own targets, prediction, QC rows, mixing rule
 * @returns the reasons, in the order listed in the module comment
 * @example releaseHoldReasons({ recipe: draft, … })[0].message // → 'The recipe is a draft: it has not been approved.'
 */
export function releaseHoldReasons(input: ReleaseHoldInput): HoldReason[] {
  const { recipe, components } = input;
  const out: HoldReason[] = [];
  if (recipe.status === 'draft') {
    out.push({ kind: 'status', message: 'The recipe is a draft: it has not been approved.' });
  } else if (recipe.status === 'superseded') {
    const by = input.supersededBy;
    out.push({
      kind: 'status',
      message: `The recipe is superseded${by ? ` by “${by.name}” (revision ${by.revision})` : ''}: print the current revision.`,
    });
  } else if (recipe.status !== 'approved') {
    out.push({ kind: 'status', message: `The recipe's status is ${RECIPE_STATUS_LABEL[recipe.status] ?? String(recipe.status)}.` });
  }
  if (recipe.archived) out.push({ kind: 'archived', message: 'The recipe is archived.' });
  const specIssue = specificationGradeIssue(recipe);
  if (specIssue) out.push({ kind: 'specification', message: specificationGradeMessage(specIssue) });

  const byId = new Map(components.map((c) => [c.id, c]));
  const used = recipe.lines.filter((l) => l.massFraction > 0);
  const withdrawn = used.map((l) => byId.get(l.componentId)).filter((c): c is Component => c?.availability === 'withdrawn');
  if (withdrawn.length > 0) {
    const codes = withdrawn.map((c) => c.code).join(', ');
    out.push({
      kind: 'withdrawn-stock',
      message: `It uses ${withdrawn.length === 1 ? 'a withdrawn stock' : 'withdrawn stocks'}: ${codes}.`,
    });
  }
  const missing = used.filter((l) => !byId.has(l.componentId));
  if (missing.length > 0) {
    out.push({
      kind: 'missing-stock',
      message: `It names ${missing.length === 1 ? 'a stock' : `${missing.length} stocks`} no longer in the library.`,
    });
  }

  const unentered = used
    .map((l) => byId.get(l.componentId))
    .filter((c): c is Component => c !== undefined && notEnteredFields(c).length > 0);
  if (unentered.length > 0) {
    // Its prediction rests on placeholders: not checked against the recipe's constraints or limits.
    out.push({ kind: 'unentered-stock', message: `${unenteredMessage(unentered, 'It uses')} Its limits are checked once they are entered.` });
    return out;
  }

  const p = input.prediction;
  if (p !== null && 'error' in p) {
    out.push({ kind: 'no-prediction', message: `Its properties cannot be predicted: ${p.error}` });
    return out;
  }

  if (input.targets && p !== null) {
    // Prices play no part in a release check: give every stock the same neutral price so that a
    // currency question cannot stop it.
    const neutral = components.map((c) => ({ ...c, price: { amount: 0, basis: 'per-kg' as const, currency: 'neutral' } }));
    try {
      const P = prepareComponents(neutral, { ...input.targets, objective: 'cost', referenceRecipeId: null }, input.method);
      const missed = checkConstraints(P, recipe.lines, p).filter((c) => !c.ok && !c.constraint.endsWith(' not usable'));
      for (const c of missed) out.push({ kind: 'constraint', message: `It misses its own constraint — ${checkInWords(c, input.display)}.` });
    } catch (e) {
      out.push({ kind: 'constraint', message: `Its own constraints cannot be checked: ${e instanceof Error ? e.message : String(e)}` });
    }
  }

  for (const r of input.qcRows ?? []) {
    if (!r.predictedOutsideTarget) continue;
    const unit = r.unit ? ` ${r.unit}` : '';
    out.push({ kind: 'release-limit', message: `The prediction misses a release limit — ${r.property}: predicted ${r.predicted}${unit}, limit ${r.target}.` });
  }
  return out;
}

/** "<lead> a stock whose measured values are not yet entered: NEW (ν40, ν100 and density)." */
function unenteredMessage(stocks: readonly Component[], lead: string): string {
  const named = stocks.map((c) => `${c.code} (${entryFieldsInWords(notEnteredFields(c))})`).join('; ');
  return `${lead} ${stocks.length === 1 ? 'a stock whose measured values are' : 'stocks whose measured values are'} not yet entered: ${named}.`;
}

/**
 * The reasons a batch correction sheet is held: every reason of the recipe's own blend sheet (the
 * batch was made from that recipe, so it is released on the same terms), and each stock the
 * correction adds that is withdrawn in the library or whose measured values are not yet entered.
 * Common practice (no source).
 *
 * @param sheetHold - the blend sheet's hold reasons for the recipe ({@link releaseHoldReasons})
 * @param addedCodes - codes of the stocks the correction adds (more than 0 kg)
 * @param components - the library (withdrawn stocks included)
 * @returns the sheet's reasons, then one reason naming the withdrawn additions and one naming those
 *   with values not entered (if any); empty → no hold
 * @example correctionHoldReasons([], ['BW-191'], lib) // → [{ kind: 'withdrawn-stock', message: 'The correction adds a withdrawn stock: BW-191.' }]
 */
export function correctionHoldReasons(
  sheetHold: readonly HoldReason[],
  addedCodes: readonly string[],
  components: readonly Component[],
): HoldReason[] {
  const withdrawn = new Set(components.filter((c) => c.availability === 'withdrawn').map((c) => c.code));
  const added = addedCodes.filter((c) => withdrawn.has(c));
  const out = [...sheetHold];
  if (added.length > 0) {
    const what = added.length === 1 ? 'a withdrawn stock' : 'withdrawn stocks';
    out.push({ kind: 'withdrawn-stock', message: `The correction adds ${what}: ${added.join(', ')}.` });
  }
  const byCode = new Map(components.map((c) => [c.code, c]));
  const unentered = addedCodes.map((code) => byCode.get(code)).filter((c): c is Component => c !== undefined && notEnteredFields(c).length > 0);
  if (unentered.length > 0) out.push({ kind: 'unentered-stock', message: unenteredMessage(unentered, 'The correction adds') });
  return out;
}

/** A recipe's prediction, QC table and release hold, computed together (as the blend sheet shows them). */
export interface ReleaseAssessment {
  /** The prediction, or the message of the error that stopped it. */
  prediction: BlendProperties | { error: string };
  /** The QC rows, or null when the prediction failed or the grade is not tabulated. */
  qcRows: QcRow[] | null;
  /** Every reason for a hold; empty → no hold. */
  reasons: HoldReason[];
}

/**
 * Predicts a recipe, builds its QC table from its specification and collects its release hold —
 * the same composition the blend sheet prints, for screens that only need the verdict.
 *
 * @param input - recipe, library, own targets, mixing rule, optional operating temperature [°C],
 *   the display style (decimal separator, grouping, temperature unit) and the superseding recipe
 * @returns prediction, QC rows, hold reasons
 */
export function assessRelease(
  input: Omit<ReleaseHoldInput, 'prediction' | 'qcRows'> & {
    operatingTempC?: number;
    /** Words for an error that stops the prediction (default: its message). */
    sayError?: (e: unknown) => string;
  },
): ReleaseAssessment {
  const say = input.sayError ?? ((e: unknown) => (e instanceof Error ? e.message : String(e)));
  let prediction: BlendProperties | { error: string };
  let qcRows: QcRow[] | null = null;
  try {
    prediction = predictBlend(input.components, input.recipe.lines, { method: input.method, operatingTempC: input.operatingTempC });
  } catch (e) {
    prediction = { error: say(e) };
  }
  if (!('error' in prediction)) {
    try {
      qcRows = qcReleaseTargets(input.recipe.grade, sheetPrediction(prediction), {
        // Another grade's limits are never printed (the hold says why).
        specification: printableSpecification(input.recipe),
        ...(input.display?.temperatureUnit ? { temperatureUnit: input.display.temperatureUnit } : {}),
        formatNumber: (x, d) => formatFixed(x, d, input.display),
      });
    } catch (e) {
      prediction = { error: say(e) };
    }
  }
  return { prediction, qcRows, reasons: releaseHoldReasons({ ...input, prediction, qcRows }) };
}
