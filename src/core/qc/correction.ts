/**
 * Batch correction and vessel heel: what to add to the oil already in a vessel so that the batch
 * lands in its ν40 band.
 *
 * ## Formulation
 * The vessel's oil is one more component, at its MEASURED ν40/ν100 (ASTM D445) and known mass M_v.
 * The unknowns are the masses mᵢ ≥ 0 [kg] of the stocks on hand. The batch's blending coordinate is
 * X = Σ cᵢmᵢXᵢ / Σ cᵢmᵢ over vessel and additions (Refutas: cᵢ = 1, so it is linear in the MASSES), so
 * every condition is a homogeneous linear inequality in (M_v, m):
 *
 *   band            Σ cᵢmᵢ(Xᵢ − X(ν_lo)) ≥ 0,  Σ cᵢmᵢ(Xᵢ − X(ν_hi)) ≤ 0     (vessel included)
 *   stock on hand   mᵢ ≤ maxAddᵢ                                           (mᵢ − (maxAddᵢ/M_v)·M_v ≤ 0)
 *   vessel limit    M_v + Σ mᵢ ≤ M_max;   a heel's exact batch: M_v + Σ mᵢ = M
 *   additive        the vessel holds it at treat rate r and so must the batch: the additions carry it
 *                   at r too, mₐ = r·(mₐ + Σ_{i≠a} mᵢ)  (topped up in proportion)
 *   minimum VI      X100 ≥ h(X40), by the solver's exact branch and bound (`solver/vi-boundary.ts`)
 *
 * and the objective is the cost of the additions Σ pᵢmᵢ or their mass Σ mᵢ (ties broken by the
 * other). With the vessel's variable normalised to 1 (Charnes–Cooper, as in `solver/engine.ts`) this is
 * exactly the engine's problem, solved by the same LP solver and branch and bound: the LP optimum is
 * exact, the VI is met to 0.005 (so "optimal" is within 0.5 % of the true optimum, and exact without a VI).
 *
 * When no addition will do, the reason is given in numbers, from relaxations: the band unreachable
 * with any amount of the stocks on hand; the least addition that reaches it against the vessel's room
 * ("needs 1,450 kg of BW-220; the vessel takes only 500 kg more"); against the stock on hand; the VI.
 */
import { BlendbenchInputError, DENSITY15_MAX, DENSITY15_MIN, FractionSumError, assertDensity15, assertFinite, assertKv40Kv100, assertViscosity, ViscosityOutOfRangeError } from '../errors';
import type { BlendMethod } from '../blending/blend-viscosity';
import { VI_MIN_KV100, viscosityIndex } from '../viscosity/viscosity-index';
import { prepareEngine, tieBreakRow, type EngineComponent, type PreparedProblem, type RatioObjective, type ExtraRow, ALL_GROUPS, type ConstraintGroup } from '../solver/engine';
import { optimise } from '../solver/branch-and-bound';
import type { PlainComponent } from '../solver/plain';
import { displayWords, type NumberDisplay } from '../words/display';

/** The oil in the vessel (a batch that missed, or a heel). */
export interface CorrectionVessel {
  /** Mass in the vessel [kg], > 0. */
  massKg: number;
  /** Measured ν40 and ν100 [mm²/s] (ν100 ≥ 2.0, below ν40). */
  kv40: number;
  kv100: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point [°C] (reported only). */
  anilinePoint: number;
}

/** A stock on hand: a plain component (its fraction bounds are ignored) with the kilograms available. */
export type CorrectionComponent = PlainComponent & {
  /** Most that can be added [kg]; absent → unlimited. */
  maxAddKg?: number;
};

export interface CorrectionProblem {
  vessel: CorrectionVessel;
  components: CorrectionComponent[];
  /** Target ν40 [mm²/s] and half-width of the band [% of the target]; the band is not clipped. */
  targetKv40: number;
  tolerancePct: number;
  /** The additive package: the vessel holds it at this mass fraction, and the batch must too. */
  additive?: { id: string; massFraction: number };
  /** The vessel's limit [kg]: the batch may not exceed it. */
  maxFinalMassKg?: number;
  /** The exact batch mass [kg] (a heel topped up to a batch). */
  finalMassKg?: number;
  /** Minimum VI of the batch (unrounded, ASTM D2270). */
  minVi?: number;
  /** 'cost': least cost of the additions; 'mass': least added mass. */
  objective: 'cost' | 'mass';
  /** How the reason writes numbers (the user's decimal separator and grouping; default ".", grouped). */
  display?: NumberDisplay;
}

