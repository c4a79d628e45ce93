/**
 * Line plan for the workbench: the recipes of a gear-oil line re-planned together, at the least
 * total cost over a planning period, when some stocks are limited (a supply in tonnes) or about to
 * be withdrawn. Each grade keeps its own saved targets and constraints (band, minimum VI, maximum
 * aniline point, polymer cap, additive treat rate, pour/flash limits, per-stock limits); the plan
 * replaces each grade's own objective by the line's total cost.
 *
 * The engine is `joint.ts` (exact: LP, VI floors and the tank limit by branch and bound); every
 * recipe it returns is recomputed by the core (`predictBlend`), checked against its grade's
 * constraints (`checkConstraints`, the tolerances of `solveBlend`), and the supplies and the tank
 * limit are checked on the recomputed use.
 *
 * A grade's minimum probability in band (lot spread, `qc/robust.ts`) is a condition of the plan,
 * met exactly by the engine (tangent cuts of the grade's cone condition, `joint.ts`) and checked on
 * the recomputed recipe. The plan is then solved once more without the probabilities, so that the
 * premium they cost the line is stated (`nominalTotalCost`, each grade's `inBand.nominalProbability`).
 */
import type { BlendTargets, Component, RecipeLine } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError, assertFinite, inField } from '../errors';
import { gradeBand } from '../viscosity/iso-grades';
import { predictBlend, type BlendProperties } from '../formulation/blend-properties';
import { checkConstraints, checkInWords, prepareComponents, type ConstraintCheck, type PreparedBlend } from '../solver/solve-blend';
import type { NumberDisplay } from '../words/display';
import { solveJoint, IN_USE_FRACTION, type JointProblem } from './joint';
import { diagnoseLinePlan, type PlanDiagnosis } from './diagnose';
import { recipeInBand } from '../qc/recipe-spread';
import { withInBandProbability } from '../qc/robust-solve';

/** One grade of the line: a recipe taking part, with its targets and its demand. */
export interface LinePlanGradeInput {
  /** The recipe's id (results are keyed by it). */
  id: string;
  /** How messages name it, e.g. "VG 460". */
  label: string;
  /** The recipe's saved targets and constraints (its objective is not used: the plan minimises the line's cost). */
  targets: BlendTargets;
  /** Demand over the planning period [kg], above 0. */
  demandKg: number;
  /** The current recipe's lines, for the comparison; null → none. */
  current: readonly RecipeLine[] | null;
}

export interface LinePlanInput {
  /** The library. */
  components: readonly Component[];
  grades: readonly LinePlanGradeInput[];
  /** Supply over the period [kg] of the limited stocks, by stock id (others are not limited). */
  supplyKg?: Readonly<Record<string, number>>;
  /** Stocks that must stay in use, with the least use over the period [kg] (0: kept in a tank, any use). */
  keepKg?: Readonly<Record<string, number>>;
  /** Largest number of distinct stocks in use across the line, the additive package included; null → no limit. */
  maxStocks?: number | null;
  /** Mixing rule (default Refutas). */
  method?: BlendMethod;
  /** Stocks treated as withdrawn in this plan (e.g. the limited ones, for the plan after they are gone). */
  withdraw?: readonly string[];
  /** Temperatures for the predicted properties [°C]. */
  operatingTempC?: number;
  coldTempC?: number;
  /** How reasons write numbers and temperatures (the user's decimal separator and unit; default ".", °C). Plain data. */
  display?: NumberDisplay;
}

/** Costs of a recipe over the period. */
export interface LinePlanCost {
  /** Per kg and per litre at 15 °C, in the library's currency. */
  costPerKg: number;
  costPerLitre: number;
  /** Demand × cost per kg. */
  cost: number;
}

