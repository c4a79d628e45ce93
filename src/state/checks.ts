/**
 * Entry checks for a component: hard errors (the value cannot be right, or the core cannot use it)
 * and warnings (possible but outside the usual range for the trade — flagged, never silently
 * accepted). Used by the library screen at entry and by imports, so both say the same thing.
 *
 * The plausible ranges are common practice (no source): wide enough for every stock type a gear-oil
 * blender meets (light esters to mid-molecular-weight polymers), narrow enough to catch unit slips
 * (kg/m³ typed as kg/L, cSt at 100 °C typed in the 40 °C column).
 */
import { ABSOLUTE_ZERO_C, DENSITY15_MAX, DENSITY15_MIN } from '../core/errors';
import { OXIDATION_RATING_MAX, OXIDATION_RATING_MIN } from '../core/scoring/oxidation';
import { VI_MIN_KV100, reportedViscosityIndex, viscosityIndex } from '../core/viscosity/viscosity-index';
import { apiGroupIssues } from '../core/classification/api-1509';
import { kv40kv100FromPoints } from '../core/viscosity/viscosity-temperature';
import type { Component } from '../core/formulation/model';
import { checkNumber, checkText, FILE_NUMBERS, type NumberRuleKey, type SayNumbers } from './field-rules';

/** Field names used in messages and for placing them beside inputs. */
export type CheckField =
  | 'code'
  | 'name'
  | 'kv40'
  | 'kv100'
  | 'viscosityPoints'
  | 'density15'
  | 'anilinePoint'
  | 'pourPoint'
  | 'flashPoint'
  | 'sulfurPct'
  | 'saturatesPct'
  | 'price'
  | 'oxidationRating'
  | 'shearLossPct'
  | 'shearLoss40Pct'
  | 'kv40LotSpreadPct'
  | 'category';

export interface CheckIssue {
  field: CheckField;
  message: string;
}

export interface CheckResult {
  errors: CheckIssue[];
  warnings: CheckIssue[];
}

type Range = readonly [number, number];
/** Plausible ranges (common practice, no source). */
export const PLAUSIBLE: Record<'kv40' | 'kv100' | 'anilinePoint' | 'pourPoint' | 'flashPoint' | 'sulfurPct' | 'shearLossPct', Range> = {
  kv40: [2, 50_000],
  kv100: [2, 3_000],
  anilinePoint: [-60, 180],
  pourPoint: [-80, 40],
  flashPoint: [60, 400],
  sulfurPct: [0, 5],
  shearLossPct: [0, 60],
};

/** Writes numbers into messages (see field-rules.ts); screens pass their formatter. */
export type { SayNumbers } from './field-rules';
export { FILE_NUMBERS } from './field-rules';

/**
 * Lowest ν40 and ν100 accepted in the library [mm²/s]: ASTM D2270 defines no VI below a ν100 of
 * 2.0 mm²/s, and the simple ASTM D341 form (Z = ν + 0.7), selectable in Settings, is stated for
 * ν ≥ 2.0 mm²/s (the default D341-20 form reaches lower).
 */
export const MIN_LIBRARY_KV = VI_MIN_KV100;

/**
 * Check a stock code or name as typed: the field rules (length, control characters), and at entry
 * a name may not be blank either (an imported stock may come without one). Returns the message, or
 * nothing when it is acceptable.
 */
export function checkLabelText(what: 'stock code' | 'name', v: string): string | undefined {
  if (!v.trim()) return `a ${what} is required`;
  const refused = checkText(what === 'stock code' ? 'stockCode' : 'stockName', v);
  return refused ? refused.charAt(0).toLowerCase() + refused.slice(1) : undefined;
}

/**
 * Hard limits (common practice, no source): beyond these a number cannot describe a blending
 * component at all (a slipped exponent or a hostile import), so it is an error, not a warning.
 */
export const POSSIBLE = { maxKv: 1e7, maxTempC: 1000, maxPrice: 1e12 } as const;

