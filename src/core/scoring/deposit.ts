/**
 * Deposit propensity — Blendbench's own assessment combining oxidation stability and solvency.
 *
 * The trade-off (common practice, no source; domain doc §6): deeper refining buys oxidation
 * stability and costs solvency. A highly refined, poorly solvent oil stays clean for a long time,
 * but once its antioxidants are spent it cannot hold polar oxidation products in solution and
 * drops them as varnish and sludge quickly ("late and abrupt"). An aromatic-rich, solvent oil
 * oxidises sooner but keeps the products dissolved, so it darkens and thickens gradually.
 *
 * Inputs are the two ordinal scales of `oxidation.ts` (blend rating r, 1–5) and `solvency.ts`
 * (band score s, 1–5, from the volume-blended aniline point). The matrix below is a design choice
 * of Blendbench (common practice, no source), not a measured or published correlation:
 *
 * | oxidation class ↓ / solvency → | poor (1) | limited (2) | moderate (3) | good (4) | strong (5) |
 * |--------------------------------|----------|-------------|--------------|----------|------------|
 * | high   (r ≥ 4.5)               | elevated | elevated    | moderate     | low      | low        |
 * | good   (3.5 ≤ r < 4.5)         | elevated | moderate    | low          | low      | low        |
 * | moderate (2.5 ≤ r < 3.5)       | moderate | moderate    | low          | low      | low        |
 * | fair   (1.5 ≤ r < 2.5)         | elevated | moderate    | moderate     | moderate | moderate   |
 * | low    (r < 1.5)               | elevated | elevated    | moderate     | moderate | moderate   |
 *
 * Patterns: 'late-abrupt' (r ≥ 3.5 and s ≤ 2), 'early-gradual' (r < 2.5 and s ≥ 3),
 * 'early-insoluble' (r < 2.5 and s ≤ 2), otherwise 'balanced'.
 */
import { displayWords, type NumberDisplay } from '../words/display';
import { blendOxidationRating, oxidationClass, OXIDATION_CLASS_LABEL } from './oxidation';
import type { BlendOxidation, OxidationClass } from './oxidation';
import { blendSolvency, SOLVENCY_BAND_LABEL } from './solvency';
import type { BlendSolvency, SolvencyBand } from './solvency';
import type { Component, RecipeLine } from '../formulation/model';

/** Ordered least to most concerning. Names are Blendbench's own. */
export type DepositPropensity = 'low' | 'moderate' | 'elevated';

export const DEPOSIT_PROPENSITIES: readonly DepositPropensity[] = ['low', 'moderate', 'elevated'];

export const DEPOSIT_PROPENSITY_LABEL: Record<DepositPropensity, string> = {
  low: 'Low deposit propensity',
  moderate: 'Moderate deposit propensity',
  elevated: 'Elevated deposit propensity',
};

/** How the blend is expected to fail, if it does. */
export type DepositPattern = 'late-abrupt' | 'early-gradual' | 'early-insoluble' | 'balanced';

export const DEPOSIT_PATTERN_LABEL: Record<DepositPattern, string> = {
  'late-abrupt': 'late and abrupt',
  'early-gradual': 'early and gradual',
  'early-insoluble': 'early, poorly dissolved',
  balanced: 'balanced',
};

/** Rows: oxidation class; columns: solvency band (poor … strong). See the module table. */
const MATRIX: Record<OxidationClass, Record<SolvencyBand, DepositPropensity>> = {
  high: { poor: 'elevated', limited: 'elevated', moderate: 'moderate', good: 'low', strong: 'low' },
  good: { poor: 'elevated', limited: 'moderate', moderate: 'low', good: 'low', strong: 'low' },
  moderate: { poor: 'moderate', limited: 'moderate', moderate: 'low', good: 'low', strong: 'low' },
  fair: { poor: 'elevated', limited: 'moderate', moderate: 'moderate', good: 'moderate', strong: 'moderate' },
  low: { poor: 'elevated', limited: 'elevated', moderate: 'moderate', good: 'moderate', strong: 'moderate' },
};

