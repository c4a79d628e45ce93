/**
 * Why a blend problem has no solution, in words a chemist accepts.
 *
 * The diagnosis works from achievable ranges, not from solver internals:
 * 1. nothing usable, or per-component limits that cannot add up to 100 %;
 * 2. the ν40 range reachable at all with the available stocks (bounds and additive only): if the
 *    heaviest blend stays below the band (or the lightest above it), that is the reason;
 * 3. otherwise each constraint group is switched off in turn; one whose removal makes the problem
 *    feasible is binding, and the reason quotes the best value reachable for it under all the other
 *    constraints (highest VI, lowest aniline point, least polymer, …) against its limit.
 */
import { flashBlendingIndex, flashPointFromIndex } from '../flash-point';
import { pourBlendingIndex, pourPointFromIndex } from '../pour-point';
import {
  ALL_GROUPS,
  anilineObjective,
  costObjective,
  flashObjective,
  polymerObjective,
  pourObjective,
  solvePrepared,
  x40Objective,
  type ConstraintGroup,
  type EngineObjective,
  type EngineOptimal,
  type PreparedProblem,
} from './engine';
import { ViBoundary } from './vi-boundary';

export interface Diagnosis {
  /** What prevents a recipe, with the numbers. */
  reason: string;
  /**
   * The binding constraint: 'components', 'bounds', 'kv40-min', 'kv40-max', 'band', 'min-vi',
   * 'max-aniline', 'max-polymer', 'max-pour', 'min-flash', 'additive', or 'combination'.
   */
  binding: string;
  /** What would fix it. */
  suggestion: string;
  /** Every constraint group whose removal alone makes the problem feasible. */
  relaxable: ConstraintGroup[];
  lpCount: number;
}

/** Wording of the viscosity target, e.g. "VG 320" and "the target band 304–336 mm²/s". */
export interface DiagnosisLabels {
  /** Name of what is being made, e.g. "VG 320" or "the target". */
  product: string;
  /** The grade's own ν40 limits [mm²/s], when the band is a tighter target band inside it. */
  gradeMin?: number;
  gradeMax?: number;
}

/** A viscosity for a message: 3 significant figures, no trailing exponent. */
export function fmtKv(kv: number): string {
  if (kv >= 100) return kv.toFixed(0);
  if (kv >= 10) return kv.toFixed(1);
  return kv.toFixed(2);
}
const pct = (f: number): string => `${(100 * f).toFixed(1)} %`;
const deg = (t: number): string => `${t.toFixed(1)} °C`;
/** "<what> reachable in <where> is 12.3 °C", or, when the LP could not say (knife-edge tolerances), no number. */
const reachable = (what: string, where: string, t: number): string =>
  `${what} reachable in ${where} under the other constraints ${Number.isFinite(t) ? `is ${deg(t)}` : 'could not be determined'}`;

const GROUP_BINDING: Record<ConstraintGroup, string> = {
  band: 'band',
  vi: 'min-vi',
  aniline: 'max-aniline',
  polymer: 'max-polymer',
  bounds: 'bounds',
  additive: 'additive',
  pour: 'max-pour',
  flash: 'min-flash',
};

/** Order in which binding groups are reported (most specific first; the band last). */
const REPORT_ORDER: readonly ConstraintGroup[] = ['polymer', 'vi', 'aniline', 'pour', 'flash', 'additive', 'bounds', 'band'];

/**
 * Diagnose an infeasible prepared problem.
 *
 * @param P - the prepared problem (already known to be infeasible)
 * @param labels - wording for the product
 * @returns reason, binding constraint, suggestion
 */
