import { describe, expect, it } from 'vitest';
import {
  describeRate,
  normaliseCurrency,
  priceInBase,
  priceLibraryInBase,
  pricingFor,
  rateDecimals,
  rateToBase,
  solvableLibrary,
  unpricedMessage,
  unpricedTitle,
} from '../../../src/core/currency/exchange-rates';
import { notEnteredFields, remainingNotEntered } from '../../../src/core/formulation/entered-values';
import { makeComponent, STOCKS } from '../../helpers/formulation-fixtures';
import { expectClose } from '../../helpers/tolerance';

// Invented rates (no market data): 1 USD = 0.92 EUR as of an invented date.
const rates = [{ currency: 'usd', rate: 0.92, asOf: '2026-11-30' }];

describe('exchange rates at the boundary', () => {
  it('normalises codes and the three common symbols', () => {
    expect(['€', ' eur', '$', '£', 'chf'].map(normaliseCurrency)).toEqual(['EUR', 'EUR', 'USD', 'GBP', 'CHF']);
  });

  it('restates a price in the base currency, keeping its basis', () => {
    // 1.50 USD/kg × 0.92 = 1.38 EUR/kg (by hand)
    const p = priceInBase({ amount: 1.5, basis: 'per-kg', currency: 'USD' }, 'EUR', rates)!;
    expect(p.basis).toBe('per-kg');
    expect(p.currency).toBe('EUR');
    expectClose(p.amount, 1.38, 1e-12);
    expect(rateToBase('€', 'EUR', [])).toEqual({ rate: 1, entry: null });
    expect(priceInBase({ amount: 1, basis: 'per-kg', currency: 'GBP' }, 'EUR', rates)).toBeNull();
  });

  it('converts a library, names the unpriced stocks and leaves them out of solving', () => {
    const eur = makeComponent(STOCKS.g2heavy!);
    const usd = { ...makeComponent(STOCKS.g2hv!), price: { amount: 2000, basis: 'per-tonne' as const, currency: 'USD' } };
    const gbp = { ...makeComponent(STOCKS.pao6!), price: { amount: 3, basis: 'per-kg' as const, currency: 'GBP' } };
    const priced = priceLibraryInBase([eur, usd, gbp], 'EUR', rates);
    expect(priced.components[0]).toBe(eur);
    // 2000 USD/t × 0.92 = 1840 EUR/t (by hand)
    expectClose(priced.components[1]!.price.amount, 1840, 1e-9);
    expect(priced.unpriced).toEqual([{ componentId: 'pao6', code: 'PAO6', currency: 'GBP' }]);
    expect(priced.ratesUsed).toEqual([rates[0]]);
    const solvable = solvableLibrary(priced);
    expect(solvable.map((c) => c.availability)).toEqual(['available', 'available', 'withdrawn']);
    expect(unpricedMessage(priced.unpriced, 'EUR')).toBe(
      'PAO6 is priced in GBP, which has no exchange rate to EUR: it is left out of costing and solving until a rate is entered under Settings → Exchange rates.',
    );
  });

  it('a stock without a price (0) is named and left out of costing and solving, never costed as free (s24 hunt)', () => {
    // A stock just added (price 0) was the least-cost choice of every solve and search, unsaid where costs are shown.
    const eur = makeComponent(STOCKS.g2heavy!);
    const free = { ...makeComponent(STOCKS.g2hv!), price: { amount: 0, basis: 'per-kg' as const, currency: 'EUR' } };
    const priced = priceLibraryInBase([eur, free], 'EUR', rates);
    expect(priced.unpriced).toEqual([{ componentId: 'g2hv', code: 'G2HV', currency: 'EUR', noPrice: true }]);
    // Not in the base currency any more: a recipe holding it is "not costed", as one holding a stock without a rate.
    expect(priced.components[1]!.price.currency).not.toBe('EUR');
    expect(solvableLibrary(priced).map((c) => c.availability)).toEqual(['available', 'withdrawn']);
    expect(unpricedMessage(priced.unpriced, 'EUR')).toBe(
      'G2HV has no price: it is left out of costing and solving until a price is entered on Stocks.',
    );
    const gbp = { ...makeComponent(STOCKS.pao6!), price: { amount: 3, basis: 'per-kg' as const, currency: 'GBP' } };
    const both = priceLibraryInBase([free, gbp, { ...eur, price: { ...eur.price, amount: 0 } }], 'EUR', rates);
    expect(unpricedMessage(both.unpriced, 'EUR')).toBe(
      'G2HV and G2HEAVY have no price: they are left out of costing and solving until a price is entered on Stocks. ' +
        'PAO6 is priced in GBP, which has no exchange rate to EUR: it is left out of costing and solving until a rate is entered under Settings → Exchange rates.',
    );
  });

  it('describes a rate as printed on costing copies', () => {
    expect(describeRate(rates[0]!, 'eur')).toBe('USD → EUR 0.92 as of 2026-11-30');
    expect(describeRate({ currency: 'USD', rate: 0.92, asOf: '' }, 'EUR')).toBe('USD → EUR 0.92 (date not given)');
  });

  it('names the rates and unpriced stocks behind the cost of some stocks only', () => {
    const eur = makeComponent(STOCKS.g2heavy!);
    const usd = { ...makeComponent(STOCKS.g2hv!), price: { amount: 2000, basis: 'per-tonne' as const, currency: 'usd' } };
    const gbp = { ...makeComponent(STOCKS.pao6!), price: { amount: 3, basis: 'per-kg' as const, currency: '£' } };
    const lib = [eur, usd, gbp];
    const priced = priceLibraryInBase(lib, 'EUR', rates);
    expect(pricingFor(priced, lib, [eur.id])).toEqual({ ratesUsed: [], unpriced: [] });
    expect(pricingFor(priced, lib, [eur.id, usd.id])).toEqual({ ratesUsed: [rates[0]], unpriced: [] });
    expect(pricingFor(priced, lib, [gbp.id, usd.id])).toEqual({ ratesUsed: [rates[0]], unpriced: [{ componentId: 'pao6', code: 'PAO6', currency: '£' }] });
  });

  it('prints a rate with the decimals it was entered with (2 to 6)', () => {
    // common practice (no source): a rate is quoted to 2–6 decimals
    expect([0.92, 0.9215, 1, 1.23456789, 0.5].map(rateDecimals)).toEqual([2, 4, 2, 6, 2]);
  });
});

