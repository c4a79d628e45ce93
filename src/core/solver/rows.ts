/**
 * Formulation rows: the LP of one branch-and-bound node, written into one dense buffer (the hot
 * path of the substitute search: no closures, few allocations). The rows are the homogeneous
 * inequalities listed in `engine.ts`; a fixed additive treat rate is folded into the other columns.
 */
import { groupOn, type PreparedProblem, type ConstraintGroup } from './prepared';
import { closestForms, type EngineObjective, type ExtraRow } from './objectives';
import type { ViBoundary, ViChord } from './vi-boundary';
import { LpWorkspace, beginWrittenTableau, noteDenseLp, observingDenseLps, solveDenseLp, solveWrittenTableau, type LpSolution } from './lp';
import { planeLp3Begin, planeLp3Row, planeLp3Solve, solvePlaneLp3 } from './plane-lp3';

/** What one solve switches on. */
export interface SolveContext {
  P: PreparedProblem;
  vars: readonly number[];
  groups: ReadonlySet<ConstraintGroup>;
  objective: EngineObjective;
  extra: readonly ExtraRow[];
  vi: ViBoundary | null;
  /** Add the three 'closest' deviation variables and rows (objective 'closest' or its tie-break). */
  withAux: boolean;
  /** Further LP variables after the auxiliaries, used only by extra rows' `lift` (a lifted model of a lazy constraint). */
  lift?: number;
}

export interface NodeSolution {
  status: 'optimal' | 'infeasible' | 'failed';
  /** Values of the component variables (aligned with ctx.vars) then the auxiliaries. */
  x: Float64Array;
  objective: number;
}

/**
 * Memory reused by every {@link solveNodeInto}: the dense rows, their bounds, the objective and the
 * LP workspace (the simplex tableau), each grown to the largest node seen and never shrunk. With
 * it a node LP allocates no arrays. Between node LPs the memory is kept clean (rows zero, bounds
 * ±∞ = absent, objective zero): each node clears only what it wrote ({@link clean}), not the
 * worst-case block; a node that did not finish (an exception) leaves it dirty, and the next one
 * clears it all.
 */
class NodeScratch {
  buf = new Float64Array(256);
  rowLo = new Float64Array(32).fill(Number.NEGATIVE_INFINITY);
  rowHi = new Float64Array(32).fill(Number.POSITIVE_INFINITY);
  obj = new Float64Array(16);
  readonly lp = new LpWorkspace();
  private dirty = false;

  /** Room for maxRows × width rows, all zero with bounds absent, and a zero objective. */
  reset(maxRows: number, width: number): void {
    if (this.dirty) {
      this.buf.fill(0);
      this.rowLo.fill(Number.NEGATIVE_INFINITY);
      this.rowHi.fill(Number.POSITIVE_INFINITY);
      this.obj.fill(0);
    }
    const size = maxRows * width;
    if (this.buf.length < size) this.buf = new Float64Array(Math.max(size, 2 * this.buf.length));
    if (this.rowLo.length < maxRows) {
      this.rowLo = new Float64Array(Math.max(maxRows, 2 * this.rowLo.length)).fill(Number.NEGATIVE_INFINITY);
      this.rowHi = new Float64Array(this.rowLo.length).fill(Number.POSITIVE_INFINITY);
    }
    if (this.obj.length < width) this.obj = new Float64Array(Math.max(width, 2 * this.obj.length));
    this.dirty = true;
  }

  /** Clear what one node wrote: `used` leading entries of the rows, m rows' bounds, width objective entries. */
  clean(used: number, m: number, width: number): void {
    // Plain loops: these ranges are a few dozen entries, where a fill call costs more than the writes.
    const { buf, rowLo, rowHi, obj } = this;
    for (let q = 0; q < used; q++) buf[q] = 0;
    for (let r = 0; r < m; r++) {
      rowLo[r] = Number.NEGATIVE_INFINITY;
      rowHi[r] = Number.POSITIVE_INFINITY;
    }
    for (let j = 0; j < width; j++) obj[j] = 0;
    this.dirty = false;
  }
}

