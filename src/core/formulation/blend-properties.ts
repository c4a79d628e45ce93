/**
 * Predicted properties of a blend — everything the workbench and the blend sheet display, each
 * number with the equation, standard and inputs that produced it (`explain`).
 *
 * All values are ESTIMATES from published mixing rules and common-practice approximations; a
 * laboratory must confirm them before a batch is released.
 */
import type { Component, RecipeLine } from './model';
import { displayWords, type NumberDisplay } from '../words/display';
import { BlendbenchInputError, assertTemperatureC } from '../errors';
import { BLEND_METHOD_LABEL, BLEND_METHOD_STANDARD, blendKv40Kv100, type BlendMethod } from '../blending/blend-viscosity';
import { VI_MIN_KV100, reportedViscosityIndex, viscosityIndex } from '../viscosity/viscosity-index';
import {
  D341_FORM_SHORT,
  D341_TRUSTED_BAND_C,
  D341_Z_EQUATION,
  assessTemperature,
  kv40kv100FromPoints,
  viscosityAtTemperature,
  type D341Form,
} from '../viscosity/viscosity-temperature';
import { blendDensity, massToVolumeFractions } from '../blending/density';
import { blendDensityAtTemperature } from '../blending/density-temperature';
import { blendCostPerKg, blendCostPerLitre, blendCostPerLitreAt, pricePerKg } from './cost';
import { blendAnilinePoint } from '../blending/aniline';
import { FLASH_INDEX_FITTED_MAX_C, blendFlashPoint, flashIndexExtrapolated } from '../blending/flash-point';
import { POUR_INDEX_FITTED_C, blendPourPoint, pourIndexExtrapolated } from '../blending/pour-point';
import { deviationFromMidPct, isoViscosityGrade } from '../viscosity/iso-grades';
import { ESTER_HYDROLYSIS_CAVEAT, blendOxidationRating } from '../scoring/oxidation';

/** How one predicted number was obtained (for the interface's "show working"). */
/** One input of a {@link PropertyExplain}: a number, a list of numbers, a word, or nothing. */
export type ExplainValue = number | string | null | readonly (number | null)[];

export interface PropertyExplain {
  /** The equation(s), in plain text. */
  equation: string;
  /** The standard or source of the method. */
  standard: string;
  /**
   * The inputs, by name, with the unit in brackets at the end of the name (e.g. "ν40 blend [mm²/s]").
   * A list holds several numbers of one line, their units in the same order separated by " / "
   * ("BW-190 φ / AP [– / °C]"). Temperatures are in °C; the screen converts them and every number
   * to the user's format.
   */
  inputs: Record<string, ExplainValue>;
  /** Caveat, if any. */
  note?: string;
}

export interface BlendPropertyLine {
  componentId: string;
  massFraction: number;
  volumeFraction: number;
  /** ν40 and ν100 used for blending (a calibrated component's effective values) [mm²/s]. */
  kv40: number;
  kv100: number;
  /** True when the effective (calibrated) viscosities were used. */
  calibrated: boolean;
}

