/**
 * Field rules: the limits of every stored field, in one place, with small validators that return a
 * message in the user's words (naming the field, and the stock or recipe when given) or null.
 *
 * One set of rules for every way in: the entry forms call these validators, and the zod schemas in
 * `schemas.ts` refine with the very same functions, so what entry accepts is exactly what storage,
 * import, backup and load accept — nothing is stored that cannot be read back. Plain TypeScript with
 * no zod import, so the entry forms and the opening screen can use it without loading zod.
 *
 * Exports (stable names; other screens rely on them):
 *   TEXT_RULES[field]       { label, max, required, singleLine } for every stored text field (TextRuleKey)
 *   NUMBER_RULES[field]     { label, unit, min, max, minExclusive, integer, nullable, percent } (NumberRuleKey)
 *   COLLECTION_LIMITS       most stocks per library, recipes, lines per recipe, viscosity points, import
 *                           rows, file sizes …
 *   STORED_SUM_TOLERANCE    how far a stored recipe's (or trial blend's) mass fractions may sum from 1
 *   checkText(field, value, who?)            → message | null
 *   checkNumber(field, value, who?)          → message | null   (value: number | null)
 *   checkDate(field, value, who?)            → message | null   (YYYY-MM-DD or empty)
 *   specificationProblems(spec, who?)        → FieldProblem[]   (a recipe's release limits; min ≤ max)
 *   checkCount(collection, count, who?)      → message | null
 *   checkFractions(fractions, who?, what?)   → message | null   (each 0–1, no stock twice, Σ = 100 %)
 *   checkBoundPair(min, max, who?)           → message | null   (min ≤ max, each 0–1)
 *   stockWho(code) / recipeWho(name)         → "stock BW-190" / "recipe “VG 320 plant”" for `who`
 *   fmtRuleNumber(v)                         → a number as messages print it (6 significant figures, true minus)
 *   stockProblems / recipeProblems / targetsProblems / sheetProblems / settingsProblems(record, who?)
 *                                            → FieldProblem[] ({ path, message }) for a whole record
 *   FieldRuleError                           thrown by a store action given a record the rules refuse
 *
 * `who` names the record ("stock BW-190"); the message then reads "Stock BW-190: density at 15 °C …".
 *
 * The ranges are hard limits, not plausibility warnings (those stay in `checks.ts`): beyond them a
 * value cannot describe a blending component, a recipe or a batch (a slipped exponent, a unit typed in
 * the wrong column, a hostile file). Each range states why; most are common practice (no source).
 */
import { DENSITY15_MAX, DENSITY15_MIN } from '../core/errors';
import type { ReleaseSpecification } from '../core/formulation/model';
import { OXIDATION_RATING_MAX, OXIDATION_RATING_MIN } from '../core/scoring/oxidation';
import { MAX_KV40_LOT_SPREAD_PCT } from '../core/qc/lot-spread';

// ---------------------------------------------------------------------------------------------
// Text fields

export interface TextRule {
  /** The field as the user knows it, lower case ("recipe name"). */
  label: string;
  /** Most characters (UTF-16 code units, as `String.length` counts them). */
  max: number;
  /** An empty or blank value is refused. */
  required: boolean;
  /** One line: control characters (line breaks, tabs …) are refused. Multi-line fields refuse
   * control characters other than line breaks and tabs. */
  singleLine: boolean;
}

const textRule = (label: string, max: number, opts: { required?: boolean; singleLine?: boolean } = {}): TextRule =>
  Object.freeze({ label, max, required: opts.required ?? false, singleLine: opts.singleLine ?? true });

/**
 * Every stored text field. Lengths are common practice (no source): a stock code fits a drum label,
 * a name a sheet's title line, notes and instructions a page or two; bounded so one hostile file
 * cannot fill the browser's storage.
 */
export const TEXT_RULES = Object.freeze({
  /** Internal identifier of a stock or recipe (never typed by the user). */
  id: textRule('identifier', 100, { required: true }),
  stockCode: textRule('stock code', 40, { required: true }),
  stockName: textRule('stock name', 200),
  stockNotes: textRule('notes field', 2000, { singleLine: false }),
  source: textRule('source', 300),
  currency: textRule('currency', 12),
  labReference: textRule('laboratory reference', 200),
  recipeName: textRule('recipe name', 200),
  recipeNotes: textRule('recipe notes field', 4000, { singleLine: false }),
  /** Blend sheet: batch or lot number. */
  lot: textRule('lot number', 120),
  vessel: textRule('vessel', 120),
  /** Blend sheet: the batch size as typed (its number is checked with NUMBER_RULES.batchSize). */
  batchSize: textRule('batch size', 32),
  instructions: textRule('text of the blending instructions', 20_000, { singleLine: false }),
  /** Blend sheet: what the heel in the vessel is (e.g. "previous batch of VG 320, lot 2291"). */
  heelSource: textRule('description of the heel', 200),
  companyName: textRule('company name', 200),
  currencySymbol: textRule('currency symbol', 8),
  /** The currency every cost is restated in (Settings); a code such as EUR. */
  baseCurrency: textRule('base currency', 12, { required: true }),
  /** The currency of an exchange rate (Settings). */
  rateCurrency: textRule('currency of the rate', 12, { required: true }),
  /** Why a recipe revision was made (printed on the blend sheet). */
  reasonForChange: textRule('reason for change', 1000),
  /** Name or number of a recipe's product specification. */
  specReference: textRule('specification reference', 120),
  /** A worded specification limit (copper strip, foam). */
  specText: textRule('specification limit', 60),
  /** ISO date-time stamps written by Blendbench. */
  timestamp: textRule('time stamp', 40),
  /** Line plan: what the planning period is called ("2026", "next 12 months"). */
  planPeriod: textRule('planning period', 80),
} satisfies Record<string, TextRule>);