/** The one scratch area of this module (the core is synchronous: one node LP at a time). */
const scratch = new NodeScratch();

/**
 * Build and solve the LP for X40 ∈ [a, b] with the given VI relaxation lines — allocation-free:
 * the returned answer and its `x` live in this module's scratch memory and are overwritten by the next node LP
 * (copy it to keep it; {@link solveNode} does).
 */
export function solveNodeInto(ctx: SolveContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[]): NodeSolution {
  const { P, vars, groups, objective, extra } = ctx;
  const nv = vars.length;
  if (!ctx.withAux && !ctx.lift && extra.length === 0 && !observingDenseLps()) {
    // The usual rows written straight into the LP's own form (see the two functions below).
    const sol =
      nv === 3 && vertexLp3
        ? directLp3
          ? solveNodeLp3Direct(ctx, a, b, bandRows, chords)
          : null
        : directTableau
          ? solveNodeTableauDirect(ctx, a, b, bandRows, chords)
          : null;
    if (sol) {
      if (sol.status === 'optimal') return sol as NodeSolution;
      return { status: sol.status === 'infeasible' ? 'infeasible' : 'failed', x: sol.x, objective: Number.NaN };
    }
  }
  const nAux = ctx.withAux ? 3 : 0;
  const nLift = ctx.lift ?? 0;
  const width = nv + nAux + nLift;
  const s = P.coords.rowScale;
  const t = P.targets;
  const comps = P.components;

  // A fixed treat rate r is substituted rather than written as an equality (two simplex rows):
  // wₐ = r·Σw ⇔ wₐ = κ·Σ_{j≠a} wⱼ with κ = r/(1 − r); column a is folded into the others below.
  let fold = -1;
  if (P.anyBounds && nv > 1 && groupOn(groups, 'additive')) {
    for (let j = 0; j < nv; j++) {
      const k = comps[vars[j]!]!;
      if (k.fixedAdditive && k.min === k.max && k.min < 1) {
        fold = j;
        break;
      }
    }
  }

  const maxRows = 8 + chords.length + 2 * nv + extra.length + 2 * nAux;
  // Row r is buf[r·width … (r+1)·width) with bounds rowLo[r] ≤ row·x ≤ rowHi[r] (±∞ = absent).
  scratch.reset(maxRows, width);
  const { buf, rowLo, rowHi, obj } = scratch;
  let m = 0; // number of rows so far
  let o = 0; // offset of the next row in buf

  // Normalisation row (Charnes–Cooper): den·w = 1. When minimising with every numerator
  // coefficient ≥ 0 the optimum lies on the row anyway (every other row is homogeneous, so scaling
  // w down towards the row never worsens the objective), and the one-sided row den·w ≥ 1 gives the
  // same optimum with one simplex row instead of two. (Not when maximising: den·w ≤ 1 would admit
  // w = 0 and hide infeasibility.)
  let oneSided = !(objective.kind === 'ratio' && objective.sense === 'maximize');
  for (let j = 0; j < nv; j++) {
    const i = vars[j]!;
    if (objective.kind === 'ratio') {
      buf[o + j] = objective.den[i]!;
      if (objective.num[i]! < 0) oneSided = false;
    } else buf[o + j] = 1;
  }
  rowLo[m] = 1;
  if (!oneSided) rowHi[m] = 1;
  m++;
  o += width;

  if (bandRows) {
    // a ≤ X40 ≤ b:  Σ cᵢwᵢ(X40ᵢ − a) ≥ 0,  Σ cᵢwᵢ(X40ᵢ − b) ≤ 0.
    const point = !(b - a > 1e-12);
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = s * P.c[i]! * (P.x40[i]! - a);
      if (!point) buf[o + width + j] = s * P.c[i]! * (P.x40[i]! - b);
    }
    if (point) {
      rowLo[m] = 0;
      rowHi[m++] = 0;
      o += width;
    } else {
      rowLo[m++] = 0;
      rowHi[m++] = 0;
      o += 2 * width;
    }
  }
  for (let q = 0; q < chords.length; q++) {
    // X100 ≥ alpha + beta·X40  ⇔  Σ cᵢwᵢ(X100ᵢ − alpha − beta·X40ᵢ) ≥ 0.
    const chord = chords[q]!;
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = s * P.c[i]! * (P.x100[i]! - chord.alpha - chord.beta * P.x40[i]!);
    }
    rowLo[m++] = 0;
    o += width;
  }
  if (t.maxAnilinePoint !== null && groupOn(groups, 'aniline')) {
    // Σ_A (wᵢ/ρᵢ)(APᵢ − AP_max) ≤ 0 (scaled by 0.1).
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      if (!Number.isNaN(P.ap[i]!)) buf[o + j] = 0.1 * P.invRho[i]! * (P.ap[i]! - t.maxAnilinePoint);
    }
    rowHi[m++] = 0;
    o += width;
  }
  if (t.maxPolymerFraction !== null && groupOn(groups, 'polymer')) {
    // Σ_P wᵢ − p_max·Σ wᵢ ≤ 0.
    let any = false;
    for (let j = 0; j < nv; j++) {
      const poly = comps[vars[j]!]!.polymer;
      if (poly) any = true;
      buf[o + j] = (poly ? 1 : 0) - t.maxPolymerFraction;
    }
    if (any) {
      rowHi[m++] = 0;
      o += width;
    } else buf.fill(0, o, o + width);
  }
  if (t.maxPourPoint !== null && groupOn(groups, 'pour')) {
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = P.invRho[i]! * (P.pourRel[i]! - 1);
    }
    rowHi[m++] = 0;
    o += width;
  }
  if (t.minFlashPoint !== null && groupOn(groups, 'flash')) {
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      buf[o + j] = P.invRho[i]! * (P.flashRel[i]! - 1);
    }
    rowHi[m++] = 0;
    o += width;
  }
  // Per-component bounds: wⱼ − l·Σw ≥ 0, wⱼ − u·Σw ≤ 0 (the folded additive needs none).
  const boundsOn = groupOn(groups, 'bounds');
  const additiveOn = groupOn(groups, 'additive');
  for (let j = 0; P.anyBounds && j < nv; j++) {
    if (j === fold) continue;
    const k = comps[vars[j]!]!;
    if (!(k.fixedAdditive ? additiveOn : boundsOn)) continue;
    const lo = k.min;
    const hi = k.max;
    if (lo <= 0 && hi >= 1) continue;
    if (lo === hi) {
      for (let q = 0; q < nv; q++) buf[o + q] = -lo;
      buf[o + j] = 1 - lo;
      rowLo[m] = 0;
      rowHi[m++] = 0;
      o += width;
      continue;
    }
    if (lo > 0) {
      for (let q = 0; q < nv; q++) buf[o + q] = -lo;
      buf[o + j] = 1 - lo;
      rowLo[m++] = 0;
      o += width;
    }
    if (hi < 1) {
      for (let q = 0; q < nv; q++) buf[o + q] = -hi;
      buf[o + j] = 1 - hi;
      rowHi[m++] = 0;
      o += width;
    }
  }
  for (let ei = 0; ei < extra.length; ei++) {
    const e = extra[ei]!;
    for (let j = 0; j < nv; j++) buf[o + j] = e.coef[vars[j]!]!;
    for (let q = 0; q < nAux; q++) buf[o + nv + q] = e.aux;
    if (e.lift) for (let q = 0; q < nLift; q++) buf[o + nv + nAux + q] = e.lift[q] ?? 0;
    if (e.sense === 'le') rowHi[m++] = 0;
    else rowLo[m++] = 0;
    o += width;
  }
  let sense: 'minimize' | 'maximize' = 'minimize';
  if (objective.kind === 'ratio') {
    for (let j = 0; j < nv; j++) obj[j] = objective.num[vars[j]!]!;
    sense = objective.sense;
  }
  if (nAux > 0) {
    // 'closest': aux_q ≥ |f_q·w|, i.e. aux_q − f_q·w ≥ 0 and aux_q + f_q·w ≥ 0; objective Σ aux_q.
    const f = closestForms(P);
    for (let q = 0; q < 3; q++) {
      const fq = f[q]!;
      for (let j = 0; j < nv; j++) {
        const v = fq[vars[j]!]!;
        buf[o + j] = -v;
        buf[o + width + j] = v;
      }
      buf[o + nv + q] = 1;
      buf[o + width + nv + q] = 1;
      rowLo[m++] = 0;
      rowLo[m++] = 0;
      o += 2 * width;
      if (objective.kind === 'closest') obj[nv + q] = 1;
    }
  }
  if (fold >= 0) {
    // Fold column `fold`: a'ⱼ = aⱼ + κ·a_fold for the other component columns, then a_fold = 0
    // (the column stays, empty, and is restored from the others after the solve).
    const k = comps[vars[fold]!]!;
    const kappa = k.min / (1 - k.min);
    for (let r = 0; r < m; r++) {
      const ro = r * width;
      const af = buf[ro + fold]!;
      if (af !== 0) {
        for (let j = 0; j < nv; j++) if (j !== fold) buf[ro + j] = buf[ro + j]! + kappa * af;
        buf[ro + fold] = 0;
      }
    }
    const of = obj[fold]!;
    if (of !== 0) {
      for (let j = 0; j < nv; j++) if (j !== fold) obj[j] = obj[j]! + kappa * of;
      obj[fold] = 0;
    }
    const sol = solveDenseLp(sense, width, obj, m, buf, rowLo, rowHi, scratch.lp);
    scratch.clean(o, m, width);
    if (sol.status !== 'optimal') {
      return { status: sol.status === 'infeasible' ? 'infeasible' : 'failed', x: sol.x, objective: Number.NaN };
    }
    let others = 0;
    for (let j = 0; j < nv; j++) if (j !== fold) others += sol.x[j]!;
    sol.x[fold] = kappa * others;
    return { status: 'optimal', x: sol.x, objective: sol.objective };
  }
  // Three component variables and nothing else: the exact vertex solver of `plane-lp3.ts` (the
  // same answer as the simplex; it hands back the cases where the two could differ).
  const sol = (width === 3 && vertexLp3 && solveNodeLp3(sense, obj, m, buf, rowLo, rowHi)) || solveDenseLp(sense, width, obj, m, buf, rowLo, rowHi, scratch.lp);
  scratch.clean(o, m, width);
  if (sol.status === 'optimal') return sol as NodeSolution; // (the LP's own answer object: no copy)
  return { status: sol.status === 'infeasible' ? 'infeasible' : 'failed', x: sol.x, objective: Number.NaN };
}

