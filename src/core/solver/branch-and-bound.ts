/**
 * The branch and bound that makes the minimum-VI condition exact. The VI condition is not linear in
 * the fractions; `vi-boundary.ts` bounds it by chords of h on X40 intervals, each node's LP is a
 * relaxation, and best-first search returns the first node whose solution meets the true VI.
 */
import { viscosityIndexUnchecked, VI_MIN_KV100 } from '../viscosity/viscosity-index';
import type { PreparedProblem } from './prepared';
import { groupOn, viBandFloor, viRoot } from './prepared';
import { solveNodeInto, threeStockPath, type NodeSolution, type SolveContext } from './rows';
import type { ViChord } from './vi-boundary';
import type { ExtraRow } from './objectives';

const NO_FRACTIONS = new Float64Array(0);
const NO_CHORDS: readonly ViChord[] = [];
/** The one row X100 ≥ alpha (beta 0) of the floor test in {@link optimise} (module scratch). */
const FLOOR_ROW: ViChord[] = [{ alpha: 0, beta: 0 }];

/** VI accepted as feasible: VI ≥ minVi − this (the tolerance is 0.01; half of it is kept in reserve). */
export const VI_ACCEPT_TOLERANCE = 0.005;
/** Cap on LPs in one branch and bound (never reached in tests; a safety net). */
const MAX_LPS = 120;
/** Cap on rounds of lazy cuts while solving one node (a safety net; see {@link LazyConstraint}). */
const MAX_LAZY_CUT_ROUNDS = 200;

/**
 * A condition checked on each node's solution rather than written up front (a "lazy constraint"),
 * e.g. the probability of landing in band (`qc/robust.ts`). Its feasible set must be convex, and
 * every row it adds must hold for every blend that meets it (an outer approximation, possibly in a
 * lifted space of extra LP variables), so that a node LP with its rows is still a relaxation and the
 * branch and bound stays exact.
 */
export interface LazyConstraint {
  /**
   * Start one optimisation over `vars`: the number of lifted LP variables the constraint's rows use
   * (appended after the component and auxiliary variables) and the rows present from the first LP.
   */
  begin(vars: readonly number[]): { lift: number; rows: ExtraRow[] };
  /**
   * null when the node solution meets the condition; otherwise rows that every feasible blend
   * satisfies and this solution violates.
   *
   * @param w - the solution's fractions, aligned with `vars`, summing to 1
   * @param x - the raw LP solution (component variables, auxiliaries, then the lifted variables)
   * @param liftOffset - index in x of the first lifted variable
   */
  separate(vars: readonly number[], w: Float64Array, x: Float64Array, liftOffset: number): ExtraRow[] | null;
}

/** A solve context with an optional lazy constraint. */
export interface OptimiseContext extends SolveContext {
  lazy?: LazyConstraint | null;
}

/**
 * Normalised mass fractions of a node solution, aligned with ctx.vars; null when the LP returned no
 * blend at all (every fraction 0: numerically degenerate data). Written into `out` when given
 * (length ≥ nv; the result is then a view of its first nv entries only if out.length = nv).
 */
export function fractions(x: Float64Array, nv: number, out?: Float64Array): Float64Array | null {
  const w = out ?? new Float64Array(nv);
  let sum = 0;
  for (let j = 0; j < nv; j++) {
    const v = x[j]! > 0 ? x[j]! : 0;
    w[j] = v;
    sum += v;
  }
  if (!(sum > 0)) return null;
  for (let j = 0; j < nv; j++) w[j] = w[j]! / sum;
  return w;
}

/** The blend's X40 and X100 of the last {@link blendX} call (module scratch: the core is synchronous). */
const BX = { x40: Number.NaN, x100: Number.NaN };

/**
 * Blend X40 and X100 of fractions over ctx.vars (Σ cᵢwᵢXᵢ / Σ cᵢwᵢ), as a module object that the
 * next call overwrites (read both numbers before the next call; no object per call).
 */
export function blendX(P: PreparedProblem, vars: readonly number[], w: Float64Array): { readonly x40: number; readonly x100: number } {
  let sc = 0;
  let s40 = 0;
  let s100 = 0;
  for (let j = 0; j < vars.length; j++) {
    const i = vars[j]!;
    const cw = P.c[i]! * w[j]!;
    sc += cw;
    s40 += cw * P.x40[i]!;
    s100 += cw * P.x100[i]!;
  }
  BX.x40 = s40 / sc;
  BX.x100 = s100 / sc;
  return BX;
}

/** ν40, ν100 [mm²/s] and VI of the last {@link viOf} call (module scratch: the core is synchronous). */
const SEEN = { kv40: Number.NaN, kv100: Number.NaN, vi: Number.NaN };

