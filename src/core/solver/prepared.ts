/**
 * The solver's prepared problem: each component's numbers precomputed once (blending coordinates at
 * 40 and 100 °C, 1/ρ, aniline point, price, oxidation rating, pour and flash indices relative to
 * their limits) for a set of components, targets and mixing rule, so that any subset can then be
 * solved quickly (`solvePrepared` in `engine.ts`).
 *
 * The formulation that uses these numbers is described in `engine.ts`; the rows are written in
 * `rows.ts`, the objectives in `objectives.ts`, the VI branch and bound in `branch-and-bound.ts`.
 */
import type { Objective } from '../formulation/model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { pourBlendingIndex } from '../blending/pour-point';
import { flashBlendingIndex } from '../blending/flash-point';
import { blendCoordinates, type BlendCoordinates } from './coordinates';
import { ViBoundary, type ViChord } from './vi-boundary';

/** One component as the engine needs it (plain numbers; see `prepareComponents` for Components). */
export interface EngineComponent {
  id: string;
  /** Short label used in messages (the stock code). */
  label: string;
  /** ν40, ν100 used for blending (effective values of a calibrated component) [mm²/s]. */
  kv40: number;
  kv100: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point [°C]; null → left out of the aniline mean (additive package). */
  anilinePoint: number | null;
  /** Price per kg, in the problem's currency. */
  pricePerKg: number;
  /** Counts toward the polymer cap. */
  polymer: boolean;
  /** Counts toward the base-fluid oxidation rating (false for additive packages). */
  baseFluid: boolean;
  /** Oxidation-stability rating (Blendbench's 1–5 scale). */
  oxidation: number;
  /** Pour point [°C] and flash point [°C]; null if unknown. */
  pourPoint: number | null;
  flashPoint: number | null;
  /** Mass-fraction bounds (0–1); the fixed additive has min = max = its treat rate. */
  min: number;
  max: number;
  /** The additive package at a fixed treat rate. */
  fixedAdditive: boolean;
  /** False for withdrawn components (and for those a constraint cannot be checked on). */
  usable: boolean;
  /** Lot-to-lot relative standard deviation of kv40, a fraction (0.02 = 2 %); absent → 0 (`qc/lot-spread.ts`). */
  kv40RelSd?: number;
}

/** Targets in plain numbers; the ν40 band is final (target band already clipped to the ISO band). */
export interface EngineTargets {
  /** ν40 band [mm²/s], inclusive. */
  kv40Min: number;
  kv40Max: number;
  /** Minimum VI (unrounded); null → none. */
  minVi: number | null;
  /** Maximum aniline point [°C]; null → none. */
  maxAnilinePoint: number | null;
  /** Maximum polymer mass fraction (0–1); null → none. */
  maxPolymerFraction: number | null;
  /** Maximum pour-point estimate [°C]; null → none. */
  maxPourPoint: number | null;
  /** Minimum flash-point estimate [°C]; null → none. */
  minFlashPoint: number | null;
  objective: Objective;
  /** Mass fractions of the reference recipe, aligned with the components (for 'closest'). */
  referenceMassFractions: readonly number[] | null;
  /**
   * Minimum probability (0–1) that a batch lands in the ν40 band under the components' lot spread
   * (`qc/robust.ts`); absent or null → none.
   */
  minInBandProbability?: number | null;
}

/** Constraint groups, switched off one at a time to find the binding one. */
export type ConstraintGroup = 'band' | 'vi' | 'aniline' | 'polymer' | 'bounds' | 'additive' | 'pour' | 'flash';

export const ALL_GROUPS: readonly ConstraintGroup[] = [
  'band',
  'vi',
  'aniline',
  'polymer',
  'bounds',
  'additive',
  'pour',
  'flash',
];

/** Every constraint group (the default of a solve). */
export const ALL_GROUP_SET: ReadonlySet<ConstraintGroup> = new Set(ALL_GROUPS);

/** Whether a constraint group is switched on (no set look-up for the default, every group on). */
export function groupOn(groups: ReadonlySet<ConstraintGroup>, g: ConstraintGroup): boolean {
  return groups === ALL_GROUP_SET || groups.has(g);
}

