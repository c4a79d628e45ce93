/**
 * The plain probability API — plain numbers in, a number out — for Node scripting and outside checks:
 * the probability that a recipe of a `solveBlendPlain` problem lands in that problem's band.
 */
import { BlendbenchInputError, FractionSumError, assertFinite, assertViscosity } from '../errors';
import type { PlainProblem } from '../solver/plain';
import { blendCoordinates } from '../solver/coordinates';
import { assertRelSd, probabilityInInterval } from './lot-spread';

const REFUTAS = blendCoordinates('refutas');

/**
 * Probability that a batch of a recipe lands in the problem's ν40 band, targetKv40 × (1 ± tolerancePct/100),
 * under the lot spread of its components (the model of `lot-spread.ts`, Refutas on mass fractions):
 *
 *   μ = Σ wᵢ·VBNᵢ,  σ = √Σ (wᵢ·VBN′(ν40ᵢ)·ν40ᵢ·sᵢ)²,  P = Φ((b − μ)/σ) − Φ((a − μ)/σ)
 *
 * with a, b the blending numbers of the band ends and sᵢ = `kv40RelSd` (absent → 0). With no spread
 * at all the answer is 1 inside the band and 0 outside.
 *
 * @param p - the plain problem (only `components[].id`, `kv40`, `kv40RelSd`, `targetKv40` and
 *   `tolerancePct` are used)
 * @param massFractions - mass fraction per component id (absent ids count as 0), summing to 1 within 1e-6
 * @returns the probability, 0–1
 * @throws InvalidNumberError, NonPositiveViscosityError, FractionSumError, BlendbenchInputError (an id
 *   not in the problem, a spread outside 0–0.25, a tolerance outside 0–100 %)
 * @example inBandProbabilityPlain(p, { light: 0.2462, heavy: 0.7538 }) // → 0.990 (the README's example problem)
 */
export function inBandProbabilityPlain(p: PlainProblem, massFractions: Record<string, number>): number {
  const fn = 'inBandProbabilityPlain';
  if (!p || !Array.isArray(p.components) || p.components.length === 0) {
    throw new BlendbenchInputError('components', p?.components, `${fn}: components must be a non-empty array`);
  }
  if (!massFractions || typeof massFractions !== 'object') {
    throw new BlendbenchInputError('massFractions', massFractions, `${fn}: massFractions must be an object of fractions by component id`);
  }
  assertViscosity(fn, 'targetKv40', p.targetKv40);
  assertFinite(fn, 'tolerancePct', p.tolerancePct);
  if (p.tolerancePct < 0 || p.tolerancePct >= 100) {
    throw new BlendbenchInputError('tolerancePct', p.tolerancePct, `${fn}: tolerancePct = ${p.tolerancePct}; it must be from 0 to below 100 (per cent)`);
  }
  let known = 0;
  let sum = 0;
  let sx = 0;
  let sg = 0;
  for (let i = 0; i < p.components.length; i++) {
    const c = p.components[i]!;
    const w = massFractions[c.id];
    if (w === undefined) continue;
    known++;
    if (!(typeof w === 'number' && w >= 0 && w <= 1)) {
      assertFinite(fn, `massFractions.${c.id}`, w);
      throw new FractionSumError(`massFractions.${c.id}`, w, `${fn}: massFractions.${c.id} = ${w}; a fraction must lie between 0 and 1`);
    }
    sum += w;
    if (w === 0) continue;
    const kv = c.kv40;
    if (!(typeof kv === 'number' && kv > 0.2 && kv < Number.POSITIVE_INFINITY)) assertViscosity(fn, `components[${i}].kv40`, kv);
    const s = c.kv40RelSd ?? 0;
    if (!(typeof s === 'number' && s >= 0 && s <= 0.25)) assertRelSd(fn, `components[${i}].kv40RelSd`, s);
    const x = REFUTAS.toXRaw(kv);
    sx += w * x;
    if (s > 0) {
      // VBN′(ν)·ν·s (the same expression as the solver's coordinates).
      const g = REFUTAS.perPct(kv) * 100 * s * w;
      sg += g * g;
    }
  }
  if (known !== Object.keys(massFractions).length) {
    const ids = new Set(p.components.map((c) => c.id));
    const stray = Object.keys(massFractions).find((k) => !ids.has(k))!;
    throw new BlendbenchInputError(`massFractions.${stray}`, massFractions[stray], `${fn}: massFractions names "${stray}", which is not a component of the problem`);
  }
  if (Math.abs(sum - 1) > 1e-6) {
    throw new FractionSumError('massFractions', sum, `${fn}: the mass fractions add up to ${sum}, not 1`);
  }
  // Refutas is defined above 0.2 mm²/s; a band reaching below that is open at its lower end.
  const lo = p.targetKv40 * (1 - p.tolerancePct / 100);
  const a = lo > 0.2 ? REFUTAS.toXRaw(lo) : Number.NEGATIVE_INFINITY;
  const b = REFUTAS.toXRaw(p.targetKv40 * (1 + p.tolerancePct / 100));
  return probabilityInInterval(sx / sum, Math.sqrt(sg) / sum, a, b);
}