/**
 * Whether a node LP has only the usual rows besides the normalisation, band, VI lines and aniline:
 * no component bounds or fixed additive (nothing folded, no bound rows) and no polymer, pour or
 * flash row — the rows the direct writers below handle (extra rows and auxiliaries are checked by
 * the caller).
 */
function usualRowsOnly(ctx: SolveContext): boolean {
  const { P, groups } = ctx;
  const t = P.targets;
  if (P.anyBounds) return false;
  if (t.maxPolymerFraction !== null && groupOn(groups, 'polymer')) return false;
  if (t.maxPourPoint !== null && groupOn(groups, 'pour')) return false;
  return !(t.minFlashPoint !== null && groupOn(groups, 'flash'));
}

/** Whether three-variable node LPs go to the vertex solver (see {@link useVertexLp3}). */
let vertexLp3 = true;
/** Whether the vertex solver gets a three-stock node's rows directly (see {@link useDirectLp3}). */
let directLp3 = true;

/**
 * A three-stock node LP written straight into the planes of the vertex solver (`plane-lp3.ts`),
 * without the dense rows: the same rows in the same order (normalisation, band, VI lines, aniline),
 * each coefficient by the same arithmetic as {@link solveNodeInto} writes it, so the vertex solver
 * sees the very numbers it would read from the dense rows and gives the same answer.
 *
 * Only for the rows most solves have: a ratio objective over exactly three component variables, no
 * extra rows, no component bounds or fixed additive (so nothing is folded), and no polymer, pour or
 * flash row. Anything else, a normalisation with a coefficient ≤ 0, or an LP the vertex solver
 * hands back (a tie or a sliver) returns null, and the caller writes the dense rows as before
 * (where the vertex solver decides alike, or the simplex solves). `useDirectLp3(false)` switches
 * it off; tests/core/solver/plane-lp3.test.ts compares whole solves with and without it.
 */
