/**
 * Solvency band — Blendbench's own scale, from the blend's aniline point (ASTM D611).
 *
 * The aniline point is the lowest temperature at which equal volumes of aniline and the oil are
 * miscible: the lower it is, the more aromatic/polar the oil and the better it dissolves additives
 * and polar oxidation products. Blends are taken by **volume** over the **base fluid** (additive
 * packages excluded, volume fractions renormalised), a first approximation that is non-ideal for
 * polar Group V fluids (esters, alkylated naphthalene): the result is approximate.
 *
 * Bands (common practice, no source; anchored on the generic typicals of
 * base-stock-typicals.md, all from memory): solvent-neutral Group I gear oils sit around
 * 112–120 °C, Group II/III blends around 120–130 °C, PAO-rich blends above 130 °C, and blends with a
 * solvency booster (alkylated naphthalene, ester, alkylbenzene) below 112 °C.
 *
 * | Band      | Score | Blend aniline point AP [°C] | Typical of                                   |
 * |-----------|-------|-----------------------------|----------------------------------------------|
 * | strong    | 5     | AP < 100                    | booster-rich or aromatic blends              |
 * | good      | 4     | 100 ≤ AP < 112              | light Group I, or a blend with a booster     |
 * | moderate  | 3     | 112 ≤ AP < 120              | traditional Group I gear oils                |
 * | limited   | 2     | 120 ≤ AP < 130              | Group II / III blends                        |
 * | poor      | 1     | AP ≥ 130                    | PAO-rich blends                              |
 *
 * The score is ordinal (higher = more solvent) and shown as a named band; the aniline point itself
 * is the number to compare. Never a measured property.
 */

import { blendAnilinePoint } from '../blending/aniline';
import { massToVolumeFractions } from '../blending/density';
import { BlendbenchInputError, assertFinite } from '../errors';
import type { Component, RecipeLine } from '../formulation/model';

/** Named solvency bands, least solvent first. Names are Blendbench's own. */
export type SolvencyBand = 'poor' | 'limited' | 'moderate' | 'good' | 'strong';

export const SOLVENCY_BANDS: readonly SolvencyBand[] = ['poor', 'limited', 'moderate', 'good', 'strong'];

export const SOLVENCY_BAND_LABEL: Record<SolvencyBand, string> = {
  poor: 'Poor solvency',
  limited: 'Limited solvency',
  moderate: 'Moderate solvency',
  good: 'Good solvency',
  strong: 'Strong solvency',
};

/**
 * Lower edges of the bands above 'poor'... expressed as upper limits: a blend whose aniline point is
 * below `maxAnilinePoint` belongs to `band` (first match wins). Common practice (no source).
 */
export const SOLVENCY_THRESHOLDS: readonly { band: SolvencyBand; score: number; belowAnilinePoint: number }[] = [
  { band: 'strong', score: 5, belowAnilinePoint: 100 },
  { band: 'good', score: 4, belowAnilinePoint: 112 },
  { band: 'moderate', score: 3, belowAnilinePoint: 120 },
  { band: 'limited', score: 2, belowAnilinePoint: 130 },
];

export interface SolvencyScore {
  /** The blend (or component) aniline point the score was taken from [°C]. */
  anilinePoint: number;
  band: SolvencyBand;
  /** Ordinal score 1 (poor) … 5 (strong), higher = more solvent. */
  score: number;
  /** Always true: the band is an estimate from a volume-blended aniline point. */
  approximate: true;
}

/**
 * Solvency band and score from an aniline point.
 *
 * score = 5 if AP < 100; 4 if AP < 112; 3 if AP < 120; 2 if AP < 130; else 1 (AP in °C).
 *
 * @param anilinePoint AP, aniline point (ASTM D611) of the blend's base fluid [°C]; any finite value.
 * @returns Band, ordinal score (1–5) and the aniline point, flagged approximate.
 * @throws InvalidNumberError if `anilinePoint` is not finite.
 * @example solvencyScore(118) // → { band: 'moderate', score: 3, anilinePoint: 118, approximate: true }
 * Source: Blendbench's own scale; thresholds are common practice (no source).
 */