export function diagnoseInfeasible(P: PreparedProblem, labels: DiagnosisLabels): Diagnosis {
  const t = P.targets;
  let lpCount = 0;
  const comps = P.components;
  const usable = P.usableIndices;
  const bandText = `${labels.product} (ν40 ${fmtKv(t.kv40Min)}–${fmtKv(t.kv40Max)} mm²/s)`;
  const done = (d: Omit<Diagnosis, 'lpCount' | 'relaxable'> & { relaxable?: ConstraintGroup[] }): Diagnosis => ({
    relaxable: [],
    ...d,
    lpCount,
  });

  // 1. Nothing to blend, or limits that cannot add up.
  if (usable.length === 0) {
    return done({
      reason:
        'No component can be used: every stock is withdrawn or excluded (a pour-point, flash-point or aniline-point ' +
        'limit leaves out stocks without that measured value).',
      binding: 'components',
      suggestion: 'Add available stocks to the library or mark a stock as available.',
    });
  }
  for (const i of P.forced) {
    const k = comps[i]!;
    if (!k.usable) {
      return done({
        reason: `${k.label} must be at least ${pct(k.min)} of the blend but cannot be used (withdrawn or excluded).`,
        binding: k.fixedAdditive ? 'additive' : 'bounds',
        suggestion: `Remove the minimum for ${k.label} or choose an available component.`,
      });
    }
  }
  const sumMin = usable.reduce((s, i) => s + comps[i]!.min, 0);
  if (sumMin > 1 + 1e-9) {
    return done({
      reason: `The minimum fractions (additive included) add up to ${pct(sumMin)}, more than the whole blend.`,
      binding: 'bounds',
      suggestion: 'Lower some of the per-component minimum fractions.',
    });
  }
  const sumMax = usable.reduce((s, i) => s + comps[i]!.max, 0);
  if (sumMax < 1 - 1e-9) {
    return done({
      reason: `The maximum fractions of the available components add up to only ${pct(sumMax)}; a blend needs 100 %.`,
      binding: 'bounds',
      suggestion: 'Raise some per-component maximum fractions or add a stock.',
    });
  }

  const solve = (groups: ReadonlySet<ConstraintGroup>, objective: EngineObjective, vi?: ViBoundary | null) => {
    const r = solvePrepared(P, null, { groups, objective, noTieBreak: true, ...(vi === undefined ? {} : { vi }) });
    lpCount += r.lpCount;
    return r;
  };
  const without = (...g: ConstraintGroup[]): Set<ConstraintGroup> => new Set(ALL_GROUPS.filter((x) => !g.includes(x)));

  // 2. The viscosity reachable at all (only bounds and the additive).
  const structural = new Set<ConstraintGroup>(['bounds', 'additive']);
  const hiRes = solve(structural, x40Objective(P, 'maximize'), null);
  const loRes = solve(structural, x40Objective(P, 'minimize'), null);
  if (hiRes.status !== 'optimal' || loRes.status !== 'optimal') {
    return done({
      reason: 'The per-component limits and the additive treat rate cannot be met together.',
      binding: 'bounds',
      suggestion: 'Check the minimum and maximum fractions and the additive treat rate.',
    });
  }
  const kvMax = hiRes.kv40;
  const kvMin = loRes.kv40;
  // The heaviest / lightest STOCK: the fixed additive is not a stock one can add more of.
  const stocks = usable.filter((i) => !comps[i]!.fixedAdditive);
  const pool = stocks.length > 0 ? stocks : usable;
  const heaviest = pool.reduce((a, i) => (comps[i]!.kv40 > comps[a]!.kv40 ? i : a), pool[0]!);
  const lightest = pool.reduce((a, i) => (comps[i]!.kv40 < comps[a]!.kv40 ? i : a), pool[0]!);
  const minNote =
    labels.gradeMin !== undefined && t.kv40Min > labels.gradeMin * (1 + 1e-9)
      ? ` (the target band; the grade itself starts at ${fmtKv(labels.gradeMin)})`
      : '';
  const maxNote =
    labels.gradeMax !== undefined && t.kv40Max < labels.gradeMax * (1 - 1e-9)
      ? ` (the target band; the grade itself ends at ${fmtKv(labels.gradeMax)})`
      : '';
  const withOthers = (): string => {
    const notes: string[] = [];
    const add = P.forced.filter((i) => comps[i]!.fixedAdditive);
    for (const i of add) notes.push(`the additive package ${comps[i]!.label} at ${pct(comps[i]!.min)}`);
    if (usable.some((i) => !comps[i]!.fixedAdditive && (comps[i]!.min > 0 || comps[i]!.max < 1))) notes.push('the per-component limits');
    return notes.length ? ` with ${notes.join(' and ')}` : '';
  };
  if (kvMax < t.kv40Min * (1 - 1e-9)) {
    const h = comps[heaviest]!;
    const blendNote =
      Math.abs(kvMax - h.kv40) > 0.005 * h.kv40 ? `; the heaviest blend${withOthers()} reaches ${fmtKv(kvMax)} mm²/s` : '';
    return done({
      reason:
        `The heaviest available stock, ${h.label}, reaches only ${fmtKv(h.kv40)} mm²/s at 40 °C${blendNote}; ` +
        `${labels.product} needs at least ${fmtKv(t.kv40Min)} mm²/s${minNote} — add a heavier stock or a thickener.`,
      binding: 'kv40-min',
      suggestion:
        'Add a heavier stock (a high-viscosity Group II stock, a high-viscosity PAO or a bright stock) or a thickening polymer, or allow more of the heaviest stock.',
    });
  }
  if (kvMin > t.kv40Max * (1 + 1e-9)) {
    const l = comps[lightest]!;
    const blendNote =
      Math.abs(kvMin - l.kv40) > 0.005 * l.kv40 ? `; the lightest blend${withOthers()} reaches ${fmtKv(kvMin)} mm²/s` : '';
    return done({
      reason:
        `The lightest available stock, ${l.label}, is ${fmtKv(l.kv40)} mm²/s at 40 °C${blendNote}; ` +
        `${labels.product} needs at most ${fmtKv(t.kv40Max)} mm²/s${maxNote} — add a lighter stock.`,
      binding: 'kv40-max',
      suggestion: 'Add a lighter base stock, or allow more of the lightest one.',
    });
  }

  // 3. Switch off one constraint group at a time.
  const hasPolymer = usable.some((i) => comps[i]!.polymer);
  const hasBounds = usable.some((i) => !comps[i]!.fixedAdditive && (comps[i]!.min > 0 || comps[i]!.max < 1));
  const hasAdditive = usable.some((i) => comps[i]!.fixedAdditive);
  const active: ConstraintGroup[] = REPORT_ORDER.filter((g) => {
    switch (g) {
      case 'vi':
        return t.minVi !== null;
      case 'aniline':
        return t.maxAnilinePoint !== null;
      case 'polymer':
        return t.maxPolymerFraction !== null && hasPolymer;
      case 'pour':
        return t.maxPourPoint !== null;
      case 'flash':
        return t.minFlashPoint !== null;
      case 'bounds':
        return hasBounds;
      case 'additive':
        return hasAdditive;
      case 'band':
        return true;
    }
  });
  const relaxable: ConstraintGroup[] = [];
  const relaxed = new Map<ConstraintGroup, EngineOptimal>();
  for (const g of active) {
    const r = solve(without(g), costObjective(P));
    if (r.status === 'optimal') {
      relaxable.push(g);
      relaxed.set(g, r);
    }
  }
  const g = relaxable[0];
  if (g === undefined) {
    const names = active.filter((x) => x !== 'band').map(groupName);
    return done({
      reason:
        `No single constraint is responsible: ${names.length ? names.join(', ') + ' and ' : ''}the viscosity band of ` +
        `${bandText} cannot be met together with these stocks (reachable ν40 ${fmtKv(kvMin)}–${fmtKv(kvMax)} mm²/s).`,
      binding: 'combination',
      suggestion: 'Relax several limits at once, or add stocks that bring the missing properties.',
    });
  }
  const others = without(g);
  switch (g) {
    case 'polymer': {
      const r = solve(others, polymerObjective(P));
      const need = r.status === 'optimal' ? polymerFractionOf(P, r.massFractions) : Number.NaN;
      return done({
        reason: Number.isFinite(need)
          ? `Meeting ${bandText} under the other constraints needs at least ${pct(need)} polymer; ` +
            `the cap is ${pct(t.maxPolymerFraction!)}.`
          : `Meeting ${bandText} under the other constraints needs more polymer than the cap of ${pct(t.maxPolymerFraction!)}.`,
        binding: 'max-polymer',
        suggestion: 'Raise the polymer cap, or add a heavier base stock so that less thickener is needed.',
        relaxable,
      });
    }
    case 'vi': {
      const best = maxReachableVi(P, others, relaxed.get('vi')!, (n) => (lpCount += n));
      return done({
        reason:
          `The highest VI reachable in ${bandText} under the other constraints is ${best.toFixed(1)}; ` +
          `the minimum asked is ${t.minVi!.toFixed(1)}.`,
        binding: 'min-vi',
        suggestion: 'Add a higher-VI stock (Group III, PAO) or a VI-improving polymer, or lower the minimum VI.',
        relaxable,
      });
    }
    case 'aniline': {
      const r = solve(others, anilineObjective(P));
      const best = r.status === 'optimal' && r.anilinePoint !== null ? r.anilinePoint : Number.NaN;
      return done({
        reason:
          `${reachable('The lowest aniline point', bandText, best)}; ` +
          `the maximum allowed is ${deg(t.maxAnilinePoint!)} (a lower aniline point means more solvency). ` +
          'Base stocks without an aniline point are left out.',
        binding: 'max-aniline',
        suggestion:
          'Add a solvency booster (an alkylated naphthalene, an ester or a more aromatic stock), or raise the maximum aniline point.',
        relaxable,
      });
    }
    case 'pour': {
      const r = solve(others, pourObjective(P));
      const best = r.status === 'optimal' ? pourPointFromIndex(r.objectiveValue * pourBlendingIndex(t.maxPourPoint!)) : Number.NaN;
      return done({
        reason:
          `${reachable('The lowest pour-point estimate', bandText, best)}; ` +
          `the limit is ${deg(t.maxPourPoint!)}. Components without a pour point are left out.`,
        binding: 'max-pour',
        suggestion: 'Add a stock with a lower pour point (PAO, Group III) or a pour-point depressant, or relax the limit.',
        relaxable,
      });
    }
    case 'flash': {
      const r = solve(others, flashObjective(P));
      const best = r.status === 'optimal' ? flashPointFromIndex(r.objectiveValue * flashBlendingIndex(t.minFlashPoint!)) : Number.NaN;
      return done({
        reason:
          `${reachable('The highest flash-point estimate', bandText, best)}; ` +
          `the minimum is ${deg(t.minFlashPoint!)}. Components without a flash point are left out.`,
        binding: 'min-flash',
        suggestion: 'Use heavier, higher-flash stocks, or relax the minimum flash point.',
        relaxable,
      });
    }
    case 'additive': {
      const a = usable.filter((i) => comps[i]!.fixedAdditive).map((i) => `${comps[i]!.label} at ${pct(comps[i]!.min)}`);
      return done({
        reason: `With the additive package ${a.join(', ')}, no blend meets the other constraints; without it one would.`,
        binding: 'additive',
        suggestion: 'Check the treat rate and the additive’s viscosity and density, or rebalance the base stocks.',
        relaxable,
      });
    }
    case 'bounds': {
      const list = usable
        .filter((i) => !comps[i]!.fixedAdditive && (comps[i]!.min > 0 || comps[i]!.max < 1))
        .map((i) => {
          const k = comps[i]!;
          const parts: string[] = [];
          if (k.min > 0) parts.push(`≥ ${pct(k.min)}`);
          if (k.max < 1) parts.push(`≤ ${pct(k.max)}`);
          return `${k.label} ${parts.join(' and ')}`;
        });
      return done({
        reason: `The per-component limits (${list.join('; ')}) prevent a blend that meets ${bandText} and the other constraints.`,
        binding: 'bounds',
        suggestion: 'Relax the per-component minimum or maximum fractions.',
        relaxable,
      });
    }
    case 'band':
    default: {
      const hi = solve(others, x40Objective(P, 'maximize'));
      const lo = solve(others, x40Objective(P, 'minimize'));
      const range =
        hi.status === 'optimal' && lo.status === 'optimal' ? `${fmtKv(lo.kv40)}–${fmtKv(hi.kv40)} mm²/s` : 'outside the band';
      return done({
        reason: `Under the other constraints the blends reach ν40 ${range} only; ${bandText} is out of reach.`,
        binding: 'band',
        suggestion: 'Widen the tolerance around the target, or add stocks that meet the other limits at this viscosity.',
        relaxable,
      });
    }
  }
}