/** Reference properties for the 'closest' objective (computed from the reference recipe). */
export interface ClosestReference {
  x40: number;
  x100: number;
  anilinePoint: number;
  /** Σ cᵢwᵢ of the reference (1 for mass-basis rules). */
  viscBasis: number;
  /** Σ_A wᵢ/ρᵢ of the reference [L/kg]. */
  anilineVolume: number;
  /** X per 1 % of ν40 and ν100 at the reference. */
  perPct40: number;
  perPct100: number;
  kv40: number;
  kv100: number;
}

/** A ratio objective num·w / den·w (linear after normalising den·w = 1). */
export interface RatioObjective {
  kind: 'ratio';
  sense: 'minimize' | 'maximize';
  num: ArrayLike<number>;
  den: ArrayLike<number>;
}
/** The 'closest' objective: min Σ of three auxiliary deviation variables, normalise Σ w = 1. */
export interface ClosestObjective {
  kind: 'closest';
}
export type EngineObjective = RatioObjective | ClosestObjective;

/**
 * One number per component, aligned with `components` (written once by `prepareEngine`, read-only
 * afterwards; a column that is one constant for every component is a shared one, possibly longer
 * than the number of components).
 */
export type Column = number[];

/**
 * A new column of n entries, every one written by the caller. A plain array in V8's packed double
 * elements kind: for the few components of a plain problem it is a third of the memory of a
 * Float64Array (an on-heap typed array of four numbers takes some 230 bytes, the array about 80),
 * and every column has the same kind (packed doubles from the start, and an
 * integer written later stays a double), so that a load from any column compiles to one form.
 */
function column(n: number): Column {
  // Packed doubles for every size (any fraction as the filler; the caller overwrites it): a
  // literal for the common sizes of a plain problem (a CPU profile of fresh three-stock solves
  // gave `new Array(n)` 2 % of the time), pushes otherwise (same elements kind).
  if (n === 3) return [0.5, 0.5, 0.5];
  if (n === 4) return [0.5, 0.5, 0.5, 0.5];
  const col: number[] = [];
  for (let i = 0; i < n; i++) col.push(0.5);
  return col;
}

/**
 * Per-component numbers precomputed once for a set of components, targets and mixing rule;
 * {@link solvePrepared} then solves any subset quickly. Arrays are aligned with `components`.
 */
export interface PreparedProblem {
  readonly method: BlendMethod;
  readonly coords: BlendCoordinates;
  readonly components: readonly EngineComponent[];
  readonly targets: EngineTargets;
  readonly n: number;
  readonly x40: Column;
  readonly x100: Column;
  /** Viscosity basis weight cᵢ (1, 1/ρᵢ, or 1/(ρᵢBᵢ) for Wright). */
  readonly c: Column;
  readonly invRho: Column;
  /** Aniline point, NaN where null. */
  readonly ap: Column;
  readonly price: Column;
  readonly ox: Column;
  /** Pour index / BI_max and flash index / FI_max (NaN where unknown or no limit). */
  readonly pourRel: Column;
  readonly flashRel: Column;
  /** Band in X: [bandA, bandB]. */
  readonly bandA: number;
  readonly bandB: number;
  readonly vi: ViBoundary | null;
  /**
   * Lazily computed numbers shared by every solve of this problem: h at the band ends and the
   * root relaxation of the VI condition (see {@link viRoot}).
   */
  readonly cache: {
    viRoot?: ViRoot;
    viFloor?: number;
    /** A ν100 [mm²/s] whose U_max reaches ν_lo (any stock at least this thick passes the VI floor test). */
    viSureKv100?: number;
    closest?: Float64Array[];
    /** The objective the targets ask for, and the name it was made for (see `primaryObjective`). */
    primary?: EngineObjective;
    primaryOf?: Objective;
    inBand?: unknown;
  };
  readonly reference: ClosestReference | null;
  /** Indices with min > 0 (always in every subset). */
  readonly forced: readonly number[];
  /** Indices of usable components. */
  readonly usableIndices: readonly number[];
  /**
   * Whether any component has a mass-fraction bound (min > 0 or max < 1) or is the fixed additive:
   * when none has, a node's LP writes no bound rows and folds no column (no look at the components).
   */
  readonly anyBounds: boolean;
}

/** Shared read-only columns of 1, 0 and NaN (grown to the largest problem seen, never shrunk). */
const CONSTANT_COLUMNS = { one: filledColumn(16, 1), zero: filledColumn(16, 0), nan: filledColumn(16, Number.NaN) };

