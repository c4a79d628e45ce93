/**
 * Viscosity index — ASTM D2270 (technically equivalent: ISO 2909).
 *
 * The VI places an oil's viscosity–temperature slope on a scale where a reference oil of VI 0
 * (viscosity L at 40 °C) and one of VI 100 (viscosity H at 40 °C), both having the same ν100 as
 * the oil, are the end points.
 *
 * Symbols (as in ASTM D2270): U = ν40 of the oil, Y = ν100 of the oil, L and H = ν40 of the VI-0 and
 * VI-100 reference oils having ν100 = Y; all kinematic viscosities in mm²/s (= cSt).
 */
import { D2270_H as TABLE_H, D2270_KV100 as TABLE_KV100, D2270_L as TABLE_L } from './d2270-table1';
import { ViscosityOutOfRangeError, assertKv40Kv100, assertViscosity, assertFinite } from '../errors';

/** Lowest ν100 for which D2270 defines a VI [mm²/s] (scope of the standard). */
export const VI_MIN_KV100 = 2.0;

/** Highest ν100 covered by Table 1 [mm²/s]; above it the standard's equations apply. */
export const VI_TABLE_MAX_KV100 = 70.0;

// Local references to the Table 1 columns: one module-binding look-up at load, not one per access
// in the binary search (Node loaders that compile modules to CommonJS turn every imported binding
// into a getter call; the solver evaluates this look-up thousands of times per second).
const D2270_KV100: Float64Array = TABLE_KV100;
const D2270_L: Float64Array = TABLE_L;
const D2270_H: Float64Array = TABLE_H;

/**
 * L and H for Y = ν100 [mm²/s], written into `out` without input checks or allocation: Table 1 with
 * linear interpolation between rows (the standard's instruction) for 2.0 ≤ Y ≤ 70.0, a Y equal to a
 * tabulated row giving that row exactly, and the D2270 equations above 70 mm²/s. The caller
 * guarantees Y ≥ 2.0 and finite; `referenceViscosities` is the checked entry point, and the solver's
 * inner loops call this directly.
 */
export function referenceViscositiesInto(y: number, out: { L: number; H: number }): void {
  if (y > VI_TABLE_MAX_KV100) {
    out.L = 0.8353 * y * y + 14.67 * y - 216;
    out.H = 0.1684 * y * y + 11.85 * y - 97;
    return;
  }
  // Binary search for the last row with kv100 ≤ y (steps are irregular: 0.1, 0.2, 0.5).
  let lo = 0;
  let hi = D2270_KV100.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((D2270_KV100[mid] as number) <= y) lo = mid;
    else hi = mid;
  }
  const y0 = D2270_KV100[lo] as number;
  const y1 = D2270_KV100[hi] as number;
  const L0 = D2270_L[lo] as number;
  const L1 = D2270_L[hi] as number;
  const H0 = D2270_H[lo] as number;
  const H1 = D2270_H[hi] as number;
  if (y === y0) {
    out.L = L0;
    out.H = H0;
  } else if (y === y1) {
    out.L = L1;
    out.H = H1;
  } else {
    const f = (y - y0) / (y1 - y0);
    out.L = L0 + f * (L1 - L0);
    out.H = H0 + f * (H1 - H0);
  }
}

function interpolateTable(y: number): { L: number; H: number } {
  const out = { L: 0, H: 0 };
  referenceViscositiesInto(y, out);
  return out;
}

/**
 * Reference viscosities L and H at 40 °C for an oil of kinematic viscosity `kv100` at 100 °C.
 *
 * - 2.0 ≤ Y ≤ 70.0 mm²/s: Table 1, linear interpolation between rows (D2270 §7.1).
 * - Y > 70.0 mm²/s: L = 0.8353·Y² + 14.67·Y − 216,  H = 0.1684·Y² + 11.85·Y − 97 (D2270 §7.2).
 *
 * @param kv100 - Y, kinematic viscosity of the oil at 100 °C [mm²/s]; valid range Y ≥ 2.0
 * @returns L and H, kinematic viscosities at 40 °C of the VI-0 and VI-100 reference oils [mm²/s]
 * @throws InvalidNumberError if `kv100` is not finite
 * @throws NonPositiveViscosityError if `kv100` ≤ 0
 * @throws ViscosityOutOfRangeError if `kv100` < 2.0 mm²/s (outside the standard's scope)
 * @example
 * referenceViscosities(8.86) // → { L: 119.94, H: 69.48 }  (D2270 worked example, interpolated)
 * referenceViscosities(100)  // → { L: 9604, H: 2772 }
 * @see ASTM D2270, Standard Practice for Calculating Viscosity Index from Kinematic Viscosity at
 *   40 °C and 100 °C: Table 1 and the equations for ν100 above 70 mm²/s (ISO 2909 is equivalent).
 */