export type CorrectionResult =
  | {
      status: 'optimal';
      /** kg to add of every component id (zeros included). */
      addKg: Record<string, number>;
      /** Σ of the additions [kg]. */
      addedKg: number;
      /** Cost of the additions (currency of the prices). */
      addedCost: number;
      /** The batch after the additions [kg]. */
      massKg: number;
      /** Its ν40, ν100 [mm²/s] (the problem's rule: Refutas on mass fractions) and unrounded VI. */
      kv40: number;
      kv100: number;
      vi: number;
    }
  | { status: 'infeasible'; reason: string };

/** Smallest addition reported [kg]: below it a line is weighing noise (masses are exact to 1e-3 kg). */
const DUST_KG = 1e-4;

/** The validated problem in engine form: index 0 is the vessel, i ≥ 1 the stocks. */
interface Prepared {
  P: PreparedProblem;
  c: CorrectionProblem;
  /** Index of the additive among the engine components (−1 for none). */
  additive: number;
  r: number;
  vars: number[];
}

const fieldOf = (i: number, f: string): string => `components[${i}].${f}`;

/** Run a check; re-raise its error as the same class with the field prefixed (`vessel.kv40`, `components[2].kv100`). */
export function withFieldPrefix(prefix: string, check: () => void): void {
  try {
    check();
  } catch (e) {
    if (e instanceof BlendbenchInputError && !e.field.startsWith(prefix)) {
      const Ctor = e.constructor as new (field: string, value: unknown, message: string) => BlendbenchInputError;
      throw new Ctor(`${prefix}${e.field}`, e.value, e.message.replace(`${e.field} =`, `${prefix}${e.field} =`));
    }
    throw e;
  }
}

