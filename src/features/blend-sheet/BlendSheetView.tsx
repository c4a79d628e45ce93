// The printable blend sheet. Presentational: everything it shows comes from its props and the pure
// core (`core/blend-sheet.ts`); the screen wrapper (`BlendSheetScreen.tsx`) wires it to the stores.
import { signedText } from '../../core/words/signed';
import { SheetFooter } from './SheetFooter';
import { displayWords, formatFixed, type NumberDisplay } from '../../core/words/display';
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { flushSync } from 'react-dom';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendProperties } from '../../core/formulation/blend-properties';
import type { BlendTargets, Component, Recipe } from '../../core/formulation/model';
import { RECIPE_STATUS_LABEL } from '../../core/formulation/model';
import { describeRate, priceLibraryInBase, pricingFor, rateDecimals, unpricedMessage, type ExchangeRate } from '../../core/currency/exchange-rates';
import { correctionHoldReasons, releaseHoldReasons, RELEASE_HOLD_LABEL, type HoldReason } from '../../core/release/release-hold';
import { identityChangeWords, stockBasisChanges, type StockFieldChange } from '../../core/recipes/stock-basis';
import { printableSpecification, specificationGradeIssue } from '../../core/recipes/specification-grade';
import { shareChanges } from '../../core/recipes/share-changes';
import {
  blendSheetCsvRows,
  buildBlendSheet,
  defaultBlendingInstructions,
  limitText,
  qcReleaseTargets,
  type BlendSheet,
  type QcRow,
  type SheetPrediction,
} from '../../core/sheet/blend-sheet';
import { DEFAULT_QC_INPUTS, DEFAULT_SHEET_INPUTS, sayRefusal, type QcInputs, type SheetInputs } from '../../state';
import { BLEND_METHOD_LABEL } from '../../core/blending/blend-viscosity';
import { recipeInBand, type RecipeInBand } from '../../core/qc/recipe-spread';
import { QcPanel } from './QcPanel';
import { parseEntry, parseNumber, probabilityText } from '../../components/format';
import { methodText } from '../../components/notices';
import { CorrectionSheet, correctedKv100Outside } from './CorrectionSheet';
import { HEEL_DEFAULT_DENSITY, adjustedRecipe, correctionFor, hasAdjustment, recipeAdditive } from './qc';
import { firstProblem, sheetProblems } from '../../state/field-rules';
import { userMessage } from '../../state/messages';
import { csvFileName, downloadCsv, holdCsvRecord, toCsv } from './csv';
import { longClass, pageRule } from './page-header';
import { densityNotEntered, unenteredStocks } from '../../core/formulation/entered-values';
import { csvWithoutLitres, litreBatchRefusal, litresNotGivenSentence, NO_PREDICTION, notPredictedSentence, withoutPrediction } from './unentered';
import '../../components/print.css';
import './blend-sheet.css';

export type PaperSize = 'a4' | 'letter';
export type CopyKind = 'plant' | 'costing';

export interface BlendSheetViewProps {
  components: readonly Component[];
  recipes: readonly Recipe[];
  /** The recipe shown; null → the first recipe. */
  recipeId: string | null;
  onRecipeChange?: (id: string) => void;
  /** Company name printed at the head of the sheet (from settings). */
  companyName: string;
  /**
   * Predicted properties of a recipe (with the prediction's own cautions and, when available, the full
   * core prediction used to recheck the recipe's own constraints); may throw with a message the sheet shows.
   */
  predict: (recipe: Recipe) => SheetPrediction & { warnings?: readonly string[]; properties?: BlendProperties };
  /** Solve targets (the recipe's own constraints) by recipe id; a recipe without targets is held only on the other reasons. */
  targets?: Readonly<Record<string, BlendTargets>>;
  /** Mixing rule of the prediction (rechecks the constraints with it); default Refutas. */
  method?: BlendMethod;
  /** Base currency and exchange rates (Settings): every cost is restated in the base currency. */
  exchange?: { base: string; rates: readonly ExchangeRate[] };
  /** Metering temperature [°C] (Settings): adds a "L at t" column (ASTM D1250-80 Table 54D). */
  meteringTempC?: number;
  /** Delivery temperature [°C] for the costing copy's cost per delivered litre; default 15 °C (none shown). */
  deliveryTempC?: number;
  /** Today's date, ISO YYYY-MM-DD (the default date of the sheet). */
  today: string;
  /** Formats a number with a fixed number of decimals; default "." with grouped thousands ("12 345.6"). */
  formatNumber?: (x: number, decimals: number) => string;
  /** Unit the sheet prints temperatures in (heat-to, operating temperature, flash, pour, aniline); default °C. */
  temperatureUnit?: 'C' | 'F';
  /**
   * The user's number style (decimal separator, grouping, temperature unit) for the sentences the core
   * composes: the hold's reasons and the QC loop's reasons. Default ".", no grouping, `temperatureUnit`.
   */
  display?: NumberDisplay;
  /**
   * Saved header fields and edited instructions by recipe id, with the setter that saves them. Without
   * them the sheet keeps its fields for as long as it is shown.
   */
  sheetInputs?: Readonly<Record<string, SheetInputs>>;
  /** Saves the fields; returns null, or why they were refused (the stored value is kept). */
  onSheetInputsChange?: (
    recipeId: string,
    patch: Partial<SheetInputs>,
    parseBatch?: (text: string) => number | null,
  ) => string | null | void;
  /** Saved QC-loop entries by recipe id, with the setter that saves them (returns null or why refused). */
  qcInputs?: Readonly<Record<string, QcInputs>>;
  onQcInputsChange?: (recipeId: string, patch: Partial<QcInputs>) => string | null;
  /** Called instead of `window.print()` (tests); told which document is printed. */
  onPrint?: (doc?: 'sheet' | 'correction') => void;
  /** Called instead of the browser download with the CSV text and file name (tests). */
  onExportCsv?: (csv: string, fileName: string) => void;
}

/** A stock's value as recorded or now, in the user's decimal separator and temperature unit (as entered: up to six significant figures). */
function changedValue(v: number | null, unit: StockFieldChange['unit'], display: NumberDisplay): string {
  if (v === null) return '—';
  const w = displayWords(display);
  return unit === '°C' ? w.sayTemp(v) : `${w.say(v)} ${unit}`;
}

/** Without the user's formatter: the app's default style ("." and grouped thousands, "12 345.6"). */
const defaultFormat = (x: number, d: number) => formatFixed(x, d, { thousandsGrouping: true });

/** Sheet fields typed as text (a refused value stays shown in its field with the message). */
type TypedField = 'lot' | 'vessel' | 'batchSize' | 'instructions';

