/**
 * The plain solver API — plain numbers in, plain numbers out — for Node scripting and outside
 * checks (issue 3, item 7). Same engine as the workbench (`engine.ts`), fixed conventions:
 *
 * - blend viscosities by Refutas (mass fractions) at 40 and 100 °C;
 * - aniline point by volume over EVERY given component; density by ideal mixing;
 * - cost per litre = density × Σ wᵢ·priceᵢ (exactly, by the Charnes–Cooper transformation);
 * - the ν40 band is targetKv40 × (1 ± tolerancePct/100), NOT clipped to an ISO band;
 * - `vi` is unrounded and `minVi` is compared with it.
 *
 * Feasible means, recomputed from the returned fractions: ν40 inside the band to 1e-4 relative,
 * VI ≥ minVi − 0.01, aniline point ≤ maximum + 0.01 °C, each fraction within its bounds and their
 * sum 1, both to 1e-6; optimal means within 0.5 % of the true optimum (the LP optimum is exact; the
 * VI condition is resolved by branch and bound to VI ≥ minVi − 0.005).
 */
import {
  BlendbenchInputError,
  DENSITY15_MAX,
  DENSITY15_MIN,
  FractionSumError,
  ViscosityOutOfRangeError,
  assertDensity15,
  assertFinite,
  assertKv40Kv100,
  assertViscosity,
  inField,
} from '../errors';
import { blendKv40Kv100 } from '../blending/blend-viscosity';
import { viscosityIndex, VI_MIN_KV100 } from '../viscosity/viscosity-index';
import { blendDensity, massToVolumeFractions } from '../blending/density';
import { blendAnilinePoint } from '../blending/aniline';
import { blendCostPerLitre } from '../formulation/cost';
import { prepareEngine, solvePrepared, type EngineComponent, type PreparedProblem } from './engine';
import { diagnoseInfeasible } from './diagnose';
import { assertRelSd } from '../qc/lot-spread';
import { assertProbability } from '../qc/robust';
import { inBandInfeasibleReason, withInBandProbability } from '../qc/robust-solve';

/** One component of a plain problem. */
export interface PlainComponent {
  id: string;
  /** ν40 [mm²/s]. */
  kv40: number;
  /** ν100 [mm²/s], ≥ 2.0 (ASTM D2270 scope) and below kv40. */
  kv100: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point [°C]. */
  anilinePoint: number;
  /** Price per kg (any one currency). */
  pricePerKg: number;
  /** Mass-fraction bounds, 0–1 (defaults 0 and 1). */
  minMassFraction?: number;
  maxMassFraction?: number;
  /** Lot-to-lot relative standard deviation of kv40, a fraction 0–0.25 (0.02 = 2 %); absent → 0. */
  kv40RelSd?: number;
}

export interface PlainProblem {
  components: PlainComponent[];
  /** Target ν40 [mm²/s]. */
  targetKv40: number;
  /** Half-width of the band [% of the target]. */
  tolerancePct: number;
  /** Minimum VI (unrounded). */
  minVi?: number;
  /** Maximum blend aniline point [°C]. */
  maxAnilinePoint?: number;
  /**
   * Minimum probability (0 to below 1) that a batch lands in the band under the components'
   * `kv40RelSd` (the model of `qc/lot-spread.ts`); absent → none.
   */
  minInBandProbability?: number;
  objective: 'cost' | 'solvency';
}

/** Properties of a plain blend. */
export interface PlainBlend {
  /** Mass fraction of every given id, zeros included. */
  massFractions: Record<string, number>;
  /** ν40 and ν100 [mm²/s] (Refutas). */
  kv40: number;
  kv100: number;
  /** Unrounded VI (ASTM D2270). */
  vi: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point [°C], by volume. */
  anilinePoint: number;
  /** Cost per litre (currency of the prices per litre at 15 °C). */
  costPerLitre: number;
}

export type PlainSolveResult =
  | ({ status: 'optimal'; /** Probability in band; present when any component has `kv40RelSd`. */ inBandProbability?: number } & PlainBlend)
  | { status: 'infeasible'; reason: string };