/** Validate and build the engine problem. */
function prepare(c: CorrectionProblem, method: BlendMethod, fn: string): Prepared {
  if (!c || typeof c !== 'object') throw new BlendbenchInputError('problem', c, `${fn}: give a correction problem`);
  const v = c.vessel;
  if (!v || typeof v !== 'object') throw new BlendbenchInputError('vessel', v, `${fn}: vessel must give massKg, kv40, kv100, density15 and anilinePoint`);
  assertFinite(fn, 'vessel.massKg', v.massKg);
  if (v.massKg <= 0) throw new BlendbenchInputError('vessel.massKg', v.massKg, `${fn}: vessel.massKg = ${v.massKg}; the vessel must hold some oil (kg above 0)`);
  withFieldPrefix('vessel.', () => assertKv40Kv100(fn, v.kv40, v.kv100));
  if (v.kv100 < VI_MIN_KV100) throw new ViscosityOutOfRangeError('vessel.kv100', v.kv100, `${fn}: vessel.kv100 = ${v.kv100} mm²/s is below 2.0 mm²/s, where ASTM D2270 defines no VI`);
  assertDensity15(fn, 'vessel.density15', v.density15);
  assertFinite(fn, 'vessel.anilinePoint', v.anilinePoint);
  if (!Array.isArray(c.components) || c.components.length === 0) {
    throw new BlendbenchInputError('components', c.components, `${fn}: components must be a non-empty array of the stocks on hand`);
  }
  const ids = new Set<string>();
  const comps: EngineComponent[] = [
    {
      id: '',
      label: 'the vessel',
      kv40: v.kv40,
      kv100: v.kv100,
      density15: v.density15,
      anilinePoint: v.anilinePoint,
      pricePerKg: 0,
      polymer: false,
      baseFluid: true,
      oxidation: 0,
      pourPoint: null,
      flashPoint: null,
      min: 0,
      max: 1,
      fixedAdditive: false,
      usable: true,
    },
  ];
  c.components.forEach((k, i) => {
    if (typeof k.id !== 'string' || k.id === '') throw new BlendbenchInputError(fieldOf(i, 'id'), k.id, `${fn}: ${fieldOf(i, 'id')} must be a non-empty string`);
    if (ids.has(k.id)) throw new BlendbenchInputError(fieldOf(i, 'id'), k.id, `${fn}: id "${k.id}" appears twice`);
    ids.add(k.id);
    withFieldPrefix(`components[${i}].`, () => assertKv40Kv100(fn, k.kv40, k.kv100));
    if (k.kv100 < VI_MIN_KV100) throw new ViscosityOutOfRangeError(fieldOf(i, 'kv100'), k.kv100, `${fn}: ${fieldOf(i, 'kv100')} = ${k.kv100} mm²/s is below 2.0 mm²/s, where ASTM D2270 defines no VI`);
    if (!(typeof k.density15 === 'number' && k.density15 >= DENSITY15_MIN && k.density15 <= DENSITY15_MAX)) assertDensity15(fn, fieldOf(i, 'density15'), k.density15);
    assertFinite(fn, fieldOf(i, 'anilinePoint'), k.anilinePoint);
    assertFinite(fn, fieldOf(i, 'pricePerKg'), k.pricePerKg);
    if (k.pricePerKg < 0) throw new BlendbenchInputError(fieldOf(i, 'pricePerKg'), k.pricePerKg, `${fn}: ${fieldOf(i, 'pricePerKg')} = ${k.pricePerKg}; a price must not be negative`);
    if (k.maxAddKg !== undefined) {
      assertFinite(fn, fieldOf(i, 'maxAddKg'), k.maxAddKg);
      if (k.maxAddKg < 0) throw new BlendbenchInputError(fieldOf(i, 'maxAddKg'), k.maxAddKg, `${fn}: ${fieldOf(i, 'maxAddKg')} = ${k.maxAddKg}; kilograms on hand cannot be negative`);
    }
    comps.push({
      id: k.id,
      label: k.id,
      kv40: k.kv40,
      kv100: k.kv100,
      density15: k.density15,
      anilinePoint: k.anilinePoint,
      pricePerKg: k.pricePerKg,
      polymer: false,
      baseFluid: true,
      oxidation: 0,
      pourPoint: null,
      flashPoint: null,
      min: 0,
      max: 1,
      fixedAdditive: false,
      usable: true,
    });
  });
  assertViscosity(fn, 'targetKv40', c.targetKv40);
  assertFinite(fn, 'tolerancePct', c.tolerancePct);
  if (c.tolerancePct < 0 || c.tolerancePct >= 100) {
    throw new BlendbenchInputError('tolerancePct', c.tolerancePct, `${fn}: tolerancePct = ${c.tolerancePct}; it must be from 0 to below 100 (per cent)`);
  }
  let additive = -1;
  let r = 0;
  if (c.additive !== undefined) {
    const a = c.additive;
    additive = c.components.findIndex((k) => k.id === a?.id) + 1;
    if (additive <= 0) throw new BlendbenchInputError('additive.id', a?.id, `${fn}: additive.id = "${String(a?.id)}" is not one of the components`);
    assertFinite(fn, 'additive.massFraction', a.massFraction);
    if (a.massFraction < 0 || a.massFraction >= 1) {
      throw new FractionSumError('additive.massFraction', a.massFraction, `${fn}: additive.massFraction = ${a.massFraction}; a treat rate is from 0 to below 1`);
    }
    r = a.massFraction;
  }
  if (c.maxFinalMassKg !== undefined) {
    assertFinite(fn, 'maxFinalMassKg', c.maxFinalMassKg);
    if (c.maxFinalMassKg < v.massKg) {
      throw new BlendbenchInputError('maxFinalMassKg', c.maxFinalMassKg, `${fn}: maxFinalMassKg = ${c.maxFinalMassKg} kg is below the ${v.massKg} kg already in the vessel`);
    }
  }
  if (c.finalMassKg !== undefined) {
    assertFinite(fn, 'finalMassKg', c.finalMassKg);
    if (c.finalMassKg < v.massKg) {
      throw new BlendbenchInputError('finalMassKg', c.finalMassKg, `${fn}: finalMassKg = ${c.finalMassKg} kg is below the ${v.massKg} kg already in the vessel`);
    }
    if (c.maxFinalMassKg !== undefined && c.finalMassKg > c.maxFinalMassKg) {
      throw new BlendbenchInputError('finalMassKg', c.finalMassKg, `${fn}: finalMassKg = ${c.finalMassKg} kg is above the vessel's limit maxFinalMassKg = ${c.maxFinalMassKg} kg`);
    }
  }
  if (c.minVi !== undefined) assertFinite(fn, 'minVi', c.minVi);
  if (c.objective !== 'cost' && c.objective !== 'mass') {
    throw new BlendbenchInputError('objective', c.objective, `${fn}: objective = ${String(c.objective)}; use 'cost' or 'mass'`);
  }
  const P = prepareEngine(
    comps,
    {
      kv40Min: c.targetKv40 * (1 - c.tolerancePct / 100),
      kv40Max: c.targetKv40 * (1 + c.tolerancePct / 100),
      minVi: c.minVi ?? null,
      maxAnilinePoint: null,
      maxPolymerFraction: null,
      maxPourPoint: null,
      minFlashPoint: null,
      objective: 'cost',
      referenceMassFractions: null,
    },
    method,
  );
  return { P, c, additive, r, vars: comps.map((_, i) => i) };
}

