/**
 * Robust recipes beyond a single solve: the nominal recipe beside the robust one (the premium the
 * probability costs), and, when no recipe reaches the probability asked for, the highest probability
 * the stocks can reach under the other constraints — the reason given to the user.
 */
import { solvePrepared, type EngineResult, type PreparedProblem } from '../solver/engine';
import { displayWords, type NumberDisplay } from '../words/display';

/** The prepared problem with another minimum probability in band (the caches are shared). */
export function withInBandProbability<T extends PreparedProblem>(P: T, p: number | null): T {
  return { ...P, targets: { ...P.targets, minInBandProbability: p } };
}

/**
 * Highest probability in band any recipe of the problem reaches under its other constraints, by
 * bisection on p (each step one robust solve; the sets {P ≥ p} are nested, so feasibility is
 * monotone in p), to `resolution`.
 *
 * @param P - the prepared problem (its own minimum probability is ignored)
 * @param subset - indices that may be used (as for `solvePrepared`); null → all usable
 * @param resolution - width of the final bracket (default 0.001 = 0.1 %)
 * @returns the probability reached (0 when not even the nominal problem is feasible)
 */
export function highestInBandProbability(P: PreparedProblem, subset: readonly number[] | null = null, resolution = 1e-3): number {
  const nominal = solvePrepared(withInBandProbability(P, null), subset);
  if (nominal.status !== 'optimal') return 0;
  let lo = nominal.inBandProbability ?? 1;
  if (lo >= 1) return 1;
  let hi = 1 - 1e-12;
  while (hi - lo > resolution) {
    const mid = (lo + hi) / 2;
    const r = solvePrepared(withInBandProbability(P, mid), subset);
    if (r.status === 'optimal') lo = Math.max(mid, r.inBandProbability ?? mid);
    else hi = mid;
  }
  return lo;
}

/** Robust and nominal answers of one problem. */
export interface RobustAnswer {
  robust: EngineResult;
  /** The recipe without the probability condition (null when the problem has none). */
  nominal: EngineResult | null;
}

/**
 * Solve with and without the minimum probability in band, so the premium can be stated
 * ("+0.030 €/L buys 99 % instead of 50 %"). The robust solve carries its certificate (`lowerBound`).
 *
 * @param P - the prepared problem
 * @param subset - as for `solvePrepared`
 * @returns both answers
 */
export function solveRobustAndNominal(P: PreparedProblem, subset: readonly number[] | null = null): RobustAnswer {
  const p = P.targets.minInBandProbability ?? null;
  const robust = solvePrepared(P, subset, { certify: true });
  if (p === null || p <= 0) return { robust, nominal: null };
  return { robust, nominal: solvePrepared(P, subset, { nominal: true }) };
}

/**
 * The reason for a problem that is feasible without its minimum probability in band but not with it.
 *
 * @param P - the prepared problem
 * @param band - the band's ends [mm²/s], for the message
 * @returns the sentence, e.g. "No recipe lands in 304–336 mm²/s with 99.0 % probability: the most
 *   robust recipe of these stocks reaches 97.3 %. Widen the band, …"
 */
export function inBandInfeasibleReason(
  P: PreparedProblem,
  band: { min: number; max: number },
  subset: readonly number[] | null = null,
  display?: NumberDisplay,
): string {
  const p = P.targets.minInBandProbability ?? 0;
  const best = highestInBandProbability(P, subset);
  const w = displayWords(display);
  const pct = (x: number): string => w.pct(Math.floor(x * 1000) / 1000); // rounded down: never overstated
  return (
    `No recipe lands in ${w.kv(band.min)}–${w.kv(band.max)} mm²/s with ${w.say(p * 100)} % probability under the stocks' lot spread: ` +
    `the most robust recipe of these stocks reaches ${pct(best)}. Widen the band, lower the probability asked for, ` +
    'or use stocks with a tighter lot-to-lot spread of ν40 (measured lot records rather than the defaults).'
  );
}