// Local copies of the limits the per-component checks compare with (one module-binding look-up at
// load: Node loaders that compile modules to CommonJS read every imported binding through a getter).
const RHO_MIN: number = DENSITY15_MIN;
const RHO_MAX: number = DENSITY15_MAX;
const KV100_FLOOR: number = VI_MIN_KV100;

/** Up to this many components, duplicate ids are found by comparing with the earlier ones (no Set). */
const SMALL_PROBLEM = 12;

/**
 * Whether components[i].id already appeared among components[0..i−1] (ids checked to be strings);
 * records it in `ids` when given (large problems), else compares with the earlier ids directly.
 */
function seenBefore(src: readonly PlainComponent[], i: number, ids: Set<string> | null): boolean {
  const id = src[i]!.id;
  if (ids) {
    if (ids.has(id)) return true;
    ids.add(id);
    return false;
  }
  for (let j = 0; j < i; j++) if (src[j]!.id === id) return true;
  return false;
}

/**
 * An array for n components, every slot written by the caller (`preparePlain` writes each one or
 * throws). Sized once: a literal for the common sizes of a plain problem (an array grown by push
 * from empty reserves 16 slots at the first push, 104 bytes of garbage per three-stock problem),
 * pushes otherwise; packed object elements either way.
 */
function componentList(n: number): EngineComponent[] {
  const none = null as unknown as EngineComponent;
  if (n === 3) return [none, none, none];
  if (n === 4) return [none, none, none, none];
  const list: EngineComponent[] = [];
  for (let i = 0; i < n; i++) list.push(none);
  return list;
}

/** Re-raise a core error with the component's index in its field name. */
function inComponent<T>(i: number, f: () => T): T {
  return inField(`components[${i}].`, f, { keep: (field) => field.startsWith('components[') });
}

/** `components[i].name`, the field name in error messages. */
function fieldOf(i: number, name: string): string {
  return `components[${i}].${name}`;
}

/** Throws unless a mass-fraction bound is a finite number from 0 to 1. */
function checkFraction(fn: string, i: number, name: string, v: number): void {
  if (typeof v === 'number' && v >= 0 && v <= 1) return;
  const f = fieldOf(i, name);
  assertFinite(fn, f, v);
  throw new FractionSumError(f, v, `${fn}: ${f} = ${v}; a fraction must lie between 0 and 1`);
}

/**
 * Validate a plain problem and build the engine's prepared problem.
 *
 * @throws BlendbenchInputError and its subclasses (InvalidNumberError, NonPositiveViscosityError,
 *   ViscosityOrderError, ViscosityOutOfRangeError, ImplausibleDensityError, FractionSumError)
 */