/** The field rule (field-rules.ts) behind each number field: its hard limits are the stored ones. */
const RULE_OF: Partial<Record<CheckField, NumberRuleKey>> = {
  kv40: 'kv40',
  kv100: 'kv100',
  density15: 'density15',
  anilinePoint: 'anilinePoint',
  pourPoint: 'pourPoint',
  flashPoint: 'flashPoint',
  sulfurPct: 'sulfurPct',
  saturatesPct: 'saturatesPct',
  price: 'price',
  oxidationRating: 'oxidationRating',
  shearLossPct: 'shearLossPct',
  shearLoss40Pct: 'shearLoss40Pct',
  kv40LotSpreadPct: 'kv40LotSpreadPct',
};

/**
 * Check one number field alone. Returns an error or a warning message, or nothing. Beyond the specific
 * messages below, anything the field rules (field-rules.ts) refuse is an error here too, so entry never
 * accepts a value that storage would refuse.
 */
export function checkValue(field: CheckField, v: number | null, words: SayNumbers = FILE_NUMBERS): { error?: string; warning?: string } {
  const r = checkValueSpecific(field, v, words);
  if (r.error || v === null || !Number.isFinite(v)) return r;
  const rule = RULE_OF[field];
  const refused = rule ? checkNumber(rule, v, undefined, words) : null;
  return refused ? { error: refused } : r;
}

function checkValueSpecific(field: CheckField, v: number | null, words: SayNumbers): { error?: string; warning?: string } {
  const fmt = words.say;
  const temp = words.sayTemp;
  if (v === null) {
    if (field === 'kv40' || field === 'kv100' || field === 'density15' || field === 'price') return { error: 'a value is required' };
    return {};
  }
  if (!Number.isFinite(v)) return { error: 'must be a finite number' };
  const outside = (r: Range, what: string, unit: string) =>
    v < r[0] || v > r[1] ? { warning: `${fmt(v)} ${unit} is outside the usual ${fmt(r[0])} to ${fmt(r[1])} ${unit} for ${what}; check the value` } : {};
  const outsideTemp = (r: Range, what: string) =>
    v < r[0] || v > r[1] ? { warning: `${temp(v)} is outside the usual ${temp(r[0])} to ${temp(r[1])} for ${what}; check the value` } : {};
  if ((field === 'anilinePoint' || field === 'pourPoint' || field === 'flashPoint') && (v < ABSOLUTE_ZERO_C || v > POSSIBLE.maxTempC)) {
    return { error: `${temp(v)} is not a possible temperature here` };
  }
  switch (field) {
    case 'kv40':
    case 'kv100':
      if (v <= 0) return { error: 'a viscosity must be above zero' };
      if (v < MIN_LIBRARY_KV) {
        return {
          error: `${fmt(v)} mm²/s is below ${fmt(MIN_LIBRARY_KV)} mm²/s, where ASTM D2270 defines no viscosity index and the ASTM D341 line does not hold`,
        };
      }
      if (v > POSSIBLE.maxKv) return { error: `${fmt(v)} mm²/s is not a possible viscosity for a blending component` };
      return outside(PLAUSIBLE[field], `ν${field === 'kv40' ? '40' : '100'}`, 'mm²/s');
    case 'density15':
      if (v <= 0) return { error: 'density must be above zero' };
      if (v > 100) return { error: `${fmt(v)} looks like kg/m³: enter kg/L (e.g. ${fmt(v / 1000)})` };
      if (v < DENSITY15_MIN || v > DENSITY15_MAX) {
        return { error: `${fmt(v)} kg/L is outside ${DENSITY15_MIN}–${DENSITY15_MAX} kg/L, impossible for an oil at 15 °C` };
      }
      if (v < 0.78 || v > 1.1) return { warning: `${fmt(v)} kg/L is unusual for a base stock or additive (0.78–1.10 kg/L)` };
      return {};
    case 'anilinePoint':
      return outsideTemp(PLAUSIBLE.anilinePoint, 'an aniline point');
    case 'pourPoint':
      return outsideTemp(PLAUSIBLE.pourPoint, 'a pour point');
    case 'flashPoint':
      return outsideTemp(PLAUSIBLE.flashPoint, 'a flash point');
    case 'sulfurPct':
      if (v < 0 || v > 100) return { error: 'sulfur must be between 0 and 100 mass %' };
      return outside(PLAUSIBLE.sulfurPct, 'base-stock sulfur', '%');
    case 'saturatesPct':
      if (v < 0 || v > 100) return { error: 'saturates must be between 0 and 100 mass %' };
      return {};
    case 'price':
      if (v < 0) return { error: 'a price cannot be negative' };
      if (v > POSSIBLE.maxPrice) return { error: `${fmt(v)} is not a possible price` };
      if (v === 0) return { warning: 'no price: left out of costing and solving until one is entered' };
      return {};
    case 'oxidationRating':
      if (v < OXIDATION_RATING_MIN || v > OXIDATION_RATING_MAX) {
        return { error: `the oxidation rating runs from ${OXIDATION_RATING_MIN} to ${OXIDATION_RATING_MAX}` };
      }
      return {};
    case 'shearLossPct':
      if (v < 0 || v > 100) return { error: 'shear loss must be between 0 and 100 %' };
      return outside(PLAUSIBLE.shearLossPct, 'a permanent shear loss', '%');
    case 'shearLoss40Pct':
      // The hard limits (0–100 %) are the field rule's (RULE_OF); the usual range is the ν100 loss's.
      return outside(PLAUSIBLE.shearLossPct, 'a permanent shear loss', '%');
    case 'kv40LotSpreadPct':
      // The hard limits (0–25 %) are the field rule's (RULE_OF); a wide spread is only unusual.
      if (v > 10) return { warning: `${fmt(v)} % is a very wide lot-to-lot spread of ν40; check the value (a relative standard deviation, not a range)` };
      return {};
    default:
      return {};
  }
}