export type TextRuleKey = keyof typeof TEXT_RULES;

// ---------------------------------------------------------------------------------------------
// Number fields

export interface NumberRule {
  label: string;
  /** Unit printed after a value ('' for none). */
  unit: string;
  min: number;
  max: number;
  /** The minimum itself is refused (e.g. a viscosity must be above zero). */
  minExclusive: boolean;
  integer: boolean;
  /** null (no value) is allowed. */
  nullable: boolean;
  /** A fraction 0–1 the user sees and types in % (messages print ×100 with "%"). */
  percent: boolean;
}

const numberRule = (
  label: string,
  unit: string,
  min: number,
  max: number,
  opts: { minExclusive?: boolean; integer?: boolean; nullable?: boolean; percent?: boolean } = {},
): NumberRule =>
  Object.freeze({
    label,
    unit,
    min,
    max,
    minExclusive: opts.minExclusive ?? false,
    integer: opts.integer ?? false,
    nullable: opts.nullable ?? false,
    percent: opts.percent ?? false,
  });

/** Viscosity in mm²/s: above zero and at most 10⁷ (a solid, not a blending component; common practice, no source). */
const KV_MAX = 1e7;
/**
 * Lowest ν100 [mm²/s]: 2.0, the lower limit of ASTM D2270 (VI is not defined below it) and of the
 * ASTM D341 chart in its plain form; a gear-oil blending stock is far above it.
 */
export const KV100_MIN = 2.0;

/**
 * Every stored number field, with its unit and hard limits (inclusive unless `minExclusive`).
 * Temperatures are °C as stored; fractions are 0–1 as stored (shown in %).
 */
export const NUMBER_RULES = Object.freeze({
  /** Density at 15 °C [kg/L]; 0.6–1.3, the core's range for an oil (see core/errors.ts). */
  density15: numberRule('density at 15 °C', 'kg/L', DENSITY15_MIN, DENSITY15_MAX),
  /** Any measured viscosity point [mm²/s]. */
  kv: numberRule('viscosity', 'mm²/s', 0, KV_MAX, { minExclusive: true }),
  /** ν40 [mm²/s]: at least ν100's floor (ν40 is always above ν100). */
  kv40: numberRule('ν40', 'mm²/s', KV100_MIN, KV_MAX),
  /** ν100 [mm²/s]: from 2.0 (ASTM D2270 scope). */
  kv100: numberRule('ν100', 'mm²/s', KV100_MIN, KV_MAX),
  /** Temperature of a viscosity point [°C]; ASTM D341 charts run about −70 to 370 °C. */
  viscosityTempC: numberRule('viscosity temperature', '°C', -100, 400, { minExclusive: true }),
  /** Aniline point, ASTM D611 [°C] (polar esters below 0, PAO about 130–150). */
  anilinePoint: numberRule('aniline point', '°C', -100, 300, { nullable: true }),
  /** Pour point, ASTM D97 [°C]. */
  pourPoint: numberRule('pour point', '°C', -100, 100, { nullable: true }),
  /** Flash point, ASTM D92 [°C]. */
  flashPoint: numberRule('flash point', '°C', -50, 500, { nullable: true }),
  sulfurPct: numberRule('sulfur', 'mass %', 0, 100, { nullable: true }),
  saturatesPct: numberRule('saturates', 'mass %', 0, 100, { nullable: true }),
  /** Price in its currency per its basis; 10¹² covers any currency per tonne (common practice, no source). */
  price: numberRule('price', '', 0, 1e12),
  oxidationRating: numberRule('oxidation rating', '', OXIDATION_RATING_MIN, OXIDATION_RATING_MAX, { nullable: true }),
  /** Permanent shear loss of ν100, KRL (ISO 26422 / CEC L-45) [%]. */
  shearLossPct: numberRule('shear loss', '%', 0, 100, { nullable: true }),
  /**
   * Lot-to-lot relative standard deviation of ν40 [%] (null → the category default); at most 25 %,
   * beyond which a drawn lot's ν40 could turn negative (core/qc/lot-spread.ts).
   */
  kv40LotSpreadPct: numberRule('lot spread of ν40', '%', 0, MAX_KV40_LOT_SPREAD_PCT, { nullable: true }),
  /**
   * Minimum probability that a batch lands in band (fraction, shown in %); certainty is impossible
   * with any lot spread, so at most 99.99 % (common practice, no source).
   */
  minInBandProbability: numberRule('probability in band', '%', 0, 0.9999, { nullable: true, percent: true }),
  /** Measured permanent shear loss of ν40 (ISO 26422 allows 40 °C too) [%]. */
  shearLoss40Pct: numberRule('ν40 shear loss', '%', 0, 100, { nullable: true }),
  /** Effective blending viscosity of a calibrated stock [mm²/s]. */
  effectiveKv: numberRule('effective viscosity', 'mm²/s', 0, KV_MAX, { minExclusive: true }),
  /** A mass fraction in a recipe or trial blend (0–1, shown in %). */
  massFraction: numberRule('share', '%', 0, 1, { percent: true }),
  /** Fixed treat rate of the additive package (mass fraction, shown in %). */
  treatRate: numberRule('additive treat rate', '%', 0, 1, { percent: true }),
  /** A per-stock lower or upper limit (mass fraction, shown in %). */
  bound: numberRule('limit', '%', 0, 1, { percent: true }),
  /** ISO viscosity grade number: VG 2 (ISO 3448) to VG 3200 (ASTM D2422). */
  grade: numberRule('viscosity grade', '', 2, 3200),
  revision: numberRule('revision', '', 1, 1_000_000, { integer: true }),
  /** Target ν40 [mm²/s] (null → the grade's mid-point). */
  targetKv40: numberRule('target ν40', 'mm²/s', 0, KV_MAX, { minExclusive: true, nullable: true }),
  /** Half-width of the band around the target [% of target]. */
  tolerancePct: numberRule('tolerance', '%', 0, 100),
  /** Minimum VI (ASTM D2270); the highest VIs of any oil are a few hundred. */
  minVi: numberRule('minimum VI', '', -100, 500, { nullable: true }),
  maxAnilinePoint: numberRule('highest aniline point', '°C', -100, 300, { nullable: true }),
  maxPolymerFraction: numberRule('polymer cap', '%', 0, 1, { nullable: true, percent: true }),
  maxPourPoint: numberRule('highest pour point', '°C', -100, 100, { nullable: true }),
  minFlashPoint: numberRule('lowest flash point', '°C', -50, 500, { nullable: true }),
  /** A mass in a vessel or on hand [kg] (heel, batch in the vessel, vessel limit, stock on hand); 0–10,000 t. */
  massKg: numberRule('mass', 'kg', 0, 1e7),
  /** Batch size [kg or litres]: up to 10,000 t, beyond any blending vessel (common practice, no source). */
  batchSize: numberRule('batch size', '', 0, 1e7, { minExclusive: true }),
  /** Gearbox operating temperature [°C]. */
  operatingTempC: numberRule('operating temperature', '°C', -60, 200),
  /** Cold-start temperature [°C]. */
  coldStartTempC: numberRule('cold-start temperature', '°C', -60, 60),
  /** Product specification: ν100 limits [mm²/s] (from the D2270 floor of 2.0). */
  specKv100: numberRule('specification ν100 limit', 'mm²/s', KV100_MIN, KV_MAX, { nullable: true }),
  /** Product specification: minimum VI. */
  specViMin: numberRule('specification VI minimum', '', -100, 500, { nullable: true }),
  /** Product specification: density limits at 15 °C [kg/L] (the stocks' own range). */
  specDensity15: numberRule('specification density limit', 'kg/L', DENSITY15_MIN, DENSITY15_MAX, { nullable: true }),
  /** Product specification: minimum flash point [°C]. */
  specFlashMin: numberRule('specification flash-point minimum', '°C', -50, 500, { nullable: true }),
  /** Product specification: maximum pour point [°C]. */
  specPourMax: numberRule('specification pour-point maximum', '°C', -100, 100, { nullable: true }),
  /**
   * Exchange rate: base-currency units per unit of the quoted currency. 10⁻⁹–10⁹ spans any pair of
   * currencies in use (common practice, no source); zero or a negative rate is refused.
   */
  exchangeRate: numberRule('exchange rate', '', 1e-9, 1e9),
  /**
   * Line plan: a grade's demand over the planning period [kg]; above 0 and at most 10¹⁰ kg (ten million
   * tonnes, beyond any blending plant's year; common practice, no source).
   */
  demandKg: numberRule('demand', 'kg', 0, 1e10, { minExclusive: true }),
  /** Line plan: supply of a limited stock over the period [kg]; 0 to 10¹⁰ kg. */
  supplyKg: numberRule('supply', 'kg', 0, 1e10),
  /** Line plan: least use over the period of a stock that must stay in use [kg]; 0 to 10¹⁰ kg. */
  minUseKg: numberRule('least use', 'kg', 0, 1e10),
  /** Line plan: most distinct stocks (tanks) across the line; 1 to 1,000 (common practice, no source). */
  maxStocks: numberRule('number of stocks', '', 1, 1000, { integer: true, nullable: true }),
  /** Metering temperature of the blend sheet's litres [°C]; the tables' and the D341 band's −20…150 °C. */
  meteringTempC: numberRule('metering temperature', '°C', -20, 150),
  /** Temperature at which delivered litres are costed [°C]. */
  deliveryTempC: numberRule('delivery temperature', '°C', -20, 150),
} satisfies Record<string, NumberRule>);