/**
 * A reader of the batch size as typed, with the decimal separator of the settings (never guessed:
 * `parseEntry`): the number, null when blank, NaN when it cannot be read.
 */
function batchSizeReader(sep: '.' | ','): (text: string) => number | null {
  return (text) => parseNumber(text, sep);
}

/** Why a typed sheet field was not saved; the stored value is kept. */
function Refusal({ id, message }: { id: string; message: string | null }) {
  if (!message) return null;
  return (
    <span id={id} className="bs-no-print bs-field-error" role="alert">
      {message}. Not saved; the last saved value is kept.
    </span>
  );
}

function errorText(e: unknown, components: readonly Component[], display: NumberDisplay): string {
  return userMessage(e, { components, words: displayWords(display) });
}

export function BlendSheetView(props: BlendSheetViewProps) {
  const { components, recipes, companyName, predict, today } = props;
  const fmt = props.formatNumber ?? defaultFormat;
  const id = useId();
  const savedRecipe = recipes.find((r) => r.id === props.recipeId) ?? recipes.find((r) => !r.archived) ?? recipes[0] ?? null;
  // A specification written for another grade (or an unknown one) is never printed: the sheet shows
  // the recipe with a blank one ("Per specification") and the hold says why.
  const recipe = useMemo(
    () => (savedRecipe && specificationGradeIssue(savedRecipe) ? { ...savedRecipe, specification: printableSpecification(savedRecipe) } : savedRecipe),
    [savedRecipe],
  );
  const pickable = recipes.filter((r) => !r.archived || r.id === recipe?.id);

  const [date, setDate] = useState(today);
  const [copy, setCopy] = useState<CopyKind>('plant');
  const [paper, setPaper] = useState<PaperSize>('a4');
  const [editingSteps, setEditingSteps] = useState(false);
  /** Which document the printer gets: the blend sheet or the correction sheet. */
  const [printDoc, setPrintDoc] = useState<'sheet' | 'correction'>('sheet');
  const [localQc, setLocalQc] = useState<Record<string, QcInputs>>({});
  /** Fields typed on this visit when the caller does not save them (by recipe id). */
  const [localInputs, setLocalInputs] = useState<Record<string, SheetInputs>>({});
  const tUnit = props.temperatureUnit ?? 'C';
  const display = useMemo((): NumberDisplay => props.display ?? { temperatureUnit: tUnit }, [props.display, tUnit]);
  const saved = recipe ? (props.sheetInputs ?? localInputs)[recipe.id] : undefined;
  const { batchSize, batchUnit, lot, vessel, instructions } = saved ?? DEFAULT_SHEET_INPUTS;
  // A typed value the field rules refuse stays in its field with the message; the stored value is kept.
  /** Why the last print or export was not made (an entry on this screen was refused), or null. */
  const [notSent, setNotSent] = useState<string | null>(null);
  const screenRef = useRef<HTMLElement>(null);
  // The notice goes once no field of the screen holds a refused entry any more (corrected or cleared),
  // so it never stands beside fields that are all saved.
  useEffect(() => {
    const root = screenRef.current;
    if (notSent === null || !root) return;
    const watch = new MutationObserver(() => {
      if (!root.querySelector('[aria-invalid="true"]')) setNotSent(null);
    });
    watch.observe(root, { subtree: true, childList: true, attributes: true, attributeFilter: ['aria-invalid'] });
    return () => watch.disconnect();
  }, [notSent]);
  const [refused, setRefused] = useState<{ recipeId: string; field: TypedField; text: string; message: string } | null>(null);
  const draft = (field: TypedField, stored: string): string =>
    refused && recipe && refused.recipeId === recipe.id && refused.field === field ? refused.text : stored;
  const refusal = (field: TypedField): string | null =>
    refused && recipe && refused.recipeId === recipe.id && refused.field === field ? refused.message : null;
  const sep = display.decimalSeparator ?? '.';
  const readBatch = batchSizeReader(sep);
  const setInputs = (patch: Partial<SheetInputs>, field?: TypedField) => {
    if (!recipe) return;
    const next = { ...DEFAULT_SHEET_INPUTS, ...saved, ...patch };
    const parse = patch.batchSize === undefined ? undefined : readBatch;
    const typed = patch.batchSize === undefined ? null : parseEntry(patch.batchSize, sep).error;
    const message =
      (typed ? `Batch size: ${typed.replace(/\.$/, '')}` : null) ??
      firstProblem(sheetProblems(next, undefined, parse)) ??
      (props.onSheetInputsChange ? props.onSheetInputsChange(recipe.id, patch, parse) ?? null : null);
    if (message) {
      if (field) setRefused({ recipeId: recipe.id, field, text: String(patch[field] ?? ''), message: sayRefusal(message, displayWords(display))! });
      return;
    }
    if (refused && refused.field in patch) setRefused(null);
    if (!props.onSheetInputsChange) setLocalInputs((m) => ({ ...m, [recipe.id]: next }));
  };
  const setBatchSize = (batchSize: string) => setInputs({ batchSize }, 'batchSize');
  const setBatchUnit = (batchUnit: 'kg' | 'litres') => setInputs({ batchUnit });
  const setLot = (lot: string) => setInputs({ lot }, 'lot');
  const setVessel = (vessel: string) => setInputs({ vessel }, 'vessel');

  const batchValue = readBatch(batchSize);
  const exchange = props.exchange;
  // Stocks of the recipe whose measured values are not yet entered: nothing is predicted from their
  // placeholders, and without a density no litres of them (nor volume shares, nor litre totals).
  const unentered = useMemo(() => (recipe ? unenteredStocks(recipe.lines, components) : []), [recipe, components]);
  const noDensity = useMemo(() => new Set(densityNotEntered(unentered).map((c) => c.id)), [unentered]);
  // Prices restated in the base currency at the boundary; a stock without a rate keeps its own
  // currency, so the costing refuses to add it in (and says which stock and currency).
  const priced = useMemo(
    () => (exchange ? priceLibraryInBase(components, exchange.base, exchange.rates) : null),
    [components, exchange],
  );
  const built = useMemo((): { sheet: BlendSheet } | { error: string } | null => {
    if (!recipe) return null;
    if (batchValue === null) return { error: 'enter the batch size (kg, or litres at 15 °C).' };
    if (Number.isNaN(batchValue)) {
      return { error: `the batch size “${batchSize.trim()}” cannot be read with the decimal separator “${sep}” (Settings); type it again.` };
    }
    const litreRefusal = batchUnit === 'litres' ? litreBatchRefusal(unentered) : null;
    if (litreRefusal) return { error: litreRefusal };
    try {
      const batch = batchUnit === 'kg' ? { kg: batchValue } : { litres: batchValue };
      return {
        sheet: buildBlendSheet(priced?.components ?? components, recipe, batch, { meteringTempC: props.meteringTempC, deliveryTempC: props.deliveryTempC }),
      };
    } catch (e) {
      return { error: errorText(e, components, display) };
    }
  }, [components, priced, recipe, batchSize, batchUnit, batchValue, props.meteringTempC, props.deliveryTempC, display, unentered]);

  const qc = useMemo(
    (): { rows: QcRow[]; warnings: readonly string[]; properties: BlendProperties | null; notPredicted?: string } | { error: string } | null => {
      if (!recipe) return null;
      if (unentered.length > 0) {
        // The release targets and methods stand; no prediction is made from placeholders.
        const opts = { temperatureUnit: tUnit, specification: recipe.specification, formatNumber: fmt };
        try {
          return { rows: withoutPrediction(qcReleaseTargets(recipe.grade, NO_PREDICTION, opts)), warnings: [], properties: null, notPredicted: notPredictedSentence(unentered) };
        } catch (e) {
          return { error: errorText(e, components, display) };
        }
      }
      try {
        const p = predict(recipe);
        return {
          rows: qcReleaseTargets(recipe.grade, p, { temperatureUnit: tUnit, specification: recipe.specification, formatNumber: fmt }),
          warnings: p.warnings ?? [],
          properties: p.properties ?? null,
        };
      } catch (e) {
        return { error: errorText(e, components, display) };
      }
    },
    [recipe, predict, tUnit, components, fmt, display, unentered],
  );

  const hold = useMemo((): HoldReason[] => {
    if (!recipe) return [];
    return releaseHoldReasons({
      recipe: savedRecipe ?? recipe,
      components,
      targets: props.targets?.[recipe.id] ?? null,
      prediction: qc === null ? null : 'error' in qc ? { error: qc.error } : qc.properties,
      qcRows: qc && 'rows' in qc ? qc.rows : null,
      method: props.method ?? 'refutas',
      supersededBy: recipes.find((r) => r.supersedes === recipe.id && r.status === 'approved') ?? null,
      display,
    });
  }, [recipe, savedRecipe, components, props.targets, qc, props.method, recipes, display]);
  const stockChanges = useMemo(() => (recipe ? stockBasisChanges(recipe.stockBasis, components) : []), [recipe, components]);

  // The QC loop: entries saved per recipe; the probability in band, the adjusted recipe and the
  // correction derived from them (qc.ts, core/qc).
  const method = props.method ?? 'refutas';
  const qcIn: QcInputs = (recipe ? (props.qcInputs ?? localQc)[recipe.id] : undefined) ?? DEFAULT_QC_INPUTS;
  const setQc = (patch: Partial<QcInputs>): string | null => {
    if (!recipe) return null;
    if (props.onQcInputsChange) return props.onQcInputsChange(recipe.id, patch);
    setLocalQc((m) => ({ ...m, [recipe.id]: { ...DEFAULT_QC_INPUTS, ...m[recipe.id], ...patch } }));
    return null;
  };
  const kvRow = qc && 'rows' in qc ? qc.rows.find((r) => r.key === 'kv40') : undefined;
  const releaseBand = kvRow && kvRow.min !== undefined && kvRow.min !== null && kvRow.max !== undefined && kvRow.max !== null ? { min: kvRow.min, max: kvRow.max } : null;
  const inBand = useMemo((): RecipeInBand | null => {
    if (!recipe || !releaseBand || unentered.length > 0) return null;
    try {
      return recipeInBand(components, recipe.lines.filter((l) => l.massFraction > 0), recipe.grade, releaseBand, method);
    } catch {
      return null;
    }
  }, [recipe, components, releaseBand?.min, releaseBand?.max, method, unentered]); // eslint-disable-line react-hooks/exhaustive-deps
  const builtSheet = built && 'sheet' in built ? built.sheet : null;
  const adjusted = useMemo(
    () =>
      recipe && builtSheet
        ? adjustedRecipe(recipe, components, qcIn, builtSheet.batchBasis === 'litres' && batchValue !== null ? { litres: batchValue } : { kg: builtSheet.totalKgExact }, method, display)
        : null,
    [recipe, builtSheet, batchValue, components, qcIn, method, display],
  );
  const heelDensity = qcIn.heel.density15 ?? HEEL_DEFAULT_DENSITY;
  /** The sheet of the additions when the recipe is adjusted (lot densities; batch less the heel). */
  const adjustedSheet = useMemo((): BlendSheet | null => {
    if (!recipe || !builtSheet || !adjusted || !('result' in adjusted) || adjusted.result.status !== 'optimal') return null;
    const r = adjusted.result;
    const lotDensity = new Map(adjusted.lots.map((l) => [l.id, l.density15]));
    const base = priced?.components ?? components;
    const lotComponents = base.map((c) => (lotDensity.has(c.id) ? { ...c, density15: lotDensity.get(c.id)! } : c));
    const lines = Object.entries(r.addedFractions)
      .filter(([, f]) => f > 0)
      .map(([componentId, massFraction]) => ({ componentId, massFraction }));
    try {
      // The heel rounded with the additions (core/sheet), so heel + column prints the batch ordered.
      const heel = adjusted.heelKg > 0 ? { kg: adjusted.heelKg, litres: adjusted.heelKg / heelDensity } : undefined;
      return buildBlendSheet(lotComponents, { ...recipe, lines }, { kg: r.batch.massKg - adjusted.heelKg }, { meteringTempC: props.meteringTempC, deliveryTempC: props.deliveryTempC, heel });
    } catch {
      return null;
    }
  }, [recipe, builtSheet, adjusted, priced, components, props.meteringTempC, props.deliveryTempC, heelDensity]);
  // Lots, a heel or an aim entered that the recipe cannot be adjusted to: the table below would charge
  // the saved recipe for the whole batch (a heel not counted), so the sheet is held and says why.
  const adjustHold = useMemo((): HoldReason[] => {
    if (!recipe || !adjusted || !hasAdjustment(qcIn)) return [];
    const why =
      'error' in adjusted
        ? adjusted.error
        : adjusted.result.status === 'infeasible'
          ? adjusted.result.reason
          : adjustedSheet === null
            ? 'the adjusted component table cannot be built'
            : null;
    if (why === null) return [];
    const heel = qcIn.heel.massKg ?? 0;
    const qd0 = builtSheet?.quantityDecimals ?? 1;
    return [
      {
        kind: 'batch-adjustment',
        message:
          `The lots, heel or aim entered for this batch cannot be used: ${why.trim().replace(/\.?$/, '.')} The component table charges the saved recipe for the whole batch` +
          (heel > 0 ? `, without the heel of ${fmt(heel, qd0)} kg already in the vessel.` : ', not adjusted to them.'),
      },
    ];
  }, [recipe, adjusted, adjustedSheet, qcIn, builtSheet, fmt]);
  /** Every reason the blend sheet is held: the recipe's and the batch adjustment's. */
  const sheetHold = useMemo(() => (adjustHold.length ? [...hold, ...adjustHold] : hold), [hold, adjustHold]);
  const correction = useMemo(
    () =>
      recipe
        ? correctionFor(recipe, priced?.components ?? components, qcIn, {
            releaseBand: releaseBand ?? { min: 0, max: Number.POSITIVE_INFINITY },
            predictedVi: qc && 'properties' in qc ? (qc.properties?.vi ?? null) : null,
            // The mass in the vessel: what the adjusted recipe charged (heel included), else the sheet's.
            batchKg: adjusted && 'result' in adjusted && adjusted.result.status === 'optimal' ? adjusted.result.batch.massKg : (builtSheet?.totalKgExact ?? null),
            targets: props.targets?.[recipe.id] ?? null,
            method,
            display,
          })
        : null,
    [recipe, priced, components, qcIn, releaseBand?.min, releaseBand?.max, qc, builtSheet, adjusted, props.targets, method, display], // eslint-disable-line react-hooks/exhaustive-deps
  );
  // The correction sheet is held for the sheet's reasons and for any withdrawn stock it adds.
  const corrHold = useMemo((): HoldReason[] => {
    if (!correction || !('result' in correction) || correction.result.status !== 'optimal') return hold;
    const added = Object.entries(correction.result.addKg)
      .filter(([, kg]) => kg > 0)
      .map(([code]) => code);
    const reasons = correctionHoldReasons(hold, added, components);
    const spec = recipe?.specification;
    if (spec && correctedKv100Outside(correction.result.kv100, spec)) {
      reasons.push({
        kind: 'release-limit',
        message: `The corrected batch misses a release limit — Kinematic viscosity at 100 °C: predicted ${fmt(correction.result.kv100, 2)} mm²/s, limit ${limitText(spec.kv100Min, spec.kv100Max, 2, fmt)}.`,
      });
    }
    return reasons;
  }, [correction, hold, components, recipe, fmt]);
  const heelSources = useMemo(() => {
    const byIdAll = new Map(components.map((c) => [c.id, c]));
    return recipes
      // A recipe holding a stock whose values are not yet entered is not predicted: no heel values from it.
      .filter((r) => !r.archived && r.lines.length > 0 && unenteredStocks(r.lines, components).length === 0)
      .flatMap((r) => {
        try {
          const p = predict(r).properties;
          if (!p) return [];
          return [{ recipe: r, kv40: p.kv40, kv100: p.kv100, density15: p.density15, additiveFraction: recipeAdditive(r, byIdAll)?.massFraction ?? 0 }];
        } catch {
          return [];
        }
      });
  }, [recipes, components, predict]);

  if (!recipe) {
    return (
      <section className="bs-screen" aria-labelledby={`${id}-h`}>
        <h2 id={`${id}-h`}>Blend sheet</h2>
        <p>There is no recipe yet. Design or adopt a recipe first, then print its blend sheet here.</p>
      </section>
    );
  }

  const savedSheet = built && 'sheet' in built ? built.sheet : null;
  // With lots, a heel or an aim entered the sheet charges the adjusted recipe (the additions), the
  // heel printed as the vessel's first line; otherwise the saved recipe.
  const sheet = adjustedSheet ?? savedSheet;
  const adjustedOk = adjustedSheet !== null && adjusted !== null && 'result' in adjusted && adjusted.result.status === 'optimal' ? adjusted : null;
  // The heel as printed (rounded with the additions by core/sheet: heel + column = the batch ordered).
  const heelKg = adjustedOk && sheet?.heel ? sheet.heel.kg : 0;
  const savedPct = new Map(recipe.lines.map((l) => [l.componentId, l.massFraction * 100]));
  const defaultSteps = sheet ? defaultBlendingInstructions(sheet, { temperatureUnit: tUnit }) : [];
  const stepsText = instructions ?? defaultSteps.join('\n');
  const steps = stepsText
    .split('\n')
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
  const costing = copy === 'costing';
  const qd = sheet?.quantityDecimals ?? 1;
  const pd = sheet?.percentDecimals ?? 2;
  const currency = sheet?.costing.available ? sheet.costing.currency : '';
  const held = sheetHold.length > 0;
  const byId = new Map(components.map((c) => [c.id, c]));
  const codeOf = (id: string) => byId.get(id)?.code ?? id;
  // Exchange rates behind this recipe's costs, and its stocks that have no rate.
  const { ratesUsed, unpriced } = priced
    ? pricingFor(priced, components, recipe.lines.map((l) => l.componentId))
    : { ratesUsed: [], unpriced: [] };
  const superseded = recipe.supersedes ? (recipes.find((r) => r.id === recipe.supersedes) ?? null) : null;
  const changes = superseded ? shareChanges(superseded.lines, recipe.lines) : [];
  const holdId = `${id}-hold`;

  // The whole batch, the heel in it: with a heel the table charges only the additions.
  const heelLitres = heelKg > 0 && sheet?.heel ? sheet.heel.litres : 0;
  const batchKgText = sheet ? fmt(sheet.batchKg, qd) : '';
  const batchLitresText = sheet ? fmt(sheet.batchLitres, qd) : '';
  // A stock without its density: no litres of it, so no volume share and no litre total either.
  const litresKnown = !sheet || !sheet.rows.some((r) => noDensity.has(r.componentId));
  const litresNote = litresKnown ? null : litresNotGivenSentence(unentered);
  // Its price per kg from a litre price needs its density; its cost is never counted (left out of costing).
  const unenteredIds = new Set(unentered.map((c) => c.id));
  const priceNeedsDensity = (componentId: string) => noDensity.has(componentId) && byId.get(componentId)?.price.basis === 'per-litre';
  const litreCell = (componentId: string, v: number | null) => (v === null || noDensity.has(componentId) ? '—' : fmt(v, qd));
  const batchText = sheet
    ? ((savedSheet ?? sheet).batchBasis === 'kg'
        ? `${batchKgText} kg (${litresKnown ? `${batchLitresText} L at 15 °C` : 'litres not given'})`
        : `${batchLitresText} L at 15 °C (${batchKgText} kg)`) +
      (heelKg > 0 ? `: heel ${fmt(heelKg, qd)} kg + additions ${fmt(sheet.totalKg, qd)} kg` : '')
    : '—';

  /**
   * A field of this screen (the sheet's own or the QC loop's) that holds a typed entry it refused: the
   * sheet would print or export the last saved value under it, so nothing leaves until it is corrected
   * or cleared. Says which field, and puts the cursor in it; null when every entry is saved.
   */
  const refuseUnsaved = (what: string): boolean => {
    const bad = screenRef.current?.querySelector<HTMLElement>('[aria-invalid="true"]') ?? null;
    if (!bad) {
      setNotSent(null);
      return false;
    }
    const label =
      ((bad as HTMLInputElement).labels?.[0]?.textContent ?? bad.getAttribute('aria-label') ?? '').replace(/\s+/g, ' ').trim() || 'A field';
    setNotSent(
      `Not ${what}: “${label}” holds an entry that was not saved (the message beside it says why). Correct it or clear it first; ` +
        'the sheet would otherwise show the last saved value, not what the field shows.',
    );
    bad.focus();
    return true;
  };
  const exportCsv = () => {
    if (!sheet || refuseUnsaved('exported')) return;
    const rows = blendSheetCsvRows(sheet, { includePrices: costing, heel: { kg: heelKg, litres: heelLitres, description: qcIn.heel.source } });
    const noLitres = new Set(sheet.rows.filter((r) => noDensity.has(r.componentId)).map((r) => r.code));
    const noPrice = new Set(sheet.rows.filter((r) => priceNeedsDensity(r.componentId)).map((r) => r.code));
    const noCost = new Set(sheet.rows.filter((r) => unenteredIds.has(r.componentId)).map((r) => r.code));
    const table = csvWithoutLitres(rows, noLitres, { noPrice, noCost });
    // A sheet on hold exports with the hold as its first line (code HOLD, which no plant system can meter)
    // and in its file name, as it prints with the hold: the file never passes for a releasable table.
    const text = toCsv(held ? [holdCsvRecord(table[0]!, sheetHold.map((h) => h.message)), ...table] : table);
    const name = csvFileName(recipe.name, recipe.revision, lot, held);
    if (props.onExportCsv) props.onExportCsv(text, name);
    else downloadCsv(text, name);
  };
  const printDocument = (doc: 'sheet' | 'correction') => {
    if (refuseUnsaved('printed')) return;
    flushSync(() => setPrintDoc(doc));
    if (props.onPrint) props.onPrint(doc);
    else window.print();
  };
  const print = () => printDocument('sheet');

  return (
    <section ref={screenRef} className="bs-screen" aria-labelledby={`${id}-h`} data-print={printDoc}>
      {/* Printed from the browser's menu while an entry is refused: this notice prints instead of the sheet. */}
      <p className="print-page bs-unsaved-print">
        Not printed: a field of the blend sheet screen holds an entry that was not saved. Correct it or clear it, then print again.
      </p>
      {/* Every printed page names its product, grade, lot and batch, and says "Page n of m". */}
      <style>{pageRule(paper, { product: recipe.name, grade: recipe.grade, lot, batch: sheet ? batchText : '' })}</style>
      <div className="bs-controls bs-no-print">
        <h2 id={`${id}-h`}>Blend sheet</h2>
        <div className="bs-control-row">
          <label>
            Recipe
            <select value={recipe.id} onChange={(e) => props.onRecipeChange?.(e.target.value)}>
              {pickable.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name} (ISO VG {r.grade}, rev. {r.revision}, {RECIPE_STATUS_LABEL[r.status].toLowerCase()}
                  {r.archived ? ', archived' : ''})
                </option>
              ))}
            </select>
          </label>
          <fieldset className="bs-inline">
            <legend>Copy</legend>
            <label>
              <input type="radio" name={`${id}-copy`} checked={copy === 'plant'} onChange={() => setCopy('plant')} />
              Plant copy (no prices)
            </label>
            <label>
              <input type="radio" name={`${id}-copy`} checked={copy === 'costing'} onChange={() => setCopy('costing')} />
              Costing copy
            </label>
          </fieldset>
          <label>
            Paper
            <select value={paper} onChange={(e) => setPaper(e.target.value as PaperSize)}>
              <option value="a4">A4</option>
              <option value="letter">US Letter</option>
            </select>
          </label>
          <button
            type="button"
            className={held ? 'bs-print-held' : undefined}
            onClick={print}
            disabled={!sheet}
            aria-describedby={held ? holdId : undefined}
          >
            {held ? `Print — ${RELEASE_HOLD_LABEL}` : 'Print'}
          </button>
          <button type="button" onClick={exportCsv} disabled={!sheet} aria-describedby={held ? holdId : undefined}>
            {held ? `Export component table (CSV) — ${RELEASE_HOLD_LABEL}` : 'Export component table (CSV)'}
          </button>
        </div>
        {notSent && (
          <p className="bs-field-error" role="alert" data-testid="not-sent">
            {notSent}
          </p>
        )}
        {held && (
          <div className="bs-hold-screen" role="alert" id={holdId}>
            <strong>{RELEASE_HOLD_LABEL}.</strong> This sheet will print with the hold and its reasons:
            <ul>
              {sheetHold.map((h) => (
                <li key={h.message}>{h.message}</li>
              ))}
            </ul>
          </div>
        )}
        <p className="bs-hint">
          Fill in the fields below, then print: your browser&rsquo;s print dialog also saves a PDF. Batch, lot, vessel and
          edited instructions are remembered for each recipe{props.onSheetInputsChange ? '' : ' while this sheet is open'}; the
          company name and the temperature unit come from the settings.
        </p>
      </div>

      <QcPanel
        recipe={recipe}
        components={components}
        heelSources={heelSources}
        qc={qcIn}
        onChange={setQc}
        adjusted={adjusted}
        correction={correction}
        inBand={inBand}
        releaseBand={releaseBand}
        batchKg={builtSheet?.totalKgExact ?? null}
        onPrintCorrection={() => printDocument('correction')}
        correctionHold={corrHold}
        fmt={fmt}
      />

      <article
        className={`blend-sheet print-page bs-paper-${paper}${sheet && sheet.rows.length + (heelKg > 0 ? 1 : 0) >= 10 ? ' bs-dense' : ''}`}
        aria-label="Printable blend sheet"
      >
        {/* The title first: a long company name flows beside it and then under it (blend-sheet.css). */}
        <header className={`bs-head${longClass(companyName, 60) ? ' bs-long-head' : ''}`}>
          <div className="bs-title">
            Blend sheet · <span className="bs-copy-kind">{costing ? 'Costing copy' : 'Plant copy'}</span>
          </div>
          <div className={`bs-company ${longClass(companyName, 60) ?? ''}`}>{companyName || 'Company name (set it in the settings)'}</div>
        </header>

        {held && (
          <section className="bs-hold" aria-label={RELEASE_HOLD_LABEL} data-testid="release-hold">
            <div className="bs-hold-title">{RELEASE_HOLD_LABEL}</div>
            <ul>
              {sheetHold.map((h) => (
                <li key={h.message}>{h.message}</li>
              ))}
            </ul>
            <div className="bs-hold-foot">Do not blend for release from this sheet until every reason is resolved.</div>
          </section>
        )}

        <dl className="bs-fields">
          <div className="bs-span3">
            <dt>Product</dt>
            <dd className={longClass(recipe.name, 90)}>{recipe.name}</dd>
          </div>
          <div className="bs-span1">
            <dt>Grade</dt>
            <dd>ISO VG {recipe.grade}</dd>
          </div>
          <div className="bs-span1">
            <dt>Recipe revision</dt>
            <dd>
              {recipe.revision} <span className="bs-sub">(saved {recipe.updatedAt.slice(0, 10)})</span>
            </dd>
          </div>
          <div className="bs-span1">
            <dt>Status</dt>
            <dd data-testid="sheet-status">
              {RECIPE_STATUS_LABEL[recipe.status]}
              {recipe.status === 'approved' && recipe.approvedAt ? <span className="bs-sub"> {recipe.approvedAt.slice(0, 10)}</span> : null}
              {recipe.archived ? <span className="bs-sub"> (archived)</span> : null}
            </dd>
          </div>
          <div className="bs-span1">
            <dt>
              <label htmlFor={`${id}-date`}>Date</label>
            </dt>
            <dd>
              <input id={`${id}-date`} className="bs-no-print" type="date" value={date} onChange={(e) => setDate(e.target.value)} />
              <span className="bs-print-only">{date || '____________'}</span>
            </dd>
          </div>
          <div className="bs-w3">
            <dt>
              <label htmlFor={`${id}-lot`}>Batch / lot no.</label>
            </dt>
            <dd className={longClass(lot, 36)}>
              <input
                id={`${id}-lot`}
                className="bs-no-print"
                value={draft('lot', lot)}
                aria-invalid={refusal('lot') ? true : undefined}
                aria-describedby={refusal('lot') ? `${id}-lot-err` : undefined}
                onChange={(e) => setLot(e.target.value)}
              />
              <Refusal id={`${id}-lot-err`} message={refusal('lot')} />
              <span className="bs-print-only">{lot || '____________'}</span>
            </dd>
          </div>
          <div className="bs-batch bs-span2">
            <dt>
              <label htmlFor={`${id}-size`}>Batch size</label>
            </dt>
            <dd>
              <span className="bs-no-print bs-batch-inputs">
                <input
                  id={`${id}-size`}
                  type="text"
                  autoComplete="off"
                  inputMode="decimal"
                  value={draft('batchSize', batchSize)}
                  aria-invalid={refusal('batchSize') ? true : undefined}
                  aria-describedby={refusal('batchSize') ? `${id}-size-err` : undefined}
                  onChange={(e) => setBatchSize(e.target.value)}
                />
                <select aria-label="Batch size unit" value={batchUnit} onChange={(e) => setBatchUnit(e.target.value as 'kg' | 'litres')}>
                  <option value="kg">kg</option>
                  <option value="litres">L at 15 °C</option>
                </select>
              </span>
              <span className="bs-batch-text">{batchText}</span>
              <Refusal id={`${id}-size-err`} message={refusal('batchSize')} />
            </dd>
          </div>
          <div className="bs-w3">
            <dt>
              <label htmlFor={`${id}-vessel`}>Vessel</label>
            </dt>
            <dd className={longClass(vessel, 36)}>
              <input
                id={`${id}-vessel`}
                className="bs-no-print"
                value={draft('vessel', vessel)}
                aria-invalid={refusal('vessel') ? true : undefined}
                aria-describedby={refusal('vessel') ? `${id}-vessel-err` : undefined}
                onChange={(e) => setVessel(e.target.value)}
              />
              <Refusal id={`${id}-vessel-err`} message={refusal('vessel')} />
              <span className="bs-print-only">{vessel || '____________'}</span>
            </dd>
          </div>
        </dl>

        {stockChanges.length > 0 && (
          <p className="bs-error bs-stock-changed" data-testid="stock-changed">
            Stock data changed since this recipe was saved ({recipe.stockBasis?.recordedAt.slice(0, 10)}):{' '}
            {stockChanges
              .map((c) =>
                c.kind === 'deleted'
                  ? `${c.code} deleted from the library`
                  : `${c.code} ${[
                      ...identityChangeWords(c),
                      ...c.fields.map((f) => `${f.property} ${changedValue(f.from, f.unit, display)} → ${changedValue(f.to, f.unit, display)}`),
                    ].join(', ')}`,
              )
              .join('; ')}
            .{unentered.length > 0 ? ' Review the recipe.' : ' The predictions below use the current data; review the recipe.'}
          </p>
        )}

        {built && 'error' in built && (
          <p className="bs-error" role="alert">
            The component table cannot be built: {built.error}
          </p>
        )}

        {sheet && (
          <table
            className={`bs-table bs-components${costing || adjustedOk ? ' bs-wide' : ''}${sheet.rows.some((r) => r.code.length > 12) ? ' bs-long-codes' : ''}`}
          >
            <caption>
              1. Components, in charging order
              {adjustedOk ? (
                <span className="bs-caption-note" data-testid="adjusted-caption">
                  {' '}
                  — adjusted to the lots in the tanks{heelKg > 0 ? ' and the heel' : ''}, aim ν40 {fmt(adjustedOk.aim, 1)} mm²/s
                </span>
              ) : null}
              {costing && currency ? <span className="bs-caption-note"> (prices and costs in {currency})</span> : null}
            </caption>
            <thead>
              <tr>
                <th scope="col" className="bs-num" title="Charging order">Step</th>
                <th scope="col" className="bs-code-head">Code</th>
                <th scope="col">Name</th>
                <th scope="col">Category</th>
                {adjustedOk && <th scope="col" className="bs-num bs-wrap bs-saved-share">Saved mass %</th>}
                <th scope="col" className={adjustedOk ? 'bs-num bs-wrap bs-added-share' : 'bs-num'}>{adjustedOk ? 'Mass % of additions' : 'Mass %'}</th>
                <th scope="col" className="bs-num">Vol. %</th>
                <th scope="col" className="bs-num">kg</th>
                <th scope="col" className="bs-num">L at 15 °C</th>
                {sheet.metering && <th scope="col" className="bs-num">L at {displayWords(display).sayTemp(sheet.metering.tempC)}</th>}
                <th scope="col" className="bs-num">Running kg</th>
                {costing && (
                  <>
                    <th scope="col" className="bs-num">Price/kg</th>
                    <th scope="col" className="bs-num">Cost</th>
                  </>
                )}
                <th scope="col" className="bs-initials">Initials</th>
              </tr>
            </thead>
            <tbody>
              {heelKg > 0 && adjustedOk && (
                <tr className="bs-heel" data-testid="heel-row">
                  <td className="bs-num">0</td>
                  <th scope="row" className="bs-code">HEEL</th>
                  {/* Over the name and category columns (a heel has no category): one line where the source is short. */}
                  <td className="bs-name" colSpan={2}>
                    Heel already in the vessel{qcIn.heel.source.trim() ? ` (${qcIn.heel.source.trim()})` : ''}
                  </td>
                  <td className="bs-num">—</td>
                  <td className="bs-num">—</td>
                  <td className="bs-num">—</td>
                  <td className="bs-num bs-qty">{fmt(heelKg, qd)}</td>
                  <td className="bs-num">{fmt(heelLitres, qd)}</td>
                  {sheet.metering && <td className="bs-num">—</td>}
                  <td className="bs-num">{fmt(heelKg, qd)}</td>
                  {costing && (
                    <>
                      <td className="bs-num">—</td>
                      <td className="bs-num">—</td>
                    </>
                  )}
                  <td className="bs-initials" />
                </tr>
              )}
              {sheet.rows.map((r) => (
                <tr key={r.componentId}>
                  <td className="bs-num">{r.chargeOrder}</td>
                  <th scope="row" className="bs-code">{r.code}</th>
                  <td className="bs-name">{r.name}</td>
                  <td>{r.categoryLabel}</td>
                  {adjustedOk && <td className="bs-num">{fmt(savedPct.get(r.componentId) ?? 0, pd)}</td>}
                  <td className="bs-num">{fmt(r.massPct, pd)}</td>
                  <td className="bs-num">{litresKnown ? fmt(r.volumePct, pd) : '—'}</td>
                  <td className="bs-num bs-qty">{fmt(r.kg, qd)}</td>
                  <td className="bs-num">{litreCell(r.componentId, r.litres)}</td>
                  {sheet.metering && <td className="bs-num">{litreCell(r.componentId, r.litresAtMetering)}</td>}
                  <td className="bs-num">{fmt(r.runningKg + heelKg, qd)}</td>
                  {costing && (
                    <>
                      <td className="bs-num">{r.pricePerKg === null || priceNeedsDensity(r.componentId) ? '—' : fmt(r.pricePerKg, 3)}</td>
                      <td className="bs-num">{r.lineCost === null || unenteredIds.has(r.componentId) ? '—' : fmt(r.lineCost, 2)}</td>
                    </>
                  )}
                  <td className="bs-initials" />
                </tr>
              ))}
            </tbody>
            <tfoot>
              <tr>
                <td />
                {/* Over the code, name and category columns: "Total added" on one line, not two in the code column. */}
                <th scope="row" colSpan={3}>
                  {heelKg > 0 && adjustedOk ? 'Total added' : 'Total'}
                </th>
                {adjustedOk && <td className="bs-num">{fmt(100, pd)}</td>}
                <td className="bs-num">{fmt(100, pd)}</td>
                <td className="bs-num">{litresKnown ? fmt(100, pd) : '—'}</td>
                <td className="bs-num bs-qty">{fmt(sheet.totalKg, qd)}</td>
                <td className="bs-num">{litresKnown ? fmt(sheet.totalLitres, qd) : '—'}</td>
                {sheet.metering && <td className="bs-num">{litresKnown ? fmt(sheet.metering.totalLitres, qd) : '—'}</td>}
                <td className="bs-num">{fmt(sheet.totalKg + heelKg, qd)}</td>
                {costing && (
                  <>
                    <td className="bs-num">{sheet.costing.available ? fmt(sheet.costing.perKg, 3) : '—'}</td>
                    <td className="bs-num">{sheet.costing.available ? fmt(sheet.costing.perBatch, 2) : '—'}</td>
                  </>
                )}
                <td className="bs-initials" />
              </tr>
            </tfoot>
          </table>
        )}

        {sheet && litresNote && (
          <p className="bs-error" data-testid="litres-not-given">
            {litresNote}
          </p>
        )}

        {adjustedOk && adjustedOk.result.status === 'optimal' && (
          <p className="bs-lots" data-testid="lot-values">
            <strong>Lot values used:</strong>{' '}
            {adjustedOk.lots
              .map(
                (l) =>
                  `${l.code} ν40 ${fmt(l.kv40, 1)}${l.measured.kv40 ? ' (lot)' : ''}, ν100 ${fmt(l.kv100, 2)}${l.measured.kv100 ? ' (lot)' : ''}, ${fmt(l.density15, 4)} kg/L${l.measured.density15 ? ' (lot)' : ''}`,
              )
              .join('; ')}
            . {heelKg > 0 ? `Heel: ν40 ${fmt(qcIn.heel.kv40 ?? 0, 1)}, ν100 ${fmt(qcIn.heel.kv100 ?? 0, 2)} mm²/s. ` : ''}
            Saved shares moved by {fmt(adjustedOk.result.changePct, 2)} points, the least change that lands the batch at the aim (its prediction
            as charged: notes of section 3). “(lot)” = measured on the lot in the tank; the others are the library’s values.
          </p>
        )}

        {sheet && costing && (
          <p className="bs-costing">
            {unpriced.length > 0 && exchange ? (
              <>Cost not available: {unpricedMessage(unpriced, exchange.base)}</>
            ) : sheet.costing.available ? (
              <>
                Cost: {fmt(sheet.costing.perKg, 3)} {currency}/kg · {fmt(sheet.costing.perLitre, 3)} {currency}/L at 15 °C ·{' '}
                {sheet.costing.perDeliveredLitre ? (
                  <span data-testid="cost-delivered">
                    {fmt(sheet.costing.perDeliveredLitre.cost, 3)} {currency} per delivered litre at {displayWords(display).sayTemp(sheet.costing.perDeliveredLitre.tempC)}
                    (ASTM D1250 Table 54D) ·{' '}
                  </span>
                ) : null}
                {fmt(sheet.costing.perBatch, 2)} {currency} per batch.{' '}
                {ratesUsed.length > 0 && exchange ? (
                  <span data-testid="rates-used">
                    Prices converted at {ratesUsed.map((r) => describeRate(r, exchange.base, (x) => fmt(x, rateDecimals(x)))).join('; ')}.{' '}
                  </span>
                ) : null}
                Component prices as entered in the library; confidential.
              </>
            ) : (
              <>Cost not available: {sheet.costing.reason}.</>
            )}
          </p>
        )}

        {superseded && (
          <section className="bs-change" aria-labelledby={`${id}-chg`}>
            <h3 id={`${id}-chg`}>
              Change from revision {superseded.revision}
              {superseded.name !== recipe.name ? ` (“${superseded.name}”)` : ''}
            </h3>
            <p className="bs-change-reason">
              Reason for change: {recipe.reasonForChange.trim() || <em>not given</em>}
            </p>
            <table className="bs-table bs-change-table">
              <thead>
                <tr>
                  <th scope="col">Code</th>
                  <th scope="col" className="bs-num">Rev. {superseded.revision}, mass %</th>
                  <th scope="col" className="bs-num">Rev. {recipe.revision}, mass %</th>
                  <th scope="col" className="bs-num">Change, points</th>
                </tr>
              </thead>
              <tbody>
                {changes.map((c) => (
                  <tr key={c.componentId}>
                    <th scope="row" className="bs-code">{codeOf(c.componentId)}</th>
                    <td className="bs-num">{c.kind === 'added' ? '—' : fmt(c.from * 100, pd)}</td>
                    <td className="bs-num">{c.kind === 'removed' ? '—' : fmt(c.to * 100, pd)}</td>
                    <td className="bs-num">
                      {/* An unchanged line as a signed zero, read like the "+1.53" / "−0.96" beside it. */}
                      {c.kind === 'same' ? `±${fmt(0, pd)}` : signedText(c.delta * 100, pd, fmt)}
                      {c.kind === 'added' ? ' (new)' : c.kind === 'removed' ? ' (removed)' : ''}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
        )}

        <section className="bs-steps" aria-labelledby={`${id}-steps`}>
          <h3 id={`${id}-steps`}>2. Blending instructions</h3>
          {editingSteps ? (
            <div className="bs-no-print">
              <label htmlFor={`${id}-steps-text`}>Instructions, one step per line</label>
              <textarea
                id={`${id}-steps-text`}
                rows={Math.max(6, steps.length + 2)}
                value={draft('instructions', stepsText)}
                aria-invalid={refusal('instructions') ? true : undefined}
                aria-describedby={refusal('instructions') ? `${id}-steps-err` : undefined}
                onChange={(e) => setInputs({ instructions: e.target.value }, 'instructions')}
              />
              <Refusal id={`${id}-steps-err`} message={refusal('instructions')} />
            </div>
          ) : null}
          <ol className={editingSteps ? 'bs-print-only' : undefined}>
            {steps.map((s, i) => (
              <li key={i}>{s}</li>
            ))}
          </ol>
          <div className="bs-no-print bs-step-buttons">
            <button type="button" onClick={() => setEditingSteps((v) => !v)}>
              {editingSteps ? 'Done editing' : 'Edit instructions'}
            </button>
            <button
              type="button"
              disabled={instructions === null}
              onClick={() => setInputs({ instructions: null })}
            >
              Restore default instructions
            </button>
          </div>
        </section>

        {/* The QC table, the cautions and the sign-off: one block that a page break never splits. */}
        <div className="bs-closing">
          <section className="bs-qc-section" aria-labelledby={`${id}-qc`}>
            {qc && 'error' in qc ? (
              <>
                <h3 id={`${id}-qc`}>3. Predicted properties and QC release</h3>
                <p className="bs-error" role="alert">
                  Properties cannot be predicted for this recipe: {qc.error}
                </p>
              </>
            ) : (
              <table className="bs-table bs-qc">
                <caption id={`${id}-qc`}>
                  3. Predicted properties and QC release
                  {inBand ? (
                    <span className="bs-caption-note" data-testid="printed-in-band">
                      {' '}
                      — lot spread (model): {probabilityText(inBand.plant.probability, fmt)} of batches in the ν40 release band,{' '}
                      {probabilityText(inBand.iso.probability, fmt)} in the ISO band
                    </span>
                  ) : null}
                  {qc?.notPredicted ? (
                    // Where the predictions would stand: why there are none (the designer's words).
                    <>
                      {' — '}
                      <span className="bs-not-predicted" data-testid="not-predicted">
                        {qc.notPredicted}
                      </span>
                    </>
                  ) : null}
                </caption>
                <thead>
                  <tr>
                    <th scope="col">Property</th>
                    <th scope="col">Unit</th>
                    <th scope="col" className="bs-num">Predicted</th>
                    <th scope="col">Release target</th>
                    <th scope="col">Test method</th>
                    <th scope="col" className="bs-measured">Measured</th>
                    <th scope="col" className="bs-initials">Initials</th>
                  </tr>
                </thead>
                <tbody>
                  {qc?.rows.map((r) => (
                    <tr key={r.key} className={r.predictedOutsideTarget ? 'bs-outside' : undefined}>
                      <th scope="row">{r.property}</th>
                      <td>{r.unit}</td>
                      <td className="bs-num">
                        {r.predictedOutsideTarget ? <span className="bs-flag">outside </span> : null}
                        {r.predicted}
                      </td>
                      <td>{r.target}</td>
                      <td className="bs-method">{r.method}</td>
                      <td className="bs-measured" />
                      <td className="bs-initials" />
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
            <p className="bs-note">
              {adjustedOk && adjustedOk.result.status === 'optimal' ? (
                <span data-testid="qc-batch-note">
                  Predicted column: the saved recipe with the library’s values. The batch as charged (lots and heel entered above) is predicted at
                  ν40 {fmt(adjustedOk.result.batch.kv40, 1)} mm²/s, ν100 {fmt(adjustedOk.result.batch.kv100, 2)} mm²/s
                  {adjustedOk.result.batch.vi === null ? '' : `, VI ${fmt(adjustedOk.result.batch.vi, 0)}`}.{' '}
                </span>
              ) : null}
              {qc && 'warnings' in qc && qc.warnings.length > 0 ? <>Prediction notes: {qc.warnings.join(' ')} </> : null}

              Release limits: ν40 from the grade (plant aim ±5 % of the mid-point, inside the ISO 3448 band); every other limit
              from the product specification
              {recipe.specification.reference.trim() ? ` ${recipe.specification.reference.trim()}` : ''} as entered for this
              recipe (“Per specification” where none was entered). Predicted values are estimates, shown for information only.{' '}
              <span data-testid="method-note">{methodText(method)}</span>
            </p>
          </section>

          <SheetFooter roles={['Blended by', 'QC tested by', 'Released by']} />
        </div>
      </article>

      {correction && 'result' in correction && correction.result.status === 'optimal' && correction.result.addedKg > 0 && (
        <CorrectionSheet
          companyName={companyName}
          recipe={recipe}
          lot={lot}
          vessel={vessel}
          date={date}
          problem={correction.problem}
          result={correction.result}
          band={correction.band}
          releaseBand={correction.releaseBand}
          kv100Estimated={correction.kv100Estimated}
          names={new Map(components.map((c) => [c.code, c.name]))}
          additiveCode={correction.problem.additive?.id ?? null}
          paper={paper}
          methodLabel={BLEND_METHOD_LABEL[method]}
          fmt={fmt}
          hold={corrHold}
        />
      )}
    </section>
  );
}

