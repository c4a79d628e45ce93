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

import { assertFinite } from './errors';

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