export type NumberRuleKey = keyof typeof NUMBER_RULES;

// ---------------------------------------------------------------------------------------------
// Collections and files

/**
 * Sizes of collections and files: one limit for entry, import, backup and load. A large plant keeps
 * well over ten thousand stock records (every grade from every source and site); 25,000 leaves room
 * above the 20,000 the plant asked for (issue 10). Common practice (no source).
 */
export const COLLECTION_LIMITS = Object.freeze({
  /** Stocks in the library. */
  stocks: 25_000,
  recipes: 10_000,
  linesPerRecipe: 60,
  viscosityPoints: 20,
  /** Exchange rates in the settings (one per currency). */
  exchangeRates: 100,
  /** Rows (CSV) or components (JSON) in one library import: a whole library. */
  importRows: 25_000,
  /** Largest library import file [characters]. */
  importFileChars: 100_000_000,
  /** Largest backup file [characters]. */
  backupFileChars: 200_000_000,
} as const);

export type CollectionKey = keyof typeof COLLECTION_LIMITS;

const COLLECTION_LABEL: Record<CollectionKey, [one: string, many: string]> = {
  stocks: ['stock', 'stocks'],
  recipes: ['recipe', 'recipes'],
  linesPerRecipe: ['line', 'lines'],
  viscosityPoints: ['viscosity point', 'viscosity points'],
  exchangeRates: ['exchange rate', 'exchange rates'],
  importRows: ['row', 'rows'],
  importFileChars: ['character', 'characters'],
  backupFileChars: ['character', 'characters'],
};

/** How far a stored recipe's or trial blend's mass fractions may sum from 1 (the designer saves within 1e-6). */
export const STORED_SUM_TOLERANCE = 1e-6;

// ---------------------------------------------------------------------------------------------
// Validators