/** A column of n entries all equal to v. */
function filledColumn(n: number, v: number): Column {
  const col = column(n);
  for (let i = 0; i < n; i++) col[i] = v;
  return col;
}

/**
 * A column of `n` or more entries all equal to 1, 0 or NaN, shared by every prepared problem: a
 * constant of the formulation, not data of any problem. Read-only (nothing writes a column).
 */
function constantColumn(which: 'one' | 'zero' | 'nan', n: number): Column {
  // (Named look-ups, not CONSTANT_COLUMNS[which]: a keyed load by a string took 2 % of a fresh
  // three-stock solve in a CPU profile.)
  const cc = CONSTANT_COLUMNS;
  const col = which === 'one' ? cc.one : which === 'zero' ? cc.zero : cc.nan;
  if (col.length >= n) return col;
  const grown = filledColumn(Math.max(n, 2 * col.length), which === 'one' ? 1 : which === 'zero' ? 0 : Number.NaN);
  if (which === 'one') cc.one = grown;
  else if (which === 'zero') cc.zero = grown;
  else cc.nan = grown;
  return grown;
}

/** Shared read-only lists 0, 1, …, n − 1 (index n), one per size seen: the usable indices when every component is usable. */
const ALL_INDICES: number[][] = [];
/** The shared empty list of forced indices (read-only). */
const NONE: readonly number[] = [];

/** The shared list 0, 1, …, n − 1 (read-only: nothing writes a prepared problem's lists). */
function allIndices(n: number): readonly number[] {
  // (No read past the end of the list: that would cost the compiled code a deoptimisation.)
  let list = n < ALL_INDICES.length ? ALL_INDICES[n] : undefined;
  if (!list) {
    list = [];
    for (let i = 0; i < n; i++) list.push(i);
    while (ALL_INDICES.length < n) ALL_INDICES.push(undefined as unknown as number[]);
    ALL_INDICES[n] = list;
  }
  return list;
}

/**
 * Precompute the engine's numbers.
 *
 * @param components - engine components (see {@link EngineComponent})
 * @param targets - final targets
 * @param method - mixing rule
 * @returns the prepared problem
 * @throws whatever the core's blending-coordinate functions throw for impossible viscosities
 */
