/**
 * Solve a recipe: the mass fractions of the available components that meet a viscosity grade and
 * the other targets, optimising cost per litre, solvency, oxidation stability or closeness to a
 * reference recipe. See `engine.ts` for the formulation (Charnes–Cooper for the ratio objectives,
 * a branch and bound for the minimum VI) and README "Solver".
 *
 * Every optimal recipe is recomputed with the calculation core (`predictBlend`) and checked
 * against every constraint (`checks`); infeasible problems come back with a reason computed from
 * the achievable range and the binding constraint (`diagnose.ts`).
 */
import { displayWords, type NumberDisplay } from '../words/display';
import { verdictDigits } from '../words/verdict-digits';
import type { BlendTargets, Component, Objective, Recipe, RecipeLine } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError, assertDensity15, assertFinite, assertTemperatureC, assertViscosity } from '../errors';
import { gradeBand } from '../viscosity/iso-grades';
import { pricePerKg } from '../formulation/cost';
import { oxidationRating } from '../scoring/oxidation';
import { blendingViscosities, predictBlend, type BlendProperties } from '../formulation/blend-properties';
import { prepareEngine, solvePrepared, type EngineComponent, type PreparedProblem } from './engine';
import { diagnoseInfeasible, fmtKv } from './diagnose';
import { kv40LotSpreadPct } from '../qc/lot-spread';
import { assertProbability } from '../qc/robust';
import { inBandInfeasibleReason, withInBandProbability } from '../qc/robust-solve';
import { recipeInBand, type RecipeInBand } from '../qc/recipe-spread';

export { solvePrepared } from './engine';
export type { EngineResult, EngineOptimal, EngineInfeasible, PreparedProblem, EngineComponent, EngineTargets } from './engine';

/** Tolerances of the feasibility check (issue 3, item 7). */
export const CHECK_TOLERANCE = {
  /** ν40 inside its band, relative. */
  kv40Relative: 1e-4,
  /** VI ≥ minimum − this. */
  vi: 0.01,
  /** Aniline, pour and flash point limits [°C]. */
  temperature: 0.01,
  /** Fractions within their bounds and the treat rate. */
  fraction: 1e-6,
} as const;

export interface SolveBlendInput {
  components: readonly Component[];
  targets: BlendTargets;
  /** The reference recipe (needed by the 'closest' objective). */
  reference?: Recipe | null;
  /** Mixing rule; default 'refutas'. */
  method?: BlendMethod;
  /** Temperatures for the predicted properties [°C] (optional). */
  operatingTempC?: number;
  coldTempC?: number;
  /** How reasons write numbers and temperatures (the user's decimal separator and unit; default ".", °C). */
  display?: NumberDisplay;
}

/** One constraint as recomputed by the core. */
export interface ConstraintCheck {
  /** The constraint with its unit, e.g. "maximum aniline point [°C]" (stored units). */
  constraint: string;
  /** The constraint in words, without unit, e.g. "maximum aniline point", "BW-280 share". */
  name: string;
  /** What the value measures, for writing it: ν40 [mm²/s], VI, a temperature [°C], a share (0–1), a probability (0–1), a mass [kg], a count. */
  quantity: 'kv' | 'vi' | 'temperature' | 'fraction' | 'probability' | 'mass' | 'count';
  value: number | null;
  /** The limit as text in stored units (".", °C, fractions), e.g. "≤ 0.25". */
  limit: string;
  /** The limit's ends in stored units; null = open. */
  min: number | null;
  max: number | null;
  ok: boolean;
}

/**
 * A recomputed constraint in words for a reason, e.g. "maximum polymer share: 31.0 %, limit at most 25 %"
 * or "minimum VI: 98.2, limit at least 120", in the display style (temperatures in its unit).
 */
