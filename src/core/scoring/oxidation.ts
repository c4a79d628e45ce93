/**
 * Oxidation-stability rating — Blendbench's own ordinal scale (not a measurement).
 *
 * Scale: 1 to 5, higher = more oxidation-stable **in a finished, antioxidant-treated oil** (the
 * relevant case for a gear oil made with an additive package). The ordering of the defaults follows
 * common practice (from memory, no source) for the response of base-stock types to antioxidants:
 *
 *   PAO ≈ Group III ≥ saturated polyol ester ≈ alkylated naphthalene ≥ Group II > Group I
 *     > unsaturated (natural or oleate) ester
 *
 * | Category          | Default | Why (common practice, from memory)                                    |
 * |-------------------|---------|-----------------------------------------------------------------------|
 * | Group IV (PAO)    | 5       | saturated, no aromatics or sulfur; strongest antioxidant response      |
 * | Group III         | 5       | severely hydroprocessed; ≈ PAO                                        |
 * | Group II          | 4       | hydroprocessed, low aromatics and sulfur                              |
 * | Group V           | 4       | the Group V fluids of gear oils — saturated polyol esters and         |
 * |                   |         | alkylated naphthalenes — are good to excellent, better than Group I;  |
 * |                   |         | override: 1 for an unsaturated ester, lower for other chemistries     |
 * | Polymer           | 3       | small fraction, behaviour depends on chemistry: middle, override       |
 * | Group I           | 2       | aromatics and sulfur oxidise readily once natural inhibitors are used  |
 * | Additive package  | 3       | not a base fluid: excluded from the blend rating (see below)          |
 *
 * Esters carry a second risk the scale does not rate: hydrolysis. With water present (and heat, acid
 * or some additive chemistries) an ester splits back into acid and alcohol, raising acidity and
 * attacking seals and deposits control — keep water out and check the ester's hydrolytic stability
 * separately ({@link ESTER_HYDROLYSIS_CAVEAT}).
 *
 * Untreated, a Group I oil can look better than a PAO because of its natural sulfur inhibitors;
 * the scale deliberately ranks the treated (finished-oil) behaviour. Users override the default per
 * component (`Component.oxidationRating`, any number in [1, 5]) — e.g. 1 for an unsaturated ester.
 *
 * Blend rating: the mass-weighted mean over the **base fluid** (every component except additive
 * packages, fractions renormalised to sum 1). It is linear in the mass fractions, so a solver can
 * maximise it directly (with a fixed additive treat rate, maximising Σ wᵢ·rᵢ over all components
 * gives the same recipe). A mean of an ordinal scale is a convention, not a physical law: it is
 * shown to one decimal and mapped to five named classes, never presented as a measured property.
 */
import { BlendbenchInputError, assertFinite } from '../errors';
import type { Component, ComponentCategory, RecipeLine } from '../formulation/model';

/** Lowest and highest value on the oxidation-stability scale. */
export const OXIDATION_RATING_MIN = 1;
export const OXIDATION_RATING_MAX = 5;

/** Default rating per category (see the table in the module comment; common practice, no source). */
export const DEFAULT_OXIDATION_RATING: Readonly<Record<ComponentCategory, number>> = {
  'group-i': 2,
  'group-ii': 4,
  'group-iii': 5,
  'group-iv': 5,
  'group-v': 4,
  polymer: 3,
  'additive-package': 3,
};

/** The hydrolysis caveat shown wherever a Group V stock (possibly an ester) is in a blend. */
export const ESTER_HYDROLYSIS_CAVEAT =
  'Esters can hydrolyse: with water present they split into acid and alcohol, raising acidity; the oxidation ' +
  'rating does not cover this — keep the oil dry and check the ester’s hydrolytic stability.';

/** Named classes of the blend rating, lowest first. Names are Blendbench's own. */
export type OxidationClass = 'low' | 'fair' | 'moderate' | 'good' | 'high';

export const OXIDATION_CLASSES: readonly OxidationClass[] = ['low', 'fair', 'moderate', 'good', 'high'];

export const OXIDATION_CLASS_LABEL: Record<OxidationClass, string> = {
  low: 'Low stability',
  fair: 'Fair stability',
  moderate: 'Moderate stability',
  good: 'Good stability',
  high: 'High stability',
};

/** Whether a component counts toward base-fluid properties (aniline point, oxidation rating). */
export function isBaseFluid(component: Pick<Component, 'category'>): boolean {
  return component.category !== 'additive-package';
}

