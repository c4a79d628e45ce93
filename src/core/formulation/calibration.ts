/**
 * Effective blending viscosity of a non-ideal component, calibrated from a measured trial blend.
 *
 * Polymers (and sometimes additive packages or polar Group V fluids) do not blend as their own
 * measured viscosity predicts: ASTM D7152 states its methods may not apply to viscosity-index
 * improvers, additive packages or strongly non-Newtonian fluids. The common practice is to make a
 * trial blend, measure it (ASTM D445), and back out the one unknown component's *effective*
 * viscosity at 40 and 100 °C so that the blending rule reproduces the measurement.
 *
 * Both rules are linear in a transformed viscosity X(ν) (see `solver/coordinates.ts`):
 *
 *   Refutas:     X = VBN = 14.534·ln(ln(ν + 0.8)) + 10.975, weights cᵢ = 1         (mass basis)
 *   ASTM D7152:  X = log₁₀ log₁₀(ν + 0.7),                weights cᵢ = 1/ρᵢ        (volume basis)
 *
 *   X_blend = Σ cᵢ·wᵢ·Xᵢ / Σ cᵢ·wᵢ      (wᵢ mass fractions)
 *
 * so the unknown component u has the exact inverse, at each temperature separately:
 *
 *   X_u = (X(ν_measured)·Σ cᵢ·wᵢ − Σ_{i≠u} cᵢ·wᵢ·Xᵢ) / (c_u·w_u),    ν_u,eff = X⁻¹(X_u).
 *
 * For the volume basis this is exact because the volume fractions depend only on the densities,
 * not on the viscosities. The result is valid only for the blending rule it was solved with, and
 * best near the trial blend's composition: a small trial fraction w_u magnifies measurement error
 * by 1/w_u.
 */
import { blendingViscosities } from './blend-properties';
import type { BlendMethod } from '../blending/blend-viscosity';
import { blendCoordinates } from '../solver/coordinates';
import {
  BlendbenchInputError,
  ViscosityOutOfRangeError,
  assertDensity15,
  assertFinite,
  assertFractions,
  assertKv40Kv100,
} from '../errors';
import type { Calibration, Component } from './model';
import { displayWords, type NumberDisplay } from '../words/display';

export interface CalibrationInput {
  /** The library: every component named in `massFractions` (others are ignored). */
  components: readonly Component[];
  /** Id of the one component whose effective viscosities are solved. */
  unknownId: string;
  /** Mass fractions of the trial blend by component id, summing to 1 within 1e-9. */
  massFractions: Record<string, number>;
  /** Measured ν40 of the trial blend, ASTM D445 [mm²/s]. */
  measuredKv40: number;
  /** Measured ν100 of the trial blend, ASTM D445 [mm²/s]. */
  measuredKv100: number;
  /** Blending rule the calibration is solved for (and valid for). */
  method: BlendMethod;
  /** Laboratory reference, e.g. sample or report number (provenance). */
  labReference: string;
  /** ISO date YYYY-MM-DD of the calibration, passed in (the core has no clock). */
  calibratedOn: string;
  /** How a refusal writes numbers (the user's decimal separator; default "."). Plain data. */
  display?: NumberDisplay;
}

/** Smallest trial fraction of the unknown accepted: below it the inverse magnifies error > 1000×. */
export const MIN_CALIBRATION_FRACTION = 0.001;

/**
 * Smallest effective viscosity accepted [mm²/s]: below 2.0 mm²/s ASTM D2270 no longer applies, and
 * no gear-oil component is that thin.
 */
export const MIN_EFFECTIVE_KV = 2.0;

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

/**
 * Solve a component's effective blending viscosities from a measured trial blend.
 *
 * X_u = (X(ν_meas)·Σ cᵢwᵢ − Σ_{i≠u} cᵢwᵢXᵢ)/(c_u·w_u) at 40 °C and at 100 °C; ν_u = X⁻¹(X_u).
 * The other components blend with their own `blendingViscosities` (their calibrations
 * included); any existing calibration of the unknown itself is ignored.
 *
 * @param input See {@link CalibrationInput}: trial mass fractions wᵢ [0–1], measured ν40 and ν100
 *   [mm²/s], rule, lab reference, date.
 * @returns A model `Calibration`: effective ν40 and ν100 [mm²/s] with the trial as provenance.
 * @throws BlendbenchInputError naming the field: unknown id, unknown component in the trial,
 *   unknown fraction ≤ 0.1 %, bad date, fractions not summing to 1 (FractionSumError), invalid
 *   measured viscosities (ViscosityOrderError …), or a trial that no positive effective viscosity
 *   of the unknown can explain (ViscosityOutOfRangeError, with the reason).
 * @example calibrateComponent({ components, unknownId: 'pib', massFractions: { base: 0.9, pib: 0.1 },
 *   measuredKv40: 220, measuredKv100: 21, method: 'refutas', labReference: 'TB-7', calibratedOn: '2024-05-02' })
 *   // → { effectiveKv40: …, effectiveKv100: …, trial: {…}, method: 'refutas', calibratedOn: '2024-05-02' }
 * Source: inverse of the Refutas rule / ASTM D7152 ASTM Blending Method (check-values.md §3) / the
 * D7152 Wright method (fixed point on the unknown's own slope, see `blending/wright.ts`).
 */