/** Which conditions a solve keeps (the diagnosis switches them off one at a time). */
interface Switches {
  room: boolean;
  stock: boolean;
  vi: boolean;
}
const ALL_ON: Switches = { room: true, stock: true, vi: true };

/** `coef` with one entry per engine component. */
const rowOf = (n: number, f: (i: number) => number, sense: 'le' | 'ge'): ExtraRow => {
  const coef = new Float64Array(n);
  for (let i = 0; i < n; i++) coef[i] = f(i);
  return { coef, aux: 0, sense };
};

/** Objective over the engine components: cost or mass of the additions, per kg of the vessel's oil. */
function objectiveOf(Q: Prepared, kind: 'cost' | 'mass'): RatioObjective {
  const n = Q.P.n;
  const num = new Float64Array(n);
  const den = new Float64Array(n);
  den[0] = 1;
  for (let i = 1; i < n; i++) num[i] = kind === 'cost' ? Q.P.price[i]! : 1;
  return { kind: 'ratio', sense: 'minimize', num, den };
}

/** The homogeneous rows of the stock, room and additive conditions. */
function rowsOf(Q: Prepared, s: Switches): ExtraRow[] {
  const { P, c } = Q;
  const n = P.n;
  const Mv = c.vessel.massKg;
  const rows: ExtraRow[] = [];
  if (s.stock) {
    c.components.forEach((k, q) => {
      if (k.maxAddKg === undefined) return;
      const i = q + 1;
      // mᵢ − (maxAddᵢ/M_v)·M_v ≤ 0, with the vessel's variable standing for M_v.
      rows.push(rowOf(n, (j) => (j === i ? 1 : j === 0 ? -k.maxAddKg! / Mv : 0), 'le'));
    });
  }
  if (s.room && c.finalMassKg !== undefined) {
    const f = c.finalMassKg / Mv;
    rows.push(rowOf(n, (j) => (j === 0 ? 1 - f : 1), 'le'));
    rows.push(rowOf(n, (j) => (j === 0 ? 1 - f : 1), 'ge'));
  } else if (s.room && c.maxFinalMassKg !== undefined) {
    const f = c.maxFinalMassKg / Mv;
    rows.push(rowOf(n, (j) => (j === 0 ? 1 - f : 1), 'le'));
  }
  if (Q.additive > 0) {
    // (1 − r)·mₐ − r·Σ_{i≠a, i≠vessel} mᵢ = 0.
    const a = Q.additive;
    const r = Q.r;
    const f = (j: number): number => (j === 0 ? 0 : j === a ? 1 - r : -r);
    rows.push(rowOf(n, f, 'le'));
    rows.push(rowOf(n, f, 'ge'));
  }
  return rows;
}

