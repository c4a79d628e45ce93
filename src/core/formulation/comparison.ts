/**
 * Side-by-side comparison of a candidate recipe with the reference recipe it would replace.
 *
 * Every difference is candidate − reference, computed from the same core predictions
 * (`predictBlend`, `assessDeposit`, `blendAfterShear`) with the same mixing rule and temperatures.
 * The oxidation class, solvency band and deposit propensity are Blendbench's own ordinal scales
 * (estimates, not measurements); their change is reported as better / same / worse.
 */
import { printedSign, signedText } from '../words/signed';
import type { BlendMethod } from '../blending/blend-viscosity';
import { predictBlend, type BlendProperties } from './blend-properties';
import { assessDeposit, DEPOSIT_PROPENSITIES, type DepositAssessment, type DepositPropensity } from '../scoring/deposit';
import { BlendbenchInputError, assertTemperatureC } from '../errors';
import type { Component, RecipeLine } from './model';
import { OXIDATION_CLASSES, OXIDATION_CLASS_LABEL, type OxidationClass } from '../scoring/oxidation';
import { blendAfterShear, type BlendAfterShear } from './shear-blend';
import { SOLVENCY_BANDS, type SolvencyBand } from '../scoring/solvency';
import { assessTemperature, D341_TRUSTED_BAND_C, type D341Form } from '../viscosity/viscosity-temperature';

export interface ComparisonInput {
  /** Library holding every component of both recipes (withdrawn ones included). */
  components: readonly Component[];
  /** The recipe made today (may use withdrawn stocks). */
  reference: readonly RecipeLine[];
  /** The proposed substitute. */
  candidate: readonly RecipeLine[];
  /** ISO VG both must meet (checked before and after shear). */
  grade: number;
  /** Gearbox operating temperature [°C]. */
  operatingTempC: number;
  /** Cold-start temperature [°C]. */
  coldTempC: number;
  method?: BlendMethod;
  /** Form of the D341 line for the viscosities at the operating and cold temperatures; default 'd341-20'. */
  d341Form?: D341Form;
  /**
   * How the summary writes numbers: `formatNumber(x, decimals)` (the user's decimal separator;
   * default `toFixed`, a dot) and the temperature unit (default °C; a difference of aniline point
   * converts by 9/5, a temperature by t_F = 9/5·t_C + 32).
   */
  display?: { formatNumber?: (x: number, decimals: number) => string; temperatureUnit?: 'C' | 'F' };
}

/** One number on both sides and its difference (candidate − reference); null where undefined. */
export interface Delta {
  reference: number | null;
  candidate: number | null;
  delta: number | null;
  /** 100·delta/|reference| [%]; null when the reference is 0 or missing. */
  deltaPct: number | null;
}

export type Change = 'better' | 'same' | 'worse';

/** Everything predicted for one recipe. */
export interface RecipeAssessment {
  properties: BlendProperties;
  deposit: DepositAssessment;
  shear: BlendAfterShear;
}

export interface Comparison {
  reference: RecipeAssessment;
  candidate: RecipeAssessment;
  costPerLitre: Delta;
  kv40: Delta;
  kv100: Delta;
  /** Unrounded VI. */
  vi: Delta;
  /** Aniline point [°C]; negative delta = more solvent. */
  anilinePoint: Delta;
  density15: Delta;
  /** ν at the operating and cold temperatures [mm²/s] (ASTM D341 line of each blend). */
  kvAtOperating: Delta & { tempC: number };
  kvAtCold: Delta & { tempC: number };
  oxidation: { reference: OxidationClass; candidate: OxidationClass; ratingDelta: number; change: Change };
  solvency: { reference: SolvencyBand; candidate: SolvencyBand; change: Change };
  deposit: { reference: DepositPropensity; candidate: DepositPropensity; change: Change };
  /** In grade after shear (ν40 after the stated KRL losses), both sides. */
  shear: {
    grade: number;
    reference: { kv40After: number; inGradeAfter: boolean };
    candidate: { kv40After: number; inGradeAfter: boolean };
  };
  /** Plain-language lines for the comparison view, most important first. */
  summary: string[];
}

const delta = (reference: number | null, candidate: number | null): Delta => {
  const d = reference === null || candidate === null ? null : candidate - reference;
  return {
    reference,
    candidate,
    delta: d,
    deltaPct: d === null || reference === null || reference === 0 ? null : (100 * d) / Math.abs(reference),
  };
};