export function calibrateComponent(input: CalibrationInput): Calibration {
  const fn = 'calibrateComponent';
  const words = displayWords(input.display);
  const { components, unknownId, massFractions, measuredKv40, measuredKv100, method } = input;
  assertKv40Kv100(fn, measuredKv40, measuredKv100);
  if (typeof input.calibratedOn !== 'string' || !ISO_DATE.test(input.calibratedOn)) {
    throw new BlendbenchInputError(
      'calibratedOn',
      input.calibratedOn,
      `${fn}: calibratedOn = ${String(input.calibratedOn)} is not an ISO date (YYYY-MM-DD)`,
    );
  }
  const byId = new Map(components.map((c) => [c.id, c]));
  const ids = Object.keys(massFractions);
  assertFractions(
    fn,
    'massFraction',
    ids.map((id) => massFractions[id]!),
  );
  const unknown = byId.get(unknownId);
  if (!unknown) {
    throw new BlendbenchInputError('unknownId', unknownId, `${fn}: unknownId = "${unknownId}" is not in the component library`);
  }
  const wU = massFractions[unknownId] ?? 0;
  if (wU < MIN_CALIBRATION_FRACTION) {
    throw new BlendbenchInputError(
      'massFractions',
      wU,
      `${fn}: the trial blend holds ${wU} of ${unknown.code}; it must hold at least ${MIN_CALIBRATION_FRACTION} by mass to calibrate it`,
    );
  }

  const coords = blendCoordinates(method);
  let sumOthersCw = 0;
  const others40: number[] = [];
  const others100: number[] = [];
  for (const id of ids) {
    const w = massFractions[id]!;
    const c = byId.get(id);
    if (!c) {
      throw new BlendbenchInputError('massFractions', id, `${fn}: trial component "${id}" is not in the component library`);
    }
    assertDensity15(fn, `${id}.density15`, c.density15);
    if (id === unknownId || w === 0) continue;
    const v = blendingViscosities(c);
    const weight = coords.basisWeight(v.kv40, v.kv100, c.density15);
    sumOthersCw += weight * w;
    others40.push(weight * w * coords.toX(v.kv40));
    others100.push(weight * w * coords.toX(v.kv100));
  }

  const solveAt = (measured: number, others: number[], label: 'ν40' | 'ν100', field: string, cU: number): number => {
    const sumCw = sumOthersCw + cU * wU;
    const xU = (coords.toX(measured) * sumCw - others.reduce((s, x) => s + x, 0)) / (cU * wU);
    let kv: number;
    let usable = true;
    try {
      kv = coords.toKv(xU);
      coords.toX(kv); // the value must be usable by the rule again (ν > 0.2 or 0.3 mm²/s)
    } catch {
      kv = Number.isFinite(xU) && xU < 0 ? 0 : Number.POSITIVE_INFINITY;
      usable = false;
    }
    if (!usable || !Number.isFinite(kv) || kv < MIN_EFFECTIVE_KV) {
      const dir = Number.isFinite(kv) ? 'thinner' : 'thicker';
      throw new ViscosityOutOfRangeError(
        field,
        measured,
        `${fn}: the measured ${label} = ${words.say(measured)} mm²/s is ${dir} than any effective ${label} of ` +
          `${unknown.code} can explain at ${words.say(Number((100 * wU).toPrecision(3)))} % by mass; check the measurement and the trial fractions`,
      );
    }
    return kv;
  };
  // Unknown's weight: 1 (Refutas) or 1/ρ (ASTM Blending Method). For the Wright method it is
  // 1/(ρ·B_u), B_u the slope of the unknown's own effective D341 line, so the two temperatures are
  // coupled: solve with the current weight, recompute B_u from the result, repeat (a fixed point that
  // converges in a few steps, since B moves the weights only slightly).
  let cU = coords.massBasis ? 1 : 1 / unknown.density15;
  let effectiveKv40 = solveAt(measuredKv40, others40, 'ν40', 'measuredKv40', cU);
  let effectiveKv100 = solveAt(measuredKv100, others100, 'ν100', 'measuredKv100', cU);
  if (method === 'd7152-wright') {
    for (let it = 0; it < 200 && effectiveKv100 < effectiveKv40; it++) {
      const next = coords.basisWeight(effectiveKv40, effectiveKv100, unknown.density15);
      const done = Math.abs(next - cU) <= 1e-15 * cU;
      cU = next;
      effectiveKv40 = solveAt(measuredKv40, others40, 'ν40', 'measuredKv40', cU);
      effectiveKv100 = solveAt(measuredKv100, others100, 'ν100', 'measuredKv100', cU);
      if (done) break;
    }
  }
  assertFinite(fn, 'effectiveKv40', effectiveKv40);
  if (!(effectiveKv100 < effectiveKv40)) {
    throw new ViscosityOutOfRangeError(
      'measuredKv100',
      measuredKv100,
      `${fn}: the effective values solved for ${unknown.code} (ν40 ${words.say(Number(effectiveKv40.toPrecision(4)))}, ν100 ` +
        `${words.say(Number(effectiveKv100.toPrecision(4)))} mm²/s) do not fall with temperature; check the measurements`,
    );
  }
  return {
    effectiveKv40,
    effectiveKv100,
    trial: {
      massFractions: { ...massFractions },
      measuredKv40,
      measuredKv100,
      labReference: input.labReference,
    },
    method,
    calibratedOn: input.calibratedOn,
  };
}