function groupName(g: ConstraintGroup): string {
  switch (g) {
    case 'vi':
      return 'the minimum VI';
    case 'aniline':
      return 'the maximum aniline point';
    case 'polymer':
      return 'the polymer cap';
    case 'pour':
      return 'the pour-point limit';
    case 'flash':
      return 'the flash-point limit';
    case 'bounds':
      return 'the per-component limits';
    case 'additive':
      return 'the additive treat rate';
    case 'band':
      return 'the viscosity band';
  }
}

function polymerFractionOf(P: PreparedProblem, w: Float64Array): number {
  let s = 0;
  for (let i = 0; i < P.n; i++) if (P.components[i]!.polymer) s += w[i]!;
  return s;
}

/**
 * Highest VI reachable under the given groups, by bisection on the minimum VI (feasibility is
 * monotone in it): starts from the VI of a feasible recipe without the VI condition.
 */
function maxReachableVi(
  P: PreparedProblem,
  groups: ReadonlySet<ConstraintGroup>,
  start: { vi: number | null },
  count: (n: number) => void,
): number {
  let lo = start.vi ?? 0;
  let hi = P.targets.minVi!;
  const withVi = new Set(groups);
  withVi.add('vi');
  for (let k = 0; k < 14 && hi - lo > 0.01; k++) {
    const m = 0.5 * (lo + hi);
    const r = solvePrepared(P, null, { groups: withVi, objective: costObjective(P), noTieBreak: true, vi: new ViBoundary(m, P.coords) });
    count(r.lpCount);
    if (r.status === 'optimal') lo = Math.max(m, r.vi ?? m);
    else hi = m;
  }
  return lo;
}

export { GROUP_BINDING };