export function referenceViscosities(kv100: number): { L: number; H: number } {
  const fn = 'referenceViscosities';
  assertViscosity(fn, 'kv100', kv100);
  assertViRange(fn, kv100);
  if (kv100 <= VI_TABLE_MAX_KV100) return interpolateTable(kv100);
  const y = kv100;
  return {
    L: 0.8353 * y * y + 14.67 * y - 216,
    H: 0.1684 * y * y + 11.85 * y - 97,
  };
}

function assertViRange(fn: string, kv100: number): void {
  if (kv100 < VI_MIN_KV100) {
    throw new ViscosityOutOfRangeError(
      'kv100',
      kv100,
      `${fn}: kv100 = ${kv100} mm²/s is below ${VI_MIN_KV100.toFixed(1)} mm²/s; ` +
        'ASTM D2270 defines no viscosity index there',
    );
  }
}

/**
 * Viscosity index, unrounded (full precision), by ASTM D2270 procedure A or B.
 *
 * Procedure A (VI ≤ 100, i.e. U ≥ H):  VI = 100·(L − U)/(L − H)
 *
 * Procedure B (VI > 100, i.e. U < H):  N = (log₁₀H − log₁₀U)/log₁₀Y,  VI = (10^N − 1)/0.00715 + 100
 *
 * Both give exactly 100 at U = H. Keep this full-precision value for calculations and constraints;
 * report {@link reportedViscosityIndex}.
 *
 * @param kv40 - U, kinematic viscosity of the oil at 40 °C [mm²/s]
 * @param kv100 - Y, kinematic viscosity of the oil at 100 °C [mm²/s]; valid range Y ≥ 2.0
 * @returns viscosity index [dimensionless], unrounded; may be negative for very poor oils
 * @throws InvalidNumberError if an input is not finite
 * @throws NonPositiveViscosityError if an input is ≤ 0
 * @throws ViscosityOrderError if kv100 ≥ kv40
 * @throws ViscosityOutOfRangeError if kv100 < 2.0 mm²/s
 * @example
 * viscosityIndex(73.30, 8.86) // → 92.43  (D2270 worked example, procedure A; reported 92)
 * viscosityIndex(22.83, 5.05) // → 156.42 (D2270 worked example, procedure B; reported 156)
 * @see ASTM D2270, procedures A and B; worked examples reproduced in tests (check values V1, V2).
 */
export function viscosityIndex(kv40: number, kv100: number): number {
  const fn = 'viscosityIndex';
  assertKv40Kv100(fn, kv40, kv100);
  assertViRange(fn, kv100);
  return viscosityIndexUnchecked(kv40, kv100);
}

/**
 * The ν40 an oil of a given ν100 and viscosity index has: ASTM D2270 procedures A and B solved for U.
 *
 * Procedure A (VI ≤ 100):  U = L − VI·(L − H)/100
 *
 * Procedure B (VI > 100):  N = log₁₀(1 + 0.00715·(VI − 100)),  U = H / Y^N
 *
 * The exact algebraic inverse of {@link viscosityIndex} (round trip to rounding error).
 *
 * @param vi - viscosity index [dimensionless], unrounded
 * @param kv100 - Y, kinematic viscosity at 100 °C [mm²/s]; valid range Y ≥ 2.0
 * @returns U, kinematic viscosity at 40 °C [mm²/s]
 * @throws InvalidNumberError if an input is not finite
 * @throws NonPositiveViscosityError if kv100 ≤ 0
 * @throws ViscosityOutOfRangeError if kv100 < 2.0 mm²/s, or the result is not above kv100 (a VI so
 *   high, or so low, that no oil has it at this ν100)
 * @example
 * kv40FromViscosityIndex(viscosityIndex(73.30, 8.86), 8.86) // → 73.30 (D2270 worked example, procedure A)
 * kv40FromViscosityIndex(viscosityIndex(22.83, 5.05), 5.05) // → 22.83 (D2270 worked example, procedure B)
 * @see ASTM D2270, procedures A and B (the equations of {@link viscosityIndex}, solved for U).
 */