export function preparePlain(p: PlainProblem, fn = 'solveBlendPlain'): PreparedProblem {
  if (!p || !Array.isArray(p.components) || p.components.length === 0) {
    throw new BlendbenchInputError('components', p?.components, `${fn}: components must be a non-empty array`);
  }
  // Validation: each cheap test below passes only for values the full assert would accept; when
  // it fails, the full assert (or the original check) runs and throws the same named error with
  // the same message. Field names are built only then (no strings or closures per component on
  // the fast path — this function runs once per solve in the substitute search).
  const src = p.components;
  const ids = src.length > SMALL_PROBLEM ? new Set<string>() : null;
  const comps = componentList(src.length);
  for (let i = 0; i < src.length; i++) {
    const c = src[i]!;
    if (typeof c.id !== 'string' || c.id === '') {
      throw new BlendbenchInputError(fieldOf(i, 'id'), c.id, `${fn}: ${fieldOf(i, 'id')} must be a non-empty string`);
    }
    if (seenBefore(src, i, ids)) throw new BlendbenchInputError(fieldOf(i, 'id'), c.id, `${fn}: id "${c.id}" appears twice`);
    const kv40 = c.kv40;
    const kv100 = c.kv100;
    if (!(typeof kv40 === 'number' && typeof kv100 === 'number' && kv100 > 0 && kv100 < kv40 && kv40 < Number.POSITIVE_INFINITY)) {
      inComponent(i, () => assertKv40Kv100(fn, c.kv40, c.kv100));
    }
    if (kv100 < KV100_FLOOR) {
      throw new ViscosityOutOfRangeError(
        fieldOf(i, 'kv100'),
        kv100,
        `${fn}: ${fieldOf(i, 'kv100')} = ${kv100} mm²/s is below 2.0 mm²/s, where ASTM D2270 defines no VI`,
      );
    }
    const rho = c.density15;
    if (!(typeof rho === 'number' && rho >= RHO_MIN && rho <= RHO_MAX)) {
      assertDensity15(fn, fieldOf(i, 'density15'), rho);
    }
    if (!(typeof c.anilinePoint === 'number' && Number.isFinite(c.anilinePoint))) {
      assertFinite(fn, fieldOf(i, 'anilinePoint'), c.anilinePoint);
    }
    const price = c.pricePerKg;
    if (!(typeof price === 'number' && Number.isFinite(price))) assertFinite(fn, fieldOf(i, 'pricePerKg'), price);
    if (price < 0) {
      const f = fieldOf(i, 'pricePerKg');
      throw new BlendbenchInputError(f, price, `${fn}: ${f} = ${price}; a price must not be negative`);
    }
    const min = c.minMassFraction ?? 0;
    const max = c.maxMassFraction ?? 1;
    checkFraction(fn, i, 'minMassFraction', min);
    checkFraction(fn, i, 'maxMassFraction', max);
    if (min > max) {
      const f = fieldOf(i, 'minMassFraction');
      throw new FractionSumError(f, min, `${fn}: ${f} = ${min} is above maxMassFraction = ${max}`);
    }
    if (c.kv40RelSd !== undefined) assertRelSd(fn, fieldOf(i, 'kv40RelSd'), c.kv40RelSd);
    comps[i] = {
      id: c.id,
      label: c.id,
      kv40,
      kv100,
      density15: rho,
      anilinePoint: c.anilinePoint,
      pricePerKg: price,
      polymer: false,
      baseFluid: true,
      oxidation: 0,
      pourPoint: null,
      flashPoint: null,
      min,
      max,
      fixedAdditive: false,
      usable: true,
      kv40RelSd: c.kv40RelSd ?? 0,
    };
  }
  assertViscosity(fn, 'targetKv40', p.targetKv40);
  assertFinite(fn, 'tolerancePct', p.tolerancePct);
  if (p.tolerancePct < 0 || p.tolerancePct >= 100) {
    throw new BlendbenchInputError('tolerancePct', p.tolerancePct, `${fn}: tolerancePct = ${p.tolerancePct}; it must be from 0 to below 100 (per cent)`);
  }
  if (p.minVi !== undefined) assertFinite(fn, 'minVi', p.minVi);
  if (p.maxAnilinePoint !== undefined) assertFinite(fn, 'maxAnilinePoint', p.maxAnilinePoint);
  if (p.minInBandProbability !== undefined) assertProbability(fn, 'minInBandProbability', p.minInBandProbability);
  if (p.objective !== 'cost' && p.objective !== 'solvency') {
    throw new BlendbenchInputError('objective', p.objective, `${fn}: objective = ${String(p.objective)}; use 'cost' or 'solvency'`);
  }
  return prepareEngine(
    comps,
    {
      kv40Min: p.targetKv40 * (1 - p.tolerancePct / 100),
      kv40Max: p.targetKv40 * (1 + p.tolerancePct / 100),
      minVi: p.minVi ?? null,
      maxAnilinePoint: p.maxAnilinePoint ?? null,
      maxPolymerFraction: null,
      maxPourPoint: null,
      minFlashPoint: null,
      objective: p.objective,
      referenceMassFractions: null,
      minInBandProbability: p.minInBandProbability ?? null,
    },
    'refutas',
  );
}