describe('stocks whose measured values are not yet entered (s25)', () => {
  it('are left out of costing and solving whatever their price, and named with the values missing', () => {
    // A stock just added, then priced: its placeholder ν40/ν100/density were solved with as if measured.
    const eur = makeComponent(STOCKS.g2heavy!);
    const fresh = { ...makeComponent(STOCKS.g2hv!), notEntered: ['kv40' as const, 'kv100' as const, 'density15' as const] };
    const priced = priceLibraryInBase([eur, fresh], 'EUR', rates);
    expect(priced.unpriced).toEqual([{ componentId: 'g2hv', code: 'G2HV', currency: 'EUR', notEntered: ['kv40', 'kv100', 'density15'] }]);
    expect(priced.components[1]!.price.currency).toBe(''); // a recipe holding it is not costed
    expect(solvableLibrary(priced).map((c) => c.availability)).toEqual(['available', 'withdrawn']);
    expect(unpricedMessage(priced.unpriced, 'EUR')).toBe(
      'G2HV has ν40, ν100 and density not yet entered: it is left out of costing and solving until the values are entered on Stocks.',
    );
    expect(unpricedTitle(priced.unpriced)).toBe('Stocks with values not yet entered');
    expect(pricingFor(priced, [eur, fresh], ['g2hv']).unpriced).toHaveLength(1);
    // A stock left out of costing uses no rate: a USD stock whose values are not entered puts no USD rate on
    // the costing copy (s25; before, "USD → EUR 0.92" was printed behind a cost it took no part in).
    const usdFresh = { ...fresh, price: { amount: 2000, basis: 'per-tonne' as const, currency: 'USD' } };
    const usdOther = { ...makeComponent(STOCKS.pao6!), price: { amount: 3, basis: 'per-kg' as const, currency: 'USD' } }; // costed, in another recipe
    const lib = [eur, usdFresh, usdOther];
    const withUsd = priceLibraryInBase(lib, 'EUR', rates);
    expect(pricingFor(withUsd, lib, ['g2heavy', 'g2hv']).ratesUsed).toEqual([]);
    expect(pricingFor(withUsd, lib, ['g2heavy', 'pao6']).ratesUsed).toEqual([rates[0]]);
  });

  it('a stock just added (no price, no values) is named for both; others keep their sentences', () => {
    const fresh = { ...makeComponent(STOCKS.g2hv!), price: { amount: 0, basis: 'per-kg' as const, currency: 'EUR' }, notEntered: ['kv40' as const, 'kv100' as const, 'density15' as const] };
    const one = { ...makeComponent(STOCKS.g2heavy!), notEntered: ['density15' as const] };
    const gbp = { ...makeComponent(STOCKS.pao6!), price: { amount: 3, basis: 'per-kg' as const, currency: 'GBP' } };
    const priced = priceLibraryInBase([fresh, one, gbp], 'EUR', rates);
    expect(priced.unpriced.map((u) => [u.code, Boolean(u.noPrice), u.notEntered ?? null])).toEqual([
      ['G2HV', true, ['kv40', 'kv100', 'density15']],
      ['G2HEAVY', false, ['density15']],
      ['PAO6', false, null],
    ]);
    expect(unpricedMessage(priced.unpriced, 'EUR')).toBe(
      'G2HV has no price: it is left out of costing and solving until a price is entered on Stocks. ' +
        'G2HV has ν40, ν100 and density not yet entered; G2HEAVY has density not yet entered: they are left out of costing and solving until the values are entered on Stocks. ' +
        'PAO6 is priced in GBP, which has no exchange rate to EUR: it is left out of costing and solving until a rate is entered under Settings → Exchange rates.',
    );
    expect(unpricedTitle(priced.unpriced)).toBe('Stocks left out of costing and solving');
    expect(unpricedMessage(priceLibraryInBase([one], 'EUR', rates).unpriced, 'EUR')).toBe(
      'G2HEAVY has density not yet entered: it is left out of costing and solving until the value is entered on Stocks.',
    );
  });

  it('a stock without the list (saved before it existed) or with an empty list is complete', () => {
    const older = makeComponent(STOCKS.g2hv!);
    expect('notEntered' in older).toBe(false);
    expect(notEnteredFields(older)).toEqual([]);
    expect(notEnteredFields({ notEntered: [] })).toEqual([]);
    expect(priceLibraryInBase([older, { ...older, id: 'x', notEntered: [] }], 'EUR', rates).unpriced).toEqual([]);
    expect(notEnteredFields({ notEntered: ['density15', 'kv40'] })).toEqual(['kv40', 'density15']);
    expect(remainingNotEntered({ notEntered: ['kv40', 'kv100'] }, ['kv40'])).toEqual(['kv100']);
    expect(remainingNotEntered({ notEntered: ['kv40'] }, ['kv40'])).toBeUndefined();
  });
});