/** A number as messages print it: at most 6 significant figures, a true minus sign. */
export function fmtRuleNumber(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return String(Number(v.toPrecision(6))).replace(/-/g, '−');
}

const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n)}…` : s);
/** `who` for a stock: "stock BW-190" (code clipped to 40 characters). */
export const stockWho = (code: string): string => `stock ${clip(code.trim(), 40) || '(no code)'}`;
/** `who` for a recipe: "recipe “VG 320 plant”" (name clipped to 40 characters). */
export const recipeWho = (name: string): string => `recipe “${clip(name.trim(), 40)}”`;

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
/** "Stock BW-190: the stock name …" or "The stock name …". */
function say(who: string | undefined, text: string): string {
  return who ? `${capital(who)}: ${text}` : capital(text);
}

// C0 and C1 controls and DEL; a multi-line field may hold line breaks and tabs.
const CONTROL_SINGLE = /[\u0000-\u001f\u007f-\u009f]/;
const CONTROL_MULTI = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

/** Check a stored text field. Returns a message naming the field (and `who`), or null. */
export function checkText(field: TextRuleKey, value: string, who?: string): string | null {
  const r: TextRule = TEXT_RULES[field];
  if (typeof value !== 'string') return say(who, `the ${r.label} must be text`);
  if (r.required && value.trim() === '') return say(who, `the ${r.label} is required`);
  if (value.length > r.max) {
    return say(who, `the ${r.label} is ${value.length} characters long; at most ${r.max} can be saved`);
  }
  const control = (r.singleLine ? CONTROL_SINGLE : CONTROL_MULTI).exec(value);
  if (control) {
    const ch = control[0];
    const what =
      ch === '\n' || ch === '\r' ? 'a line break' : ch === '\t' ? 'a tab' : `an invisible control character (U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')})`;
    return say(who, `the ${r.label} contains ${what}; remove it`);
  }
  return null;
}

/**
 * Writes numbers into messages. Entry screens pass their formatter, so a message shows numbers with
 * the user's decimal separator and temperatures in the user's unit (what they would type back);
 * files and stored data keep "." and °C ({@link FILE_NUMBERS}).
 */
export interface SayNumbers {
  /** A plain number. */
  say: (v: number) => string;
  /** A temperature given in °C, with its unit. */
  sayTemp: (c: number) => string;
}

/** Numbers in messages about files and stored data: "." as decimal separator, °C. */
export const FILE_NUMBERS: SayNumbers = { say: (v) => fmtRuleNumber(v), sayTemp: (c) => `${fmtRuleNumber(c)} °C` };

/**
 * Check a stored number field. Returns a message naming the field (and `who`), or null. `words`
 * writes the numbers (default: "." and °C).
 */
export function checkNumber(field: NumberRuleKey, value: number | null, who?: string, words: SayNumbers = FILE_NUMBERS): string | null {
  const r: NumberRule = NUMBER_RULES[field];
  if (value === null || value === undefined) return r.nullable ? null : say(who, `the ${r.label} is required`);
  if (typeof value !== 'number' || !Number.isFinite(value)) return say(who, `the ${r.label} must be a finite number`);
  const k = r.percent ? 100 : 1;
  const unit = r.unit ? (r.unit === '%' ? ' %' : ` ${r.unit}`) : '';
  const show = (v: number) => (r.unit === '°C' ? words.sayTemp(v) : `${words.say(Number((v * k).toPrecision(12)))}${unit}`);
  const low = r.minExclusive ? value <= r.min : value < r.min;
  if (low || value > r.max) {
    const range = r.minExclusive ? `above ${show(r.min)} and at most ${show(r.max)}` : `from ${show(r.min)} to ${show(r.max)}`;
    return say(who, `the ${r.label} ${show(value)} is outside the possible range (${range})`);
  }
  if (r.integer && !Number.isInteger(value)) return say(who, `the ${r.label} must be a whole number`);
  return null;
}

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
/** Check a stored date: empty, or a real calendar date YYYY-MM-DD. */
export function checkDate(field: 'sourceDate' | 'calibratedOn' | 'rateAsOf', value: string, who?: string): string | null {
  const label = field === 'sourceDate' ? 'source date' : field === 'calibratedOn' ? 'calibration date' : '“as of” date of the rate';
  if (typeof value !== 'string') return say(who, `the ${label} must be text`);
  if (value === '') return null;
  const m = DATE.exec(value);
  if (m) {
    const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
    const dt = new Date(Date.UTC(y, mo - 1, d));
    if (dt.getUTCFullYear() === y && dt.getUTCMonth() === mo - 1 && dt.getUTCDate() === d) return null;
  }
  return say(who, `the ${label} “${clip(value, 20)}” is not a date YYYY-MM-DD`);
}

/** Check the size of a collection. */
export function checkCount(collection: CollectionKey, count: number, who?: string): string | null {
  const max = COLLECTION_LIMITS[collection];
  if (count <= max) return null;
  const [, many] = COLLECTION_LABEL[collection];
  return say(who, `${count} ${many} is more than Blendbench keeps (at most ${max})`);
}

/**
 * Check the lines of a recipe or trial blend: at most `COLLECTION_LIMITS.linesPerRecipe`, each share
 * 0–100 %, no stock twice, and (when there is any line) a total of 100 % within STORED_SUM_TOLERANCE.
 * `what` names the collection in the message ("shares", "trial shares").
 */
export function checkFractions(
  lines: ReadonlyArray<{ componentId: string; massFraction: number }>,
  who?: string,
  what = 'shares',
): string | null {
  const many = checkCount('linesPerRecipe', lines.length, who);
  if (many) return many;
  const seen = new Set<string>();
  let sum = 0;
  for (const l of lines) {
    const bad = checkNumber('massFraction', l.massFraction, who);
    if (bad) return bad;
    if (seen.has(l.componentId)) return say(who, `a stock appears twice among the ${what}`);
    seen.add(l.componentId);
    sum += l.massFraction;
  }
  if (lines.length > 0 && Math.abs(sum - 1) > STORED_SUM_TOLERANCE) {
    return say(who, `the ${what} add up to ${fmtRuleNumber(sum * 100)} %, not 100 %`);
  }
  return null;
}