function solveNodeLp3Direct(ctx: SolveContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[]): LpSolution | null {
  const { P, vars, groups, objective } = ctx;
  if (objective.kind !== 'ratio' || !usualRowsOnly(ctx)) return null;
  const t = P.targets;
  const i0 = vars[0]!;
  const i1 = vars[1]!;
  const i2 = vars[2]!;
  // Row 0, the normalisation den·w = 1 (one-sided ≥ 1 when minimising with every num ≥ 0).
  const den = objective.den;
  const num = objective.num;
  const d0 = den[i0]!;
  const d1 = den[i1]!;
  const d2 = den[i2]!;
  if (!(d0 > 0 && d1 > 0 && d2 > 0)) return null;
  const c0 = num[i0]!;
  const c1 = num[i1]!;
  const c2 = num[i2]!;
  // One-sided (den·w ≥ 1) exactly where solveNodeInto writes it so; `solvePlaneLp3` then wants
  // every cost ≥ 0 (false for NaN), else the simplex solves.
  const oneSided = objective.sense !== 'maximize' && !(c0 < 0 || c1 < 0 || c2 < 0);
  if (oneSided && !(c0 >= 0 && c1 >= 0 && c2 >= 0)) return null;
  const s = P.coords.rowScale;
  const c = P.c;
  const x40 = P.x40;
  const x100 = P.x100;
  const aniline = t.maxAnilinePoint !== null && groupOn(groups, 'aniline');
  planeLp3Begin(2 + chords.length + 1);
  if (bandRows) {
    // a ≤ X40 ≤ b:  Σ cᵢwᵢ(X40ᵢ − a) ≥ 0,  Σ cᵢwᵢ(X40ᵢ − b) ≤ 0 (one equality row when a = b).
    const l0 = s * c[i0]! * (x40[i0]! - a);
    const l1 = s * c[i1]! * (x40[i1]! - a);
    const l2 = s * c[i2]! * (x40[i2]! - a);
    if (!(b - a > 1e-12)) planeLp3Row(l0, l1, l2, true, true);
    else {
      planeLp3Row(l0, l1, l2, true, false);
      planeLp3Row(s * c[i0]! * (x40[i0]! - b), s * c[i1]! * (x40[i1]! - b), s * c[i2]! * (x40[i2]! - b), false, true);
    }
  }
  for (let q = 0; q < chords.length; q++) {
    // X100 ≥ alpha + beta·X40  ⇔  Σ cᵢwᵢ(X100ᵢ − alpha − beta·X40ᵢ) ≥ 0.
    const chord = chords[q]!;
    const al = chord.alpha;
    const be = chord.beta;
    planeLp3Row(
      s * c[i0]! * (x100[i0]! - al - be * x40[i0]!),
      s * c[i1]! * (x100[i1]! - al - be * x40[i1]!),
      s * c[i2]! * (x100[i2]! - al - be * x40[i2]!),
      true,
      false,
    );
  }
  if (aniline) {
    // Σ_A (wᵢ/ρᵢ)(APᵢ − AP_max) ≤ 0 (scaled by 0.1); a component without an aniline point adds 0.
    const apMax = t.maxAnilinePoint!;
    const ap = P.ap;
    const inv = P.invRho;
    const v0 = Number.isNaN(ap[i0]!) ? 0 : 0.1 * inv[i0]! * (ap[i0]! - apMax);
    const v1 = Number.isNaN(ap[i1]!) ? 0 : 0.1 * inv[i1]! * (ap[i1]! - apMax);
    const v2 = Number.isNaN(ap[i2]!) ? 0 : 0.1 * inv[i2]! * (ap[i2]! - apMax);
    planeLp3Row(v0, v1, v2, false, true);
  }
  return planeLp3Solve(objective.sense, d0, d1, d2, c0, c1, c2);
}

