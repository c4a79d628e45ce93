/**
 * zod schemas for everything Blendbench stores or imports: components, recipes, targets, settings,
 * and the backup file. Stored data and imported files are validated with the same schemas, and every
 * field is refined with its rule from `field-rules.ts` — the very validators the entry forms call —
 * so a record that could not be typed in through the interface cannot arrive through the back door,
 * and nothing typed in can fail to load again.
 */
import { z } from 'zod';
import { COMPONENT_CATEGORIES } from '../core/formulation/model';
import type { BlendTargets, Component, ComponentCategory, EntryField, Recipe } from '../core/formulation/model';
import { ENTRY_FIELDS } from '../core/formulation/entered-values';
import type { LinePlanInputs } from './lineplan';
import {
  COLLECTION_LIMITS,
  checkCount,
  checkNumber,
  checkText,
  linePlanProblems,
  recipeProblems,
  settingsProblems,
  sheetProblems,
  qcProblems,
  type QcInputs,
  stockProblems,
  targetsProblems,
  type CollectionKey,
  type FieldProblem,
} from './field-rules';

// zod 4 probes `new Function` at start-up unless told not to; our CSP forbids eval.
z.config({ jitless: true });

export { z };

/** Report a record's refused fields (from field-rules.ts) as zod issues at their paths. */
function report(ctx: z.RefinementCtx, problems: readonly FieldProblem[]): void {
  for (const p of problems) ctx.addIssue({ code: 'custom', path: p.path, message: p.message });
}
/** A list refined with its collection limit. */
const list = <T extends z.ZodTypeAny>(item: T, collection: CollectionKey) =>
  z.array(item).superRefine((v, ctx) => {
    const m = checkCount(collection, v.length);
    if (m) ctx.addIssue({ code: 'custom', message: m });
  });
const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
// Shape only: the limits come from the record checks below.
const str = z.string();
const nullableNum = finite.nullable();

export const categorySchema = z.enum(COMPONENT_CATEGORIES as unknown as [ComponentCategory, ...ComponentCategory[]]);
export const availabilitySchema = z.enum(['available', 'limited', 'withdrawn']);
export const priceBasisSchema = z.enum(['per-kg', 'per-litre', 'per-tonne']);

export const viscosityPointSchema = z.object({ tempC: finite, kv: finite });

export const calibrationSchema = z.object({
  effectiveKv40: finite,
  effectiveKv100: finite,
  trial: z.object({
    massFractions: z.record(str, finite),
    measuredKv40: finite,
    measuredKv100: finite,
    labReference: str,
  }),
  method: z.enum(['refutas', 'astm-d7152', 'd7152-wright']),
  calibratedOn: str,
});

/** A stock: shape here, every value checked by `stockProblems` (field-rules.ts). */
export const componentSchema = z
  .object({
    id: str,
    code: str,
    name: str,
    category: categorySchema,
    viscosityPoints: z.array(viscosityPointSchema).min(2, { message: 'needs at least two viscosity points' }),
    density15: finite,
    anilinePoint: nullableNum,
    pourPoint: nullableNum,
    flashPoint: nullableNum,
    sulfurPct: nullableNum,
    saturatesPct: nullableNum,
    price: z.object({ amount: finite, basis: priceBasisSchema, currency: str }),
    availability: availabilitySchema,
    oxidationRating: nullableNum,
    shearLossPct: nullableNum,
    kv40LotSpreadPct: nullableNum,
    shearLoss40Pct: nullableNum.optional(),
    calibration: calibrationSchema.nullable(),
    // Measured values not yet entered (a stock just added); absent → all entered (older data, imports).
    notEntered: z.array(z.enum(ENTRY_FIELDS as unknown as [EntryField, ...EntryField[]])).optional(),
    source: str,
    sourceDate: str,
    notes: str,
  })
  .superRefine((c, ctx) => report(ctx, stockProblems(c, '')));

export const recipeLineSchema = z.object({ componentId: str, massFraction: finite });

/** The product specification of a recipe: shape here, values checked with the recipe (field-rules.ts). */
export const specificationSchema = z.object({
  grade: nullableNum,
  reference: str,
  kv100Min: nullableNum,
  kv100Max: nullableNum,
  viMin: nullableNum,
  density15Min: nullableNum,
  density15Max: nullableNum,
  flashMin: nullableNum,
  pourMax: nullableNum,
  copper: str,
  foam: str,
});