export function checkInWords(c: ConstraintCheck, display?: NumberDisplay): string {
  const w = displayWords(display);
  // A value that misses its limit by less than its usual rounding gets the digits (at most 3) that show
  // the miss: "95.96, limit at least 96", not "96.0". Compared in the unit shown (°F, %): verdictDigits.
  const missDigits = (v: number, base: number): number => {
    const beyond = !c.ok && ((c.min !== null && v < c.min) || (c.max !== null && v > c.max));
    if (!beyond) return base;
    const k = c.quantity === 'fraction' || c.quantity === 'probability' ? 100 : 1;
    // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale)
    const shown = (x: number | null) =>
      x === null ? null : c.quantity === 'temperature' && display?.temperatureUnit === 'F' ? (x * 9) / 5 + 32 : x * k;
    return verdictDigits(shown(v)!, { min: shown(c.min), max: shown(c.max) }, 'missed', base, Math.max(base, 3)).digits;
  };
  const value = (v: number): string => {
    switch (c.quantity) {
      case 'kv':
        return `${w.num(v, missDigits(v, v >= 100 ? 0 : v >= 10 ? 1 : 2))} mm²/s`;
      case 'temperature':
        return w.temp(v, missDigits(v, 1));
      case 'fraction':
      case 'probability':
        return w.pct(v, missDigits(v, 1));
      case 'mass':
        return `${w.num(v, 0)} kg`;
      case 'count':
        return w.num(v, 0);
      default:
        return w.num(v, missDigits(v, 1));
    }
  };
  const limit = (v: number): string => {
    switch (c.quantity) {
      case 'kv':
        return `${w.kv(v)} mm²/s`;
      case 'temperature':
        return w.sayTemp(v);
      case 'fraction':
      case 'probability':
        return `${w.say(100 * v)} %`;
      case 'mass':
        return `${w.say(v)} kg`;
      default:
        return w.say(v);
    }
  };
  const { min, max } = c;
  const lim =
    min !== null && max !== null ? (min === max ? `exactly ${limit(min)}` : `${limit(min)} to ${limit(max)}`) : min !== null ? `at least ${limit(min)}` : max !== null ? `at most ${limit(max)}` : c.limit;
  return `${c.name}: ${c.value === null ? 'not predicted' : value(c.value)}, limit ${lim}`;
}

export interface SolveOptimal {
  status: 'optimal';
  /** The recipe: used components (fraction > 0) in library order, summing to 1. */
  lines: RecipeLine[];
  /** All properties, recomputed by the core. */
  properties: BlendProperties;
  objective: Objective;
  /**
   * Value of the objective: cost per litre (currency/L), aniline point (°C), oxidation rating
   * (1–5) or the closeness distance (see README "Solver").
   */
  objectiveValue: number;
  /** The ν40 band the recipe was solved to [mm²/s]. */
  band: { min: number; max: number; target: number };
  /** Every constraint recomputed by the core. */
  checks: ConstraintCheck[];
  lpCount: number;
  /** Probability of landing in the solve band and in the ISO band under the stocks' lot spread (`qc/`). */
  inBand: RecipeInBand;
  /**
   * With a minimum probability in band: the nominal recipe's cost and probability (the premium the
   * probability costs) and the certificate's lower bound on the objective; null without one.
   */
  robust: {
    minProbability: number;
    /** Cost per litre and probability in band of the recipe solved without the condition (null: none). */
    nominalCostPerLitre: number | null;
    nominalProbability: number | null;
    /** A lower bound on the objective over every recipe that meets the probability. */
    lowerBound: number | null;
  } | null;
}
export interface SolveInfeasible {
  status: 'infeasible';
  reason: string;
  /** The binding constraint (see `Diagnosis.binding`). */
  binding: string;
  suggestion: string;
  /** Every constraint group whose removal alone would make the problem feasible. */
  relaxable: string[];
  lpCount: number;
}
export interface SolveInvalidInput {
  status: 'invalid-input';
  /** The offending input, e.g. `targets.tolerancePct` or `components[2].density15`. */
  field: string;
  /** The offending value as given. */
  value: unknown;
  message: string;
}
export type SolveResult = SolveOptimal | SolveInfeasible | SolveInvalidInput;