export function prepareEngine(
  components: readonly EngineComponent[],
  targets: EngineTargets,
  method: BlendMethod,
): PreparedProblem {
  const coords = blendCoordinates(method);
  const n = components.length;
  // One array per column, sized once (see `column`).
  const x40 = column(n);
  const x100 = column(n);
  const invRho = column(n);
  const ap = column(n);
  const price = column(n);
  const pourMax = targets.maxPourPoint === null ? null : pourBlendingIndex(targets.maxPourPoint);
  const flashMax = targets.minFlashPoint === null ? null : flashBlendingIndex(targets.minFlashPoint);
  // Columns that are the same constant for every component share one read-only column of that
  // constant (no array of their own): the basis weight of a mass-basis rule (1), the pour and flash
  // indices without a limit (NaN), the oxidation ratings when every one is 0.
  const c = coords.massBasis ? constantColumn('one', n) : column(n);
  const pourRel = pourMax === null ? constantColumn('nan', n) : column(n);
  const flashRel = flashMax === null ? constantColumn('nan', n) : column(n);
  let anyOx = false;
  for (let i = 0; i < n; i++) if (components[i]!.baseFluid && components[i]!.oxidation !== 0) anyOx = true;
  const ox = anyOx ? column(n) : constantColumn('zero', n);
  // The lists of forced and usable indices are the shared ones (none forced; every one usable)
  // until a component differs: most problems allocate neither.
  let forced: readonly number[] = NONE;
  let usableIndices: readonly number[] = allIndices(n);
  let anyBounds = false;
  for (let i = 0; i < n; i++) {
    const k = components[i]!;
    // The checked toX only where it would throw (same value either way): the stock's two
    // blending coordinates are its only logarithms of the preparation.
    x40[i] = coords.acceptsKv(k.kv40) ? coords.toXRaw(k.kv40) : coords.toX(k.kv40);
    x100[i] = coords.acceptsKv(k.kv100) ? coords.toXRaw(k.kv100) : coords.toX(k.kv100);
    invRho[i] = 1 / k.density15;
    if (!coords.massBasis) c[i] = coords.basisWeight(k.kv40, k.kv100, k.density15);
    ap[i] = k.anilinePoint === null ? Number.NaN : k.anilinePoint;
    price[i] = k.pricePerKg;
    if (anyOx) ox[i] = k.baseFluid ? k.oxidation : 0;
    if (pourMax !== null) pourRel[i] = k.pourPoint !== null ? pourBlendingIndex(k.pourPoint) / pourMax : Number.NaN;
    if (flashMax !== null) flashRel[i] = k.flashPoint !== null ? flashBlendingIndex(k.flashPoint) / flashMax : Number.NaN;
    if (!k.usable && usableIndices.length === n) usableIndices = allIndices(n).filter((j) => components[j]!.usable);
    if (k.min > 0) forced = forced === NONE ? [i] : [...forced, i];
    if (k.min > 0 || k.max < 1 || k.fixedAdditive) anyBounds = true;
  }
  const bandA = coords.acceptsKv(targets.kv40Min) ? coords.toXRaw(targets.kv40Min) : coords.toX(targets.kv40Min);
  const bandB = coords.acceptsKv(targets.kv40Max) ? coords.toXRaw(targets.kv40Max) : coords.toX(targets.kv40Max);
  let vi: ViBoundary | null = null;
  if (targets.minVi !== null) vi = new ViBoundary(targets.minVi, coords);
  let reference: ClosestReference | null = null;
  if (targets.referenceMassFractions) {
    const w = targets.referenceMassFractions;
    let sc = 0;
    let s40 = 0;
    let s100 = 0;
    let sa = 0;
    let saAp = 0;
    for (let i = 0; i < n; i++) {
      const wi = w[i] ?? 0;
      if (wi <= 0) continue;
      sc += c[i]! * wi;
      s40 += c[i]! * wi * x40[i]!;
      s100 += c[i]! * wi * x100[i]!;
      if (!Number.isNaN(ap[i]!)) {
        sa += invRho[i]! * wi;
        saAp += invRho[i]! * wi * ap[i]!;
      }
    }
    if (sc > 0) {
      const rx40 = s40 / sc;
      const rx100 = s100 / sc;
      const kv40 = coords.toKv(rx40);
      const kv100 = coords.toKv(rx100);
      reference = {
        x40: rx40,
        x100: rx100,
        anilinePoint: sa > 0 ? saAp / sa : Number.NaN,
        viscBasis: sc,
        anilineVolume: sa,
        perPct40: coords.perPct(kv40),
        perPct100: coords.perPct(kv100),
        kv40,
        kv100,
      };
    }
  }
  return {
    method,
    coords,
    components,
    targets,
    n,
    x40,
    x100,
    c,
    invRho,
    ap,
    price,
    ox,
    pourRel,
    flashRel,
    bandA,
    bandB,
    vi,
    // Every slot present from the start (undefined until computed): every problem's cache then has
    // the same shape whatever it computes first, so its look-ups stay monomorphic.
    cache: { viRoot: undefined, viFloor: undefined, viSureKv100: undefined, closest: undefined, primary: undefined, primaryOf: undefined, inBand: undefined },
    reference,
    forced,
    usableIndices,
    anyBounds,
  };
}

/** h at the band ends and the VI relaxation on the whole band. */
export interface ViRoot {
  hA: number;
  hB: number;
  chords: readonly ViChord[];
}

/**
 * h(X(ν_lo)): the least blend X100 that meets the minimum VI anywhere in the ν40 band (h rises
 * with X40), computed on first use and cached; null without a minimum VI. A subset whose thickest
 * stock at 100 °C stays below it cannot meet the minimum VI in band.
 */
export function viBandFloor(P: PreparedProblem): number | null {
  if (!P.vi) return null;
  let hA = P.cache.viFloor;
  if (hA === undefined) P.cache.viFloor = hA = P.vi.h(P.bandA);
  return hA;
}

/** The root VI relaxation of a prepared problem, computed on first use and cached. */
export function viRoot(P: PreparedProblem): ViRoot | null {
  if (!P.vi) return null;
  if (!P.cache.viRoot) {
    const hA = viBandFloor(P)!;
    const hB = P.vi.h(P.bandB, hA);
    P.cache.viRoot = { hA, hB, chords: P.vi.relaxation(P.bandA, hA, P.bandB, hB) };
  }
  return P.cache.viRoot;
}

// ---------------------------------------------------------------------------------------------
// Objectives and LP construction