export interface LinePlanGradeResult extends LinePlanCost {
  id: string;
  label: string;
  demandKg: number;
  /** The planned recipe: stocks used (fraction > 0), in library order, summing to 1. */
  lines: RecipeLine[];
  /** Recomputed by the core. */
  properties: BlendProperties;
  /** The grade's constraints, recomputed. */
  checks: ConstraintCheck[];
  /** The current recipe, costed at today's prices; null when there is none or it cannot be predicted. */
  current: (LinePlanCost & { properties: BlendProperties }) | null;
  /**
   * Where the grade asks for a minimum probability in band (a condition of the plan): that minimum,
   * the planned recipe's probability of landing in the band under the stocks' lot spread, and the
   * probability of the grade's recipe in the plan solved without any minimum (null when that plan
   * has no solution or was not solved).
   */
  inBand: { minimum: number; probability: number; nominalProbability: number | null } | null;
}

/** Use of one stock over the period. */
export interface LinePlanStockUse {
  id: string;
  code: string;
  /** Planned use [kg]. */
  useKg: number;
  /** Supply [kg]; null when not limited. */
  supplyKg: number | null;
  /** Use by grade [kg], aligned with the plan's grades. */
  byGrade: number[];
}

export interface LinePlanOptimal {
  status: 'optimal';
  currency: string | null;
  /** Σ demand × cost per kg over the grades [currency]. */
  totalCost: number;
  /** The same for the current recipes; null when a grade has none. */
  currentTotalCost: number | null;
  grades: LinePlanGradeResult[];
  /** Every stock in use, in library order. */
  stockUse: LinePlanStockUse[];
  /** Ids of the stocks the plan uses (library order). */
  stocksUsed: string[];
  /** Ids used by the current recipes of these grades but not by the plan. */
  stocksNoLongerNeeded: string[];
  /** Ids used by the plan but by none of the current recipes. */
  stocksNewlyNeeded: string[];
  /** Supply and tank limits on the recomputed use. */
  limitChecks: ConstraintCheck[];
  /**
   * When a grade asks for a minimum probability in band: the total cost of the line planned without
   * any minimum (the premium is totalCost − this); null otherwise or when that plan has no solution.
   */
  nominalTotalCost: number | null;
  lpCount: number;
  nodeCount: number;
}

export interface LinePlanInfeasible {
  status: 'infeasible';
  /** Why, in words (quantities in tonnes). */
  reason: string;
  /** The same reason with its quantities in kg, when it names quantities (kinds 'supply', 'min-use'). */
  reasonKg?: string;
  kind: PlanDiagnosis['kind'] | 'check' | 'search-limit';
  /** The grade that cannot be made (kind 'grade'). */
  gradeId: string | null;
  /** Short stocks and tonnes (kinds 'supply', 'min-use'). */
  short: { id: string; code: string; tonnes: number }[];
  /** Least number of stocks the line needs (kind 'tanks'). */
  minStocks: number | null;
  lpCount: number;
}

export interface LinePlanInvalid {
  status: 'invalid-input';
  field: string;
  /** The offending value, as the core's error gives it. */
  value?: unknown;
  message: string;
}

export type LinePlanResult = LinePlanOptimal | LinePlanInfeasible | LinePlanInvalid;

/** A line plan prepared once (reused for the marginal values). */
export interface PreparedLinePlan {
  readonly input: LinePlanInput;
  /** The library as planned (withdrawn ones marked). */
  readonly components: readonly Component[];
  readonly prepared: readonly PreparedBlend[];
  readonly joint: JointProblem;
}

/**
 * Supply-use tolerance when recomputed: 1e-6 of the supply plus 1 g, plus the LP's rounding of the
 * planned fractions: the simplex returns each mass fraction rounded to 1e-8 (`solver/lp.ts`), so a
 * grade's use of a stock may be off by up to 1e-8 of its demand (`lpFraction` per kg of demand).
 */
export const SUPPLY_CHECK_TOLERANCE = { relative: 1e-6, kg: 1e-3, lpFraction: 1e-8 } as const;