/** Solve with the given switches and objective; masses of the additions (index i ≥ 1 ↔ components[i − 1]), or null. */
function solveMasses(Q: Prepared, s: Switches, kind: 'cost' | 'mass'): { masses: Float64Array; value: number } | 'infeasible' | 'failed' {
  const { P } = Q;
  const groups: ReadonlySet<ConstraintGroup> = new Set(ALL_GROUPS.filter((g) => g !== 'vi' || s.vi));
  const objective = objectiveOf(Q, kind);
  const extra = rowsOf(Q, s);
  const ctx = { P, vars: Q.vars, groups, objective, extra, vi: s.vi ? P.vi : null, withAux: false };
  const first = optimise(ctx);
  if (first.status !== 'optimal') return first.status;
  let w = first.w;
  // Ties: least cost among the least added masses, or least mass among the cheapest.
  const second = optimise({ ...ctx, objective: objectiveOf(Q, kind === 'cost' ? 'mass' : 'cost'), extra: [...extra, tieBreakRow(P, objective, first.value)] });
  if (second.status === 'optimal') w = second.w;
  const Mv = Q.c.vessel.massKg;
  const masses = new Float64Array(P.n);
  for (let i = 1; i < P.n; i++) {
    const m = (w[i]! / w[0]!) * Mv;
    masses[i] = m > DUST_KG ? m : 0;
  }
  if (Q.additive > 0) {
    // Exactly r of the additions (the LP meets it to its tolerance; restore it to the last digit).
    let others = 0;
    for (let i = 1; i < P.n; i++) if (i !== Q.additive) others += masses[i]!;
    masses[Q.additive] = (Q.r / (1 - Q.r)) * others;
  }
  return { masses, value: first.value * Mv };
}

/** Batch properties after adding `masses` (mixing rule of the problem). */
function batchOf(Q: Prepared, masses: Float64Array): { massKg: number; kv40: number; kv100: number; vi: number } {
  const { P } = Q;
  let sc = P.c[0]! * Q.c.vessel.massKg;
  let s40 = sc * P.x40[0]!;
  let s100 = sc * P.x100[0]!;
  let total = Q.c.vessel.massKg;
  for (let i = 1; i < P.n; i++) {
    const m = masses[i]!;
    if (m <= 0) continue;
    total += m;
    const cm = P.c[i]! * m;
    sc += cm;
    s40 += cm * P.x40[i]!;
    s100 += cm * P.x100[i]!;
  }
  const kv40 = P.coords.toKv(s40 / sc);
  // Every part has ν100 ≥ 2.0 (checked in prepare), so the blend has too; the round trip through the
  // blending coordinate can return 1.9999999999999998 for parts at exactly 2.0, where D2270 has no VI.
  const kv100 = Math.max(VI_MIN_KV100, P.coords.toKv(s100 / sc));
  return { massKg: total, kv40, kv100, vi: viscosityIndex(kv40, kv100) };
}


/** The additions of a masses vector, largest first, in words ("1,450 kg of BW-220 and 30 kg of BW-900"). */
function listOf(Q: Prepared, masses: Float64Array, kg: (m: number) => string, only?: (i: number) => boolean): string {
  const parts: [number, string][] = [];
  for (let i = 1; i < Q.P.n; i++) if (masses[i]! > 0.5 && (!only || only(i))) parts.push([masses[i]!, `${kg(masses[i]!)} of ${Q.P.components[i]!.label}`]);
  parts.sort((a, b) => b[0] - a[0]);
  const t = parts.map((p) => p[1]);
  return t.length <= 1 ? (t[0] ?? 'nothing') : `${t.slice(0, -1).join(', ')} and ${t[t.length - 1]}`;
}