export interface BlendProperties {
  method: BlendMethod;
  lines: BlendPropertyLine[];
  /** ν40, ν100 of the blend [mm²/s]. */
  kv40: number;
  kv100: number;
  /** VI, unrounded (ASTM D2270); null when ν100 < 2.0 mm²/s (outside D2270). */
  vi: number | null;
  /** VI as reported (whole number, ASTM E29 rounding); null likewise. */
  reportedVi: number | null;
  /** Density at 15 °C [kg/L], ideal mixing. */
  density15: number;
  /** Aniline point [°C], volume basis; basis 'base-fluid' when parts without one were left out. */
  anilinePoint: { value: number; basis: 'all' | 'base-fluid' } | null;
  /** Density at the delivery temperature [kg/L] (ASTM D1250-80 Table 54D per component, ideal mixing). */
  densityAtDelivery: { tempC: number; density: number };
  /** Flash-point and pour-point estimates [°C]; null if a used component's value is unknown. */
  flashPoint: number | null;
  pourPoint: number | null;
  /** True when the index is used beyond the range it was fitted on (gear oils: always for flash). */
  flashPointExtrapolated: boolean;
  pourPointExtrapolated: boolean;
  /**
   * Cost per kg and per litre at 15 °C, in `currency`; null when currencies are mixed or a used stock
   * has no usable price (a blank currency, as `priceLibraryInBase` marks it).
   */
  costPerKg: number | null;
  costPerLitre: number | null;
  /** Cost per delivered litre, counted at the delivery temperature; null when currencies are mixed. */
  costPerDeliveredLitre: { tempC: number; cost: number } | null;
  /** The common currency of the used components; null when they differ (see `mixedCurrencies`) or one has a blank currency. */
  currency: string | null;
  mixedCurrencies: boolean;
  /** ISO VG holding ν40, or null between grades. */
  grade: number | null;
  /** Deviation of ν40 from that grade's mid-point [%], null between grades. */
  deviationFromMidPct: number | null;
  /** The form of the D341 line behind `kvAtOperating` and `kvAtCold` (default 'd341-20'). */
  d341Form: D341Form;
  /**
   * ν at the operating / cold temperature (the blend's ASTM D341 line, in `d341Form`), null if not
   * asked or not defined; flagged when outside the fitted 40–100 °C (`extrapolated`) and outside −20…150 °C
   * (`outsideBand`).
   */
  kvAtOperating: KvAtTemperature | null;
  kvAtCold: KvAtTemperature | null;
  /** Mass fraction of polymer components (0–1). */
  polymerFraction: number;
  /** Base-fluid oxidation-stability rating (Blendbench's 1–5 scale), null without base fluid. */
  oxidationRating: number | null;
  /** How each number was obtained, by property name. */
  explain: Record<string, PropertyExplain>;
  /** Plain-language cautions (estimates, extrapolation, mixed currencies …). */
  warnings: string[];
}

/** A viscosity read off the blend's D341 line, with the extrapolation guard's verdict. */
export interface KvAtTemperature {
  tempC: number;
  kv: number;
  /** The D341 form of the line it was read off. */
  form: D341Form;
  /** Outside the measured 40–100 °C. */
  extrapolated: boolean;
  /** Outside −20…150 °C: shown only with a warning. */
  outsideBand: boolean;
}

export interface PredictOptions {
  /** Mixing rule; default 'refutas'. */
  method?: BlendMethod;
  /** Temperature at which delivered litres are counted [°C]; default 15 (the tables' reference). */
  deliveryTempC?: number;
  /** Operating temperature of the gearbox [°C]. */
  operatingTempC?: number;
  /** Cold-start temperature [°C]. */
  coldTempC?: number;
  /**
   * Form of the D341 line for ν at the operating and cold temperatures; default 'd341-20' (the full
   * Z). The blending rules themselves (D7152 ASTM Blending Method and Wright) keep the D341-20 Z.
   */
  d341Form?: D341Form;
  /** How warnings and notes write numbers and temperatures (the user's separator and unit; default ".", °C). */
  display?: NumberDisplay;
}

/**
 * The ν40 and ν100 a component blends with: its calibration's effective values when present,
 * otherwise its measured points (ν at exactly 40/100 °C as measured, else read off its ASTM D341 line).
 *
 * @param component - the component
 * @returns ν40, ν100 [mm²/s] and whether calibrated values were used
 * @throws the errors of `kv40kv100FromPoints` for unusable viscosity data
 * @example blendingViscosities(stock) // → { kv40: 110, kv100: 12, calibrated: false }
 */
export function blendingViscosities(component: Component): { kv40: number; kv100: number; calibrated: boolean } {
  if (component.calibration) {
    return {
      kv40: component.calibration.effectiveKv40,
      kv100: component.calibration.effectiveKv100,
      calibrated: true,
    };
  }
  const { kv40, kv100 } = kv40kv100FromPoints(component.viscosityPoints);
  return { kv40, kv100, calibrated: false };
}

const fmt = (x: number, d = 4): number => Number(x.toPrecision(d + 2));

/**
 * The recipe's lines joined to their components, each with the viscosities it blends with
 * (`blendingViscosities`: a calibration's effective values when present, else the measured ones).
 *
 * @param fn Name of the calling function, for the error message.
 * @param components Library holding every component named by `lines`.
 * @param lines Recipe lines (mass fractions 0–1).
 * @returns One entry per line, in recipe order: the line, its component, ν40 and ν100 [mm²/s].
 * @throws BlendbenchInputError naming `lines[i].componentId` when a line names no component.
 */