/**
 * The most a plan may use of a stock when recomputed and still meet its supply:
 * S·(1 + 1e-6) + 1 g + 1e-8·Σ_g D_g ({@link SUPPLY_CHECK_TOLERANCE}).
 *
 * @param supplyKg - the stock's supply S [kg]
 * @param demandsKg - the grades' demands D_g [kg]
 * @returns the largest accepted use [kg]
 * @example supplyCheckLimitKg(1, [516_000]) // → ≈ 1.00616 (1 kg + 1 mg + 1 g + 5.16 g)
 */
export function supplyCheckLimitKg(supplyKg: number, demandsKg: readonly number[]): number {
  return supplyKg * (1 + SUPPLY_CHECK_TOLERANCE.relative) + SUPPLY_CHECK_TOLERANCE.kg + lpRoundingKg(demandsKg);
}

/**
 * The least use of a stock a recomputed plan may show and still meet its least use M:
 * M·(1 − 1e-6) − 1 g − 1e-8·Σ_g D_g ({@link SUPPLY_CHECK_TOLERANCE}).
 *
 * @param minUseKg - the least use M [kg]
 * @param demandsKg - the grades' demands D_g [kg]
 * @returns the smallest accepted use [kg]
 */
export function leastUseCheckFloorKg(minUseKg: number, demandsKg: readonly number[]): number {
  return minUseKg * (1 - SUPPLY_CHECK_TOLERANCE.relative) - SUPPLY_CHECK_TOLERANCE.kg - lpRoundingKg(demandsKg);
}

function lpRoundingKg(demandsKg: readonly number[]): number {
  return SUPPLY_CHECK_TOLERANCE.lpFraction * demandsKg.reduce((s, d) => s + d, 0);
}

const FN = 'planLine';

function fail(field: string, value: unknown, message: string): never {
  throw new BlendbenchInputError(field, value, message);
}

/**
 * Validate a line plan and build its engine problem.
 *
 * @param input - the plan ({@link LinePlanInput})
 * @returns the prepared plan
 * @throws BlendbenchInputError (or a subclass) naming the offending field, e.g.
 *   `grades[2].demandKg`, `grades[1].targets.minVi`, `supplyKg.<id>`
 */
export function prepareLinePlan(input: LinePlanInput): PreparedLinePlan {
  if (!Array.isArray(input.grades) || input.grades.length === 0) {
    fail('grades', input.grades, `${FN}: choose at least one grade with a demand`);
  }
  const withdraw = new Set(input.withdraw ?? []);
  const components = input.components.map((c) => (withdraw.has(c.id) && c.availability !== 'withdrawn' ? { ...c, availability: 'withdrawn' as const } : c));
  const index = new Map(components.map((c, i) => [c.id, i]));
  const ids = new Set<string>();
  const prepared: PreparedBlend[] = [];
  const demandKg: number[] = [];
  input.grades.forEach((g, k) => {
    if (ids.has(g.id)) fail(`grades[${k}].id`, g.id, `${FN}: ${g.label} appears twice in the plan`);
    ids.add(g.id);
    assertFinite(FN, `grades[${k}].demandKg`, g.demandKg);
    if (!(g.demandKg > 0)) {
      fail(`grades[${k}].demandKg`, g.demandKg, `${FN}: the demand for ${g.label} must be above 0 (leave a grade without demand out of the plan)`);
    }
    demandKg.push(g.demandKg);
    // The plan minimises the line's cost (not each grade's own objective); a minimum probability in
    // band is a condition of the grade (see the module notes).
    const targets = { ...g.targets, objective: 'cost' as const };
    prepared.push(inField(`grades[${k}].`, () => prepareComponents(components, targets, input.method ?? 'refutas'), { message: (m) => `${g.label}: ${m}` }));
  });
  const currencies = new Set(prepared.map((P) => P.currency).filter((c): c is string => c !== null));
  if (currencies.size > 1) {
    fail('components.price.currency', [...currencies], `${FN}: prices are in ${[...currencies].join(' and ')}; give every stock's price in one currency`);
  }
  const n = components.length;
  const supplyKg = new Array<number>(n).fill(Number.POSITIVE_INFINITY);
  for (const [id, kg] of Object.entries(input.supplyKg ?? {})) {
    const i = index.get(id);
    if (i === undefined) fail(`supplyKg.${id}`, id, `${FN}: a supply is given for a stock that is not in the library (${id})`);
    assertFinite(FN, `supplyKg.${id}`, kg);
    if (kg < 0) fail(`supplyKg.${id}`, kg, `${FN}: the supply of ${components[i]!.code} cannot be negative`);
    supplyKg[i] = kg;
  }
  const minUseKg = new Array<number>(n).fill(0);
  const keep = new Array<boolean>(n).fill(false);
  for (const [id, kg] of Object.entries(input.keepKg ?? {})) {
    const i = index.get(id);
    if (i === undefined) fail(`keepKg.${id}`, id, `${FN}: a stock to keep in use is not in the library (${id})`);
    if (withdraw.has(id)) continue; // gone in this plan: nothing to keep
    const c = components[i]!;
    if (c.availability === 'withdrawn') fail(`keepKg.${id}`, id, `${FN}: ${c.code} is withdrawn, so it cannot stay in use`);
    assertFinite(FN, `keepKg.${id}`, kg);
    if (kg < 0) fail(`keepKg.${id}`, kg, `${FN}: the least use of ${c.code} cannot be negative`);
    keep[i] = true;
    minUseKg[i] = kg;
  }
  const maxStocks = input.maxStocks ?? null;
  if (maxStocks !== null) {
    assertFinite(FN, 'maxStocks', maxStocks);
    if (!Number.isInteger(maxStocks) || maxStocks < 1) fail('maxStocks', maxStocks, `${FN}: the number of stocks must be a whole number, at least 1`);
  }
  return { input, components, prepared, joint: { grades: prepared, demandKg, supplyKg, minUseKg, maxStocks, keep } };
}