/** Unrounded VI of a blend from its coordinates; −Infinity where D2270 defines none. */
export function viOf(P: PreparedProblem, x40: number, x100: number): number {
  const kv40 = P.coords.toKvRaw(x40);
  const kv100 = P.coords.toKvRaw(x100);
  SEEN.kv40 = kv40;
  SEEN.kv100 = kv100;
  SEEN.vi = Number.NEGATIVE_INFINITY;
  if (!Number.isFinite(kv40) || !Number.isFinite(kv100)) return Number.NEGATIVE_INFINITY;
  if (!(kv100 >= VI_MIN_KV100) || !(kv100 < kv40)) return Number.NEGATIVE_INFINITY;
  return (SEEN.vi = viscosityIndexUnchecked(kv40, kv100));
}

/** The outcome without an optimum (built only when it is the answer). */
function noOptimum(status: 'infeasible' | 'failed', lpCount: number): OptimiseOutcome {
  return { status, w: NO_FRACTIONS, value: Number.NaN, lpCount };
}

/** An optimal outcome whose fractions passed the VI check, with the check's ν40, ν100 and VI. */
function checkedOptimal(w: Float64Array, value: number, lpCount: number): OptimiseOutcome {
  return { status: 'optimal', w, value, lpCount, kv40: SEEN.kv40, kv100: SEEN.kv100, vi: SEEN.vi };
}

export interface OptimiseOutcome {
  status: 'optimal' | 'infeasible' | 'failed';
  /** Mass fractions aligned with ctx.vars (optimal only). */
  w: Float64Array;
  /** Objective value: the ratio (or the closest distance) at the optimum. */
  value: number;
  lpCount: number;
  /**
   * Where the VI condition was checked on `w`: the blend's ν40, ν100 [mm²/s] and unrounded VI as
   * the check computed them (so the caller need not compute them again).
   */
  kv40?: number;
  kv100?: number;
  vi?: number;
}

/**
 * Solve one node's LP (into the LP scratch memory, as `solveNodeInto`); with a lazy constraint, add
 * its cuts (to the shared `ctx.extra` pool, valid for every node) and re-solve until the node's
 * solution meets it. The node value stays a lower bound, since each cut only removes blends that fail
 * the condition.
 */
function solveWith(ctx: OptimiseContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[], count: { lps: number }): NodeSolution {
  let sol = solveNodeInto(ctx, a, b, bandRows, chords);
  count.lps++;
  const lazy = ctx.lazy;
  if (!lazy) return sol;
  for (let k = 0; sol.status === 'optimal'; k++) {
    const w = fractions(sol.x, ctx.vars.length);
    if (!w) return sol;
    const cuts = lazy.separate(ctx.vars, w, sol.x, ctx.vars.length + (ctx.withAux ? 3 : 0));
    if (!cuts) return sol;
    if (k >= MAX_LAZY_CUT_ROUNDS) return { status: 'failed', x: sol.x, objective: Number.NaN };
    (ctx.extra as ExtraRow[]).push(...cuts);
    sol = solveNodeInto(ctx, a, b, bandRows, chords);
    count.lps++;
  }
  return sol;
}

/** An open node of the VI branch and bound: an X40 interval, h at its ends and its LP solution. */
interface BbNode {
  a: number;
  b: number;
  ha: number;
  hb: number;
  sol: NodeSolution;
}

/**
 * Solve the node LP on [na, nb] with the given VI relaxation lines and keep it in `open` when
 * optimal (its solution copied out of the LP scratch memory). Returns true when the LP solver failed.
 */
function addNode(
  ctx: OptimiseContext,
  open: BbNode[],
  count: { lps: number },
  na: number,
  nb: number,
  ha: number,
  hb: number,
  chords: readonly ViChord[],
): boolean {
  const sol = solveWith(ctx, na, nb, true, chords, count);
  if (sol.status === 'optimal') open.push({ a: na, b: nb, ha, hb, sol: { status: sol.status, x: sol.x.slice(), objective: sol.objective } });
  return sol.status === 'failed';
}

/**
 * Optimise over ctx: one LP when there is no VI condition; otherwise best-first branch and bound
 * over X40 intervals. Each node's LP replaces h by its padded chord on the node's interval, so it
 * is a relaxation of the true problem restricted to that interval; the union of the children is
 * the parent's interval, so the smallest open node value is a lower bound on the true optimum at all
 * times. The first node popped whose solution satisfies the true VI condition (recomputed by
 * ASTM D2270, within {@link VI_ACCEPT_TOLERANCE}) is therefore optimal: its value equals the global
 * lower bound. A node whose solution violates the condition is split at the solution's X40; the
 * chord gap shrinks quadratically with the interval, so few splits are needed.
 */