export function resolveBlendParts(
  fn: string,
  components: readonly Component[],
  lines: readonly RecipeLine[],
): { line: RecipeLine; component: Component; kv40: number; kv100: number; calibrated: boolean }[] {
  const byId = new Map(components.map((c) => [c.id, c]));
  return lines.map((l, i) => {
    const c = byId.get(l.componentId);
    if (!c) {
      throw new BlendbenchInputError(
        `lines[${i}].componentId`,
        l.componentId,
        `${fn}: lines[${i}].componentId = "${l.componentId}" names no component in the library`,
      );
    }
    try {
      return { line: l, component: c, ...blendingViscosities(c) };
    } catch (e) {
      // Name the stock whose data cannot be used (same error class, the stock code in front).
      if (e instanceof BlendbenchInputError) {
        const Same = e.constructor as typeof BlendbenchInputError;
        throw new Same(`lines[${i}].${e.field}`, e.value, `${c.code}: ${e.message}`);
      }
      throw e;
    }
  });
}

/**
 * Predict a blend's properties from its components and mass fractions.
 *
 * - ν40, ν100: the chosen mixing rule (Refutas on mass fractions or ASTM D7152 on volume fractions)
 * - VI: ASTM D2270 from the blend's ν40 and ν100 (unrounded and reported)
 * - density: ideal mixing, 1/ρ = Σ wᵢ/ρᵢ; volume fractions φᵢ = (wᵢ/ρᵢ)·ρ
 * - aniline point: volume-weighted over parts that have one (ASTM D611 values; common practice)
 * - flash and pour point: blending indices by volume (estimates)
 * - cost: c_kg = Σ wᵢ·p_kg,ᵢ, c_L = ρ·c_kg
 * - ν at other temperatures: the ASTM D341 line through the blend's ν40 and ν100
 *
 * @param components - the library (at least every component named by `lines`)
 * @param lines - mass fractions by component id, summing to 1 (lines at 0 are allowed)
 * @param opts - mixing rule and the operating / cold temperatures [°C]
 * @returns the properties with their explanations
 * @throws BlendbenchInputError for an unknown component id; the core's named errors for impossible
 *   data (fractions not summing to 1, ν100 ≥ ν40, implausible density …)
 * @example predictBlend(lib, [{ componentId: 'n100', massFraction: 0.45 }, { componentId: 'bs', massFraction: 0.55 }])
 *   // → { kv40: ≈220, kv100: …, vi: …, density15: …, … }
 */