/** The stock data a recipe was saved with (one snapshot per stock). */
export const stockSnapshotSchema = z.object({
  componentId: str,
  code: str,
  category: categorySchema.optional(),
  viscosityPoints: z.array(viscosityPointSchema),
  calibratedKv40: nullableNum,
  calibratedKv100: nullableNum,
  density15: finite,
  anilinePoint: nullableNum,
  pourPoint: nullableNum,
  flashPoint: nullableNum,
  notEntered: z.array(z.enum(ENTRY_FIELDS as unknown as [EntryField, ...EntryField[]])).optional(),
});

/** A recipe: shape here, every value checked by `recipeProblems` (field-rules.ts). */
export const recipeSchema = z
  .object({
    id: str,
    name: str,
    grade: finite,
    lines: z.array(recipeLineSchema),
    revision: finite,
    isReference: z.boolean(),
    notes: str,
    updatedAt: str,
    status: z.enum(['draft', 'approved', 'superseded']),
    approvedAt: str.nullable(),
    archived: z.boolean(),
    supersedes: str.nullable(),
    reasonForChange: str,
    specification: specificationSchema,
    stockBasis: z.object({ recordedAt: str, stocks: z.array(stockSnapshotSchema) }).nullable(),
  })
  .superRefine((r, ctx) => report(ctx, recipeProblems(r, '')));

const boundsSchema = z.object({ min: finite.optional(), max: finite.optional() });

/** Solve targets: shape here, every value checked by `targetsProblems` (field-rules.ts). */
export const targetsSchema = z
  .object({
    grade: finite,
    targetKv40: nullableNum,
    tolerancePct: finite,
    minVi: nullableNum,
    maxAnilinePoint: nullableNum,
    maxPolymerFraction: nullableNum,
    maxPourPoint: nullableNum,
    minFlashPoint: nullableNum,
    additive: z.object({ componentId: str, massFraction: finite }).nullable(),
    bounds: z.record(str, boundsSchema),
    objective: z.enum(['cost', 'cost-kg', 'solvency', 'oxidation', 'closest']),
    referenceRecipeId: str.nullable(),
    minInBandProbability: nullableNum,
  })
  .superRefine((t, ctx) => report(ctx, targetsProblems(t)));

/** Settings: shape here, every value checked by `settingsProblems` (field-rules.ts). */
export const settingsSchema = z
  .object({
    temperatureUnit: z.enum(['C', 'F']),
    currencySymbol: str,
    decimalSeparator: z.enum(['.', ',']),
    thousandsGrouping: z.boolean(),
    companyName: str,
    operatingTempC: finite,
    coldStartTempC: finite,
    blendMethod: z.enum(['refutas', 'astm-d7152', 'd7152-wright']),
    d341Form: z.enum(['d341-20', 'walther-simple']),
    meteringTempC: finite,
    deliveryTempC: finite,
    lastBackupAt: str.nullable(),
    baseCurrency: str,
    exchangeRates: z.array(z.object({ currency: str, rate: finite, asOf: str })),
  })
  .superRefine((s, ctx) => report(ctx, settingsProblems(s)));

/** Blend-sheet inputs of one recipe (lot, batch size as typed, vessel, edited instructions). */
export const sheetInputsSchema = z
  .object({
    lot: str,
    batchSize: str,
    batchUnit: z.enum(['kg', 'litres']),
    vessel: str,
    instructions: str.nullable(),
  })
  .superRefine((s, ctx) => report(ctx, sheetProblems(s)));

/** The line plan (kept with the recipes; see `lineplan.ts`). */
export const linePlanSchema = z
  .object({
    period: str,
    demandUnit: z.enum(['kg', 't']),
    demands: z.record(str, finite),
    supplies: z.record(str, finite.nullable()),
    keep: z.record(str, finite),
    maxStocks: finite.nullable(),
  })
  .superRefine((p, ctx) => report(ctx, linePlanProblems(p)));
const nullableFinite = finite.nullable();
/** QC-loop inputs of one recipe's blend sheet: shape here, every value checked by `qcProblems` (field-rules.ts). */
export const qcInputsSchema = z
  .object({
    aimKv40: nullableFinite,
    lots: z.record(str, z.object({ kv40: nullableFinite, kv100: nullableFinite, density15: nullableFinite })),
    heel: z.object({
      massKg: nullableFinite,
      kv40: nullableFinite,
      kv100: nullableFinite,
      density15: nullableFinite,
      additiveFraction: nullableFinite,
      source: str,
    }),
    correction: z.object({
      kv40: nullableFinite,
      kv100: nullableFinite,
      massKg: nullableFinite,
      vesselLimitKg: nullableFinite,
      bandPct: nullableFinite,
      objective: z.enum(['cost', 'mass']),
      onHandKg: z.record(str, nullableFinite),
      stockIds: z.array(str),
    }),
  })
  .superRefine((q, ctx) => report(ctx, qcProblems(q)));