/**
 * Deposit propensity and pattern from the blend's oxidation rating and solvency score.
 *
 * @param oxidationRating r, blend rating on the 1–5 oxidation scale (higher = more stable).
 * @param solvencyScore s, solvency score 1–5 (higher = more solvent).
 * @returns Propensity (matrix in the module comment) and pattern.
 * @example depositPropensity(4.8, 1) // → { propensity: 'elevated', pattern: 'late-abrupt' }
 * Source: Blendbench's own matrix; the trade-off is common practice (no source).
 */
export function depositPropensity(
  oxidationRating: number,
  solvencyScore: number,
): { propensity: DepositPropensity; pattern: DepositPattern } {
  const oxClass = oxidationClass(oxidationRating);
  const band = bandOfScore(solvencyScore);
  const propensity = MATRIX[oxClass][band];
  let pattern: DepositPattern = 'balanced';
  if (oxidationRating >= 3.5 && solvencyScore <= 2) pattern = 'late-abrupt';
  else if (oxidationRating < 2.5 && solvencyScore >= 3) pattern = 'early-gradual';
  else if (oxidationRating < 2.5 && solvencyScore <= 2) pattern = 'early-insoluble';
  return { propensity, pattern };
}

function bandOfScore(score: number): SolvencyBand {
  if (score <= 1) return 'poor';
  if (score <= 2) return 'limited';
  if (score <= 3) return 'moderate';
  if (score <= 4) return 'good';
  return 'strong';
}

/** A component named as a driver of the assessment. */
export interface DepositDriver {
  componentId: string;
  code: string;
  /** Signed pull on the blend value: °C of aniline point, or points of oxidation rating. */
  pull: number;
}

export interface DepositAssessment {
  propensity: DepositPropensity;
  pattern: DepositPattern;
  oxidation: BlendOxidation;
  solvency: BlendSolvency;
  drivers: {
    /** Components raising the aniline point (less solvent), largest pull first. */
    raiseAniline: DepositDriver[];
    /** Components lowering the aniline point (more solvent), largest pull first. */
    lowerAniline: DepositDriver[];
    /** Components raising the oxidation rating, largest first. */
    raiseStability: DepositDriver[];
    /** Components lowering the oxidation rating, largest first. */
    lowerStability: DepositDriver[];
  };
  /** Plain-language explanation naming the driving components. */
  explanation: string;
  /** Always true: built from ordinal scales, never measured. */
  approximate: true;
}

/** Pulls smaller than these are not named as drivers (no false precision). */
const MIN_ANILINE_PULL = 0.5; // °C
const MIN_RATING_PULL = 0.05; // rating points
const MAX_DRIVERS = 2;

/**
 * Deposit-propensity assessment of a blend, with the components that drive it.
 *
 * Computes the blend oxidation rating (mass-weighted mean over the base fluid) and the blend
 * aniline point (volume basis), looks up the matrix of {@link depositPropensity}, and names the
 * components with the largest pulls: φᵢ·(APᵢ − AP_blend) for solvency, fᵢ·(rᵢ − r_blend) for
 * stability.
 *
 * @param components Library holding every component named by `lines`.
 * @param lines Recipe lines, mass fractions summing to 1.
 * @returns The assessment, with a plain-language explanation; flagged approximate.
 * @throws the errors of `blendOxidationRating` and `blendSolvency`.
 * @example assessDeposit(lib, recipe.lines).explanation
 *   // → "Elevated deposit propensity (late and abrupt). …"
 * Source: Blendbench's own scales (common practice, no source).
 */
export function assessDeposit(
  components: readonly Pick<Component, 'id' | 'code' | 'category' | 'oxidationRating' | 'density15' | 'anilinePoint'>[],
  lines: readonly RecipeLine[],
): DepositAssessment {
  const oxidation = blendOxidationRating(components, lines);
  const solvency = blendSolvency(components, lines);
  const { propensity, pattern } = depositPropensity(oxidation.rating, solvency.score);
  const codeOf = new Map(components.map((c) => [c.id, c.code]));

  const pick = (items: { componentId: string; pull: number }[], sign: 1 | -1, min: number): DepositDriver[] =>
    items
      .filter((x) => sign * x.pull >= min)
      .sort((a, b) => sign * b.pull - sign * a.pull || a.componentId.localeCompare(b.componentId))
      .slice(0, MAX_DRIVERS)
      .map((x) => ({ componentId: x.componentId, code: codeOf.get(x.componentId) ?? x.componentId, pull: x.pull }));

  const oxPulls = oxidation.contributions.map((c) => ({
    componentId: c.componentId,
    pull: c.baseFluidFraction * (c.rating - oxidation.rating),
  }));
  const drivers = {
    raiseAniline: pick(solvency.contributions, 1, MIN_ANILINE_PULL),
    lowerAniline: pick(solvency.contributions, -1, MIN_ANILINE_PULL),
    raiseStability: pick(oxPulls, 1, MIN_RATING_PULL),
    lowerStability: pick(oxPulls, -1, MIN_RATING_PULL),
  };
  const explanation = explain(propensity, pattern, oxidation, solvency, drivers);
  return { propensity, pattern, oxidation, solvency, drivers, explanation, approximate: true };
}