export function solvencyScore(anilinePoint: number): SolvencyScore {
  assertFinite('solvencyScore', 'anilinePoint', anilinePoint);
  for (const t of SOLVENCY_THRESHOLDS) {
    if (anilinePoint < t.belowAnilinePoint) {
      return { anilinePoint, band: t.band, score: t.score, approximate: true };
    }
  }
  return { anilinePoint, band: 'poor', score: 1, approximate: true };
}

/** One component's part in the blend aniline point. */
export interface SolvencyContribution {
  componentId: string;
  /** Volume fraction within the parts that carry an aniline point (renormalised), 0–1. */
  volumeFraction: number;
  /** The component's aniline point [°C]. */
  anilinePoint: number;
  /**
   * How far the component pulls the blend aniline point up (> 0, less solvent) or down (< 0):
   * φᵢ·(APᵢ − AP_blend) [°C]. The pulls sum to zero.
   */
  pull: number;
}

export interface BlendSolvency extends SolvencyScore {
  /** 'base-fluid' when parts without an aniline point (the additive package) were left out. */
  basis: 'all' | 'base-fluid';
  /** One entry per part with a positive fraction and an aniline point, in recipe order. */
  contributions: SolvencyContribution[];
}

/**
 * Blend aniline point (by volume, over the parts that have one) with its solvency band and each
 * component's pull on it.
 *
 * φᵢ = (wᵢ/ρᵢ)/Σⱼ(wⱼ/ρⱼ);  AP_blend = Σ φᵢ·APᵢ / Σ φᵢ over parts with an aniline point;
 * pullᵢ = φᵢ′·(APᵢ − AP_blend) with φᵢ′ renormalised over those parts.
 *
 * @param components Library holding every component named by `lines` (uses density15, anilinePoint).
 * @param lines Mass fractions wᵢ (0–1, summing to 1).
 * @returns Aniline point [°C], basis, band/score (approximate) and contributions.
 * @throws BlendbenchInputError for an unknown component, FractionSumError, ImplausibleDensityError,
 *   or when no part with a positive fraction has an aniline point.
 * @example blendSolvency(lib, [{componentId:'g2heavy', massFraction:0.98},{componentId:'add', massFraction:0.02}])
 *   // → anilinePoint 121, band 'limited', basis 'base-fluid'
 * Source: volume blending of the aniline point is common practice (no source), approximate for
 *   polar Group V fluids; ASTM D611 defines the aniline point.
 */
export function blendSolvency(
  components: readonly Pick<Component, 'id' | 'density15' | 'anilinePoint'>[],
  lines: readonly RecipeLine[],
): BlendSolvency {
  const byId = new Map(components.map((c) => [c.id, c]));
  const parts = lines.map((l) => {
    const c = byId.get(l.componentId);
    if (!c) {
      throw new BlendbenchInputError(
        'componentId',
        l.componentId,
        `blendSolvency: componentId = "${l.componentId}" is not in the component library`,
      );
    }
    return { c, massFraction: l.massFraction, density15: c.density15 };
  });
  const phi = massToVolumeFractions(parts);
  const ap = blendAnilinePoint(parts.map((p, i) => ({ volumeFraction: phi[i]!, anilinePoint: p.c.anilinePoint })));
  let sumPhi = 0;
  parts.forEach((p, i) => {
    if (p.c.anilinePoint !== null && phi[i]! > 0) sumPhi += phi[i]!;
  });
  const contributions: SolvencyContribution[] = [];
  parts.forEach((p, i) => {
    const a = p.c.anilinePoint;
    if (a === null || !(phi[i]! > 0)) return;
    const f = phi[i]! / sumPhi;
    contributions.push({ componentId: p.c.id, volumeFraction: f, anilinePoint: a, pull: f * (a - ap.value) });
  });
  return { ...solvencyScore(ap.value), basis: ap.basis, contributions };
}