/** Check ν100 against ν40 (a higher temperature always gives a lower viscosity). */
export function checkViscosityPair(kv40: number, kv100: number, words: SayNumbers = FILE_NUMBERS): { error?: string; warning?: string } {
  const fmt = words.say;
  if (!(kv40 > 0) || !(kv100 > 0)) return {};
  if (kv100 >= kv40) return { error: `ν100 (${fmt(kv100)} mm²/s) must be below ν40 (${fmt(kv40)} mm²/s)` };
  if (kv40 / kv100 < 1.8) return { warning: `ν40/ν100 = ${fmt(kv40 / kv100)} is unusually close; check the two values` };
  return {};
}

/** ν40 and ν100 of a component (measured, or read off its ASTM D341 line), or null when unusable. */
export function kv40kv100(c: Pick<Component, 'viscosityPoints'>): { kv40: number; kv100: number } | null {
  try {
    return kv40kv100FromPoints(c.viscosityPoints);
  } catch {
    return null;
  }
}

/**
 * The VI of a ν40/ν100 pair for display, or why there is none (in words for the table cell):
 * ν100 not below ν40, or ν100 below 2.0 mm²/s (outside ASTM D2270).
 */
export function viOrReason(kv40: number | null, kv100: number | null): { vi: number } | { reason: string; why: string } {
  if (kv40 === null || kv100 === null || !(kv40 > 0) || !(kv100 > 0)) return { reason: '—', why: 'needs ν40 and ν100' };
  if (kv100 >= kv40) return { reason: 'ν100 ≥ ν40', why: 'no VI: ν100 must be below ν40' };
  if (kv100 < VI_MIN_KV100) return { reason: 'ν100 < 2', why: 'no VI: ASTM D2270 defines none below a ν100 of 2.0 mm²/s' };
  const vi = safeVi(kv40, kv100);
  return vi === null ? { reason: '—', why: 'no VI for these viscosities' } : { vi };
}

