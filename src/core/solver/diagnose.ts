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
import { displayWords, type NumberDisplay } from '../words/display';
import { flashBlendingIndex, flashPointFromIndex } from '../blending/flash-point';
import { pourBlendingIndex, pourPointFromIndex } from '../blending/pour-point';
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
  type PreparedProblem,
} from './engine';
import { VI_MIN_KV100, viscosityIndex } from '../viscosity/viscosity-index';

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
  /**
   * Constraint groups whose removal alone makes the problem feasible (the band is listed only when
   * no other group is).
   */
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
  /** How the reason writes numbers and temperatures (default ".", °C). */
  display?: NumberDisplay;
}

/** A viscosity for a message: 3 significant figures, no trailing exponent ("." as decimal separator). */
export function fmtKv(kv: number): string {
  return displayWords().kv(kv);
}

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
  const words = displayWords(labels.display);
  const kv = words.kv;
  const pct = (f: number) => words.pct(f);
  const deg = (tC: number) => words.temp(tC);
  /** "<what> reachable in <where> is 12.3 °C", or, when the LP could not say (knife-edge tolerances), no number. */
  const reachable = (what: string, where: string, tC: number): string =>
    `${what} reachable in ${where} under the other constraints ${Number.isFinite(tC) ? `is ${deg(tC)}` : 'could not be determined'}`;
  const bandText = `${labels.product} (ν40 ${kv(t.kv40Min)}–${kv(t.kv40Max)} mm²/s)`;
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

  const solve = (groups: ReadonlySet<ConstraintGroup>, objective: EngineObjective, vi?: null) => {
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
      ? ` (the target band; the grade itself starts at ${kv(labels.gradeMin)})`
      : '';
  const maxNote =
    labels.gradeMax !== undefined && t.kv40Max < labels.gradeMax * (1 - 1e-9)
      ? ` (the target band; the grade itself ends at ${kv(labels.gradeMax)})`
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
      Math.abs(kvMax - h.kv40) > 0.005 * h.kv40 ? `; the heaviest blend${withOthers()} reaches ${kv(kvMax)} mm²/s` : '';
    return done({
      reason:
        `The heaviest available stock, ${h.label}, reaches only ${kv(h.kv40)} mm²/s at 40 °C${blendNote}; ` +
        `${labels.product} needs at least ${kv(t.kv40Min)} mm²/s${minNote} — add a heavier stock or a thickener.`,
      binding: 'kv40-min',
      suggestion:
        'Add a heavier stock (a high-viscosity Group II stock, a high-viscosity PAO or a bright stock) or a thickening polymer, or allow more of the heaviest stock.',
    });
  }
  if (kvMin > t.kv40Max * (1 + 1e-9)) {
    const l = comps[lightest]!;
    const blendNote =
      Math.abs(kvMin - l.kv40) > 0.005 * l.kv40 ? `; the lightest blend${withOthers()} reaches ${kv(kvMin)} mm²/s` : '';
    return done({
      reason:
        `The lightest available stock, ${l.label}, is ${kv(l.kv40)} mm²/s at 40 °C${blendNote}; ` +
        `${labels.product} needs at most ${kv(t.kv40Max)} mm²/s${maxNote} — add a lighter stock.`,
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
  for (const g of active) {
    // The band is relaxable whenever the other limits can be met at some viscosity; test it only
    // when no specific limit explains the failure (it is also the costliest test with a VI limit).
    if (g === 'band' && relaxable.length > 0) continue;
    const r = solve(without(g), costObjective(P));
    if (r.status === 'optimal') {
      relaxable.push(g);
    }
  }
  const g = relaxable[0];
  if (g === undefined) {
    const names = active.filter((x) => x !== 'band').map(groupName);
    return done({
      reason:
        `No single constraint is responsible: ${names.length ? names.join(', ') + ' and ' : ''}the viscosity band of ` +
        `${bandText} cannot be met together with these stocks (reachable ν40 ${kv(kvMin)}–${kv(kvMax)} mm²/s).`,
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
      const best = maxReachableVi(P, others, (n) => (lpCount += n));
      return done({
        reason:
          `The highest VI reachable in ${bandText} under the other constraints is ${words.num(best, 1)}; ` +
          `the minimum asked is ${words.num(t.minVi!, 1)}.`,
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
        hi.status === 'optimal' && lo.status === 'optimal' ? `${kv(lo.kv40)}–${kv(hi.kv40)} mm²/s` : 'outside the band';
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
 * Highest VI reachable under the given constraint groups (the VI condition itself off).
 *
 * VI rises with ν100 at fixed ν40 and falls with ν40 at fixed ν100 (ASTM D2270), so its maximum over
 * the achievable set F of blend coordinates (X40, X100) lies on F's upper-left boundary: the chain
 * of vertices from the lowest X40 to the highest X100. F is convex (a linear, or for volume-basis
 * rules a projective, image of the feasible polytope), so the chain is found by LPs in the
 * directions normal to its edges, and every point of an edge is achievable. The VI is then
 * maximised along each edge by golden-section search (ASTM D2270 via the core).
 */
function maxReachableVi(P: PreparedProblem, groups: ReadonlySet<ConstraintGroup>, count: (n: number) => void): number {
  const coords = P.coords;
  interface Pt {
    x40: number;
    x100: number;
  }
  const extreme = (a100: number, a40: number): Pt | null => {
    // maximise a100·X100 − a40·X40 (a ratio over Σ cᵢwᵢ; linear after normalising).
    const num = new Float64Array(P.n);
    for (let i = 0; i < P.n; i++) num[i] = P.c[i]! * (a100 * P.x100[i]! - a40 * P.x40[i]!);
    const r = solvePrepared(P, null, { groups, objective: { kind: 'ratio', sense: 'maximize', num, den: P.c }, noTieBreak: true, vi: null });
    count(r.lpCount);
    if (r.status !== 'optimal') return null;
    return { x40: coords.toX(r.kv40), x100: coords.toX(r.kv100) };
  };
  const viAt = (p: Pt): number => {
    const kv40 = coords.toKv(p.x40);
    const kv100 = coords.toKv(p.x100);
    return kv100 >= VI_MIN_KV100 && kv100 < kv40 ? viscosityIndex(kv40, kv100) : Number.NEGATIVE_INFINITY;
  };
  const left = extreme(1e-6, 1); // lowest X40, then highest X100
  const top = extreme(1, 1e-6); // highest X100, then lowest X40
  if (!left || !top) return Number.NaN;
  const chain: Pt[] = [left];
  const walk = (p1: Pt, p2: Pt, depth: number): void => {
    const d40 = p2.x40 - p1.x40;
    const d100 = p2.x100 - p1.x100;
    if (depth > 12 || !(d40 > 1e-12) || !(d100 > 1e-12)) return;
    const q = extreme(d40, d100);
    if (q) {
      const gain = d40 * q.x100 - d100 * q.x40 - (d40 * p1.x100 - d100 * p1.x40);
      if (gain > 1e-9 * (Math.abs(d40) + Math.abs(d100))) {
        walk(p1, q, depth + 1);
        chain.push(q);
        walk(q, p2, depth + 1);
      }
    }
  };
  walk(left, top, 0);
  chain.push(top);
  let best = Number.NEGATIVE_INFINITY;
  for (const p of chain) best = Math.max(best, viAt(p));
  const phi = (Math.sqrt(5) - 1) / 2;
  for (let k = 0; k + 1 < chain.length; k++) {
    const a = chain[k]!;
    const b = chain[k + 1]!;
    const at = (t: number): number => viAt({ x40: a.x40 + t * (b.x40 - a.x40), x100: a.x100 + t * (b.x100 - a.x100) });
    let lo = 0;
    let hi = 1;
    let t1 = hi - phi * (hi - lo);
    let t2 = lo + phi * (hi - lo);
    let f1 = at(t1);
    let f2 = at(t2);
    for (let it = 0; it < 40; it++) {
      if (f1 < f2) {
        lo = t1;
        t1 = t2;
        f1 = f2;
        t2 = lo + phi * (hi - lo);
        f2 = at(t2);
      } else {
        hi = t2;
        t2 = t1;
        f2 = f1;
        t1 = hi - phi * (hi - lo);
        f1 = at(t1);
      }
    }
    best = Math.max(best, f1, f2);
  }
  return best;
}

export { GROUP_BINDING };