/** A problem prepared once for many solves (the fast path); an engine problem plus its sources. */
export interface PreparedBlend extends PreparedProblem {
  /** The components, in the same order as the engine's (index i ↔ components[i]). */
  readonly library: readonly Component[];
  readonly blendTargets: BlendTargets;
  /** The ν40 band solved to [mm²/s]. */
  readonly band: { min: number; max: number; target: number };
  /** The common currency of the usable components (null if none is usable). */
  readonly currency: string | null;
  /** e.g. "VG 320". */
  readonly productLabel: string;
}

const fail = (field: string, value: unknown, message: string): never => {
  throw new BlendbenchInputError(field, value, message);
};

/**
 * Prepare components and targets once; then {@link solvePrepared}`(prepared, subset)` solves any
 * subset of the components quickly (the substitute search's fast path).
 *
 * Which components are usable: not withdrawn; an additive package only if it is the targets'
 * additive or has explicit bounds; with a pour-point (flash-point) limit, only components whose
 * pour (flash) point is known; with a maximum aniline point, only base fluids whose aniline point is known. The targets' additive is fixed at its treat rate (min = max).
 *
 * @param components - the library; index i of the result refers to components[i]
 * @param targets - targets and constraints
 * @param method - mixing rule (default 'refutas')
 * @param reference - reference recipe (for the 'closest' objective; may use withdrawn stocks)
 * @returns the prepared problem
 * @throws BlendbenchInputError (or a subclass) naming the offending field
 */