/** Check a per-stock lower/upper limit pair (each 0–100 %, lower not above upper). */
export function checkBoundPair(min: number | undefined, max: number | undefined, who?: string): string | null {
  for (const [v, which] of [
    [min, 'lower'],
    [max, 'upper'],
  ] as const) {
    if (v === undefined) continue;
    const bad = checkNumber('bound', v, who);
    if (bad) return bad.replace(/\b([Tt]he) limit/, `$1 ${which} limit`);
  }
  if (min !== undefined && max !== undefined && min > max) {
    return say(who, `the lower limit ${fmtRuleNumber(min * 100)} % is above the upper limit ${fmtRuleNumber(max * 100)} %`);
  }
  return null;
}

// ---------------------------------------------------------------------------------------------
// Whole records: every field of a stock, recipe, targets, blend sheet or settings against its rule.
// The zod schemas check shape and types, then call these, so the field → rule mapping lives here only.

/** One refused field of a record: `path` inside the record (e.g. ['price', 'amount']) and the message. */
export interface FieldProblem {
  path: Array<string | number>;
  message: string;
}

type Collect = (path: Array<string | number>, message: string | null) => void;
function collector(): { out: FieldProblem[]; add: Collect } {
  const out: FieldProblem[] = [];
  return { out, add: (path, message) => void (message && out.push({ path, message })) };
}

/** A stock's fields as stored (structurally the core's `Component`). */
export interface StockFields {
  id: string;
  code: string;
  name: string;
  viscosityPoints: ReadonlyArray<{ tempC: number; kv: number }>;
  density15: number;
  anilinePoint: number | null;
  pourPoint: number | null;
  flashPoint: number | null;
  sulfurPct: number | null;
  saturatesPct: number | null;
  price: { amount: number; currency: string };
  oxidationRating: number | null;
  shearLossPct: number | null;
  kv40LotSpreadPct: number | null;
  shearLoss40Pct?: number | null;
  calibration: {
    effectiveKv40: number;
    effectiveKv100: number;
    trial: { massFractions: Record<string, number>; measuredKv40: number; measuredKv100: number; labReference: string };
    calibratedOn: string;
  } | null;
  source: string;
  sourceDate: string;
  notes: string;
}

/**
 * Every field of a stock against its rule: code, name, texts, viscosity points (ν40/ν100 from 2.0 mm²/s,
 * falling as temperature rises, two different temperatures at least), density, temperatures, price,
 * scores, calibration. `who` defaults to "stock <code>".
 */
export function stockProblems(c: StockFields, who: string = stockWho(String(c.code ?? ''))): FieldProblem[] {
  const { out, add } = collector();
  add(['id'], checkText('id', c.id, who));
  add(['code'], checkText('stockCode', c.code, who));
  add(['name'], checkText('stockName', c.name, who));
  add(['viscosityPoints'], checkCount('viscosityPoints', c.viscosityPoints.length, who));
  c.viscosityPoints.forEach((p, i) => {
    add(['viscosityPoints', i, 'tempC'], checkNumber('viscosityTempC', p.tempC, who));
    const field: NumberRuleKey = p.tempC === 40 ? 'kv40' : p.tempC === 100 ? 'kv100' : 'kv';
    add(['viscosityPoints', i, 'kv'], checkNumber(field, p.kv, who));
  });
  const temps = new Set(c.viscosityPoints.map((p) => p.tempC));
  if (temps.size < 2) add(['viscosityPoints'], say(who, 'viscosities at two different temperatures are needed'));
  const sorted = [...c.viscosityPoints].sort((a, b) => a.tempC - b.tempC);
  for (let i = 1; i < sorted.length; i++) {
    const lo = sorted[i - 1]!;
    const hi = sorted[i]!;
    if (hi.tempC > lo.tempC && hi.kv >= lo.kv) {
      add(
        ['viscosityPoints'],
        say(
          who,
          `the viscosity at ${fmtRuleNumber(hi.tempC)} °C (${fmtRuleNumber(hi.kv)} mm²/s) must be below the viscosity at ${fmtRuleNumber(lo.tempC)} °C (${fmtRuleNumber(lo.kv)} mm²/s)`,
        ),
      );
    }
  }
  add(['density15'], checkNumber('density15', c.density15, who));
  add(['anilinePoint'], checkNumber('anilinePoint', c.anilinePoint, who));
  add(['pourPoint'], checkNumber('pourPoint', c.pourPoint, who));
  add(['flashPoint'], checkNumber('flashPoint', c.flashPoint, who));
  add(['sulfurPct'], checkNumber('sulfurPct', c.sulfurPct, who));
  add(['saturatesPct'], checkNumber('saturatesPct', c.saturatesPct, who));
  add(['price', 'amount'], checkNumber('price', c.price.amount, who));
  add(['price', 'currency'], checkText('currency', c.price.currency, who));
  add(['oxidationRating'], checkNumber('oxidationRating', c.oxidationRating, who));
  add(['shearLossPct'], checkNumber('shearLossPct', c.shearLossPct, who));
  add(['kv40LotSpreadPct'], checkNumber('kv40LotSpreadPct', c.kv40LotSpreadPct, who));
  add(['shearLoss40Pct'], checkNumber('shearLoss40Pct', c.shearLoss40Pct ?? null, who));
  if (c.calibration) {
    const k = c.calibration;
    add(['calibration', 'effectiveKv40'], checkNumber('effectiveKv', k.effectiveKv40, who));
    add(['calibration', 'effectiveKv100'], checkNumber('effectiveKv', k.effectiveKv100, who));
    add(['calibration', 'trial', 'measuredKv40'], checkNumber('kv40', k.trial.measuredKv40, who));
    add(['calibration', 'trial', 'measuredKv100'], checkNumber('kv100', k.trial.measuredKv100, who));
    add(['calibration', 'trial', 'labReference'], checkText('labReference', k.trial.labReference, who));
    const trial = Object.entries(k.trial.massFractions).map(([componentId, massFraction]) => ({ componentId, massFraction }));
    add(['calibration', 'trial', 'massFractions'], checkFractions(trial, who, 'trial blend’s shares'));
    add(['calibration', 'calibratedOn'], checkDate('calibratedOn', k.calibratedOn, who));
  }
  add(['source'], checkText('source', c.source, who));
  add(['sourceDate'], checkDate('sourceDate', c.sourceDate, who));
  add(['notes'], checkText('stockNotes', c.notes, who));
  return out;
}

