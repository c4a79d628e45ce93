/**
 * Aniline point of a blend — a volume-weighted approximation.
 *
 * The aniline point (ASTM D611) is the lowest temperature at which equal volumes of aniline and the
 * oil are miscible; a lower value means a more aromatic, better-solvating oil. Blendbench estimates
 * a blend's aniline point as the volume-weighted mean of its components':
 *
 *   AP_blend ≈ Σ φᵢ·APᵢ / Σ φᵢ   (sums over the parts that have an aniline point)
 *
 * This is an approximation (common practice, no source): hydrocarbon base stocks blend close to it,
 * but polar Group V fluids (esters, and to a lesser degree alkylated aromatics) are strongly
 * non-ideal with aniline and can pull the real blend value well away from the weighted mean. The
 * additive package has no meaningful aniline point; its share is left out and the rest renormalised,
 * and the result is then labelled as taken over the base fluid. Confirm by laboratory test.
 */
import { BlendbenchInputError, assertFinite, assertFractions } from '../errors';

/**
 * Aniline point of a blend, volume-weighted over the parts that have one.
 *
 * @param parts - `volumeFraction` φᵢ [0–1, sum 1 within 1e-9] and `anilinePoint` APᵢ [°C] of each part,
 *   null where not meaningful (additive package)
 * @returns `value`, the estimated aniline point [°C]; `basis` 'all' when every part with a non-zero
 *   fraction contributed, 'base-fluid' when some were left out and the rest renormalised
 * @throws InvalidNumberError, FractionSumError; BlendbenchInputError when no part with a non-zero
 *   fraction has an aniline point
 * @example blendAnilinePoint([{ volumeFraction: 0.5, anilinePoint: 100 }, { volumeFraction: 0.5, anilinePoint: 120 }]) // → { value: 110, basis: 'all' }
 * @see ASTM D611 (the test method); the mixing rule is common practice (no source), an approximation.
 */
export function blendAnilinePoint(
  parts: readonly { volumeFraction: number; anilinePoint: number | null }[],
): { value: number; basis: 'all' | 'base-fluid' } {
  const fn = 'blendAnilinePoint';
  assertFractions(
    fn,
    'volumeFraction',
    parts.map((p) => p.volumeFraction),
  );
  let sumPhi = 0;
  let sumPhiAp = 0;
  let leftOut = false;
  parts.forEach((p, i) => {
    if (p.anilinePoint === null) {
      if (p.volumeFraction > 0) leftOut = true;
      return;
    }
    assertFinite(fn, `parts[${i}].anilinePoint`, p.anilinePoint);
    sumPhi += p.volumeFraction;
    sumPhiAp += p.volumeFraction * p.anilinePoint;
  });
  if (sumPhi <= 0) {
    throw new BlendbenchInputError(
      'anilinePoint',
      null,
      `${fn}: no part with a non-zero volumeFraction has an anilinePoint; the blend's aniline point cannot be estimated`,
    );
  }
  return { value: sumPhiAp / sumPhi, basis: leftOut ? 'base-fluid' : 'all' };
}