/**
 * The plain-language explanation of an assessment written in the user's number style: the oxidation
 * rating with their decimal separator, the blend aniline point in their temperature unit
 * (t_F = 9/5·t_C + 32). `assessDeposit(…).explanation` is the same text with "." and °C.
 *
 * @param a - an assessment from {@link assessDeposit}
 * @param display - decimal separator and temperature unit (default ".", °C)
 * @returns the explanation, e.g. "… (rating 3,2 of 5) … (aniline point about 221 °F, by volume) …"
 * Source: Blendbench's own scales (common practice, no source).
 */
export function explainDeposit(a: DepositAssessment, display?: NumberDisplay): string {
  return explain(a.propensity, a.pattern, a.oxidation, a.solvency, a.drivers, display);
}

const list = (ds: DepositDriver[]): string => ds.map((d) => d.code).join(' and ');

function explain(
  propensity: DepositPropensity,
  pattern: DepositPattern,
  ox: BlendOxidation,
  sol: BlendSolvency,
  d: DepositAssessment['drivers'],
  display?: NumberDisplay,
): string {
  const w = displayWords(display);
  const s: string[] = [];
  s.push(`${DEPOSIT_PROPENSITY_LABEL[propensity]} (${DEPOSIT_PATTERN_LABEL[pattern]}).`);
  let oxLine = `${OXIDATION_CLASS_LABEL[ox.oxidationClass]} (rating ${w.num(ox.rating, 1)} of 5)`;
  const up = d.raiseStability.length ? `raised by ${list(d.raiseStability)}` : '';
  const down = d.lowerStability.length ? `lowered by ${list(d.lowerStability)}` : '';
  if (up || down) oxLine += `, ${[up, down].filter(Boolean).join(', ')}`;
  s.push(`${oxLine}.`);
  const basis = sol.basis === 'base-fluid' ? 'by volume over the base fluid' : 'by volume';
  let solLine = `${SOLVENCY_BAND_LABEL[sol.band]} (aniline point about ${w.temp(sol.anilinePoint, 0)}, ${basis})`;
  const apUp = d.raiseAniline.length ? `pushed up most by ${list(d.raiseAniline)}` : '';
  const apDown = d.lowerAniline.length ? `pulled down by ${list(d.lowerAniline)}` : '';
  if (apUp || apDown) solLine += `, ${[apUp, apDown].filter(Boolean).join(', ')}`;
  s.push(`${solLine}.`);
  switch (pattern) {
    case 'late-abrupt':
      s.push(
        'A highly refined, poorly solvent blend stays clean for long, but once its antioxidants are spent it ' +
          'cannot keep polar oxidation products in solution and may shed them as varnish and sludge abruptly. ' +
          'A solvency booster (alkylated naphthalene, ester or alkylbenzene) lowers the aniline point.',
      );
      break;
    case 'early-gradual':
      s.push(
        'An aromatic-rich, solvent blend oxidises sooner but keeps its oxidation products dissolved: expect ' +
          'gradual darkening and thickening rather than sudden varnish.',
      );
      break;
    case 'early-insoluble':
      s.push('The blend oxidises comparatively early and dissolves oxidation products poorly: sludge and varnish may both appear sooner.');
      break;
    case 'balanced':
      s.push('Stability and solvency are balanced on these scales: no particular deposit tendency is indicated.');
      break;
  }
  s.push('Estimate from ordinal scales, not a measurement: confirm with laboratory oxidation and deposit tests.');
  return s.join(' ');
}