/**
 * Plan the line: the least total cost over the period for every grade at once.
 *
 * Total cost = Σ_g D_g·Σ_i w_gi·p_i (D_g demand [kg], w_gi mass fraction, p_i price per kg); subject
 * to each grade's targets, Σ_g D_g·w_gi ≤ supply_i, Σ_g D_g·w_gi ≥ least use_i for the stocks that
 * must stay in use, and at most `maxStocks` distinct stocks in use across the line.
 *
 * @param input - the plan ({@link LinePlanInput}); demands and supplies in kg
 * @returns 'optimal' with each grade's recipe recomputed by the core, costs over the period, the use
 *   of every stock and the comparison with the current recipes; 'infeasible' with the reason (the
 *   grade that cannot be made, the short supply in tonnes, or the least number of stocks needed);
 *   or 'invalid-input' naming the field
 * @example
 * planLine({ components: lib, grades: [{ id: 'r220', label: 'VG 220', targets, demandKg: 120_000, current }],
 *            supplyKg: { bs: 250_000 }, maxStocks: 6 })
 *   // → { status: 'optimal', totalCost: 171_300, grades: [...], stockUse: [...], ... }
 */
export function planLine(input: LinePlanInput): LinePlanResult {
  let plan: PreparedLinePlan;
  try {
    plan = prepareLinePlan(input);
  } catch (e) {
    if (e instanceof BlendbenchInputError) return { status: 'invalid-input', field: e.field, value: e.value, message: e.message };
    throw e;
  }
  return solvePreparedLinePlan(plan);
}

/**
 * Solve a prepared line plan, optionally with other supplies (the marginal values re-solve with
 * one more tonne of a stock).
 *
 * @param plan - from {@link prepareLinePlan}
 * @param supplyKg - supplies [kg] aligned with the components; default the plan's own
 * @param nominal - also solve the plan without the grades' minimum probabilities in band, for the
 *   premium (default true; the marginal values leave it out)
 */