export function prepareComponents(
  components: readonly Component[],
  targets: BlendTargets,
  method: BlendMethod = 'refutas',
  reference: Recipe | null = null,
): PreparedBlend {
  const fn = 'prepareComponents';
  if (method !== 'refutas' && method !== 'astm-d7152' && method !== 'd7152-wright') fail('method', method, `${fn}: unknown mixing rule "${String(method)}"`);
  // Targets.
  let iso: ReturnType<typeof gradeBand>;
  try {
    iso = gradeBand(targets.grade);
  } catch (e) {
    if (e instanceof BlendbenchInputError) throw new BlendbenchInputError('targets.grade', targets.grade, e.message);
    throw e;
  }
  const target = targets.targetKv40 ?? iso.mid;
  assertViscosity(fn, 'targets.targetKv40', target);
  assertFinite(fn, 'targets.tolerancePct', targets.tolerancePct);
  if (targets.tolerancePct < 0) {
    fail('targets.tolerancePct', targets.tolerancePct, `${fn}: targets.tolerancePct = ${targets.tolerancePct}; a tolerance cannot be negative`);
  }
  const lo = Math.max(target * (1 - targets.tolerancePct / 100), iso.min);
  const hi = Math.min(target * (1 + targets.tolerancePct / 100), iso.max);
  if (lo > hi) {
    fail(
      'targets.targetKv40',
      target,
      `${fn}: target ν40 ${fmtKv(target)} mm²/s ± ${targets.tolerancePct} % lies outside the VG ${iso.grade} band ` +
        `${fmtKv(iso.min)}–${fmtKv(iso.max)} mm²/s`,
    );
  }
  if (targets.minVi !== null) assertFinite(fn, 'targets.minVi', targets.minVi);
  if (targets.maxAnilinePoint !== null) assertFinite(fn, 'targets.maxAnilinePoint', targets.maxAnilinePoint);
  if (targets.maxPolymerFraction !== null) assertUnit(fn, 'targets.maxPolymerFraction', targets.maxPolymerFraction);
  if (targets.maxPourPoint !== null) assertTemperatureC(fn, 'targets.maxPourPoint', targets.maxPourPoint);
  if (targets.minFlashPoint !== null) assertTemperatureC(fn, 'targets.minFlashPoint', targets.minFlashPoint);
  if (targets.minInBandProbability !== null && targets.minInBandProbability !== undefined) {
    assertProbability(fn, 'targets.minInBandProbability', targets.minInBandProbability);
  }
  const objectives: Objective[] = ['cost', 'cost-kg', 'solvency', 'oxidation', 'closest'];
  if (!objectives.includes(targets.objective)) {
    fail('targets.objective', targets.objective, `${fn}: unknown objective "${String(targets.objective)}"`);
  }
  const ids = new Set<string>();
  components.forEach((c, i) => {
    if (ids.has(c.id)) fail(`components[${i}].id`, c.id, `${fn}: component id "${c.id}" appears twice`);
    ids.add(c.id);
  });
  const additive = targets.additive;
  if (additive) {
    if (!ids.has(additive.componentId)) {
      fail('targets.additive.componentId', additive.componentId, `${fn}: the additive "${additive.componentId}" is not in the library`);
    }
    assertUnit(fn, 'targets.additive.massFraction', additive.massFraction);
    if (additive.massFraction >= 1) {
      fail('targets.additive.massFraction', additive.massFraction, `${fn}: an additive treat rate must be below 100 %`);
    }
    const a = components.find((c) => c.id === additive.componentId)!;
    if (a.availability === 'withdrawn') {
      fail('targets.additive.componentId', additive.componentId, `${fn}: the additive package ${a.code} is withdrawn; choose an available one`);
    }
  }
  for (const [id, b] of Object.entries(targets.bounds)) {
    if (b.min !== undefined) assertUnit(fn, `targets.bounds.${id}.min`, b.min);
    if (b.max !== undefined) assertUnit(fn, `targets.bounds.${id}.max`, b.max);
    if (b.min !== undefined && b.max !== undefined && b.min > b.max) {
      fail(`targets.bounds.${id}`, b, `${fn}: the minimum fraction of ${id} (${b.min}) is above its maximum (${b.max})`);
    }
  }
  if (targets.objective === 'closest' && !reference) {
    fail('reference', null, `${fn}: the 'closest' objective needs a reference recipe`);
  }

  // Components.
  const currencies = new Set<string>();
  const engineComponents: EngineComponent[] = components.map((c, i) => {
    const field = (f: string): string => `components[${i}].${f}`;
    let kv: { kv40: number; kv100: number };
    try {
      kv = blendingViscosities(c);
      assertDensity15(fn, field('density15'), c.density15);
    } catch (e) {
      if (e instanceof BlendbenchInputError && !e.field.startsWith('components[')) {
        throw new BlendbenchInputError(field(e.field), e.value, `${c.code}: ${e.message}`);
      }
      throw e;
    }
    if (c.anilinePoint !== null) assertFinite(fn, field('anilinePoint'), c.anilinePoint);
    const isAdditive = additive?.componentId === c.id;
    const bound = targets.bounds[c.id];
    let usable = c.availability !== 'withdrawn';
    if (c.category === 'additive-package' && !isAdditive && bound === undefined) usable = false;
    if (targets.maxPourPoint !== null && c.pourPoint === null) {
      if (isAdditive) fail(field('pourPoint'), null, `${fn}: a pour-point limit needs the pour point of the additive package ${c.code}`);
      usable = false;
    }
    if (targets.minFlashPoint !== null && c.flashPoint === null) {
      if (isAdditive) fail(field('flashPoint'), null, `${fn}: a flash-point limit needs the flash point of the additive package ${c.code}`);
      usable = false;
    }
    // A base fluid without an aniline point would escape the limit (the blend value is taken over
    // the parts that have one), so it is left out, as for pour and flash limits.
    if (targets.maxAnilinePoint !== null && c.anilinePoint === null && c.category !== 'additive-package') usable = false;
    const price = usable || reference ? pricePerKg(c.price, c.density15) : 0;
    if (usable) currencies.add(c.price.currency);
    const min = isAdditive ? additive!.massFraction : (bound?.min ?? 0);
    const max = isAdditive ? additive!.massFraction : (bound?.max ?? 1);
    return {
      id: c.id,
      label: c.code,
      kv40: kv.kv40,
      kv100: kv.kv100,
      density15: c.density15,
      anilinePoint: c.anilinePoint,
      pricePerKg: price,
      polymer: c.category === 'polymer',
      baseFluid: c.category !== 'additive-package',
      oxidation: oxidationRating(c),
      pourPoint: c.pourPoint,
      flashPoint: c.flashPoint,
      min,
      max,
      fixedAdditive: isAdditive,
      usable,
      kv40RelSd: kv40LotSpreadPct(c) / 100,
    };
  });
  if (currencies.size > 1) {
    fail(
      'components.price.currency',
      [...currencies],
      `${fn}: prices are in ${[...currencies].join(' and ')}; the solver never converts currencies — restate every usable component's price in one currency first (the app does it with the exchange rates in Settings)`,
    );
  }
  let referenceFractions: number[] | null = null;
  if (reference) {
    referenceFractions = new Array<number>(components.length).fill(0);
    reference.lines.forEach((l, i) => {
      const k = components.findIndex((c) => c.id === l.componentId);
      if (k < 0) fail(`reference.lines[${i}].componentId`, l.componentId, `${fn}: the reference names an unknown component "${l.componentId}"`);
      assertUnit(fn, `reference.lines[${i}].massFraction`, l.massFraction);
      referenceFractions![k] = (referenceFractions![k] ?? 0) + l.massFraction;
    });
  }
  const engine = prepareEngine(
    engineComponents,
    {
      kv40Min: lo,
      kv40Max: hi,
      minVi: targets.minVi,
      maxAnilinePoint: targets.maxAnilinePoint,
      maxPolymerFraction: targets.maxPolymerFraction,
      maxPourPoint: targets.maxPourPoint,
      minFlashPoint: targets.minFlashPoint,
      objective: targets.objective,
      referenceMassFractions: referenceFractions,
      minInBandProbability: targets.minInBandProbability ?? null,
    },
    method,
  );
  return {
    ...engine,
    library: components,
    blendTargets: targets,
    band: { min: lo, max: hi, target },
    currency: currencies.size === 1 ? [...currencies][0]! : null,
    productLabel: `VG ${iso.grade}`,
  };
}

