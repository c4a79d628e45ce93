/**
 * The branch and bound that makes the minimum-VI condition exact. The VI condition is not linear in
 * the fractions; `vi-boundary.ts` bounds it by chords of h on X40 intervals, each node's LP is a
 * relaxation, and best-first search returns the first node whose solution meets the true VI.
 */
import { viscosityIndex, VI_MIN_KV100 } from '../viscosity/viscosity-index';
import type { PreparedProblem } from './prepared';
import { viRoot } from './prepared';
import { solveNodeInto, type NodeSolution, type SolveContext } from './rows';
import type { ViChord } from './vi-boundary';

const NO_FRACTIONS = new Float64Array(0);
const NO_CHORDS: readonly ViChord[] = [];

/** VI accepted as feasible: VI ≥ minVi − this (the tolerance is 0.01; half of it is kept in reserve). */
export const VI_ACCEPT_TOLERANCE = 0.005;
/** Cap on LPs in one branch and bound (never reached in tests; a safety net). */
const MAX_LPS = 120;

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

/** Blend X40 and X100 of fractions over ctx.vars. */
export function blendX(P: PreparedProblem, vars: readonly number[], w: Float64Array): { x40: number; x100: number } {
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
  return { x40: s40 / sc, x100: s100 / sc };
}

/** Unrounded VI of a blend from its coordinates; −Infinity where D2270 defines none. */
export function viOf(P: PreparedProblem, x40: number, x100: number): number {
  const kv40 = P.coords.toKvRaw(x40);
  const kv100 = P.coords.toKvRaw(x100);
  if (!Number.isFinite(kv40) || !Number.isFinite(kv100)) return Number.NEGATIVE_INFINITY;
  if (!(kv100 >= VI_MIN_KV100) || !(kv100 < kv40)) return Number.NEGATIVE_INFINITY;
  return viscosityIndex(kv40, kv100);
}

export interface OptimiseOutcome {
  status: 'optimal' | 'infeasible' | 'failed';
  /** Mass fractions aligned with ctx.vars (optimal only). */
  w: Float64Array;
  /** Objective value: the ratio (or the closest distance) at the optimum. */
  value: number;
  lpCount: number;
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
export function optimise(ctx: SolveContext): OptimiseOutcome {
  const { P, vars, groups } = ctx;
  const nv = vars.length;
  const empty = { status: 'infeasible' as const, w: NO_FRACTIONS, value: Number.NaN, lpCount: 0 };
  if (nv === 0) return empty;
  const bandOn = groups.has('band');
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
  const vi = groups.has('vi') ? ctx.vi : null;
  const sign = ctx.objective.kind === 'ratio' && ctx.objective.sense === 'maximize' ? -1 : 1;
  // First LP without the VI condition: a relaxation; if its optimum already meets the VI it is
  // optimal, and the (costlier) VI relaxation is never built. Most recipes end here.
  const plain = solveNodeInto(ctx, a, b, bandOn, NO_CHORDS);
  if (plain.status !== 'optimal') return { ...empty, status: plain.status, lpCount: 1 };
  const w0 = fractions(plain.x, nv);
  if (!w0) return { ...empty, status: 'failed', lpCount: 1 };
  if (!vi) return { status: 'optimal', w: w0, value: plain.objective, lpCount: 1 };
  const bx0 = blendX(P, vars, w0);
  if (viOf(P, bx0.x40, bx0.x100) >= vi.minVi - VI_ACCEPT_TOLERANCE) {
    return { status: 'optimal', w: w0, value: plain.objective, lpCount: 1 };
  }
  const minAccept = vi.minVi - VI_ACCEPT_TOLERANCE;
  interface Node {
    a: number;
    b: number;
    ha: number;
    hb: number;
    sol: NodeSolution;
  }
  let lpCount = 1;
  const open: Node[] = [];
  let failed = false;
  const addNode = (na: number, nb: number, ha: number, hb: number, cached?: readonly ViChord[] | null): void => {
    const chords = cached ?? vi.relaxation(na, ha, nb, hb);
    const sol = solveNodeInto(ctx, na, nb, true, chords);
    lpCount++;
    if (sol.status === 'failed') failed = true;
    // The node is kept: its solution is copied out of the LP scratch memory.
    if (sol.status === 'optimal') open.push({ a: na, b: nb, ha, hb, sol: { ...sol, x: sol.x.slice() } });
  };
  const root = bandOn && vi === P.vi ? viRoot(P) : null;
  if (root) addNode(a, b, root.hA, root.hB, root.chords);
  else addNode(a, b, vi.h(a), vi.h(b));
  while (open.length > 0 && lpCount < MAX_LPS) {
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
    if (viOf(P, bx.x40, bx.x100) >= minAccept) {
      return { status: 'optimal', w, value: node.sol.objective, lpCount };
    }
    // Split at the solution's X40, kept away from the ends so both children shrink.
    const span = node.b - node.a;
    if (!(span > 1e-10)) continue; // a point interval whose chord is exact cannot improve
    const split = Math.min(node.b - 0.02 * span, Math.max(node.a + 0.02 * span, bx.x40));
    const hs = vi.h(split, node.ha);
    addNode(node.a, split, node.ha, hs);
    addNode(split, node.b, hs, node.hb);
  }
  return { ...empty, status: failed && open.length === 0 ? 'failed' : 'infeasible', lpCount };
}

// ---------------------------------------------------------------------------------------------
// Public engine entry points
