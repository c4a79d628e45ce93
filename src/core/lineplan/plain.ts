/**
 * The plain line-plan API — plain numbers in, plain numbers out — for Node scripting and outside
 * checks (issue 11, item 5). Same conventions per grade as `solveBlendPlain`:
 *
 * - blend viscosities by Refutas (mass fractions) at 40 and 100 °C; VI by ASTM D2270, unrounded;
 * - aniline point by volume over EVERY given component; density by ideal mixing;
 * - the ν40 band of a grade is targetKv40 × (1 ± tolerancePct/100), NOT clipped to an ISO band;
 * - components' mass-fraction bounds apply in every grade (min = max fixes a share in every grade).
 *
 * Objective: least total cost Σ_g demandKg_g × Σ_i w_gi × pricePerKg_i. `supplyKg` caps
 * Σ_g demandKg_g × w_gi; `maxStocks` caps the number of component ids with a mass fraction above
 * 1e-6 in any grade. Exact: LP optimum, VI floors by branch and bound (VI ≥ minVi − 0.005 when
 * recomputed), tank limit by branch and bound on the choice of stocks (see `joint.ts`).
 */
import { BlendbenchInputError, assertFinite, inField } from '../errors';
import { preparePlain, plainBlendProperties, type PlainBlend, type PlainComponent } from '../solver/plain';
import type { PreparedProblem } from '../solver/prepared';
import { solveJoint, IN_USE_FRACTION, type JointProblem } from './joint';
import { diagnoseLinePlan } from './diagnose';
import { inBandProbabilityPlain } from '../qc/probability-plain';

/** A component of a plain line plan: as in `solveBlendPlain`, with an optional supply over the period. */
export type PlainLineComponent = PlainComponent & {
  /** Supply over the planning period [kg]; absent → not limited. */
  supplyKg?: number;
};

/** One grade of a plain line plan. */
export interface PlainLineGrade {
  /** Unique, non-empty. */
  id: string;
  /** Target ν40 [mm²/s]. */
  targetKv40: number;
  /** Half-width of the band [% of the target], 0 to below 100. */
  tolerancePct: number;
  /** Demand over the planning period [kg], above 0. */
  demandKg: number;
  /** Minimum VI (unrounded). */
  minVi?: number;
  /** Maximum blend aniline point [°C]. */
  maxAnilinePoint?: number;
  /**
   * Least probability (0 to below 1) that a batch lands in the band under the components'
   * `kv40RelSd` (as `solveBlendPlain`'s `minInBandProbability`); met exactly by the plan.
   */
  minInBandProbability?: number;
}

export interface PlainLineProblem {
  components: PlainLineComponent[];
  grades: PlainLineGrade[];
  /** Largest number of distinct component ids in use across the line (a whole number ≥ 1). */
  maxStocks?: number;
}

/**
 * One grade of a plain line plan's answer: its id and its blend, recomputed by the core (as
 * `solveBlendPlain`'s); with `inBandProbability` when any component has a `kv40RelSd`.
 */
export type PlainLineGradeResult = { id: string; inBandProbability?: number } & PlainBlend;

export type PlainLineResult =
  | {
      status: 'optimal';
      /** Σ_g demandKg_g × cost per kg of grade g, in the prices' currency. */
      totalCost: number;
      grades: PlainLineGradeResult[];
      /** Kilograms of every component id used over the period, zeros included. */
      stockUseKg: Record<string, number>;
      /** Ids with a mass fraction above 1e-6 in some grade, in the order given. */
      stocksUsed: string[];
    }
  | { status: 'infeasible'; reason: string };

const FN = 'planLinePlain';

/** Re-raise a grade-level error of `preparePlain` with `grades[g].` in front of its field. */
function inGrade<T>(g: number, f: () => T): T {
  return inField(`grades[${g}].`, f, { keep: (field) => field.startsWith('components') });
}

/**
 * Validate a plain line plan and build the engine's problem (one prepared problem per grade).
 *
 * @throws the core's named errors (BlendbenchInputError and subclasses), each naming its field
 */
