/**
 * Property tests of the exchange-rate boundary (src/core/currency/exchange-rates.ts): random invented
 * libraries with prices in codes and symbols, random rates (invented, no market data). Contracts:
 * price in base = amount × rate; a stock without a rate is named unpriced and never costed.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { normaliseCurrency, priceLibraryInBase, pricingFor, solvableLibrary } from '../../../src/core/currency/exchange-rates';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import { makeComponent, STOCKS } from '../../helpers/formulation-fixtures';

const specs = ['g1sn600', 'g2heavy', 'g2hv', 'pao6', 'an12'].map((id) => STOCKS[id]!);
const currencies = ['EUR', 'eur ', '€', 'USD', '$', ' usd', 'GBP', '£', 'CHF'];

const arb = fc.record({
  cur: fc.array(fc.constantFrom(...currencies), { minLength: specs.length, maxLength: specs.length }),
  amount: fc.array(fc.double({ min: 0.5, max: 5000, noNaN: true }), { minLength: specs.length, maxLength: specs.length }),
  basis: fc.array(fc.constantFrom('per-kg' as const, 'per-litre' as const, 'per-tonne' as const), { minLength: specs.length, maxLength: specs.length }),
  base: fc.constantFrom('EUR', 'USD', '€', ' gbp'),
  rates: fc.subarray(['usd', 'EUR', 'GBP', 'chf'].map((c) => ({ currency: c, asOf: '2026-11-30' }))),
  rate: fc.double({ min: 0.01, max: 100, noNaN: true }),
  mask: fc.array(fc.boolean(), { minLength: specs.length, maxLength: specs.length }),
});

describe('priceLibraryInBase properties', () => {
  it('a recipe made only of stocks in a currency without a rate is not costed (found by the property below)', () => {
    // Base EUR, no CHF rate: the recipe of one CHF stock was costed 0.4425 "CHF"/L (0.5/kg × ρ15 0.885).
    const chf = { ...makeComponent(STOCKS.g1sn600!), price: { amount: 0.5, basis: 'per-kg' as const, currency: 'CHF' } };
    const free = { ...makeComponent(STOCKS.g2hv!), price: { amount: 0, basis: 'per-kg' as const, currency: 'EUR' } };
    const priced = priceLibraryInBase([chf, free], 'EUR', []);
    for (const id of ['g1sn600', 'g2hv']) {
      const p = predictBlend(priced.components, [{ componentId: id, massFraction: 1 }]);
      expect(p.costPerLitre).toBeNull();
      expect(p.costPerKg).toBeNull();
      expect(p.currency).toBeNull();
      expect(p.warnings.join(' ')).toMatch(/no usable price/);
    }
    expect(priced.unpriced.map((u) => u.currency)).toEqual(['CHF', 'EUR']);
  });


  it('price in base = amount × rate; an unpriced stock is never costed, alone or in a blend', () => {
    fc.assert(
      fc.property(arb, (a) => {
        const lib = specs.map((s, i) => ({ ...makeComponent(s), price: { amount: a.amount[i]!, basis: a.basis[i]!, currency: a.cur[i]! } }));
        const rates = a.rates.map((r, k) => ({ ...r, rate: a.rate * (k + 1) }));
        const priced = priceLibraryInBase(lib, a.base, rates);
        const base = normaliseCurrency(a.base);
        const unpriced = new Set(priced.unpriced.map((u) => u.componentId));
        lib.forEach((c, i) => {
          const cur = normaliseCurrency(c.price.currency);
          const rate = cur === base ? 1 : rates.find((r) => normaliseCurrency(r.currency) === cur)?.rate;
          const p = priced.components[i]!;
          if (rate === undefined) {
            expect(unpriced.has(c.id)).toBe(true);
            return;
          }
          expect(unpriced.has(c.id)).toBe(false);
          expect(normaliseCurrency(p.price.currency)).toBe(base);
          expect(p.price.basis).toBe(c.price.basis);
          // relative 1e-12: one multiplication, common practice (no source)
          expect(Math.abs(p.price.amount - c.price.amount * rate)).toBeLessThanOrEqual(1e-12 * c.price.amount * rate);
        });
        // Solving: unpriced stocks withdrawn.
        for (const c of solvableLibrary(priced)) if (unpriced.has(c.id)) expect(c.availability).toBe('withdrawn');
        // A recipe of the chosen stocks (equal shares), predicted from the priced library: costed only
        // when none of its stocks is unpriced, and then in the base currency.
        const chosen = priced.components.filter((_, i) => a.mask[i]);
        if (chosen.length === 0) return;
        const lines = chosen.map((c) => ({ componentId: c.id, massFraction: 1 / chosen.length }));
        const p = predictBlend(priced.components, lines);
        const holdsUnpriced = chosen.some((c) => unpriced.has(c.id));
        if (holdsUnpriced) {
          expect(p.costPerLitre, JSON.stringify({ currency: p.currency, chosen: chosen.map((c) => c.price.currency) })).toBeNull();
        } else {
          expect(p.costPerLitre).not.toBeNull();
          expect(normaliseCurrency(p.currency!)).toBe(base);
        }
        const pf = pricingFor(priced, lib, chosen.map((c) => c.id));
        expect(pf.unpriced.map((u) => u.componentId).sort()).toEqual(chosen.filter((c) => unpriced.has(c.id)).map((c) => c.id).sort());
      }),
      { numRuns: 300 },
    );
  });
});