/**
 * Oxidation-stability rating of one component on Blendbench's ordinal 1–5 scale.
 *
 * r = component.oxidationRating if set, else DEFAULT_OXIDATION_RATING[component.category].
 *
 * @param component The component (uses `category` and the optional `oxidationRating` override).
 * @returns Rating r, dimensionless, 1 (least stable) … 5 (most stable).
 * @throws InvalidNumberError, BlendbenchInputError if the override is not a finite number in [1, 5].
 * @example oxidationRating({ category: 'group-ii', oxidationRating: null }) // → 4
 * Source: Blendbench's own scale; ordering is common practice (no source).
 */
export function oxidationRating(component: Pick<Component, 'category' | 'oxidationRating'>): number {
  const override = component.oxidationRating;
  if (override === null || override === undefined) {
    return DEFAULT_OXIDATION_RATING[component.category];
  }
  assertFinite('oxidationRating', 'oxidationRating', override);
  if (override < OXIDATION_RATING_MIN || override > OXIDATION_RATING_MAX) {
    throw new BlendbenchInputError(
      'oxidationRating',
      override,
      `oxidationRating: override must be a number from ${OXIDATION_RATING_MIN} to ${OXIDATION_RATING_MAX}, got ${String(override)}`,
    );
  }
  return override;
}

/**
 * Map a rating (component or blend mean) to its named class.
 *
 * Bands (half-way between the integer anchors): < 1.5 low, < 2.5 fair, < 3.5 moderate,
 * < 4.5 good, ≥ 4.5 high.
 *
 * @param rating Rating r on the 1–5 scale.
 * @returns The class name.
 * @example oxidationClass(4.2) // → 'good'
 */
export function oxidationClass(rating: number): OxidationClass {
  assertFinite('oxidationClass', 'rating', rating);
  if (rating < 1.5) return 'low';
  if (rating < 2.5) return 'fair';
  if (rating < 3.5) return 'moderate';
  if (rating < 4.5) return 'good';
  return 'high';
}

/** One component's share of the blend rating. */
export interface OxidationContribution {
  componentId: string;
  /** Mass fraction within the base fluid (renormalised without additive packages), 0–1. */
  baseFluidFraction: number;
  /** The component's rating. */
  rating: number;
  /** baseFluidFraction × rating: its term in the weighted mean. */
  contribution: number;
}

export interface BlendOxidation {
  /** Mass-weighted mean rating over the base fluid, 1–5. */
  rating: number;
  oxidationClass: OxidationClass;
  /** Terms of the mean, one per base-fluid component with a positive fraction, in recipe order. */
  contributions: OxidationContribution[];
}

/**
 * Oxidation-stability rating of a blend: mass-weighted mean over the base fluid.
 *
 * r_blend = Σ wᵢ·rᵢ / Σ wᵢ, over components that are not additive packages (wᵢ mass fractions).
 *
 * @param components Library (at least every component named by `lines`).
 * @param lines Recipe lines with mass fractions (0–1).
 * @returns Blend rating (1–5), its class and the per-component terms.
 * @throws BlendbenchInputError (or InvalidNumberError) if a line names an unknown component, a fraction is negative or not finite,
 *   or the base fluid has zero mass.
 * @example blendOxidationRating(lib, [{componentId:'g1', massFraction:0.5},{componentId:'pao', massFraction:0.5}])
 *   // Group I (2) + PAO (5) 50/50 → rating 3.5, class 'good'
 */
export function blendOxidationRating(
  components: readonly Pick<Component, 'id' | 'category' | 'oxidationRating'>[],
  lines: readonly RecipeLine[],
): BlendOxidation {
  const byId = new Map(components.map((c) => [c.id, c]));
  let baseMass = 0;
  const terms: { id: string; w: number; r: number }[] = [];
  for (const line of lines) {
    const c = byId.get(line.componentId);
    if (!c) {
      throw new BlendbenchInputError(
        'componentId',
        line.componentId,
        `blendOxidationRating: componentId = "${line.componentId}" is not in the component library`,
      );
    }
    assertFinite('blendOxidationRating', `massFraction[${line.componentId}]`, line.massFraction);
    if (line.massFraction < 0) {
      throw new BlendbenchInputError(
        `massFraction[${line.componentId}]`,
        line.massFraction,
        `blendOxidationRating: massFraction of "${line.componentId}" = ${line.massFraction}; it must be ≥ 0`,
      );
    }
    if (!isBaseFluid(c) || line.massFraction === 0) continue;
    baseMass += line.massFraction;
    terms.push({ id: c.id, w: line.massFraction, r: oxidationRating(c) });
  }
  if (!(baseMass > 0)) {
    throw new BlendbenchInputError('lines', lines, 'blendOxidationRating: the blend has no base fluid (only additive packages)');
  }
  let rating = 0;
  const contributions = terms.map((t) => {
    const f = t.w / baseMass;
    rating += f * t.r;
    return { componentId: t.id, baseFluidFraction: f, rating: t.r, contribution: f * t.r };
  });
  return { rating, oxidationClass: oxidationClass(rating), contributions };
}