function assertUnit(fn: string, field: string, x: unknown): asserts x is number {
  assertFinite(fn, field, x);
  if (x < 0 || x > 1) fail(field, x, `${fn}: ${field} = ${x}; a fraction must lie between 0 and 1`);
}

/**
 * Solve for the recipe that meets the targets with the best objective.
 *
 * @param input - components, targets, optional reference recipe, mixing rule and temperatures
 * @returns 'optimal' with the recipe, every property recomputed by the core and the constraint
 *   checks; 'infeasible' with the reason, binding constraint and a suggestion; or 'invalid-input'
 *   naming the field
 * @example
 * solveBlend({ components: lib, targets: { grade: 320, targetKv40: null, tolerancePct: 5, minVi: 95,
 *   maxAnilinePoint: null, maxPolymerFraction: 0.1, maxPourPoint: null, minFlashPoint: null,
 *   additive: { componentId: 'ep', massFraction: 0.02 }, bounds: {}, objective: 'cost',
 *   referenceRecipeId: null } })
 *   // → { status: 'optimal', lines: [...], properties: { kv40: 304.0, ... }, objectiveValue: 1.38, ... }
 */
export function solveBlend(input: SolveBlendInput): SolveResult {
  let P: PreparedBlend;
  try {
    P = prepareComponents(input.components, input.targets, input.method ?? 'refutas', input.reference ?? null);
  } catch (e) {
    if (e instanceof BlendbenchInputError) return { status: 'invalid-input', field: e.field, value: e.value, message: e.message };
    throw e;
  }
  const pMin = P.blendTargets.minInBandProbability ?? null;
  const r = solvePrepared(P, null, { certify: pMin !== null && pMin > 0 });
  if (r.status !== 'optimal') {
    const iso = gradeBand(P.blendTargets.grade);
    if (pMin !== null && pMin > 0 && solvePrepared(P, null, { nominal: true }).status === 'optimal') {
      const reason = inBandInfeasibleReason(P, P.band, null, input.display);
      return {
        status: 'infeasible',
        reason,
        binding: 'in-band-probability',
        suggestion: 'Widen the band, lower the probability asked for, or enter the stocks\' measured lot-to-lot spread.',
        relaxable: [],
        lpCount: r.lpCount,
      };
    }
    const d = diagnoseInfeasible(withInBandProbability(P, null), { product: P.productLabel, gradeMin: iso.min, gradeMax: iso.max, display: input.display });
    const solverNote = r.solverFailure ? ' (The LP solver also reported a numerical failure.)' : '';
    return {
      status: 'infeasible',
      reason: d.reason + solverNote,
      binding: d.binding,
      suggestion: d.suggestion,
      relaxable: d.relaxable,
      lpCount: r.lpCount + d.lpCount,
    };
  }
  const lines: RecipeLine[] = [];
  P.library.forEach((c, i) => {
    const w = r.massFractions[i]!;
    if (w > 0) lines.push({ componentId: c.id, massFraction: w });
  });
  const properties = predictBlend(P.library, lines, {
    method: P.method,
    ...(input.operatingTempC === undefined ? {} : { operatingTempC: input.operatingTempC }),
    ...(input.coldTempC === undefined ? {} : { coldTempC: input.coldTempC }),
  });
  const checks = checkConstraints(P, lines, properties);
  // Never offer a recipe that fails a constraint when recomputed by the core (e.g. a blend whose
  // aniline point is unknown under an aniline limit, or a knife-edge LP tolerance).
  const failed = checks.filter((c) => !c.ok);
  if (failed.length > 0) {
    const what = failed.map((c) => checkInWords(c, input.display)).join('; ');
    return {
      status: 'infeasible',
      reason: `The best recipe found fails a constraint when recomputed by the core: ${what}. Blendbench does not offer it.`,
      binding: 'combination',
      suggestion: 'Relax that limit a little, or add stocks that bring the missing property (with its measured values).',
      relaxable: [],
      lpCount: r.lpCount,
    };
  }
  let objectiveValue = r.objectiveValue;
  if (P.blendTargets.objective === 'cost' && properties.costPerLitre !== null) objectiveValue = properties.costPerLitre;
  if (P.blendTargets.objective === 'cost-kg' && properties.costPerKg !== null) objectiveValue = properties.costPerKg;
  if (P.blendTargets.objective === 'solvency' && properties.anilinePoint) objectiveValue = properties.anilinePoint.value;
  if (P.blendTargets.objective === 'oxidation' && properties.oxidationRating !== null) objectiveValue = properties.oxidationRating;
  const inBand = recipeInBand(P.library, lines, P.blendTargets.grade, P.band, P.method);
  let robust: SolveOptimal['robust'] = null;
  if (pMin !== null && pMin > 0) {
    const nominal = solvePrepared(P, null, { nominal: true });
    robust = {
      minProbability: pMin,
      nominalCostPerLitre: nominal.status === 'optimal' ? nominal.costPerLitre : null,
      nominalProbability: nominal.status === 'optimal' ? nominal.inBandProbability : null,
      lowerBound: r.lowerBound ?? null,
    };
  }
  return {
    status: 'optimal',
    lines,
    properties,
    objective: P.blendTargets.objective,
    objectiveValue,
    band: P.band,
    checks,
    lpCount: r.lpCount,
    inBand,
    robust,
  };
}