/** VI (unrounded) or null when not defined (ν100 < 2 mm²/s or inputs unusable). */
export function safeVi(kv40: number, kv100: number): number | null {
  try {
    return viscosityIndex(kv40, kv100);
  } catch {
    return null;
  }
}

/** Every check on a whole component. */
export function checkComponent(c: Component, others: readonly Component[] = []): CheckResult {
  const errors: CheckIssue[] = [];
  const warnings: CheckIssue[] = [];
  const add = (field: CheckField, r: { error?: string; warning?: string }) => {
    if (r.error) errors.push({ field, message: r.error });
    if (r.warning) warnings.push({ field, message: r.warning });
  };
  const codeProblem = checkLabelText('stock code', c.code);
  if (codeProblem) errors.push({ field: 'code', message: codeProblem });
  // A blank name is refused at entry; an imported stock may come without one.
  const nameProblem = c.name.trim() ? checkLabelText('name', c.name) : undefined;
  if (nameProblem) errors.push({ field: 'name', message: nameProblem });
  const clash = others.find((o) => o.id !== c.id && o.code.trim().toLowerCase() === c.code.trim().toLowerCase());
  if (c.code.trim() && clash) errors.push({ field: 'code', message: `stock code ${c.code} is already used` });
  const at = (t: number) => c.viscosityPoints.find((pt) => pt.tempC === t)?.kv;
  const m40 = at(40);
  const m100 = at(100);
  const pair = m40 !== undefined && m100 !== undefined ? checkViscosityPair(m40, m100) : {};
  // A measured ν40/ν100 outside what can be used is named as such (not as an unusable line).
  const measuredError = (['kv40', 'kv100'] as const)
    .map((f) => ({ f, v: f === 'kv40' ? m40 : m100 }))
    .map(({ f, v }) => ({ f, e: v === undefined ? undefined : checkValue(f, v).error }))
    .find((x) => x.e !== undefined);
  const p = pair.error || measuredError ? null : kv40kv100(c);
  if (measuredError) {
    errors.push({ field: measuredError.f, message: measuredError.e! });
  } else if (pair.error) {
    errors.push({ field: 'kv100', message: pair.error });
  } else if (!p) {
    errors.push({ field: 'viscosityPoints', message: 'needs viscosities at two temperatures, falling as temperature rises' });
  } else {
    add('kv40', checkValue('kv40', p.kv40));
    add('kv100', checkValue('kv100', p.kv100));
    add('kv100', checkViscosityPair(p.kv40, p.kv100));
    const vi = p.kv100 < p.kv40 ? safeVi(p.kv40, p.kv100) : null;
    const reported = vi === null ? null : reportedViscosityIndex(p.kv40, p.kv100);
    for (const issue of apiGroupIssues(c.category, { reportedVi: reported, sulfurPct: null, saturatesPct: null })) {
      warnings.push({ field: 'category', message: issue.message });
    }
  }
  for (const issue of apiGroupIssues(c.category, { reportedVi: null, sulfurPct: c.sulfurPct, saturatesPct: c.saturatesPct })) {
    warnings.push({ field: issue.field === 'sulfurPct' ? 'sulfurPct' : 'saturatesPct', message: issue.message });
  }
  add('density15', checkValue('density15', c.density15));
  add('anilinePoint', checkValue('anilinePoint', c.anilinePoint));
  add('pourPoint', checkValue('pourPoint', c.pourPoint));
  add('flashPoint', checkValue('flashPoint', c.flashPoint));
  add('sulfurPct', checkValue('sulfurPct', c.sulfurPct));
  add('saturatesPct', checkValue('saturatesPct', c.saturatesPct));
  add('price', checkValue('price', c.price.amount));
  add('oxidationRating', checkValue('oxidationRating', c.oxidationRating));
  add('shearLossPct', checkValue('shearLossPct', c.shearLossPct));
  add('shearLoss40Pct', checkValue('shearLoss40Pct', c.shearLoss40Pct ?? null));
  add('kv40LotSpreadPct', checkValue('kv40LotSpreadPct', c.kv40LotSpreadPct));
  return { errors, warnings };
}