export function predictBlend(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  opts: PredictOptions = {},
): BlendProperties {
  const fn = 'predictBlend';
  const method: BlendMethod = opts.method ?? 'refutas';
  const d341Form: D341Form = opts.d341Form ?? 'd341-20';
  const parts = resolveBlendParts(fn, components, lines);
  const warnings: string[] = [];
  const words = displayWords(opts.display);
  const explain: Record<string, PropertyExplain> = {};
  const blendParts = parts.map((p) => ({
    massFraction: p.line.massFraction,
    density15: p.component.density15,
    kv40: p.kv40,
    kv100: p.kv100,
  }));

  // Viscosity at 40 and 100 °C.
  const { kv40, kv100 } = blendKv40Kv100(method, blendParts);
  const viscEquation =
    method === 'refutas'
      ? 'VBN = 14.534·ln(ln(ν + 0.8)) + 10.975;  VBN_blend = Σ wᵢ·VBNᵢ (mass fractions);  ν = exp(exp((VBN − 10.975)/14.534)) − 0.8'
      : method === 'astm-d7152'
        ? 'log₁₀ log₁₀ Z(ν_blend) = Σ φᵢ·log₁₀ log₁₀ Z(νᵢ) (volume fractions), Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²)'
        : 'log₁₀ T_blend(ν) = Σ φᵢ·log₁₀ Tᵢ(ν) (volume fractions), Tᵢ(ν) on component i’s ASTM D341-20 line through its ν40 and ν100';
  const viscStandard = BLEND_METHOD_STANDARD[method];
  const compInputs = (key: 'kv40' | 'kv100'): Record<string, number> => {
    const out: Record<string, number> = {};
    for (const p of parts) {
      out[`${p.component.code} w [mass fraction]`] = fmt(p.line.massFraction);
      out[`${p.component.code} ν${key === 'kv40' ? '40' : '100'} [mm²/s]`] = p[key];
    }
    return out;
  };
  explain.kv40 = { equation: viscEquation, standard: viscStandard, inputs: compInputs('kv40') };
  explain.kv100 = { equation: viscEquation, standard: viscStandard, inputs: compInputs('kv100') };
  const calibratedCodes = parts.filter((p) => p.calibrated && p.line.massFraction > 0).map((p) => p.component.code);
  if (calibratedCodes.length > 0) {
    const note = `Effective (calibrated) viscosities used for ${calibratedCodes.join(', ')}.`;
    explain.kv40.note = note;
    explain.kv100.note = note;
  }

  // Viscosity index.
  let vi: number | null = null;
  let reportedVi: number | null = null;
  if (kv100 >= VI_MIN_KV100) {
    vi = viscosityIndex(kv40, kv100);
    reportedVi = reportedViscosityIndex(kv40, kv100);
  } else {
    warnings.push(`ν100 = ${words.say(fmt(kv100, 3))} mm²/s is below ${words.num(VI_MIN_KV100, 1)} mm²/s: ASTM D2270 defines no viscosity index.`);
  }
  explain.vi = {
    equation:
      'U = ν40, Y = ν100, L and H from D2270 Table 1 at Y. VI ≤ 100: VI = 100·(L − U)/(L − H); ' +
      'VI > 100: N = (log H − log U)/log Y, VI = (10^N − 1)/0.00715 + 100',
    standard: 'ASTM D2270 (ISO 2909)',
    inputs: { 'U = ν40 [mm²/s]': kv40, 'Y = ν100 [mm²/s]': kv100 },
  };

  // Density and volume fractions.
  const density15 = blendDensity(blendParts);
  const deliveryTempC = opts.deliveryTempC ?? 15;
  assertTemperatureC(fn, 'deliveryTempC', deliveryTempC);
  const densityAtDelivery = { tempC: deliveryTempC, density: blendDensityAtTemperature(blendParts, deliveryTempC) };
  const phi = massToVolumeFractions(blendParts);
  explain.density15 = {
    equation: '1/ρ = Σ wᵢ/ρᵢ (ideal mixing, densities at 15 °C)',
    standard: 'common practice (ideal mixing); measure by ASTM D4052',
    inputs: Object.fromEntries(parts.map((p) => [`${p.component.code} ρ15 [kg/L]`, p.component.density15])),
  };

  // Aniline point (volume basis, over the parts that have one).
  const apParts = parts.map((p, i) => ({ volumeFraction: phi[i]!, anilinePoint: p.component.anilinePoint }));
  let anilinePoint: BlendProperties['anilinePoint'] = null;
  if (apParts.some((p) => p.anilinePoint !== null && p.volumeFraction > 0)) {
    anilinePoint = blendAnilinePoint(apParts);
  } else {
    warnings.push('No component in the blend has an aniline point: the blend aniline point is unknown.');
  }
  explain.anilinePoint = {
    equation: 'AP ≈ Σ φᵢ·APᵢ / Σ φᵢ over the parts that have an aniline point (volume fractions)',
    standard: 'ASTM D611 values; volume-weighted mean is common practice (no source), non-ideal for polar Group V fluids',
    inputs: Object.fromEntries(parts.map((p, i) => [`${p.component.code} φ / AP [– / °C]`, [fmt(phi[i]!), p.component.anilinePoint]])),
    note:
      anilinePoint?.basis === 'base-fluid'
        ? 'Taken over the base fluid: parts without an aniline point (additive package) are left out and the rest renormalised.'
        : undefined,
  };

  // Flash and pour point (blending indices by volume).
  const flashPoint = blendFlashPoint(parts.map((p, i) => ({ volumeFraction: phi[i]!, flashPoint: p.component.flashPoint })));
  const pourPoint = blendPourPoint(parts.map((p, i) => ({ volumeFraction: phi[i]!, pourPoint: p.component.pourPoint })));
  explain.flashPoint = {
    equation: 'log₁₀ BI = −6.1188 + 2414/(T − 42.6), T [K];  BI_blend = Σ φᵢ·BIᵢ',
    standard: 'Wickey–Chittenden flash-point blending index (1963), estimate; measure by ASTM D92',
    inputs: Object.fromEntries(parts.map((p) => [`${p.component.code} flash [°C]`, p.component.flashPoint])),
    note: 'An estimate; a light diluent in the additive package can dominate the real flash point.',
  };
  explain.pourPoint = {
    equation: 'BI = T^12.5, T [K];  BI_blend = Σ φᵢ·BIᵢ;  T = BI^0.08',
    standard: 'Hu–Burns pour-point blending index (1970), estimate; measure by ASTM D97',
    inputs: Object.fromEntries(parts.map((p) => [`${p.component.code} pour [°C]`, p.component.pourPoint])),
    note: 'An estimate only: wax and pour-point depressants defeat any mixing rule.',
  };
  if (flashPoint === null) warnings.push('Flash point not estimated: a component in the blend has no flash point.');
  if (pourPoint === null) warnings.push('Pour point not estimated: a component in the blend has no pour point.');
  const usedParts = parts.filter((p) => p.line.massFraction > 0);
  const flashPointExtrapolated =
    flashPoint !== null && flashIndexExtrapolated(flashPoint, usedParts.map((p) => p.component.flashPoint));
  const pourPointExtrapolated = pourPoint !== null && pourIndexExtrapolated(pourPoint, usedParts.map((p) => p.component.pourPoint));
  if (flashPointExtrapolated) {
    explain.flashPoint.note =
      `Extrapolation: the Wickey–Chittenden index was fitted on flash points below ${words.sayTemp(FLASH_INDEX_FITTED_MAX_C)} (petroleum fuels and ` +
      'distillates); gear-oil flash points lie beyond that. ' +
      explain.flashPoint.note;
  }
  if (pourPointExtrapolated) {
    explain.pourPoint.note =
      `Extrapolation: the Hu–Burns index was fitted on pour points of ${words.sayTemp(POUR_INDEX_FITTED_C.min)}…${words.sayTemp(POUR_INDEX_FITTED_C.max)} ` +
      '(distillate fuels). ' +
      explain.pourPoint.note;
  }

  // Cost.
  const used = parts.filter((p) => p.line.massFraction > 0);
  const currencies = [...new Set(used.map((p) => p.component.price.currency))];
  const mixedCurrencies = currencies.length > 1;
  // A blank currency marks a stock without a usable price (`currency/exchange-rates.ts`: no price,
  // values not yet entered, or no exchange rate to the base): a blend holding one is never costed,
  // even when every stock of it is such a one.
  const unpricedCodes = used.filter((p) => p.component.price.currency.trim() === '').map((p) => p.component.code);
  let costPerKg: number | null = null;
  let costPerLitre: number | null = null;
  let costPerDeliveredLitre: { tempC: number; cost: number } | null = null;
  const currency = mixedCurrencies || unpricedCodes.length > 0 ? null : (currencies[0] ?? null);
  const priceParts = parts.map((p) => ({
    massFraction: p.line.massFraction,
    density15: p.component.density15,
    pricePerKg: pricePerKg(p.component.price, p.component.density15),
  }));
  if (unpricedCodes.length > 0) {
    warnings.push(
      `${unpricedCodes.join(', ')} ${unpricedCodes.length === 1 ? 'has' : 'have'} no usable price (none entered, values not yet entered, or no exchange rate), so no cost is shown.`,
    );
  } else if (mixedCurrencies) {
    warnings.push(
      `Prices are in different currencies (${currencies.join(', ')}); a price is never added into another currency, so no cost is shown (enter an exchange rate under Settings).`,
    );
  } else {
    costPerKg = blendCostPerKg(priceParts);
    costPerLitre = blendCostPerLitre(priceParts);
    costPerDeliveredLitre = { tempC: deliveryTempC, cost: blendCostPerLitreAt(priceParts, deliveryTempC) };
  }
  explain.costPerLitre = {
    equation: 'c_kg = Σ wᵢ·p_kg,ᵢ;  c_L(15 °C) = ρ15,blend·c_kg (= Σ φᵢ·p_L,ᵢ)',
    standard: 'common practice',
    inputs: Object.fromEntries(priceParts.map((p, i) => [`${parts[i]!.component.code} price [${parts[i]!.component.price.currency}/kg]`, p.pricePerKg])),
  };
  explain.costPerKg = { ...explain.costPerLitre };
  explain.costPerDeliveredLitre = {
    equation: `c_L(t) = ρ_blend(t)·c_kg, 1/ρ_blend(t) = Σ wᵢ/ρᵢ(t), ρᵢ(t) = ρ15,ᵢ·exp(−α₁₅Δt(1 + 0.8α₁₅Δt)), α₁₅ = 0.6278/ρ15 [kg/m³], Δt = t − 15 °C`,
    standard: 'ASTM D1250-80 / ISO 91-1 Table 54D (lubricating oils); common practice for cost',
    inputs: { 'delivery temperature t [°C]': deliveryTempC, 'ρ_blend(t) [kg/L]': fmt(densityAtDelivery.density) },
  };

  // Grade.
  const grade = isoViscosityGrade(kv40);
  const deviation = grade === null ? null : deviationFromMidPct(kv40, grade);
  explain.grade = {
    equation: 'grade whose band (mid-point ±10 %, inclusive) holds ν40; deviation = 100·(ν40 − mid)/mid',
    standard: 'ISO 3448 (ASTM D2422)',
    inputs: { 'ν40 [mm²/s]': kv40 },
  };

  // Viscosity at the operating and cold temperatures (the blend's own D341 line), with the guard.
  const atTemp = (tempC: number | undefined, field: string): KvAtTemperature | null => {
    if (tempC === undefined) return null;
    assertTemperatureC(fn, field, tempC);
    try {
      const kv = viscosityAtTemperature(kv40, kv100, tempC, d341Form);
      const a = assessTemperature(tempC, undefined, opts.display);
      if (a.outsideBand) warnings.push(`Viscosity at ${words.sayTemp(tempC)}: ${a.note}`);
      return { tempC, kv, form: d341Form, extrapolated: a.extrapolated, outsideBand: a.outsideBand };
    } catch (e) {
      if (e instanceof BlendbenchInputError) {
        warnings.push(`No viscosity at ${words.sayTemp(tempC)}: ${e.message}`);
        return null;
      }
      throw e;
    }
  };
  const kvAtOperating = atTemp(opts.operatingTempC, 'operatingTempC');
  const kvAtCold = atTemp(opts.coldTempC, 'coldTempC');
  explain.kvAtTemperature = {
    equation: `log₁₀ log₁₀ Z = A − B·log₁₀ T, T [K], ${D341_Z_EQUATION[d341Form]}, through the blend’s ν40 and ν100`,
    standard: D341_FORM_SHORT[d341Form],
    inputs: { 'ν40 [mm²/s]': kv40, 'ν100 [mm²/s]': kv100 },
    // The measured temperatures and the trusted band in the user's unit (as the charts' note words them).
    note:
      `Outside ${words.sayTemp(40)}–${words.sayTemp(100)} the line is extrapolated, and outside ` +
      `${words.sayTemp(D341_TRUSTED_BAND_C.min)}…${words.sayTemp(D341_TRUSTED_BAND_C.max)} it is not to be trusted; not meaningful below ` +
      'the pour point or for polymer-thickened oils at low temperature.',
  };

  // Polymer share and oxidation rating.
  const polymerFraction = parts.reduce((s, p) => s + (p.component.category === 'polymer' ? p.line.massFraction : 0), 0);
  let oxidationRating: number | null = null;
  if (parts.some((p) => p.component.category !== 'additive-package' && p.line.massFraction > 0)) {
    oxidationRating = blendOxidationRating(components, lines).rating;
  }
  explain.oxidationRating = {
    equation: 'r = Σ wᵢ·rᵢ / Σ wᵢ over the base fluid (additive packages left out)',
    standard: 'Blendbench’s own ordinal 1–5 scale (common practice ordering, not a measurement)',
    inputs: {},
    note: parts.some((p) => p.component.category === 'group-v' && p.line.massFraction > 0) ? ESTER_HYDROLYSIS_CAVEAT : undefined,
  };
  explain.method = { equation: BLEND_METHOD_LABEL[method], standard: viscStandard, inputs: {} };

  return {
    method,
    d341Form,
    lines: parts.map((p, i) => ({
      componentId: p.component.id,
      massFraction: p.line.massFraction,
      volumeFraction: phi[i]!,
      kv40: p.kv40,
      kv100: p.kv100,
      calibrated: p.calibrated,
    })),
    kv40,
    kv100,
    vi,
    reportedVi,
    density15,
    densityAtDelivery,
    anilinePoint,
    flashPoint,
    pourPoint,
    flashPointExtrapolated,
    pourPointExtrapolated,
    costPerKg,
    costPerLitre,
    costPerDeliveredLitre,
    currency,
    mixedCurrencies,
    grade,
    deviationFromMidPct: deviation,
    kvAtOperating,
    kvAtCold,
    polymerFraction,
    oxidationRating,
    explain,
    warnings,
  };
}