export function solvePreparedLinePlan(plan: PreparedLinePlan, supplyKg?: readonly number[], nominal = true): LinePlanResult {
  const J = supplyKg ? { ...plan.joint, supplyKg } : plan.joint;
  const { input, components, prepared } = plan;
  const r = solveJoint(J);
  const robust = J.grades.some((P) => (P.targets.minInBandProbability ?? 0) > 0);
  const r0 = r.status === 'optimal' && robust && nominal ? solveJoint({ ...J, grades: J.grades.map((P) => withInBandProbability(P, null)) }) : null;
  const infeasible = (d: Partial<LinePlanInfeasible> & Pick<LinePlanInfeasible, 'reason' | 'kind'>): LinePlanInfeasible => ({
    status: 'infeasible',
    gradeId: null,
    short: [],
    minStocks: null,
    lpCount: r.lpCount,
    ...d,
  });
  if (r.status === 'limit') {
    return infeasible({
      kind: 'search-limit',
      reason: `The plan search stopped after ${r.lpCount} LPs without proving the best plan; allow more stocks or plan fewer grades at once.`,
    });
  }
  if (r.status !== 'optimal') {
    const d = diagnoseLinePlan(J, {
      grades: input.grades.map((g, k) => {
        const iso = gradeBand(g.targets.grade);
        const label = { product: g.label, display: input.display };
        const P = prepared[k]!;
        return P.band.min > iso.min || P.band.max < iso.max ? { ...label, gradeMin: iso.min, gradeMax: iso.max } : label;
      }),
      stocks: components.map((c) => c.code),
      display: input.display,
    });
    return infeasible({
      reason: d.reason,
      ...(d.reasonKg === undefined ? {} : { reasonKg: d.reasonKg }),
      kind: d.kind,
      gradeId: d.grade === null ? null : input.grades[d.grade]!.id,
      short: d.short.map((s) => ({ id: components[s.stock]!.id, code: components[s.stock]!.code, tonnes: s.tonnes })),
      minStocks: d.minStocks,
      lpCount: r.lpCount + d.lpCount,
    });
  }

  const n = components.length;
  const opts = {
    method: input.method ?? 'refutas',
    ...(input.operatingTempC === undefined ? {} : { operatingTempC: input.operatingTempC }),
    ...(input.coldTempC === undefined ? {} : { coldTempC: input.coldTempC }),
  };
  const useKg = new Float64Array(n);
  const byGrade: number[][] = components.map(() => new Array<number>(input.grades.length).fill(0));
  const currentUsed = new Set<string>();
  let currentTotal: number | null = 0;
  let total = 0;
  const failures: string[] = [];
  const grades: LinePlanGradeResult[] = input.grades.map((g, k) => {
    const w = r.fractions[k]!;
    const lines = linesOf(components, w);
    components.forEach((_, i) => {
      if (w[i]! > 0) {
        useKg[i] = useKg[i]! + g.demandKg * w[i]!;
        byGrade[i]![k] = g.demandKg * w[i]!;
      }
    });
    const properties = predictBlend(components, lines, opts);
    const checks = checkConstraints(prepared[k]!, lines, properties);
    for (const c of checks) if (!c.ok) failures.push(`${g.label}: ${checkInWords(c, input.display)}`);
    const cost = costOf(prepared[k]!, w, properties, g.demandKg);
    total += cost.cost;
    let current: LinePlanGradeResult['current'] = null;
    if (g.current && g.current.length > 0) {
      try {
        const cp = predictBlend(input.components, g.current, opts);
        if (cp.costPerKg !== null && cp.costPerLitre !== null) {
          current = { properties: cp, costPerKg: cp.costPerKg, costPerLitre: cp.costPerLitre, cost: cp.costPerKg * g.demandKg };
        }
        for (const l of g.current) if (l.massFraction > 0) currentUsed.add(l.componentId);
      } catch (e) {
        if (!(e instanceof BlendbenchInputError)) throw e;
      }
    }
    if (current && currentTotal !== null) currentTotal += current.cost;
    else currentTotal = null;
    const pMin = g.targets.minInBandProbability ?? null;
    const probabilityOf = (f: Float64Array): number =>
      recipeInBand(components, linesOf(components, f), g.targets.grade, prepared[k]!.band, prepared[k]!.method).plant.probability;
    const inBand =
      pMin !== null && pMin > 0
        ? { minimum: pMin, probability: probabilityOf(w), nominalProbability: r0?.status === 'optimal' ? probabilityOf(r0.fractions[k]!) : null }
        : null;
    return { id: g.id, label: g.label, demandKg: g.demandKg, lines, properties, checks, ...cost, current, inBand };
  });

  // Supplies, least uses and the tank limit, on the recomputed use.
  const limitChecks: ConstraintCheck[] = [];
  const J0 = plan.joint;
  const supplies = J.supplyKg;
  components.forEach((c, i) => {
    const s = supplies[i]!;
    if (s < Number.POSITIVE_INFINITY) {
      limitChecks.push({
        constraint: `supply of ${c.code} [kg]`,
        name: `supply of ${c.code}`,
        quantity: 'mass',
        value: useKg[i]!,
        limit: `≤ ${s}`,
        min: null,
        max: s,
        ok: useKg[i]! <= supplyCheckLimitKg(s, J.demandKg),
      });
    }
    if (J0.keep[i]) {
      const m = J0.minUseKg[i]!;
      limitChecks.push({
        constraint: `least use of ${c.code} [kg]`,
        name: `least use of ${c.code}`,
        quantity: 'mass',
        value: useKg[i]!,
        limit: `≥ ${m}`,
        min: m,
        max: null,
        ok: useKg[i]! >= leastUseCheckFloorKg(m, J.demandKg),
      });
    }
  });
  const usedIdx = components.map((_, i) => i).filter((i) => J0.keep[i] || r.fractions.some((w) => w[i]! > IN_USE_FRACTION));
  if (J0.maxStocks !== null) {
    limitChecks.push({
      constraint: 'distinct stocks in use',
      name: 'distinct stocks in use',
      quantity: 'count',
      value: usedIdx.length,
      limit: `≤ ${J0.maxStocks}`,
      min: null,
      max: J0.maxStocks,
      ok: usedIdx.length <= J0.maxStocks,
    });
  }
  for (const c of limitChecks) if (!c.ok) failures.push(checkInWords(c, input.display));
  if (failures.length > 0) {
    return infeasible({
      kind: 'check',
      reason: `The best plan found fails a limit when recomputed by the core: ${failures.join('; ')}. Blendbench does not offer it.`,
    });
  }
  const stocksUsed = usedIdx.map((i) => components[i]!.id);
  const usedSet = new Set(stocksUsed);
  return {
    status: 'optimal',
    currency: prepared.find((P) => P.currency !== null)?.currency ?? null,
    totalCost: total,
    currentTotalCost: currentTotal,
    grades,
    stockUse: usedIdx.map((i) => ({
      id: components[i]!.id,
      code: components[i]!.code,
      useKg: useKg[i]!,
      supplyKg: supplies[i]! < Number.POSITIVE_INFINITY ? supplies[i]! : null,
      byGrade: byGrade[i]!,
    })),
    stocksUsed,
    stocksNoLongerNeeded: components.filter((c) => currentUsed.has(c.id) && !usedSet.has(c.id)).map((c) => c.id),
    stocksNewlyNeeded: stocksUsed.filter((id) => !currentUsed.has(id)),
    limitChecks,
    nominalTotalCost: r0?.status === 'optimal' ? r0.fractions.reduce((sum, f, k) => sum + costOf(prepared[k]!, f, predictBlend(components, linesOf(components, f), opts), input.grades[k]!.demandKg).cost, 0) : null,
    lpCount: r.lpCount + (r0?.lpCount ?? 0),
    nodeCount: r.nodeCount,
  };
}