/** A recipe's fields as stored (structurally the core's `Recipe`). */
export interface RecipeFields {
  id: string;
  name: string;
  grade: number;
  lines: ReadonlyArray<{ componentId: string; massFraction: number }>;
  revision: number;
  notes: string;
  updatedAt: string;
  approvedAt: string | null;
  supersedes: string | null;
  reasonForChange: string;
  specification: SpecificationFields;
  stockBasis: { recordedAt: string; stocks: ReadonlyArray<SnapshotFields> } | null;
}

/** A recipe's product specification as stored (the core's `ReleaseSpecification`). */
export type SpecificationFields = ReleaseSpecification;

/** The stock data recorded with a recipe (structurally the core's `StockSnapshot`). */
export interface SnapshotFields {
  componentId: string;
  code: string;
  viscosityPoints: ReadonlyArray<{ tempC: number; kv: number }>;
  calibratedKv40: number | null;
  calibratedKv100: number | null;
  density15: number;
}

/**
 * Every limit of a product specification against its rule; a minimum may not exceed its maximum.
 * `who` names the recipe.
 */
export function specificationProblems(sp: SpecificationFields, who?: string): FieldProblem[] {
  const { out, add } = collector();
  add(['grade'], sp.grade === null ? null : checkNumber('grade', sp.grade, who));
  add(['reference'], checkText('specReference', sp.reference, who));
  add(['kv100Min'], checkNumber('specKv100', sp.kv100Min, who));
  add(['kv100Max'], checkNumber('specKv100', sp.kv100Max, who));
  add(['viMin'], checkNumber('specViMin', sp.viMin, who));
  add(['density15Min'], checkNumber('specDensity15', sp.density15Min, who));
  add(['density15Max'], checkNumber('specDensity15', sp.density15Max, who));
  add(['flashMin'], checkNumber('specFlashMin', sp.flashMin, who));
  add(['pourMax'], checkNumber('specPourMax', sp.pourMax, who));
  add(['copper'], checkText('specText', sp.copper, who));
  add(['foam'], checkText('specText', sp.foam, who));
  const pair = (lo: number | null, hi: number | null, what: string, unit: string) =>
    lo !== null && hi !== null && lo > hi
      ? say(who, `the specification's ${what} minimum ${fmtRuleNumber(lo)} ${unit} is above its maximum ${fmtRuleNumber(hi)} ${unit}`)
      : null;
  add(['kv100Min'], pair(sp.kv100Min, sp.kv100Max, 'ν100', 'mm²/s'));
  add(['density15Min'], pair(sp.density15Min, sp.density15Max, 'density', 'kg/L'));
  return out;
}

/** Every field of a recipe against its rule; the lines must add up to 100 %. `who` defaults to "recipe “<name>”". */
export function recipeProblems(r: RecipeFields, who: string = recipeWho(String(r.name ?? ''))): FieldProblem[] {
  const { out, add } = collector();
  add(['id'], checkText('id', r.id, who));
  add(['name'], checkText('recipeName', r.name, who));
  add(['grade'], checkNumber('grade', r.grade, who));
  add(['lines'], checkFractions(r.lines, who));
  add(['revision'], checkNumber('revision', r.revision, who));
  add(['notes'], checkText('recipeNotes', r.notes, who));
  add(['updatedAt'], checkText('timestamp', r.updatedAt, who));
  add(['approvedAt'], r.approvedAt === null ? null : checkText('timestamp', r.approvedAt, who));
  add(['supersedes'], r.supersedes === null ? null : checkText('id', r.supersedes, who));
  add(['reasonForChange'], checkText('reasonForChange', r.reasonForChange, who));
  for (const p of specificationProblems(r.specification, who)) add(['specification', ...p.path], p.message);
  if (r.stockBasis) {
    add(['stockBasis', 'recordedAt'], checkText('timestamp', r.stockBasis.recordedAt, who));
    add(['stockBasis', 'stocks'], checkCount('linesPerRecipe', r.stockBasis.stocks.length, who));
    r.stockBasis.stocks.forEach((sn, i) => {
      const at = (f: string) => ['stockBasis', 'stocks', i, f];
      add(at('componentId'), checkText('id', sn.componentId, who));
      add(at('code'), checkText('stockCode', sn.code, who));
      add(at('viscosityPoints'), checkCount('viscosityPoints', sn.viscosityPoints.length, who));
      sn.viscosityPoints.forEach((p, j) => {
        add(['stockBasis', 'stocks', i, 'viscosityPoints', j, 'tempC'], checkNumber('viscosityTempC', p.tempC, who));
        add(['stockBasis', 'stocks', i, 'viscosityPoints', j, 'kv'], checkNumber('kv', p.kv, who));
      });
      add(at('calibratedKv40'), sn.calibratedKv40 === null ? null : checkNumber('effectiveKv', sn.calibratedKv40, who));
      add(at('calibratedKv100'), sn.calibratedKv100 === null ? null : checkNumber('effectiveKv', sn.calibratedKv100, who));
      add(at('density15'), checkNumber('density15', sn.density15, who));
    });
  }
  return out;
}

