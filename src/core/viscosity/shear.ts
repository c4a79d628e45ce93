/**
 * Permanent shear loss of viscosity — KRL definition (ISO 26422 / CEC L-45, tapered roller
 * bearing test), and the in-grade check after shear.
 *
 *   loss % = 100·(ν_before − ν_after)/ν_before,   ν measured at 100 °C
 *   ν_after = ν_before·(1 − loss %/100)
 *
 * ISO 26422 allows the loss to be stated at 40 °C or at 100 °C. The functions here take one loss and
 * its viscosity; when only the ν100 loss is known, the grade check (a ν40 band) applies the same
 * percentage to ν40 (carry-over assumption, common practice, no source) — a simplification, as the
 * relative loss at 40 °C of a polymer-thickened oil generally differs from that at 100 °C. A measured
 * ν40 loss, where entered, is used as measured (`formulation/shear-blend.ts`).
 */
import { BlendbenchInputError, assertFinite, assertViscosity } from '../errors';
import { isInGrade } from './iso-grades';

/**
 * Permanent viscosity loss by the KRL definition:  100·(ν_before − ν_after)/ν_before.
 *
 * @param kvBefore - ν100 of the fresh oil [mm²/s]
 * @param kvAfter - ν100 after the shear test [mm²/s]
 * @returns loss [% of ν_before]; negative if the sheared value is higher (measurement scatter)
 * @throws InvalidNumberError, NonPositiveViscosityError
 * @example krlShearLossPct(20, 18) // → 10
 * @see ISO 26422; CEC L-45 (definition, check-values S1).
 */
export function krlShearLossPct(kvBefore: number, kvAfter: number): number {
  assertViscosity('krlShearLossPct', 'kvBefore', kvBefore);
  assertViscosity('krlShearLossPct', 'kvAfter', kvAfter);
  return (100 * (kvBefore - kvAfter)) / kvBefore;
}

/**
 * Viscosity after a permanent loss:  ν_after = ν·(1 − loss/100).
 *
 * @param kv - viscosity before shear [mm²/s]
 * @param lossPct - permanent loss [%], 0 ≤ loss < 100
 * @returns viscosity after shear [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, BlendbenchInputError (loss outside [0, 100))
 * @example shearedKv(20, 10) // → 18
 */
export function shearedKv(kv: number, lossPct: number): number {
  const fn = 'shearedKv';
  assertViscosity(fn, 'kv', kv);
  assertLossPct(fn, lossPct);
  return kv * (1 - lossPct / 100);
}

/**
 * Whether an oil stays in its ISO grade after a permanent shear loss, assuming the loss measured at
 * 100 °C applies in the same proportion at 40 °C (see module note).
 *
 * @param kv40 - ν40 of the fresh oil [mm²/s]
 * @param lossPct - permanent ν100 loss [%], 0 ≤ loss < 100
 * @param grade - ISO viscosity grade
 * @returns true if the sheared ν40 lies within the grade's band (inclusive)
 * @throws as {@link shearedKv} and {@link isInGrade}
 * @example inGradeAfterShear(330, 8, 320) // → true (303.6 mm²/s)
 */
export function inGradeAfterShear(kv40: number, lossPct: number, grade: number): boolean {
  return isInGrade(shearedKv(kv40, lossPct), grade);
}

function assertLossPct(fn: string, lossPct: unknown): asserts lossPct is number {
  assertFinite(fn, 'lossPct', lossPct);
  if (lossPct < 0 || lossPct >= 100) {
    throw new BlendbenchInputError('lossPct', lossPct, `${fn}: lossPct = ${lossPct} %; a permanent loss must lie in [0, 100)`);
  }
}