/** Recipe lines of fractions aligned with the components (stocks above 0, library order). */
function linesOf(components: readonly Component[], w: Float64Array): RecipeLine[] {
  const lines: RecipeLine[] = [];
  components.forEach((c, i) => {
    if (w[i]! > 0) lines.push({ componentId: c.id, massFraction: w[i]! });
  });
  return lines;
}

/** Cost per kg and per litre of a planned grade (the engine's prices), and over the period. */
function costOf(P: PreparedBlend, w: Float64Array, p: BlendProperties, demandKg: number): LinePlanCost {
  let perKg = 0;
  for (let i = 0; i < P.n; i++) perKg += w[i]! * P.price[i]!;
  return { costPerKg: perKg, costPerLitre: perKg * p.density15, cost: perKg * demandKg };
}

/** What one more tonne of a limited stock is worth to the line. */
export interface MarginalValue {
  id: string;
  code: string;
  supplyKg: number;
  useKg: number;
  /** True when the plan uses the whole supply (to 1 kg). */
  binding: boolean;
  /** Lower total cost over the period with one more tonne [currency]; 0 when not binding; null when the re-solve failed. */
  savingPerTonne: number | null;
}

/** Both plans of a withdrawal: while the limited stocks last, and after they are gone. */
export interface LinePlanScenarios {
  /** With the limited stocks at their supplies. */
  lasting: LinePlanResult;
  /** With the limited stocks withdrawn. */
  after: LinePlanResult;
  /** after.totalCost − lasting.totalCost, when both are optimal: the cost of the withdrawal over the period. */
  withdrawalCost: number | null;
  /** One entry per stock with a supply in the lasting plan. */
  marginal: MarginalValue[];
  lpCount: number;
}