export function preparePlainLine(p: PlainLineProblem): JointProblem {
  if (!p || !Array.isArray(p.grades) || p.grades.length === 0) {
    throw new BlendbenchInputError('grades', p?.grades, `${FN}: grades must be a non-empty array`);
  }
  const ids = new Set<string>();
  const grades: PreparedProblem[] = [];
  const demandKg: number[] = [];
  p.grades.forEach((g, k) => {
    if (!g || typeof g.id !== 'string' || g.id === '') {
      throw new BlendbenchInputError(`grades[${k}].id`, g?.id, `${FN}: grades[${k}].id must be a non-empty string`);
    }
    if (ids.has(g.id)) throw new BlendbenchInputError(`grades[${k}].id`, g.id, `${FN}: grade id "${g.id}" appears twice`);
    ids.add(g.id);
    assertFinite(FN, `grades[${k}].demandKg`, g.demandKg);
    if (!(g.demandKg > 0)) {
      throw new BlendbenchInputError(
        `grades[${k}].demandKg`,
        g.demandKg,
        `${FN}: grades[${k}].demandKg = ${g.demandKg}; a demand must be above 0 kg (leave a grade without demand out of the plan)`,
      );
    }
    demandKg.push(g.demandKg);
    const problem = {
      components: p.components,
      targetKv40: g.targetKv40,
      tolerancePct: g.tolerancePct,
      objective: 'cost' as const,
      ...(g.minVi === undefined ? {} : { minVi: g.minVi }),
      ...(g.maxAnilinePoint === undefined ? {} : { maxAnilinePoint: g.maxAnilinePoint }),
      ...(g.minInBandProbability === undefined ? {} : { minInBandProbability: g.minInBandProbability }),
    };
    grades.push(inGrade(k, () => preparePlain(problem, FN)));
  });
  const supplyKg = p.components.map((c, i) => {
    if (c.supplyKg === undefined) return Number.POSITIVE_INFINITY;
    assertFinite(FN, `components[${i}].supplyKg`, c.supplyKg);
    if (c.supplyKg < 0) {
      throw new BlendbenchInputError(`components[${i}].supplyKg`, c.supplyKg, `${FN}: components[${i}].supplyKg = ${c.supplyKg}; a supply cannot be negative`);
    }
    return c.supplyKg;
  });
  let maxStocks: number | null = null;
  if (p.maxStocks !== undefined) {
    assertFinite(FN, 'maxStocks', p.maxStocks);
    if (!Number.isInteger(p.maxStocks) || p.maxStocks < 1) {
      throw new BlendbenchInputError('maxStocks', p.maxStocks, `${FN}: maxStocks = ${p.maxStocks}; it must be a whole number of stocks, at least 1`);
    }
    maxStocks = p.maxStocks;
  }
  return {
    grades,
    demandKg,
    supplyKg,
    minUseKg: p.components.map(() => 0),
    maxStocks,
    keep: p.components.map(() => false),
  };
}

/**
 * Plan a whole line in plain numbers: the least total cost over the period for every grade at
 * once, sharing the supply of limited components, with an optional limit on the number of
 * distinct components in use across the line.
 *
 * @param p - the plan ({@link PlainLineProblem}): components (as `solveBlendPlain`, plus `supplyKg`
 *   [kg]), grades (target ν40 [mm²/s], tolerance [%], demand [kg], optional minimum VI, maximum
 *   aniline point [°C] and least probability in band) and an optional `maxStocks`
 * @returns `{ status: 'optimal', totalCost, grades, stockUseKg, stocksUsed }`, each grade's
 *   properties recomputed by the core, or `{ status: 'infeasible', reason }` naming the grade that
 *   cannot be made, the supply that is short (in tonnes) or the least number of stocks needed
 * @throws the core's named errors (BlendbenchInputError and subclasses) for impossible input
 * @example
 * planLinePlain({
 *   components: [
 *     { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 },
 *     { id: 'heavy', kv40: 460, kv100: 31, density15: 0.90, anilinePoint: 125, pricePerKg: 1.5, supplyKg: 50_000 },
 *     { id: 'hvi', kv40: 400, kv100: 40, density15: 0.85, anilinePoint: 145, pricePerKg: 3.0 },
 *   ],
 *   grades: [
 *     { id: 'VG 220', targetKv40: 220, tolerancePct: 5, demandKg: 100_000 },
 *     { id: 'VG 320', targetKv40: 320, tolerancePct: 5, demandKg: 40_000 },
 *   ],
 * }) // → { status: 'optimal', totalCost: …, stockUseKg: { heavy: 50000, … }, … }
 */
export function planLinePlain(p: PlainLineProblem): PlainLineResult {
  const J = preparePlainLine(p);
  const r = solveJoint(J);
  if (r.status !== 'optimal') {
    if (r.status === 'limit') {
      return { status: 'infeasible', reason: `The plan search stopped after ${r.lpCount} LPs without an answer; simplify the plan.` };
    }
    const d = diagnoseLinePlan(J, {
      grades: p.grades.map((g) => ({ product: `Grade "${g.id}"` })),
      stocks: p.components.map((c) => c.id),
    });
    return { status: 'infeasible', reason: d.reason };
  }
  const comps = p.components;
  const stockUseKg: Record<string, number> = {};
  for (const c of comps) stockUseKg[c.id] = 0;
  let totalCost = 0;
  const spread = comps.some((c) => c.kv40RelSd !== undefined);
  const grades = p.grades.map((g, k) => {
    const w = r.fractions[k]!;
    const props = plainBlendProperties(comps, w);
    let costPerKg = 0;
    comps.forEach((c, i) => {
      costPerKg += w[i]! * c.pricePerKg;
      stockUseKg[c.id] = stockUseKg[c.id]! + g.demandKg * w[i]!;
    });
    totalCost += g.demandKg * costPerKg;
    if (!spread) return { id: g.id, ...props };
    const massFractions: Record<string, number> = {};
    comps.forEach((c, i) => (massFractions[c.id] = w[i]!));
    const band = { components: comps, targetKv40: g.targetKv40, tolerancePct: g.tolerancePct, objective: 'cost' as const };
    return { id: g.id, ...props, inBandProbability: inBandProbabilityPlain(band, massFractions) };
  });
  const stocksUsed = comps.filter((_, i) => r.fractions.some((w) => w[i]! > IN_USE_FRACTION)).map((c) => c.id);
  return { status: 'optimal', totalCost, grades, stockUseKg, stocksUsed };
}