/** Higher index in `order` is better when `higherBetter`. */
function change<T>(order: readonly T[], ref: T, cand: T, higherBetter: boolean): Change {
  const d = order.indexOf(cand) - order.indexOf(ref);
  if (d === 0) return 'same';
  return (d > 0) === higherBetter ? 'better' : 'worse';
}

/**
 * Assess one recipe: properties, deposit propensity and blend after shear.
 *
 * @param components Library.
 * @param lines Mass fractions summing to 1.
 * @param opts Grade, temperatures [°C], mixing rule.
 * @returns The three assessments.
 * @throws the errors of `predictBlend`, `assessDeposit`, `blendAfterShear`.
 */
export function assessRecipe(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  opts: { grade: number; operatingTempC: number; coldTempC: number; method?: BlendMethod; d341Form?: D341Form },
): RecipeAssessment {
  const method = opts.method ?? 'refutas';
  return {
    properties: predictBlend(components, lines, {
      method,
      operatingTempC: opts.operatingTempC,
      coldTempC: opts.coldTempC,
      d341Form: opts.d341Form ?? 'd341-20',
    }),
    deposit: assessDeposit(components, lines),
    shear: blendAfterShear(components, lines, { method, grade: opts.grade }),
  };
}

/**
 * Compare a candidate recipe with the reference: Δ cost per litre, Δ VI, Δ aniline point, change of
 * oxidation class, solvency band and deposit propensity, Δ viscosity at the operating and cold
 * temperatures, and whether each is in grade after shear.
 *
 * Δx = x_candidate − x_reference (Δ% relative to the reference). The cost difference is given only
 * when both recipes are costed in the same currency (otherwise null: restate prices in one currency
 * first, see `core/currency/exchange-rates.ts`).
 *
 * @param input Library, both recipes (mass fractions), grade, operating and cold temperatures [°C],
 *   mixing rule.
 * @returns The comparison with a plain-language summary.
 * @throws BlendbenchInputError for an empty recipe, temperatures below absolute zero, and the
 *   errors of the predictions (unknown component, fractions not summing to 1 …).
 * @example compareRecipes({ components: lib, reference: ref.lines, candidate: cand.lines, grade: 320,
 *   operatingTempC: 65, coldTempC: -10 }).costPerLitre.delta // → −0.04 (4 cents a litre cheaper)
 */
export function compareRecipes(input: ComparisonInput): Comparison {
  const fn = 'compareRecipes';
  if (input.reference.length === 0) throw new BlendbenchInputError('reference', input.reference, `${fn}: the reference recipe has no lines`);
  if (input.candidate.length === 0) throw new BlendbenchInputError('candidate', input.candidate, `${fn}: the candidate recipe has no lines`);
  assertTemperatureC(fn, 'operatingTempC', input.operatingTempC);
  assertTemperatureC(fn, 'coldTempC', input.coldTempC);
  const opts = {
    grade: input.grade,
    operatingTempC: input.operatingTempC,
    coldTempC: input.coldTempC,
    method: input.method ?? 'refutas',
    d341Form: input.d341Form ?? 'd341-20',
  };
  const ref = assessRecipe(input.components, input.reference, opts);
  const cand = assessRecipe(input.components, input.candidate, opts);
  const rp = ref.properties;
  const cp = cand.properties;

  const oxidation = {
    reference: ref.deposit.oxidation.oxidationClass,
    candidate: cand.deposit.oxidation.oxidationClass,
    ratingDelta: cand.deposit.oxidation.rating - ref.deposit.oxidation.rating,
    change: change(OXIDATION_CLASSES, ref.deposit.oxidation.oxidationClass, cand.deposit.oxidation.oxidationClass, true),
  };
  const solvency = {
    reference: ref.deposit.solvency.band,
    candidate: cand.deposit.solvency.band,
    change: change(SOLVENCY_BANDS, ref.deposit.solvency.band, cand.deposit.solvency.band, true),
  };
  const deposit = {
    reference: ref.deposit.propensity,
    candidate: cand.deposit.propensity,
    change: change(DEPOSIT_PROPENSITIES, ref.deposit.propensity, cand.deposit.propensity, false),
  };
  const result: Comparison = {
    reference: ref,
    candidate: cand,
    // A cost is compared only in one currency: a price is never subtracted from one in another.
    costPerLitre:
      rp.currency !== null && rp.currency === cp.currency
        ? delta(rp.costPerLitre, cp.costPerLitre)
        : { reference: rp.costPerLitre, candidate: cp.costPerLitre, delta: null, deltaPct: null },
    kv40: delta(rp.kv40, cp.kv40),
    kv100: delta(rp.kv100, cp.kv100),
    vi: delta(rp.vi, cp.vi),
    anilinePoint: delta(rp.anilinePoint?.value ?? null, cp.anilinePoint?.value ?? null),
    density15: delta(rp.density15, cp.density15),
    kvAtOperating: { ...delta(rp.kvAtOperating?.kv ?? null, cp.kvAtOperating?.kv ?? null), tempC: input.operatingTempC },
    kvAtCold: { ...delta(rp.kvAtCold?.kv ?? null, cp.kvAtCold?.kv ?? null), tempC: input.coldTempC },
    oxidation,
    solvency,
    deposit,
    shear: {
      grade: input.grade,
      reference: { kv40After: ref.shear.kv40After, inGradeAfter: ref.shear.inGradeAfter === true },
      candidate: { kv40After: cand.shear.kv40After, inGradeAfter: cand.shear.inGradeAfter === true },
    },
    summary: [],
  };
  result.summary = summarise(result, rp.currency, input.display ?? {});
  return result;
}