/** One more tonne [kg]: the step of the marginal value. */
export const MARGINAL_STEP_KG = 1000;

/**
 * Plan the line twice — while the limited stocks last (at their supplies) and after they are gone
 * (withdrawn) — and value each limited stock: what one more tonne would save over the period,
 * by re-solving the plan with its supply raised by {@link MARGINAL_STEP_KG} (exact for the plan,
 * whatever the VI floors and the tank limit; for a pure LP it equals the dual value of the supply
 * row as long as the optimal basis holds over that tonne).
 *
 * @param input - the plan ({@link LinePlanInput}) with the limited stocks' supplies
 * @param limited - ids of the limited stocks (withdrawn in the plan after they are gone)
 * @returns both plans, the cost of the withdrawal and the marginal values
 */
export function planLineScenarios(input: LinePlanInput, limited: readonly string[]): LinePlanScenarios {
  let plan: PreparedLinePlan | null = null;
  let lasting: LinePlanResult;
  try {
    plan = prepareLinePlan(input);
    lasting = solvePreparedLinePlan(plan);
  } catch (e) {
    if (!(e instanceof BlendbenchInputError)) throw e;
    lasting = { status: 'invalid-input', field: e.field, value: e.value, message: e.message };
  }
  const after = planLine({ ...input, withdraw: [...(input.withdraw ?? []), ...limited] });
  let lpCount = (lasting.status === 'invalid-input' ? 0 : lasting.lpCount) + (after.status === 'invalid-input' ? 0 : after.lpCount);
  const marginal: MarginalValue[] = [];
  if (plan && lasting.status === 'optimal') {
    const base = plan.joint.supplyKg;
    plan.components.forEach((c, i) => {
      const s = base[i]!;
      if (!(s < Number.POSITIVE_INFINITY) || c.availability === 'withdrawn') return;
      const useKg = lasting.stockUse.find((u) => u.id === c.id)?.useKg ?? 0;
      const binding = useKg >= s - 1;
      let savingPerTonne: number | null = 0;
      if (binding) {
        const more = base.slice();
        more[i] = s + MARGINAL_STEP_KG;
        const r = solvePreparedLinePlan(plan!, more, false);
        if (r.status !== 'invalid-input') lpCount += r.lpCount;
        savingPerTonne = r.status === 'optimal' ? Math.max(0, lasting.totalCost - r.totalCost) : null;
      }
      marginal.push({ id: c.id, code: c.code, supplyKg: s, useKg, binding, savingPerTonne });
    });
  }
  const withdrawalCost = lasting.status === 'optimal' && after.status === 'optimal' ? after.totalCost - lasting.totalCost : null;
  return { lasting, after, withdrawalCost, marginal, lpCount };
}