/** Solve targets as stored (structurally the core's `BlendTargets`). */
export interface TargetsFields {
  grade: number;
  targetKv40: number | null;
  tolerancePct: number;
  minVi: number | null;
  maxAnilinePoint: number | null;
  maxPolymerFraction: number | null;
  maxPourPoint: number | null;
  minFlashPoint: number | null;
  additive: { componentId: string; massFraction: number } | null;
  bounds: Record<string, { min?: number | undefined; max?: number | undefined }>;
  minInBandProbability: number | null;
}

/**
 * Every field of a recipe's targets against its rule. `who` names the recipe; `stockName(id)` names a
 * stock in a per-stock limit's message (default: "a stock").
 */
export function targetsProblems(t: TargetsFields, who?: string, stockName?: (id: string) => string): FieldProblem[] {
  const { out, add } = collector();
  add(['grade'], checkNumber('grade', t.grade, who));
  add(['targetKv40'], checkNumber('targetKv40', t.targetKv40, who));
  add(['tolerancePct'], checkNumber('tolerancePct', t.tolerancePct, who));
  add(['minVi'], checkNumber('minVi', t.minVi, who));
  add(['maxAnilinePoint'], checkNumber('maxAnilinePoint', t.maxAnilinePoint, who));
  add(['maxPolymerFraction'], checkNumber('maxPolymerFraction', t.maxPolymerFraction, who));
  add(['maxPourPoint'], checkNumber('maxPourPoint', t.maxPourPoint, who));
  add(['minFlashPoint'], checkNumber('minFlashPoint', t.minFlashPoint, who));
  add(['minInBandProbability'], checkNumber('minInBandProbability', t.minInBandProbability, who));
  if (t.additive) {
    add(['additive', 'componentId'], checkText('id', t.additive.componentId, who));
    add(['additive', 'massFraction'], checkNumber('treatRate', t.additive.massFraction, who));
  }
  for (const [id, b] of Object.entries(t.bounds)) {
    const m = checkBoundPair(b.min, b.max, who);
    if (m) add(['bounds', id], stockName ? m.replace(/the (lower |upper )?limit/, (x) => `${x} for ${stockName(id)}`) : m);
  }
  return out;
}

/** Blend-sheet inputs as stored. */
export interface SheetFields {
  lot: string;
  batchSize: string;
  vessel: string;
  instructions: string | null;
}

/**
 * Every blend-sheet field against its rule. The batch size is stored as typed (at most 32 characters
 * of digits, signs, separators and exponent). With `parseBatch` (the entry form's own number reader)
 * its number must also lie within NUMBER_RULES.batchSize; stored data written before these rules are
 * not refused for the number (the sheet says plainly when a batch size cannot be used).
 */