/** Whether the simplex tableau of other node LPs is written directly (see {@link useDirectTableau}). */
let directTableau = true;

/**
 * A node LP of any size but three (or of three with the vertex solver off) written straight into
 * the simplex tableau (`beginWrittenTableau` in `lp.ts`), without the dense rows that `lp.ts` would
 * copy into it: the same rows in the same order (normalisation, band, VI lines, aniline), each
 * coefficient by the same arithmetic as {@link solveNodeInto} writes it and each tableau entry as
 * `lp.ts` would copy it (an upper-bound row as [u, a], a lower-bound row as [−l, −a], +0 for a zero,
 * upper before lower), so the simplex sees the very tableau it would have built and pivots alike.
 *
 * For the same rows as {@link solveNodeLp3Direct} (a ratio objective, no extra rows, no component
 * bounds or fixed additive, no polymer, pour or flash row); anything else, and an LP whose first
 * simplex run reaches the pivot limit (the retry rewrites the tableau from dense rows), returns
 * null and the caller writes the dense rows as before. `useDirectTableau(false)` switches it off;
 * tests/core/solver/rows.test.ts compares whole solves with and without it bit for bit.
 */
function solveNodeTableauDirect(ctx: SolveContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[]): LpSolution | null {
  const { P, vars, groups, objective } = ctx;
  if (objective.kind !== 'ratio' || !usualRowsOnly(ctx)) return null;
  const t = P.targets;
  const nv = vars.length;
  const num = objective.num;
  const den = objective.den;
  // The objective (as solveNodeInto's obj) and the one-sided normalisation, as solveNodeInto decides it.
  const obj = scratch.obj.length >= nv ? scratch.obj : (scratch.obj = new Float64Array(2 * nv));
  let oneSided = objective.sense !== 'maximize';
  for (let j = 0; j < nv; j++) {
    const c = num[vars[j]!]!;
    obj[j] = c;
    if (c < 0) oneSided = false;
  }
  const aniline = t.maxAnilinePoint !== null && groupOn(groups, 'aniline');
  const point = !(b - a > 1e-12);
  const height = 1 + (oneSided ? 1 : 2) + (bandRows ? 2 : 0) + chords.length + (aniline ? 1 : 0);
  const mat = beginWrittenTableau(scratch.lp, objective.sense, nv, height, obj);
  for (let j = 0; j < nv; j++) obj[j] = 0; // (the scratch objective is kept zero between node LPs)
  const width = nv + 1;
  let o = width;
  // Row 0, den·w = 1 (or ≥ 1): [1, den] when bounded above, then [−1, −den].
  if (!oneSided) {
    mat[o] = 1;
    for (let j = 0; j < nv; j++) {
      const v = den[vars[j]!]!;
      mat[o + 1 + j] = v !== 0 ? v : 0;
    }
    o += width;
  }
  mat[o] = -1;
  for (let j = 0; j < nv; j++) {
    const v = den[vars[j]!]!;
    mat[o + 1 + j] = v !== 0 ? -v : 0;
  }
  o += width;
  const s = P.coords.rowScale;
  const c = P.c;
  const x40 = P.x40;
  const x100 = P.x100;
  if (bandRows) {
    if (point) {
      // One row Σ cᵢwᵢ(X40ᵢ − a) = 0: its upper-bound form, then its lower-bound form.
      mat[o] = 0;
      mat[o + width] = -0;
      for (let j = 0; j < nv; j++) {
        const i = vars[j]!;
        const v = s * c[i]! * (x40[i]! - a);
        mat[o + 1 + j] = v !== 0 ? v : 0;
        mat[o + width + 1 + j] = v !== 0 ? -v : 0;
      }
    } else {
      // Σ cᵢwᵢ(X40ᵢ − a) ≥ 0 (lower-bound form), Σ cᵢwᵢ(X40ᵢ − b) ≤ 0 (upper-bound form).
      mat[o] = -0;
      mat[o + width] = 0;
      for (let j = 0; j < nv; j++) {
        const i = vars[j]!;
        const lo = s * c[i]! * (x40[i]! - a);
        const hi = s * c[i]! * (x40[i]! - b);
        mat[o + 1 + j] = lo !== 0 ? -lo : 0;
        mat[o + width + 1 + j] = hi !== 0 ? hi : 0;
      }
    }
    o += 2 * width;
  }
  for (let q = 0; q < chords.length; q++) {
    // X100 ≥ alpha + beta·X40  ⇔  Σ cᵢwᵢ(X100ᵢ − alpha − beta·X40ᵢ) ≥ 0 (lower-bound form).
    const chord = chords[q]!;
    mat[o] = -0;
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      const v = s * c[i]! * (x100[i]! - chord.alpha - chord.beta * x40[i]!);
      mat[o + 1 + j] = v !== 0 ? -v : 0;
    }
    o += width;
  }
  if (aniline) {
    // Σ_A (wᵢ/ρᵢ)(APᵢ − AP_max) ≤ 0 (scaled by 0.1; upper-bound form); no aniline point adds 0.
    const apMax = t.maxAnilinePoint!;
    mat[o] = 0;
    for (let j = 0; j < nv; j++) {
      const i = vars[j]!;
      const v = Number.isNaN(P.ap[i]!) ? 0 : 0.1 * P.invRho[i]! * (P.ap[i]! - apMax);
      mat[o + 1 + j] = v !== 0 ? v : 0;
    }
  }
  return solveWrittenTableau(scratch.lp, objective.sense, nv);
}