/**
 * Check a recipe's recomputed properties against every constraint of a prepared problem, with the
 * tolerances of {@link CHECK_TOLERANCE}.
 *
 * @param P - the prepared problem
 * @param lines - the recipe
 * @param p - its properties from `predictBlend`
 * @returns one check per constraint that is set
 */
export function checkConstraints(P: PreparedBlend, lines: readonly RecipeLine[], p: BlendProperties): ConstraintCheck[] {
  const t = P.blendTargets;
  const tol = CHECK_TOLERANCE;
  const out: ConstraintCheck[] = [];
  /** "a–b", "≥ a", "≤ b" or "= a" in stored units (programmers' text). */
  const limitText = (min: number | null, max: number | null, show: (x: number) => string = String): string =>
    min !== null && max !== null ? (min === max ? `= ${show(min)}` : `${show(min)}–${show(max)}`) : min !== null ? `≥ ${show(min)}` : `≤ ${show(max!)}`;
  const add = (name: string, unit: string, quantity: ConstraintCheck['quantity'], value: number | null, min: number | null, max: number | null, ok: boolean, show?: (x: number) => string) =>
    out.push({ constraint: unit ? `${name} [${unit}]` : name, name, quantity, value, limit: limitText(min, max, show), min, max, ok });
  add('ν40 band', 'mm²/s', 'kv', p.kv40, P.band.min, P.band.max, p.kv40 >= P.band.min * (1 - tol.kv40Relative) && p.kv40 <= P.band.max * (1 + tol.kv40Relative), fmtKv);
  if (t.minVi !== null) add('minimum VI', '', 'vi', p.vi, t.minVi, null, p.vi !== null && p.vi >= t.minVi - tol.vi);
  if (t.maxAnilinePoint !== null) {
    const v = p.anilinePoint?.value ?? null;
    add('maximum aniline point', '°C', 'temperature', v, null, t.maxAnilinePoint, v !== null && v <= t.maxAnilinePoint + tol.temperature);
  }
  if (t.maxPolymerFraction !== null) {
    add('maximum polymer fraction', '', 'fraction', p.polymerFraction, null, t.maxPolymerFraction, p.polymerFraction <= t.maxPolymerFraction + tol.fraction);
  }
  if (t.maxPourPoint !== null) add('maximum pour point', '°C', 'temperature', p.pourPoint, null, t.maxPourPoint, p.pourPoint !== null && p.pourPoint <= t.maxPourPoint + tol.temperature);
  if (t.minFlashPoint !== null) add('minimum flash point', '°C', 'temperature', p.flashPoint, t.minFlashPoint, null, p.flashPoint !== null && p.flashPoint >= t.minFlashPoint - tol.temperature);
  const pMin = t.minInBandProbability ?? null;
  if (pMin !== null && pMin > 0) {
    const q = recipeInBand(P.library, lines, t.grade, P.band, P.method).plant.probability;
    add('probability in band', '', 'probability', q, pMin, null, q >= pMin);
  }
  const byId = new Map(lines.map((l) => [l.componentId, l.massFraction]));
  const sum = lines.reduce((s, l) => s + l.massFraction, 0);
  add('fractions sum to 1', '', 'fraction', sum, 1, 1, Math.abs(sum - 1) <= tol.fraction);
  P.components.forEach((k) => {
    const w = byId.get(k.id) ?? 0;
    if (!k.usable) {
      if (w > 0) add(`${k.label} not usable`, '', 'fraction', w, 0, 0, false);
      return;
    }
    if (k.min > 0 || k.max < 1) {
      add(`${k.label} ${k.fixedAdditive ? 'treat rate' : 'fraction'}`, '', 'fraction', w, k.min, k.max, w >= k.min - tol.fraction && w <= k.max + tol.fraction);
    }
  });
  return out;
}