export function sheetProblems(s: SheetFields, who?: string, parseBatch?: (text: string) => number | null): FieldProblem[] {
  const { out, add } = collector();
  add(['lot'], checkText('lot', s.lot, who));
  add(['vessel'], checkText('vessel', s.vessel, who));
  add(['instructions'], s.instructions === null ? null : checkText('instructions', s.instructions, who));
  const notNumber = say(who, `the batch size “${clip(s.batchSize, 20)}” is not a number`);
  if (parseBatch && s.batchSize.trim() !== '') {
    // The entry form's reading first: "1e+40 is outside the possible range" says more than a length.
    const v = parseBatch(s.batchSize);
    add(['batchSize'], v === null || Number.isNaN(v) ? notNumber : checkNumber('batchSize', v, who) ?? checkText('batchSize', s.batchSize, who));
  } else {
    const size = checkText('batchSize', s.batchSize, who);
    add(['batchSize'], size ?? (/^[0-9 .,'eE+\-\u00a0\u202f]*$/.test(s.batchSize) ? null : notNumber));
  }
  return out;
}

/**
 * What the plant enters for a recipe's QC loop on its blend sheet (every number null = not entered):
 * the aim, the measured lots in the tanks, the heel in the vessel, and the QC result of a batch with
 * the limits of its correction. Units: mm²/s, kg/L at 15 °C, kg; fractions 0–1.
 */
export interface QcInputs {
  /** Aim ν40 of the batch [mm²/s]; null → the grade mid-point. */
  aimKv40: number | null;
  /** Measured values of the lot in the tank, by stock id; null → the library's value. */
  lots: Record<string, { kv40: number | null; kv100: number | null; density15: number | null }>;
  /** Oil already in the vessel; massKg null or 0 → none. `additiveFraction` is its additive package share. */
  heel: { massKg: number | null; kv40: number | null; kv100: number | null; density15: number | null; additiveFraction: number | null; source: string };
  correction: {
    /** Measured ν40 and ν100 of the batch [mm²/s]. */
    kv40: number | null;
    kv100: number | null;
    /** Mass in the vessel [kg]; null → the batch size. */
    massKg: number | null;
    /** Most the vessel holds [kg]; null → no limit. */
    vesselLimitKg: number | null;
    /** Correct to within ± this % of the aim (inside the release band); null → the default. */
    bandPct: number | null;
    objective: 'cost' | 'mass';
    /** kg on hand by stock id; null → unlimited. */
    onHandKg: Record<string, number | null>;
    /** Stocks besides the recipe's that may be added. */
    stockIds: string[];
  };
}

/**
 * Every QC-loop field of a recipe's blend sheet against its rule: the aim and lot viscosities and
 * densities, the heel, the QC result of the batch and the correction's limits. Blank (null) is allowed
 * everywhere: it means "not measured" or "no limit".
 */
export function qcProblems(q: QcInputs, who?: string): FieldProblem[] {
  const { out, add } = collector();
  const opt = (path: Array<string | number>, field: NumberRuleKey, v: number | null) => add(path, v === null ? null : checkNumber(field, v, who));
  opt(['aimKv40'], 'targetKv40', q.aimKv40);
  for (const [id, lot] of Object.entries(q.lots)) {
    opt(['lots', id, 'kv40'], 'kv40', lot.kv40);
    opt(['lots', id, 'kv100'], 'kv100', lot.kv100);
    opt(['lots', id, 'density15'], 'density15', lot.density15);
  }
  opt(['heel', 'massKg'], 'massKg', q.heel.massKg);
  opt(['heel', 'kv40'], 'kv40', q.heel.kv40);
  opt(['heel', 'kv100'], 'kv100', q.heel.kv100);
  opt(['heel', 'density15'], 'density15', q.heel.density15);
  opt(['heel', 'additiveFraction'], 'treatRate', q.heel.additiveFraction);
  add(['heel', 'source'], checkText('heelSource', q.heel.source, who));
  const c = q.correction;
  opt(['correction', 'kv40'], 'kv40', c.kv40);
  opt(['correction', 'kv100'], 'kv100', c.kv100);
  opt(['correction', 'massKg'], 'massKg', c.massKg);
  opt(['correction', 'vesselLimitKg'], 'massKg', c.vesselLimitKg);
  opt(['correction', 'bandPct'], 'tolerancePct', c.bandPct);
  for (const [id, kg] of Object.entries(c.onHandKg)) opt(['correction', 'onHandKg', id], 'massKg', kg);
  add(['correction', 'stockIds'], checkCount('linesPerRecipe', c.stockIds.length, who));
  return out;
}

/** Settings as stored. */
export interface SettingsFields {
  currencySymbol: string;
  companyName: string;
  operatingTempC: number;
  coldStartTempC: number;
  meteringTempC: number;
  deliveryTempC: number;
  lastBackupAt: string | null;
  baseCurrency: string;
  exchangeRates: ReadonlyArray<{ currency: string; rate: number; asOf: string }>;
}

/** Every settings field against its rule. */
export function settingsProblems(s: SettingsFields): FieldProblem[] {
  const { out, add } = collector();
  add(['currencySymbol'], checkText('currencySymbol', s.currencySymbol));
  add(['companyName'], checkText('companyName', s.companyName));
  add(['operatingTempC'], checkNumber('operatingTempC', s.operatingTempC));
  add(['coldStartTempC'], checkNumber('coldStartTempC', s.coldStartTempC));
  add(['meteringTempC'], checkNumber('meteringTempC', s.meteringTempC));
  add(['deliveryTempC'], checkNumber('deliveryTempC', s.deliveryTempC));
  add(['lastBackupAt'], s.lastBackupAt === null ? null : checkText('timestamp', s.lastBackupAt));
  add(['baseCurrency'], checkText('baseCurrency', s.baseCurrency));
  add(['exchangeRates'], checkCount('exchangeRates', s.exchangeRates.length));
  const seen = new Set<string>();
  s.exchangeRates.forEach((r, i) => {
    const who = `the rate for ${clip(String(r.currency ?? '').trim(), 12) || '(no currency)'}`;
    add(['exchangeRates', i, 'currency'], checkText('rateCurrency', r.currency, who));
    add(['exchangeRates', i, 'rate'], checkNumber('exchangeRate', r.rate, who));
    add(['exchangeRates', i, 'asOf'], checkDate('rateAsOf', r.asOf, who));
    const key = String(r.currency ?? '').trim().toUpperCase();
    if (key && seen.has(key)) add(['exchangeRates', i, 'currency'], say(who, 'this currency has a rate already; keep one'));
    seen.add(key);
  });
  return out;
}

/** Thrown by a store action asked to store a record the field rules refuse (entry should have said so first). */
export class FieldRuleError extends Error {
  readonly problems: readonly FieldProblem[];
  constructor(problems: readonly FieldProblem[]) {
    super(problems.map((p) => p.message).join('; '));
    this.name = 'FieldRuleError';
    this.problems = problems;
  }
}

/** The first message of a list of problems, or null when there is none (for actions that refuse). */
export function firstProblem(problems: readonly FieldProblem[]): string | null {
  return problems[0]?.message ?? null;
}

/** A line plan as stored (structurally `LinePlanInputs` of `lineplan.ts`). */
export interface LinePlanFields {
  period: string;
  demands: Record<string, number>;
  supplies: Record<string, number | null>;
  keep: Record<string, number>;
  maxStocks: number | null;
}

/** Every field of the line plan against its rule (demands, supplies, least uses, tank limit, period). */
export function linePlanProblems(p: LinePlanFields): FieldProblem[] {
  const { out, add } = collector();
  add(['period'], checkText('planPeriod', p.period));
  add(['demands'], checkCount('recipes', Object.keys(p.demands).length));
  for (const [id, kg] of Object.entries(p.demands)) add(['demands', id], checkNumber('demandKg', kg));
  add(['supplies'], checkCount('stocks', Object.keys(p.supplies).length));
  for (const [id, kg] of Object.entries(p.supplies)) add(['supplies', id], kg === null ? null : checkNumber('supplyKg', kg));
  add(['keep'], checkCount('stocks', Object.keys(p.keep).length));
  for (const [id, kg] of Object.entries(p.keep)) add(['keep', id], checkNumber('minUseKg', kg));
  add(['maxStocks'], checkNumber('maxStocks', p.maxStocks));
  return out;
}