/**
 * Recompute a plain blend's properties from its fractions with the calculation core.
 *
 * @param components - the plain components
 * @param w - mass fractions aligned with `components`, summing to 1
 * @returns the properties ({@link PlainBlend})
 */
export function plainBlendProperties(components: readonly PlainComponent[], w: ArrayLike<number>): PlainBlend {
  const parts = components.map((c, i) => ({ massFraction: w[i] ?? 0, density15: c.density15, kv40: c.kv40, kv100: c.kv100 }));
  const { kv40, kv100 } = blendKv40Kv100('refutas', parts);
  const phi = massToVolumeFractions(parts);
  const massFractions: Record<string, number> = {};
  components.forEach((c, i) => (massFractions[c.id] = w[i] ?? 0));
  return {
    massFractions,
    kv40,
    kv100,
    vi: viscosityIndex(kv40, kv100),
    density15: blendDensity(parts),
    anilinePoint: blendAnilinePoint(components.map((c, i) => ({ volumeFraction: phi[i]!, anilinePoint: c.anilinePoint }))).value,
    costPerLitre: blendCostPerLitre(components.map((c, i) => ({ massFraction: w[i] ?? 0, density15: c.density15, pricePerKg: c.pricePerKg }))),
  };
}

/**
 * Solve a blend in plain numbers: least cost per litre (or lowest aniline point, ties broken by
 * cost) with ν40 in targetKv40 × (1 ± tolerancePct/100), optional minimum VI and maximum aniline
 * point, and per-component mass-fraction bounds.
 *
 * @param p - the problem ({@link PlainProblem})
 * @returns `{ status: 'optimal', massFractions, kv40, kv100, vi, density15, anilinePoint, costPerLitre }`
 *   with every given id in `massFractions` (zeros included), or `{ status: 'infeasible', reason }`
 * @throws the core's named errors (BlendbenchInputError subclasses) for impossible input
 * @example
 * solveBlendPlain({
 *   components: [
 *     { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 },
 *     { id: 'heavy', kv40: 460, kv100: 31, density15: 0.90, anilinePoint: 125, pricePerKg: 1.5 },
 *   ],
 *   targetKv40: 220, tolerancePct: 0, objective: 'cost',
 * }) // → { status: 'optimal', massFractions: { light: 0.4487, heavy: 0.5513 }, kv40: 220, … }
 */
export function solveBlendPlain(p: PlainProblem): PlainSolveResult {
  const P = preparePlain(p);
  const r = solvePrepared(P);
  if (r.status !== 'optimal') {
    if ((p.minInBandProbability ?? 0) > 0 && solvePrepared(P, null, { nominal: true }).status === 'optimal') {
      return { status: 'infeasible', reason: inBandInfeasibleReason(P, { min: P.targets.kv40Min, max: P.targets.kv40Max }) };
    }
    const d = diagnoseInfeasible(withInBandProbability(P, null), { product: `the target ν40 ${p.targetKv40} mm²/s ± ${p.tolerancePct} %` });
    const withSuggestion = d.binding === 'kv40-min' || d.binding === 'kv40-max' ? d.reason : `${d.reason} ${d.suggestion}`;
    return { status: 'infeasible', reason: withSuggestion };
  }
  // The engine's numbers come from the same equations as the core's (Refutas, D2270, ideal mixing);
  // tests/core/solver/plain.test.ts checks them against plainBlendProperties (the core itself).
  const massFractions: Record<string, number> = {};
  p.components.forEach((c, i) => (massFractions[c.id] = r.massFractions[i]!));
  return {
    status: 'optimal',
    massFractions,
    kv40: r.kv40,
    kv100: r.kv100,
    vi: r.vi!,
    density15: r.density15,
    anilinePoint: r.anilinePoint!,
    costPerLitre: r.costPerLitre,
    ...(p.components.some((c) => c.kv40RelSd !== undefined) ? { inBandProbability: r.inBandProbability ?? 1 } : {}),
  };
}