/** Why no addition brings the batch into band, in numbers. */
function diagnose(Q: Prepared): string {
  const { P, c } = Q;
  const words = displayWords({ thousandsGrouping: true, ...c.display });
  const { kg, kv: fmtKv } = words;
  /** A limit in kg, rounded down (never more room or stock than there is; `kg` rounds a need up). */
  const kgLimit = (m: number): string => `${words.num(Math.max(0, Math.floor(m + 1e-9)), 0)} kg`;
  // The band and the measured batch as entered and printed on the correction sheet (313.6–326.4, 280.5), not
  // rounded to the display's whole mm²/s above 100 (which read 314–326 and 281 beside the sheet's figures).
  const band = `${words.say(P.targets.kv40Min)}–${words.say(P.targets.kv40Max)} mm²/s`;
  const batchKv = words.say(c.vessel.kv40);
  const v = c.vessel;
  // 1. No amount of the stocks on hand reaches the band.
  const free = solveMasses(Q, { room: false, stock: false, vi: false }, 'mass');
  if (free === 'infeasible' || free === 'failed') {
    const stocks = c.components.map((k) => k).filter((_, q) => q + 1 !== Q.additive);
    const below = v.kv40 < P.targets.kv40Min;
    const pkg = Q.additive > 0 && Q.r > 0 && stocks.length > 0 ? Q.additive : -1;
    if (pkg > 0) {
      // Every addition carries the additive at r (module notes), so an addition of stock i is the mix
      // (1 − r)·i + r·additive: X = (cᵢ(1 − r)Xᵢ + cₐrXₐ)/(cᵢ(1 − r) + cₐr). The batch can go no further
      // than the most extreme such mix; when the stock alone would reach the band, the additive is why.
      const mixX = (q: number): number => {
        const i = q + 1;
        const wi = P.c[i]! * (1 - Q.r);
        const wa = P.c[pkg]! * Q.r;
        return (wi * P.x40[i]! + wa * P.x40[pkg]!) / (wi + wa);
      };
      const qs = stocks.map((k) => c.components.indexOf(k));
      const best = qs.reduce((a, b) => (below ? mixX(b) > mixX(a) : mixX(b) < mixX(a)) ? b : a, qs[0]!);
      const k = c.components[best]!;
      const edge = below ? P.targets.kv40Min : P.targets.kv40Max;
      const mixKv = P.coords.toKv(mixX(best));
      if ((below ? k.kv40 >= edge : k.kv40 <= edge) && (below ? mixKv < edge : mixKv > edge)) {
        const a = c.components[pkg - 1]!;
        return `The batch is at ${batchKv} mm²/s, ${below ? 'below' : 'above'} the band ${band}, and no addition can ${below ? 'raise' : 'lower'} it that far: every addition carries the additive package ${a.id} (${fmtKv(a.kv40)} mm²/s) at the treat rate of ${words.pct(Q.r, 2)}, so the ${below ? 'heaviest' : 'thinnest'} addition, ${k.id} (${fmtKv(k.kv40)} mm²/s) with ${a.id}, is ${fmtKv(mixKv)} mm²/s. Add a ${below ? 'heavier' : 'thinner'} stock to the stocks on hand.`;
      }
    }
    if (below) {
      const heaviest = stocks.reduce((a, b) => (b.kv40 > a.kv40 ? b : a), stocks[0] ?? c.components[0]!);
      return `The batch is at ${batchKv} mm²/s, below the band ${band}, and no stock on hand is heavy enough to raise it: the heaviest, ${heaviest.id}, has ${fmtKv(heaviest.kv40)} mm²/s. Add a stock heavier than ${fmtKv(P.targets.kv40Min)} mm²/s to the stocks on hand.`;
    }
    const thinnest = stocks.reduce((a, b) => (b.kv40 < a.kv40 ? b : a), stocks[0] ?? c.components[0]!);
    return `The batch is at ${batchKv} mm²/s, above the band ${band}, and no stock on hand is thin enough to lower it: the thinnest, ${thinnest.id}, has ${fmtKv(thinnest.kv40)} mm²/s. Add a stock thinner than ${fmtKv(P.targets.kv40Max)} mm²/s to the stocks on hand.`;
  }
  const reasons: string[] = [];
  // 2. The vessel's room (or a heel's exact batch size).
  const noRoom = solveMasses(Q, { room: false, stock: true, vi: true }, 'mass');
  const room = c.finalMassKg !== undefined ? c.finalMassKg - v.massKg : c.maxFinalMassKg !== undefined ? c.maxFinalMassKg - v.massKg : Number.POSITIVE_INFINITY;
  if (typeof noRoom === 'object') {
    const need = noRoom.masses.reduce((s, m) => s + m, 0);
    if (need > room + 1e-6) {
      reasons.push(
        c.finalMassKg !== undefined && need > room
          ? `it needs at least ${kg(need)} of additions (${listOf(Q, noRoom.masses, kg)}); a batch of ${kg(c.finalMassKg)} on ${kg(v.massKg)} in the vessel leaves room for only ${kgLimit(room)}`
          : `it needs ${listOf(Q, noRoom.masses, kg)} (${kg(need)} in all); the vessel takes only ${kgLimit(room)} more`,
      );
    } else if (c.finalMassKg !== undefined) {
      reasons.push(`with exactly ${kg(room)} of additions (a batch of ${kg(c.finalMassKg)}) the stocks on hand cannot land in the band`);
    }
  }
  // 3. The stock on hand.
  const noStock = solveMasses(Q, { room: true, stock: false, vi: true }, 'mass');
  if (typeof noStock === 'object') {
    const short = c.components
      .map((k, q) => ({ k, m: noStock.masses[q + 1]! }))
      .filter(({ k, m }) => k.maxAddKg !== undefined && m > k.maxAddKg + 1e-6);
    if (short.length > 0) {
      reasons.push(short.map(({ k, m }) => `it needs ${kg(m)} of ${k.id}; only ${kgLimit(k.maxAddKg!)} is on hand`).join('; '));
    }
  }
  // 4. The minimum VI.
  if (c.minVi !== undefined) {
    const noVi = solveMasses(Q, { room: true, stock: true, vi: false }, 'mass');
    if (typeof noVi === 'object') {
      const b = batchOf(Q, noVi.masses);
      reasons.push(`the additions that reach the band leave the VI below ${words.say(c.minVi)} (${words.num(b.vi, 1)} with the least addition, ${listOf(Q, noVi.masses, kg)})`);
    }
  }
  if (reasons.length === 0) {
    // Lifting any one limit alone does not help: name every limit in force, in numbers, so the user
    // sees which ones must change together (a full vessel and a minimum VI, say).
    const limits: string[] = [];
    // (Each of room, stock and VI lifted alone was tried above; with one of them only, lifting it is
    // step 1, so at least two are in force here.)
    if (c.finalMassKg !== undefined) limits.push(`the batch of exactly ${kg(c.finalMassKg)} (room for ${kgLimit(room)} of additions)`);
    else if (c.maxFinalMassKg !== undefined) limits.push(`the vessel's room (${kgLimit(room)} more)`);
    const onHand = c.components.filter((k) => k.maxAddKg !== undefined).map((k) => `${kgLimit(k.maxAddKg!)} of ${k.id}`);
    if (onHand.length > 0) limits.push(`the stock on hand (${onHand.join(', ')})`);
    if (c.minVi !== undefined) limits.push(`the minimum VI of ${words.say(c.minVi)}`);
    reasons.push(
      limits.length > 1
        ? `no one of its limits alone stands in the way, so more than one must change: ${limits.slice(0, -1).join(', ')} and ${limits[limits.length - 1]}`
        : `the vessel's room, the stock on hand and the band cannot all be met together${limits.length === 1 ? ` (${limits[0]})` : ''}`,
    );
  }
  return `No addition brings the batch (${kg(v.massKg)} at ${batchKv} mm²/s) into ${band}: ${reasons.join('; and ')}.`;
}

