/**
 * Blend viscosity at any temperature, by a selectable mixing rule.
 *
 * Each component is first moved along its own ASTM D341 line (through its ν40 and ν100) to the
 * blending temperature; the rule then mixes the component viscosities at that one temperature:
 * - `'refutas'`: Refutas blending number, mass fractions ({@link blendViscosityRefutas});
 * - `'astm-d7152'`: ASTM D7152 ASTM Blending Method (constant temperature), volume fractions (mass
 *   fractions converted by ideal mixing at 15 °C, see `density.ts`) ({@link blendViscosityAstmD7152});
 * - `'d7152-wright'`: ASTM D7152 Wright method, volume fractions, each component's D341 line through
 *   its ν40 and ν100 ({@link blendViscosityWright}).
 * Refutas is not part of ASTM D7152 and is never labelled as such. Every result names the method
 * that produced it.
 */
import { massToVolumeFractions } from './density';
import {
  BlendbenchInputError,
  assertAboveAbsoluteZeroC,
  assertDensity15,
  assertFractions,
  assertKv40Kv100,
} from '../errors';
import { viscosityAtTemperature } from '../viscosity/viscosity-temperature';
import { blendViscosityAstmD7152 } from './astm-loglog';
import { blendViscosityRefutas } from './refutas';
import { blendViscosityWright } from './wright';

/** A blend-viscosity mixing rule. */
export type BlendMethod = 'refutas' | 'astm-d7152' | 'd7152-wright';

/** Every mixing rule, in display order. */
export const BLEND_METHODS: readonly BlendMethod[] = ['d7152-wright', 'astm-d7152', 'refutas'];

/** Human-readable name of each mixing rule, with its fraction basis. */
export const BLEND_METHOD_LABEL: Record<BlendMethod, string> = {
  refutas: 'Refutas blending number (mass fractions)',
  'astm-d7152': 'D7152 ASTM Blending Method (constant temperature), volume fractions',
  'd7152-wright': 'D7152 Wright method (two temperatures per component), volume fractions',
};

/** The standard (or source) behind each mixing rule, for "show working". */
export const BLEND_METHOD_STANDARD: Record<BlendMethod, string> = {
  refutas: 'Refutas viscosity blending number (not an ASTM D7152 method)',
  'astm-d7152': 'ASTM D7152, ASTM Blending Method (constant temperature); Z of ASTM D341-20',
  'd7152-wright': 'ASTM D7152, Wright method; lines of ASTM D341-20',
};

/** The mixing rules a trial-blend calibration can be solved with (linear in one transformed viscosity). */
export type CalibrationMethod = 'refutas' | 'astm-d7152';

/** One component of a blend, with what every mixing rule needs. */
export interface BlendPart {
  /** Mass fraction [0–1]; a blend's parts sum to 1. */
  massFraction: number;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Kinematic viscosity at 40 °C [mm²/s]. */
  kv40: number;
  /** Kinematic viscosity at 100 °C [mm²/s], below kv40. */
  kv100: number;
}

/**
 * Kinematic viscosity of a blend at a temperature by the chosen mixing rule.
 *
 * Steps: (1) νᵢ(t) for each part from its ν40, ν100 by ASTM D341 (at exactly 40 or 100 °C the
 * measured value itself); (2) mix with Refutas on mass fractions, or with the D7152 log-log rule on
 * volume fractions φᵢ = (wᵢ/ρᵢ)/Σ(wⱼ/ρⱼ).
 *
 * @param method - mixing rule, `'refutas'`, `'astm-d7152'` or `'d7152-wright'`
 * @param parts - the blend's parts (mass fractions summing to 1 within 1e-9)
 * @param tempC - blending temperature [°C]
 * @returns `kv`, the blend's kinematic viscosity at `tempC` [mm²/s], and the `method` used
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError (a part's ν100 ≥ ν40),
 *   ViscosityOutOfRangeError (D341 range), FractionSumError, ImplausibleDensityError,
 *   BelowAbsoluteZeroError
 * @example
 * blendViscosityAt('refutas', [
 *   { massFraction: 0.5, density15: 0.88, kv40: 100, kv100: 11 },
 *   { massFraction: 0.5, density15: 0.90, kv40: 460, kv100: 31 },
 * ], 40) // → { kv: 203.39, method: 'refutas' }
 * @see ASTM D341-20; Refutas; ASTM D7152 (ASTM Blending Method, Wright method).
 */
