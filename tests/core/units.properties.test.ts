/**
 * Property-based round trips of the unit conversions (`units.ts`) and of kg ↔ litres at 15 °C ↔ litres
 * at a temperature (ASTM D1250-80 Table 54D, `blending/density-temperature.ts`). Invariants only; seeds
 * fixed so CI is deterministic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cToF, cToK, convertPrice, fToC } from '../../src/core/units';
import { densityAtTemperature } from '../../src/core/blending/density-temperature';
import { batchQuantities } from '../../src/core/formulation/cost';
import { BelowAbsoluteZeroError } from '../../src/core/errors';

const NUM_RUNS = 2000;

describe('temperature — round trips (properties)', () => {
  it('°C → °F → °C and °F → °C → °F return the value; kelvin is t + 273.15; °F is increasing in °C', () => {
    fc.assert(
      fc.property(fc.double({ min: -273.15, max: 5000, noNaN: true }), fc.double({ min: 0, max: 100, noNaN: true }), (t, dt) => {
        expect(Math.abs(fToC(cToF(t)) - t)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(t)));
        const f = cToF(t);
        expect(Math.abs(cToF(fToC(f)) - f)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(f)));
        expect(Math.abs(cToK(t) - (t + 273.15))).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(t)));
        expect(cToK(t)).toBeGreaterThanOrEqual(0);
        if (t + dt <= 5000) expect(cToF(t + dt)).toBeGreaterThanOrEqual(f);
      }),
      { seed: 25_401, numRuns: NUM_RUNS },
    );
  });

  it('a valid temperature stays valid through any chain of conversions, down to absolute zero itself', () => {
    // −459.67 °F is absolute zero (−273.15 °C): before, fToC gave −273.15000000000003 and cToF refused it
    const zeroF = fc.double({ min: 0, max: 1e-6, noNaN: true }).map((e) => -459.67 + e);
    const zeroC = fc.double({ min: 0, max: 1e-6, noNaN: true }).map((e) => -273.15 + e);
    fc.assert(
      fc.property(fc.oneof(zeroC, fc.constant(-273.15), fc.double({ min: -273.15, max: 1000, noNaN: true })), fc.oneof(zeroF, fc.constant(-459.67)), (tC, tF) => {
        expect(() => cToK(fToC(cToF(fToC(cToF(tC)))))).not.toThrow();
        expect(() => cToK(fToC(cToF(fToC(tF))))).not.toThrow();
        expect(fToC(tF)).toBeGreaterThanOrEqual(-273.15);
        expect(cToF(tC)).toBeGreaterThanOrEqual(-459.67);
      }),
      { seed: 25_405, numRuns: NUM_RUNS },
    );
  });

  it('refuses a temperature below absolute zero in either scale', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1e6, noNaN: true }), (below) => {
        expect(() => cToF(-273.15 - below)).toThrow(BelowAbsoluteZeroError);
        expect(() => fToC(-459.67 - below)).toThrow(BelowAbsoluteZeroError);
      }),
      { seed: 25_402, numRuns: 500 },
    );
  });
});

describe('prices — round trips (properties)', () => {
  it('a price restated on another basis and back is the same price, in the same currency', () => {
    const basis = fc.constantFrom('per-kg' as const, 'per-litre' as const, 'per-tonne' as const);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e5, noNaN: true }), basis, basis, fc.double({ min: 0.7, max: 1.2, noNaN: true }), (amount, from, to, rho) => {
        const there = convertPrice({ amount, basis: from, currency: 'EUR' }, to, rho);
        expect(there.currency).toBe('EUR');
        const back = convertPrice(there, from, rho);
        expect(Math.abs(back.amount - amount)).toBeLessThanOrEqual(1e-12 * Math.max(1, amount));
      }),
      { seed: 25_403, numRuns: NUM_RUNS },
    );
  });
});

describe('kg ↔ litres at 15 °C ↔ litres at temperature (properties)', () => {
  it('litres at 15 °C of a batch in kg, ordered back in litres, give the same kg; litres at t = kg/ρ_t, more when warmer', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ w: fc.double({ min: 0.01, max: 1, noNaN: true }), rho: fc.double({ min: 0.8, max: 1.1, noNaN: true }) }), { minLength: 1, maxLength: 6 }),
        fc.double({ min: 1, max: 1e6, noNaN: true }),
        fc.double({ min: 16, max: 150, noNaN: true }),
        (ps, kg, t) => {
          const W = ps.reduce((a, p) => a + p.w, 0);
          const parts = ps.map((p) => ({ massFraction: p.w / W, density15: p.rho }));
          const byKg = batchQuantities(parts, { kg }, t);
          const byL = batchQuantities(parts, { litres: byKg.totalLitres }, t);
          expect(Math.abs(byL.totalKg - kg)).toBeLessThanOrEqual(1e-12 * kg);
          byKg.lines.forEach((l, i) => {
            expect(Math.abs(l.litres * parts[i]!.density15 - l.kg)).toBeLessThanOrEqual(1e-12 * l.kg);
            const rhoT = densityAtTemperature(parts[i]!.density15, t);
            expect(Math.abs(l.litresAtMetering! * rhoT - l.kg)).toBeLessThanOrEqual(1e-12 * l.kg);
            // oil expands when warmed: more litres at t above 15 °C
            expect(l.litresAtMetering!).toBeGreaterThan(l.litres);
          });
          expect(densityAtTemperature(parts[0]!.density15, 15)).toBe(parts[0]!.density15);
        },
      ),
      { seed: 25_404, numRuns: NUM_RUNS },
    );
  });
});