/**
 * Additions that bring a batch in a vessel into its ν40 band — a QC correction, or a heel topped up
 * to a batch — at least cost or least added mass (see the module notes for the formulation).
 *
 * @param c - the problem ({@link CorrectionProblem}): the vessel's oil as measured, the stocks on hand
 *   (`maxAddKg` [kg]; fraction bounds ignored), the band targetKv40 × (1 ± tolerancePct/100), the
 *   additive's treat rate, the vessel's limit or the exact batch mass [kg], a minimum VI, the objective
 * @param method - mixing rule; default 'refutas' (mass basis; the plain API's rule)
 * @returns `{ status: 'optimal', addKg (every id), addedKg, addedCost, massKg, kv40, kv100, vi }`, or
 *   `{ status: 'infeasible', reason }` with the reason in numbers
 * @throws BlendbenchInputError and its subclasses, naming the field (e.g. `components[2].maxAddKg`)
 * @example
 * correctBatchPlain({
 *   vessel: { massKg: 10000, kv40: 290, kv100: 22, density15: 0.88, anilinePoint: 120 },
 *   components: [{ id: 'BW-280', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6, maxAddKg: 5000 }],
 *   targetKv40: 320, tolerancePct: 5, maxFinalMassKg: 12000, objective: 'cost',
  * }) // → { status: 'optimal', addKg: { 'BW-280': 1183.1 }, addedKg: 1183.1, … kv40: 304.0 }
 */