/** Persisted slice of the library store. */
export const libraryDataSchema = z.object({ components: list(componentSchema, 'stocks') });
/** Persisted slice of the recipes store. */
export const recipesDataSchema = z.object({
  recipes: list(recipeSchema, 'recipes'),
  targets: z.record(str, targetsSchema),
  activeRecipeId: str.nullable(),
  sheets: z.record(str, sheetInputsSchema),
  linePlan: linePlanSchema,
  qc: z.record(str, qcInputsSchema),
});
/** Persisted slice of the settings store. */
export const settingsDataSchema = z.object({ settings: settingsSchema });

/** Objectives, as the targets name them. */
const objectiveSchema = targetsSchema.shape.objective;
const draftLines = list(recipeLineSchema, 'linesPerRecipe').superRefine((lines, ctx) => {
  for (const l of lines) {
    const m = checkNumber('massFraction', l.massFraction);
    if (m) ctx.addIssue({ code: 'custom', message: m });
  }
});

/** A candidate of the substitute search as kept in the workspace (further fields kept as they are). */
const candidateSchema = z.looseObject({
  key: str,
  componentIds: z.array(str),
  lines: draftLines,
  objectiveValue: finite,
  costPerLitre: finite,
  anilinePoint: nullableFinite,
  kv40: finite,
  kv100: finite,
  vi: nullableFinite,
  density15: finite,
  oxidationRating: nullableFinite,
  rank: finite,
  onFrontier: z.boolean(),
});

/** A finished substitute search as kept in the workspace (the explorer ranks at most 200 candidates). */
const searchResultSchema = z.looseObject({
  evaluated: finite,
  total: finite,
  feasible: finite,
  distinct: finite,
  done: z.boolean(),
  objective: objectiveSchema,
  candidates: z.array(candidateSchema).max(1000),
  frontier: z.array(candidateSchema).max(COLLECTION_LIMITS.stocks),
  excludedIds: z.array(str),
  forcedIds: z.array(str),
  poolIds: z.array(str),
  maxComponents: finite,
  band: z.object({ min: finite, max: finite }),
});

const scenarioSchema = z.object({
  referenceId: str,
  polymerCap: nullableFinite.optional(),
  minInBandProbability: nullableFinite.optional(),
  pricingKey: str.optional(),
  method: z.enum(['refutas', 'astm-d7152', 'd7152-wright']).optional(),
  referenceCost: nullableFinite.optional(),
  withdrawn: z.array(str),
  maxComponents: finite,
  objective: objectiveSchema,
});

/** The designer's unsaved draft and the explorer's session (workspace store, see workspace.ts). */
export const workspaceDataSchema = z.object({
  // Every tab's draft with unsaved edits, by the tab's draft key (workspace schema 3).
  drafts: z.record(
    str,
    z.object({
      targets: targetsSchema,
      lines: draftLines,
      name: str.superRefine((v, ctx) => {
        const m = checkText('recipeName', v);
        if (m) ctx.addIssue({ code: 'custom', message: m });
      }),
      sourceRecipeId: str.nullable(),
      basedOn: z.union([z.object({ updatedAt: str }), z.object({ unknown: z.literal(true) })]).nullable(),
      basis: z.enum(['mass', 'volume']),
      rebalanceMode: z.enum(['balance', 'proportional']),
      balanceId: str.nullable(),
      dirty: z.boolean(),
      keptAt: str.nullable(),
    }),
  ),
  habits: z.object({ basis: z.enum(['mass', 'volume']), rebalanceMode: z.enum(['balance', 'proportional']) }).nullable(),
  explorer: z
    .object({
      referenceId: str.nullable(),
      withdrawn: z.array(str),
      maxComponents: finite,
      objective: objectiveSchema,
      polymerCap: nullableFinite.optional(),
      // Optional: sessions kept before the explorer asked for a probability in band have none.
      minInBandProbability: nullableFinite.optional(),
      result: searchResultSchema.nullable(),
      resultFor: scenarioSchema.nullable(),
      resultBasis: str.nullable(),
      selectedKey: str.nullable(),
      sort: z.object({ key: str, dir: z.enum(['asc', 'desc']) }),
      adopted: z.record(str, str),
    })
    .nullable(),
});