export function blendViscosityAt(
  method: BlendMethod,
  parts: readonly BlendPart[],
  tempC: number,
): { kv: number; method: BlendMethod } {
  const fn = 'blendViscosityAt';
  assertMethod(fn, method);
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  assertFractions(
    fn,
    'massFraction',
    parts.map((p) => p.massFraction),
  );
  parts.forEach((p, i) => {
    assertDensity15(fn, `parts[${i}].density15`, p.density15);
    try {
      assertKv40Kv100('blendViscosityAt', p.kv40, p.kv100);
    } catch (e) {
      throw renameField(e, i);
    }
  });
  if (method === 'd7152-wright') return { kv: wrightAt(parts, tempC), method };
  const kvs = parts.map((p, i) => {
    if (tempC === 40) return p.kv40;
    if (tempC === 100) return p.kv100;
    try {
      return viscosityAtTemperature(p.kv40, p.kv100, tempC);
    } catch (e) {
      throw renameField(e, i);
    }
  });
  if (method === 'refutas') {
    const kv = blendViscosityRefutas(parts.map((p, i) => ({ massFraction: p.massFraction, kv: kvs[i]! })));
    return { kv, method };
  }
  const phi = massToVolumeFractions(parts);
  const kv = blendViscosityAstmD7152(phi.map((f, i) => ({ volumeFraction: f, kv: kvs[i]! })));
  return { kv, method };
}

/** The Wright method: the blend's own D341 line from the components' lines (see `wright.ts`). */
function wrightAt(parts: readonly BlendPart[], tempC: number): number {
  const phi = massToVolumeFractions(parts);
  return blendViscosityWright(
    parts.map((p, i) => ({ volumeFraction: phi[i]!, kv40: p.kv40, kv100: p.kv100 })),
    tempC,
  );
}

/**
 * The blend's ν40 and ν100 by the chosen mixing rule (as {@link blendViscosityAt} at 40 and 100 °C).
 *
 * @param method - mixing rule
 * @param parts - the blend's parts
 * @returns `kv40` and `kv100` [mm²/s] and the `method` used
 * @throws as {@link blendViscosityAt}
 * @example blendKv40Kv100('refutas', parts) // → { kv40: 203.39, kv100: 18.6, method: 'refutas' }
 */
export function blendKv40Kv100(
  method: BlendMethod,
  parts: readonly BlendPart[],
): { kv40: number; kv100: number; method: BlendMethod } {
  const kv40 = blendViscosityAt(method, parts, 40).kv;
  const kv100 = blendViscosityAt(method, parts, 100).kv;
  return { kv40, kv100, method };
}

function assertMethod(fn: string, method: unknown): asserts method is BlendMethod {
  if (!BLEND_METHODS.includes(method as BlendMethod)) {
    throw new BlendbenchInputError(
      'method',
      method,
      `${fn}: method = ${String(method)} is not a known mixing rule (${BLEND_METHODS.join(', ')})`,
    );
  }
}

/**
 * Re-raise an error found in one part as the same error class, naming this function and the part:
 * `blendViscosityAt: parts[1]: viscosityAtTemperature: at tempC = 250 °C the line gives …`.
 */
function renameField(e: unknown, i: number): unknown {
  if (e instanceof BlendbenchInputError && !e.field.startsWith('parts[')) {
    const Ctor = e.constructor as new (field: string, value: unknown, message: string) => BlendbenchInputError;
    const inner = e.message.replace(/^blendViscosityAt: /, '');
    return new Ctor(`parts[${i}].${e.field}`, e.value, `blendViscosityAt: parts[${i}]: ${inner}`);
  }
  return e;
}