export function correctBatchPlain(c: CorrectionProblem, method: BlendMethod = 'refutas'): CorrectionResult {
  const Q = prepare(c, method, 'correctBatchPlain');
  const r = solveMasses(Q, ALL_ON, c.objective);
  if (r === 'infeasible' || r === 'failed') return { status: 'infeasible', reason: diagnose(Q) + (r === 'failed' ? ' (The LP solver also reported a numerical failure.)' : '') };
  const addKg: Record<string, number> = {};
  let addedKg = 0;
  let addedCost = 0;
  c.components.forEach((k, q) => {
    const m = r.masses[q + 1]!;
    addKg[k.id] = m;
    addedKg += m;
    addedCost += m * k.pricePerKg;
  });
  const b = batchOf(Q, r.masses);
  return { status: 'optimal', addKg, addedKg, addedCost, massKg: b.massKg, kv40: b.kv40, kv100: b.kv100, vi: b.vi };
}

/**
 * How far inside each edge of the release band a correction aims [% of that edge's ν40] — common
 * practice (no source): Blendbench has no other viscosity margin (the robust recipe's margin is one of
 * probability, not of ν40), so one is chosen here. A least-cost correction lands on the edge of the
 * band it is given; with this margin a corrected batch is predicted at least 1 % of ν40 inside the
 * release limit instead of exactly on it, room for the re-test's scatter and the additions' own lots.
 */
export const CORRECTION_EDGE_MARGIN_PCT = 1;

/**
 * The ν40 band a correction aims into: the aim ± its half-width, kept at least
 * {@link CORRECTION_EDGE_MARGIN_PCT} inside each edge of the release band.
 *
 *   lo = max(aim·(1 − b), ν_min·(1 + m)),   hi = min(aim·(1 + b), ν_max·(1 − m)),   m = margin / 100
 *
 * @param aimKv40 - the aim ν40 [mm²/s] (the grade mid-point or the plant's own)
 * @param halfWidthPct - b, the half-width around the aim [%]
 * @param releaseBand - the release band's ν40 limits [mm²/s]
 * @param marginPct - m [% of the edge's ν40] (default {@link CORRECTION_EDGE_MARGIN_PCT})
 * @returns the band, or null when the aim's band does not reach inside the margin (no correction can aim there)
 * @example correctionBand(335, 2, { min: 304, max: 336 }) // → { min: 328.3, max: 332.64 } (not 336: 1 % inside the edge)
 */
export function correctionBand(
  aimKv40: number,
  halfWidthPct: number,
  releaseBand: { min: number; max: number },
  marginPct: number = CORRECTION_EDGE_MARGIN_PCT,
): { min: number; max: number } | null {
  assertFinite('correctionBand', 'aimKv40', aimKv40);
  assertFinite('correctionBand', 'halfWidthPct', halfWidthPct);
  assertFinite('correctionBand', 'marginPct', marginPct);
  const b = halfWidthPct / 100;
  const m = marginPct / 100;
  const min = Math.max(aimKv40 * (1 - b), releaseBand.min * (1 + m));
  const max = Math.min(aimKv40 * (1 + b), releaseBand.max * (1 - m));
  return max >= min ? { min, max } : null;
}