export function kv40FromViscosityIndex(vi: number, kv100: number): number {
  const fn = 'kv40FromViscosityIndex';
  assertFinite(fn, 'vi', vi);
  assertViscosity(fn, 'kv100', kv100);
  assertViRange(fn, kv100);
  const { L, H } = referenceViscosities(kv100);
  const U = vi <= 100 ? L - (vi * (L - H)) / 100 : H / Math.pow(kv100, Math.log10(1 + 0.00715 * (vi - 100)));
  if (!(U > kv100)) {
    throw new ViscosityOutOfRangeError('vi', vi, `${fn}: no oil of ν100 ${kv100} mm²/s has a viscosity index of ${vi} (ν40 would be ${U.toPrecision(4)} mm²/s)`);
  }
  return U;
}

/** L and H of {@link viscosityIndexUnchecked} (module scratch: the core is synchronous). */
const LH_SCRATCH = { L: 0, H: 0 };

/**
 * {@link viscosityIndex} without its input checks and without allocation, for inner loops whose
 * arguments are already known to be valid (finite, 2.0 ≤ kv100 < kv40 [mm²/s]); the same
 * arithmetic, so the same result bit for bit.
 *
 * @param kv40 - U [mm²/s]
 * @param kv100 - Y [mm²/s], ≥ 2.0
 * @returns the unrounded viscosity index (ASTM D2270 procedure A or B)
 */
export function viscosityIndexUnchecked(kv40: number, kv100: number): number {
  const U = kv40;
  const Y = kv100;
  referenceViscositiesInto(Y, LH_SCRATCH);
  const L = LH_SCRATCH.L;
  const H = LH_SCRATCH.H;
  if (U >= H) {
    // Procedure A: linear position of U between the VI-0 and VI-100 reference oils.
    return (100 * (L - U)) / (L - H);
  }
  // Procedure B: the logarithmic form used above VI 100.
  const N = (Math.log10(H) - Math.log10(U)) / Math.log10(Y);
  return (Math.pow(10, N) - 1) / 0.00715 + 100;
}

/**
 * Round to the nearest whole number, an exact half going to the even neighbour (ASTM E29
 * "round half to even"): 116.5 → 116, 115.5 → 116, −2.5 → −2.
 *
 * @param x - value to round [any unit]
 * @returns the nearest integer, ties to even
 * @throws InvalidNumberError if `x` is not finite
 * @example roundHalfEven(116.5) // → 116
 * @see ASTM E29, Standard Practice for Using Significant Digits in Test Data to Determine
 *   Conformance with Specifications (rounding method), as referenced by ASTM D2270.
 */
export function roundHalfEven(x: number): number {
  assertFinite('roundHalfEven', 'x', x);
  const floor = Math.floor(x);
  const diff = x - floor;
  if (diff < 0.5) return floor;
  if (diff > 0.5) return floor + 1;
  return floor % 2 === 0 ? floor : floor + 1;
}

/**
 * The viscosity index as ASTM D2270 reports it: the unrounded {@link viscosityIndex} rounded to the
 * nearest whole number, exact halves to even (ASTM E29, which D2270 references).
 *
 * @param kv40 - U, kinematic viscosity at 40 °C [mm²/s]
 * @param kv100 - Y, kinematic viscosity at 100 °C [mm²/s]; valid range Y ≥ 2.0
 * @returns reported viscosity index, a whole number [dimensionless]
 * @throws the same errors as {@link viscosityIndex}
 * @example reportedViscosityIndex(73.30, 8.86) // → 92 (D2270 worked example)
 * @see ASTM D2270 (report the VI as a whole number) and ASTM E29.
 */
export function reportedViscosityIndex(kv40: number, kv100: number): number {
  const vi = viscosityIndex(kv40, kv100);
  const r = roundHalfEven(vi);
  return r === 0 ? 0 : r; // normalise −0
}