export function optimise(context: OptimiseContext): OptimiseOutcome {
  // With a lazy constraint the node LPs share one growing pool of cuts (a private copy of extra).
  let ctx: OptimiseContext = context;
  if (context.lazy) {
    const start = context.lazy.begin(context.vars);
    ctx = { ...context, extra: [...context.extra, ...start.rows], lift: start.lift };
  }
  const { P, vars, groups } = ctx;
  const count = { lps: 0 };
  const nv = vars.length;
  if (nv === 0) return noOptimum('infeasible', 0);
  const bandOn = groupOn(groups, 'band');
  let a = P.bandA;
  let b = P.bandB;
  if (!bandOn) {
    a = Number.POSITIVE_INFINITY;
    b = Number.NEGATIVE_INFINITY;
    for (const i of vars) {
      a = Math.min(a, P.x40[i]!);
      b = Math.max(b, P.x40[i]!);
    }
  }
  const vi = groupOn(groups, 'vi') ? ctx.vi : null;
  const sign = ctx.objective.kind === 'ratio' && ctx.objective.sense === 'maximize' ? -1 : 1;
  // First LP without the VI condition: a relaxation; if its optimum already meets the VI it is
  // optimal, and the (costlier) VI relaxation is never built. Most recipes end here.
  const plain = solveWith(ctx, a, b, bandOn, NO_CHORDS, count);
  if (plain.status !== 'optimal') return noOptimum(plain.status, count.lps);
  const w0 = fractions(plain.x, nv);
  if (!w0) return noOptimum('failed', count.lps);
  if (!vi) return { status: 'optimal', w: w0, value: plain.objective, lpCount: count.lps };
  const bx0 = blendX(P, vars, w0);
  if (viOf(P, bx0.x40, bx0.x100) >= vi.minVi - VI_ACCEPT_TOLERANCE) return checkedOptimal(w0, plain.objective, count.lps);
  const minAccept = vi.minVi - VI_ACCEPT_TOLERANCE;
  const own = bandOn && vi === P.vi;
  if (own && P.cache.viRoot === undefined && threeStockPath(ctx)) {
    // Before the root relaxation is first built (h at both band ends and its chords, about 1 µs):
    // h rises with X40, so every blend in band with VI ≥ minVi has X100 ≥ h(X(ν_lo)), the floor
    // of `viBandFloor`. One LP with that row, lowered by the margin of the cheap test in
    // `solvePrepared` (≈ 0.05 VI, more than VI_ACCEPT_TOLERANCE), is a relaxation of every node the
    // branch and bound could accept: infeasible, it proves the problem infeasible without the
    // relaxation. Only where the LP is a three-variable one (`plane-lp3.ts`, about 0.15 µs): on
    // the engine bench's problems it settled 4 of the 7 three-stock problems whose root relaxation
    // is infeasible, and none of the 3 four-stock ones, where each LP costs a simplex. (Once the
    // root relaxation is cached this LP would only add to its own.)
    FLOOR_ROW[0]!.alpha = viBandFloor(P)! - 1e-3 / P.coords.rowScale;
    const floor = solveWith(ctx, a, b, true, FLOOR_ROW, count);
    if (floor.status !== 'optimal') return noOptimum(floor.status, count.lps);
  }
  const open: BbNode[] = [];
  const root = own ? viRoot(P) : null;
  let failed: boolean;
  if (root) failed = addNode(ctx, open, count, a, b, root.hA, root.hB, root.chords);
  else {
    const ha = vi.h(a);
    const hb = vi.h(b);
    failed = addNode(ctx, open, count, a, b, ha, hb, vi.relaxation(a, ha, b, hb));
  }
  const maxLps = ctx.lazy ? 20 * MAX_LPS : MAX_LPS; // lazy cuts add LPs without adding nodes
  while (open.length > 0 && count.lps < maxLps) {
    // Best-first: the open node with the smallest (signed) objective.
    let best = 0;
    for (let k = 1; k < open.length; k++) {
      if (sign * open[k]!.sol.objective < sign * open[best]!.sol.objective) best = k;
    }
    const node = open[best]!;
    open.splice(best, 1);
    const w = fractions(node.sol.x, nv);
    if (!w) {
      failed = true;
      continue;
    }
    const bx = blendX(P, vars, w);
    if (viOf(P, bx.x40, bx.x100) >= minAccept) return checkedOptimal(w, node.sol.objective, count.lps);
    // Split at the solution's X40, kept away from the ends so both children shrink.
    const span = node.b - node.a;
    if (!(span > 1e-10)) continue; // a point interval whose chord is exact cannot improve
    const split = Math.min(node.b - 0.02 * span, Math.max(node.a + 0.02 * span, bx.x40));
    const hs = vi.h(split, node.ha);
    if (addNode(ctx, open, count, node.a, split, node.ha, hs, vi.relaxation(node.a, node.ha, split, hs))) failed = true;
    if (addNode(ctx, open, count, split, node.b, hs, node.hb, vi.relaxation(split, hs, node.b, node.hb))) failed = true;
  }
  return noOptimum(failed && open.length === 0 ? 'failed' : 'infeasible', count.lps);
}

// ---------------------------------------------------------------------------------------------
// Public engine entry points