function summarise(c: Comparison, currency: string | null, display: NonNullable<ComparisonInput['display']>): string[] {
  const num = display.formatNumber ?? ((x: number, d: number) => x.toFixed(d));
  const isF = display.temperatureUnit === 'F';
  const deg = isF ? '°F' : '°C';
  // A temperature, and a difference of temperatures, in the display unit (definition of °F).
  const temp = (tC: number) => num(isF ? (tC * 9) / 5 + 32 : tC, 0);
  const tempDelta = (dC: number) => (isF ? (dC * 9) / 5 : dC);
  // The sign of the value as printed: a change that prints as zero at its decimals reads "±0.0"
  // (a round-off or sub-digit change is no direction), like the blend sheet's "±0.00".
  const signed = (x: number, digits: number): string => signedText(x, digits, num);
  const out: string[] = [];
  if (c.costPerLitre.delta !== null) {
    const pct = c.costPerLitre.deltaPct === null ? '' : ` (${signed(c.costPerLitre.deltaPct, 1)} %)`;
    out.push(`Cost per litre at 15 °C ${signed(c.costPerLitre.delta, 3)}${currency ? ` ${currency}` : ''}${pct}`);
  } else {
    out.push(`Cost per litre at 15 °C not compared (prices in different currencies or missing).`);
  }
  if (c.vi.delta !== null) out.push(`VI ${signed(c.vi.delta, 1)}`);
  if (c.anilinePoint.delta !== null) {
    const dT = tempDelta(c.anilinePoint.delta);
    const sign = printedSign(dT, 1);
    const word = sign < 0 ? 'more solvent' : sign > 0 ? 'less solvent' : 'same solvency';
    out.push(`Aniline point ${signed(dT, 1)} ${deg} (${word}; approximate)`);
  }
  if (c.oxidation.change !== 'same') {
    out.push(
      `Oxidation stability ${c.oxidation.change}: ${OXIDATION_CLASS_LABEL[c.oxidation.reference].toLowerCase()} → ` +
        `${OXIDATION_CLASS_LABEL[c.oxidation.candidate].toLowerCase()} (Blendbench scale)`,
    );
  }
  if (c.deposit.change !== 'same') {
    out.push(`Deposit propensity ${c.deposit.change}: ${c.deposit.reference} → ${c.deposit.candidate} (estimate)`);
  }
  for (const [label, d] of [
    ['operating', c.kvAtOperating],
    ['cold-start', c.kvAtCold],
  ] as const) {
    if (d.deltaPct === null) continue;
    // Outside the measured 40–100 °C the D341 line is extrapolated; outside −20…150 °C not to be trusted.
    const a = assessTemperature(d.tempC);
    const flag = a.outsideBand
      ? `; outside ${temp(D341_TRUSTED_BAND_C.min)}…${temp(D341_TRUSTED_BAND_C.max)} ${deg}, not to be trusted`
      : a.extrapolated
        ? '; extrapolated'
        : '';
    out.push(`Viscosity at ${temp(d.tempC)} ${deg} (${label}${flag}) ${signed(d.deltaPct, 1)} %`);
  }
  const s = c.shear;
  if (!s.candidate.inGradeAfter) out.push(`The candidate falls out of VG ${s.grade} after shear (ν40 ≈ ${num(s.candidate.kv40After, 0)} mm²/s).`);
  if (!s.reference.inGradeAfter) out.push(`The reference falls out of VG ${s.grade} after shear (ν40 ≈ ${num(s.reference.kv40After, 0)} mm²/s).`);
  out.push('Predicted values are estimates: laboratory confirmation is required before release.');
  return out;
}