/**
 * Switch the directly written tableau of node LPs on or off (on by default; off, their rows are
 * written as dense rows and copied into the tableau). For tests and benchmarks that compare the two.
 *
 * @param on - true to use it
 * @returns the setting before
 */
export function useDirectTableau(on: boolean): boolean {
  const before = directTableau;
  directTableau = on;
  return before;
}

/**
 * Switch the direct rows of three-stock node LPs on or off (on by default; off, they are written
 * as dense rows and read back by the vertex solver). For tests and benchmarks that compare the two.
 *
 * @param on - true to use them
 * @returns the setting before
 */
export function useDirectLp3(on: boolean): boolean {
  const before = directLp3;
  directLp3 = on;
  return before;
}

/**
 * Whether a solve takes the three-stock path: its node LPs have three variables and nothing else
 * (no 'closest' auxiliaries, no lifted variables), so `plane-lp3.ts` solves them, and the branch
 * and bound tries its floor LP before the root relaxation (`branch-and-bound.ts`).
 */
export function threeStockPath(ctx: SolveContext): boolean {
  return vertexLp3 && ctx.vars.length === 3 && !ctx.withAux && !ctx.lift;
}

/**
 * Switch the three-stock path on or off (on by default; off, every node LP goes to the dense
 * simplex and the branch and bound goes straight to the root relaxation, as for other sizes). For
 * tests and benchmarks that compare the two paths.
 *
 * @param on - true to use it
 * @returns the setting before
 */
export function useVertexLp3(on: boolean): boolean {
  const before = vertexLp3;
  vertexLp3 = on;
  return before;
}

/**
 * A three-variable node LP by {@link solvePlaneLp3}, shown to the LP observer as the simplex's LPs
 * are (benchmarks hand the same LPs to another solver); null where the simplex must solve it.
 */
function solveNodeLp3(
  sense: 'minimize' | 'maximize',
  obj: Float64Array,
  m: number,
  buf: Float64Array,
  rowLo: Float64Array,
  rowHi: Float64Array,
): LpSolution | null {
  const sol = solvePlaneLp3(sense, obj, m, buf, rowLo, rowHi);
  if (sol && observingDenseLps()) noteDenseLp(sense, 3, obj, m, buf, rowLo, rowHi);
  return sol;
}

/**
 * Build and solve the LP for X40 ∈ [a, b] with the given VI relaxation lines (see
 * {@link solveNodeInto}); the returned `x` is the caller's own copy.
 */
export function solveNode(ctx: SolveContext, a: number, b: number, bandRows: boolean, chords: readonly ViChord[]): NodeSolution {
  const sol = solveNodeInto(ctx, a, b, bandRows, chords);
  return { status: sol.status, x: sol.x.slice(), objective: sol.objective };
}