// Compile-time checks that the schemas and the domain model agree (each assignable to the other).
function agree<A, B extends A>(_check?: [A, B]): void {}
agree<z.infer<typeof componentSchema>, Component>();
agree<Component, z.infer<typeof componentSchema>>();
agree<z.infer<typeof recipeSchema>, Recipe>();
agree<Recipe, z.infer<typeof recipeSchema>>();
agree<z.infer<typeof targetsSchema>, BlendTargets>();
agree<BlendTargets, z.infer<typeof targetsSchema>>();
agree<z.infer<typeof linePlanSchema>, LinePlanInputs>();
agree<LinePlanInputs, z.infer<typeof linePlanSchema>>();
agree<z.infer<typeof qcInputsSchema>, QcInputs>();
agree<QcInputs, z.infer<typeof qcInputsSchema>>();

/** One-line, human-readable summary of a zod error: "viscosityPoints: …; price.amount: …". */
export function describeIssues(error: z.ZodError, max = 4): string {
  const parts = error.issues.slice(0, max).map((i) => {
    const path = i.path.map(String).join('.');
    return path ? `${path}: ${i.message}` : i.message;
  });
  if (error.issues.length > max) parts.push(`… and ${error.issues.length - max} more`);
  return parts.join('; ');
}

const clipName = (s: unknown, n = 40) => {
  const t = typeof s === 'string' ? s.trim() : '';
  return t.length > n ? `${t.slice(0, n)}…` : t;
};
const at = (v: unknown, k: PropertyKey): unknown => (v && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k] : undefined);

/**
 * The record a path inside stored data (library, recipes or settings section) belongs to, in the
 * user's words, and the rest of the path: ['components', 12, 'density15'] → ["stock BW-190", ['density15']].
 */
function recordOf(data: unknown, path: readonly PropertyKey[]): { who: string; rest: PropertyKey[] } {
  const [head, key, ...rest] = path;
  const recipeName = (id: unknown) => {
    const list = at(data, 'recipes');
    const r = Array.isArray(list) ? list.find((x) => at(x, 'id') === id) : undefined;
    return r ? `recipe “${clipName(at(r, 'name'))}”` : `recipe ${clipName(String(id))}`;
  };
  if (head === 'components' && typeof key === 'number') {
    const code = clipName(at(at(at(data, 'components'), key), 'code'));
    return { who: code ? `stock ${code} (entry ${key + 1})` : `stock entry ${key + 1}`, rest };
  }
  if (head === 'recipes' && typeof key === 'number') {
    const name = clipName(at(at(at(data, 'recipes'), key), 'name'));
    return { who: `recipe “${name}” (entry ${key + 1})`, rest };
  }
  if (head === 'targets' && key !== undefined) return { who: `the targets of ${recipeName(key)}`, rest };
  if (head === 'sheets' && key !== undefined) return { who: `the blend sheet of ${recipeName(key)}`, rest };
  if (head === 'qc' && key !== undefined) return { who: `the QC entries of ${recipeName(key)}`, rest };
  if (head === 'settings') return { who: 'settings', rest: path.slice(1) };
  return { who: '', rest: [...path] };
}

/**
 * Every refused field of stored or imported data, naming the record (stock code, recipe name) and the
 * field: "Stock BW-190 (entry 13): the density at 15 °C 1e−300 kg/L is outside …; Recipe “VG 320”
 * (entry 2): the shares add up to 300 %, not 100 %". At most `max` issues, then "… and n more".
 */
export function describeStoredIssues(error: z.ZodError, data: unknown, max = 12): string {
  const parts = storedIssueLines(error, data, max);
  if (error.issues.length > max) parts.push(`… and ${error.issues.length - max} more`);
  return parts.join('; ');
}

/** The refused fields of stored or imported data, one line each (at most `max`), as in describeStoredIssues. */
export function storedIssueLines(error: z.ZodError, data: unknown, max = 200): string[] {
  const cap = (t: string) => t.charAt(0).toUpperCase() + t.slice(1);
  const low = (t: string) => t.charAt(0).toLowerCase() + t.slice(1);
  return error.issues.slice(0, max).map((i) => {
    const { who, rest } = recordOf(data, i.path);
    // Messages from the field rules name the field themselves ("The density at 15 °C …").
    const named = i.code === 'custom';
    const field = rest.map(String).join('.');
    if (!who) return field ? `${field}: ${i.message}` : i.message;
    if (named) return `${cap(who)}: ${low(i.message)}`;
    return `${cap(who)}${field ? `, ${field}` : ''}: ${low(i.message)}`;
  });
}
