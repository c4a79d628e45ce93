/**
 * Cost–solvency trade-off: the Pareto frontier of a set of candidate blends, and the ε-constraint
 * sweep that traces the frontier of one chosen combination of components.
 *
 * Both objectives are minimised: cost per litre, and the blend aniline point (lower = more
 * solvent). A point is *dominated* when another is no costlier AND no less solvent, and strictly
 * better in one of the two; the frontier is the set of points no other point dominates.
 *
 * ε-constraint method (Haimes, Lasdon & Wismer 1971, "On a bicriterion formulation of the problems
 * of integrated system identification and system optimization", IEEE Trans. SMC 1(3)): minimise
 * cost subject to aniline point ≤ ε, for ε stepped from the aniline point of the least-cost blend
 * down to the lowest aniline point the combination can reach. Each step is one solve of the same
 * linear-fractional problem with a tighter aniline row, so each point is exactly optimal for its ε.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError } from '../errors';
import type { BlendTargets, Component, RecipeLine } from '../formulation/model';
import { prepareComponents, solvePrepared } from '../solver/solve-blend';

/**
 * The non-dominated subset of `items` for two minimised criteria, in ascending order of the first
 * (ties of the first broken by the second, then by input order).
 *
 * Sweep: sort by (x, y); keep an item when its y is strictly below every kept y so far. Items with
 * a non-finite x or y are left out. Of several items at the same point, the first is kept.
 *
 * @param items Anything.
 * @param x First criterion (e.g. cost per litre), minimised.
 * @param y Second criterion (e.g. aniline point [°C]), minimised.
 * @returns The frontier, x ascending (y then strictly descending).
 * @example paretoFrontier([{c:1,a:130},{c:2,a:120},{c:2.5,a:125}], p=>p.c, p=>p.a) // → first two
 */
export function paretoFrontier<T>(items: readonly T[], x: (t: T) => number, y: (t: T) => number): T[] {
  const idx = items
    .map((t, i) => ({ t, i, x: x(t), y: y(t) }))
    .filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y))
    .sort((a, b) => a.x - b.x || a.y - b.y || a.i - b.i);
  const out: T[] = [];
  let bestY = Number.POSITIVE_INFINITY;
  for (const p of idx) {
    if (p.y < bestY) {
      out.push(p.t);
      bestY = p.y;
    }
  }
  return out;
}

/** One point of an ε-constraint sweep. */
export interface FrontierPoint {
  /** The aniline-point limit ε of this step [°C]. */
  anilineLimit: number;
  /** The recipe (used components, library order). */
  lines: RecipeLine[];
  /** Cost per litre (currency of the library). */
  costPerLitre: number;
  /** Blend aniline point [°C] (volume basis over parts that have one). */
  anilinePoint: number;
  kv40: number;
  kv100: number;
  /** Unrounded VI; null where ν100 < 2.0 mm²/s. */
  vi: number | null;
}

export interface FrontierSweepInput {
  components: readonly Component[];
  /** Targets of the search; objective is ignored (cost is minimised), maxAnilinePoint caps ε. */
  targets: BlendTargets;
  /** The chosen combination: component ids (the fixed additive is added automatically). */
  componentIds: readonly string[];
  method?: BlendMethod;
  /** Number of ε steps including both ends (default 11, at least 2). */
  steps?: number;
}

/**
 * ε-constraint sweep: the cost–aniline frontier of one combination of components.
 *
 * min cost per litre  s.t. every target, and aniline point ≤ εⱼ,
 * εⱼ = AP_cost − j·(AP_cost − AP_min)/(steps − 1), j = 0 … steps − 1,
 * where AP_cost is the aniline point of the least-cost blend and AP_min the lowest reachable.
 *
 * @param input Library, targets, the combination's component ids, mixing rule, number of steps.
 * @returns The non-dominated points, cost ascending (aniline point descending); empty when the
 *   combination cannot meet the targets at all; one point when cost and solvency do not conflict.
 * @throws BlendbenchInputError for unknown ids, steps < 2, or the errors of `prepareComponents`.
 * @example epsilonConstraintSweep({ components: lib, targets, componentIds: ['g2hv', 'g2heavy', 'an12'] })
 *   // → [{ anilineLimit: 126.1, costPerLitre: 1.52, anilinePoint: 126.1, … }, …, { anilinePoint: 117.3, … }]
 */
export function epsilonConstraintSweep(input: FrontierSweepInput): FrontierPoint[] {
  const fn = 'epsilonConstraintSweep';
  const steps = input.steps ?? 11;
  if (!Number.isInteger(steps) || steps < 2) {
    throw new BlendbenchInputError('steps', steps, `${fn}: steps = ${String(steps)}; it must be a whole number of at least 2`);
  }
  const method = input.method ?? 'refutas';
  const { components, targets } = input;
  const subset = input.componentIds.map((id) => {
    const i = components.findIndex((c) => c.id === id);
    if (i < 0) throw new BlendbenchInputError('componentIds', id, `${fn}: component "${id}" is not in the library`);
    return i;
  });

  const solve = (t: BlendTargets) => {
    const P = prepareComponents(components, t, method);
    return solvePrepared(P, subset);
  };
  const cheapest = solve({ ...targets, objective: 'cost' });
  if (cheapest.status !== 'optimal' || cheapest.anilinePoint === null) return [];
  const mostSolvent = solve({ ...targets, objective: 'solvency' });
  if (mostSolvent.status !== 'optimal' || mostSolvent.anilinePoint === null) return [];
  const hi = cheapest.anilinePoint;
  const lo = mostSolvent.anilinePoint;

  const toPoint = (eps: number, r: typeof cheapest & { status: 'optimal' }): FrontierPoint => {
    const lines: RecipeLine[] = [];
    components.forEach((c, i) => {
      const w = r.massFractions[i]!;
      if (w > 0) lines.push({ componentId: c.id, massFraction: w });
    });
    return {
      anilineLimit: eps,
      lines,
      costPerLitre: r.costPerLitre,
      anilinePoint: r.anilinePoint!,
      kv40: r.kv40,
      kv100: r.kv100,
      vi: r.vi,
    };
  };

  const points: FrontierPoint[] = [toPoint(hi, cheapest)];
  if (hi - lo > 1e-6) {
    for (let j = 1; j < steps; j++) {
      const last = j === steps - 1;
      // The last step is the least-cost blend at the lowest aniline point (tiny slack for round-off).
      const eps = last ? lo + 1e-7 : hi - (j * (hi - lo)) / (steps - 1);
      const r = solve({ ...targets, objective: 'cost', maxAnilinePoint: Math.min(eps, targets.maxAnilinePoint ?? eps) });
      if (r.status === 'optimal' && r.anilinePoint !== null) points.push(toPoint(eps, r));
    }
  }
  return paretoFrontier(
    points,
    (p) => p.costPerLitre,
    (p) => p.anilinePoint,
  );
}
