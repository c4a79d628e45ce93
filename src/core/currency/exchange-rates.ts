/**
 * Exchange rates at the boundary: every stock price is restated in one base currency before it
 * reaches a cost figure or the solver, with the rates and dates the user entered. A price in a
 * currency without a rate is never mixed in: the stock is reported as unpriced and left out of
 * costing and solving until a rate is entered.
 *
 *   price in base = amount × rate,  rate = base-currency units per one unit of the stock's currency
 *   (e.g. USD → EUR 0.92: 1 USD = 0.92 EUR, so 1.00 USD/kg = 0.92 EUR/kg)
 *
 * Currencies are compared by code, trimmed and upper-cased; the symbols €, $ and £ are read as EUR,
 * USD and GBP (common practice (no source): the three symbols a price list most often carries
 * instead of a code). The price basis (per kg, litre, tonne) is kept: only the amount is restated.
 */
import type { Component, EntryField, Price } from '../formulation/model';
import { entryFieldsInWords, notEnteredFields } from '../formulation/entered-values';
import { BlendbenchInputError, assertFinite } from '../errors';

/** One exchange rate, as the user entered it. */
export interface ExchangeRate {
  /** Currency code of the quoted prices, e.g. "USD". */
  currency: string;
  /** Base-currency units per one unit of `currency` (> 0). */
  rate: number;
  /** ISO date (YYYY-MM-DD) the rate was taken; '' → not given. */
  asOf: string;
}

const SYMBOLS: Record<string, string> = { '€': 'EUR', $: 'USD', US$: 'USD', '£': 'GBP' };

/**
 * A currency name as compared: trimmed, upper-cased, the symbols €, $, £ read as EUR, USD, GBP.
 *
 * @param currency - a code or symbol as typed ("usd ", "€")
 * @returns the normalised code ("USD", "EUR"); '' for a blank name
 * @example normaliseCurrency(' eur') // → 'EUR'
 */
export function normaliseCurrency(currency: string): string {
  const t = currency.trim();
  return SYMBOLS[t] ?? t.toUpperCase();
}

/**
 * Why a currency code as normalised ({@link normaliseCurrency}) is no code, or null when it is one:
 * a code has three letters A–Z (ISO 4217, e.g. USD). Blank is left to the field's own rule.
 *
 * @param code - the normalised code ("US", "USD")
 * @returns the reason, or null
 * @example currencyCodeProblem('US') // → '“US” is no currency code: a currency code has three letters (ISO 4217), e.g. USD.'
 */
export function currencyCodeProblem(code: string): string | null {
  if (code === '' || /^[A-Z]{3}$/.test(code)) return null;
  return `“${code}” is no currency code: a currency code has three letters (ISO 4217), e.g. USD.`;
}

/**
 * The rate that restates `currency` in `base`: 1 for the base currency itself, else the user's rate.
 *
 * @param currency - the price's currency
 * @param base - the base currency
 * @param rates - the user's rates to the base
 * @returns the rate (base units per unit of `currency`) and its entry, or null when there is none
 * @example rateToBase('USD', 'EUR', [{ currency: 'USD', rate: 0.92, asOf: '2026-11-30' }]) // → { rate: 0.92, entry: … }
 */
export function rateToBase(
  currency: string,
  base: string,
  rates: readonly ExchangeRate[],
): { rate: number; entry: ExchangeRate | null } | null {
  const c = normaliseCurrency(currency);
  if (c === normaliseCurrency(base)) return { rate: 1, entry: null };
  const entry = rates.find((r) => normaliseCurrency(r.currency) === c);
  return entry ? { rate: entry.rate, entry } : null;
}

/**
 * A price restated in the base currency (same basis).
 *
 * @param price - amount, basis, currency as quoted
 * @param base - base currency code
 * @param rates - the user's rates
 * @returns the price in the base currency (currency field = normalised base code), or null when the
 *   price's currency has no rate
 * @throws BlendbenchInputError if the rate found is not a positive finite number
 * @example priceInBase({ amount: 1, basis: 'per-kg', currency: 'USD' }, 'EUR', rates) // → { amount: 0.92, basis: 'per-kg', currency: 'EUR' }
 */
export function priceInBase(price: Price, base: string, rates: readonly ExchangeRate[]): Price | null {
  const r = rateToBase(price.currency, base, rates);
  if (!r) return null;
  assertFinite('priceInBase', 'rate', r.rate);
  if (r.rate <= 0) throw new BlendbenchInputError('rate', r.rate, `priceInBase: the rate for ${price.currency} must be above 0`);
  return { amount: price.amount * r.rate, basis: price.basis, currency: normaliseCurrency(base) };
}

/** A stock whose price could not be restated in the base currency. */
export interface UnpricedStock {
  componentId: string;
  code: string;
  /** The currency as entered on the stock. */
  currency: string;
  /** True when the stock has no price at all (0, as a stock just added): nothing to restate. */
  noPrice?: true;
  /**
   * The measured values not yet entered on the stock (a stock just added: its ν40, ν100, density are
   * placeholders). Such a stock is left out of costing and solving like one without a price, whatever
   * its price.
   */
  notEntered?: EntryField[];
}

/** The library with every price in the base currency, and what could not be converted. */
export interface PricedLibrary {
  /**
   * Same order and ids as the input; prices restated where a rate exists. An unpriced stock's copy
   * has a blank currency (its amount and basis as quoted), so it is never costed.
   */
  components: Component[];
  /** Normalised base currency code. */
  base: string;
  /** Stocks without a usable price: no price, values not yet entered, or a currency without a rate (never costed). */
  unpriced: UnpricedStock[];
  /** The rates actually used (one per foreign currency present), in first-use order. */
  ratesUsed: ExchangeRate[];
}

/**
 * Restates every stock's price in the base currency.
 *
 * @param components - the library
 * @param base - base currency code (e.g. "EUR")
 * @param rates - the user's rates to the base
 * @returns the converted library, the unpriced stocks and the rates used
 * @throws BlendbenchInputError if a rate used is not a positive finite number
 */
export function priceLibraryInBase(components: readonly Component[], base: string, rates: readonly ExchangeRate[]): PricedLibrary {
  const unpriced: UnpricedStock[] = [];
  const used = new Map<string, ExchangeRate>();
  const out = components.map((c) => {
    const notEntered = notEnteredFields(c);
    if (!(c.price.amount > 0) || notEntered.length > 0) {
      // No price (0): never costed as free. Values not yet entered: its placeholders are never solved
      // with. Its currency is blanked in the priced copy, so a recipe holding it is not costed, like
      // one holding a stock without a rate (the stored stock keeps it).
      unpriced.push({
        componentId: c.id,
        code: c.code,
        currency: c.price.currency.trim(),
        ...(c.price.amount > 0 ? {} : { noPrice: true as const }),
        ...(notEntered.length ? { notEntered } : {}),
      });
      return { ...c, price: { ...c.price, currency: '' } };
    }
    const r = rateToBase(c.price.currency, base, rates);
    if (!r) {
      // No rate: its currency is blanked in the priced copy as well, so that no recipe holding it is
      // costed — not even one made only of stocks in that currency (predictBlend costs no blend
      // holding a blank currency). The stored stock and `unpriced` keep the quoted currency.
      unpriced.push({ componentId: c.id, code: c.code, currency: c.price.currency.trim() });
      return { ...c, price: { ...c.price, currency: '' } };
    }
    if (r.entry) used.set(normaliseCurrency(r.entry.currency), r.entry);
    else if (c.price.currency === normaliseCurrency(base)) return c; // already in the base currency, as written
    const price = priceInBase(c.price, base, rates)!;
    return { ...c, price };
  });
  return { components: out, base: normaliseCurrency(base), unpriced, ratesUsed: [...used.values()] };
}

/**
 * The library as the solver may use it: unpriced stocks are marked withdrawn (left out of every
 * solve and search, never priced at a wrong rate). Used only as solver input, never stored.
 *
 * @param priced - from {@link priceLibraryInBase}
 * @returns the components for solving
 */
export function solvableLibrary(priced: PricedLibrary): Component[] {
  if (priced.unpriced.length === 0) return priced.components;
  const out = new Set(priced.unpriced.map((u) => u.componentId));
  return priced.components.map((c) => (out.has(c.id) ? { ...c, availability: 'withdrawn' as const } : c));
}

/**
 * The exchange rates and the unpriced stocks behind the cost of some stocks (one recipe's, or a
 * plan's), for printing beside that cost.
 *
 * @param priced - from {@link priceLibraryInBase}
 * @param quoted - the library as entered (prices in their quoted currencies)
 * @param ids - ids of the stocks whose cost is shown
 * @returns the rates used by those stocks that are costed (in `priced.ratesUsed` order) and those of them left
 *   out of costing (no price, no rate, values not entered); a stock left out uses no rate
 * @example pricingFor(priced, library, ['bw-160']) // → { ratesUsed: [{ currency: 'USD', rate: 0.92, … }], unpriced: [] }
 */
export function pricingFor(
  priced: PricedLibrary,
  quoted: readonly Component[],
  ids: Iterable<string>,
): { ratesUsed: ExchangeRate[]; unpriced: UnpricedStock[] } {
  const wanted = new Set(ids);
  // A stock left out of costing (no price, no rate, values not entered) adds no cost, so no rate behind it.
  const leftOut = new Set(priced.unpriced.map((u) => u.componentId));
  const currencies = new Set(quoted.filter((c) => wanted.has(c.id) && !leftOut.has(c.id)).map((c) => normaliseCurrency(c.price.currency)));
  return {
    ratesUsed: priced.ratesUsed.filter((r) => currencies.has(normaliseCurrency(r.currency))),
    unpriced: priced.unpriced.filter((u) => wanted.has(u.componentId)),
  };
}

/**
 * Decimals that print an exchange rate as entered: at least 2, at most 6.
 *
 * @param rate - the rate
 * @returns the number of decimals
 * @example rateDecimals(0.9215) // → 4
 */
export function rateDecimals(rate: number): number {
  for (let d = 2; d < 6; d++) if (Math.abs(Number(rate.toFixed(d)) - rate) < 1e-12 * Math.max(1, Math.abs(rate))) return d;
  return 6;
}

/**
 * The line printed on costing copies for a rate: "USD → EUR 0.92 as of 2026-11-30".
 *
 * @param rate - the rate entry
 * @param base - base currency code
 * @param formatRate - formats the rate (the caller's number format); default up to 6 significant digits
 * @returns the text
 */
export function describeRate(rate: ExchangeRate, base: string, formatRate: (x: number) => string = (x) => String(Number(x.toPrecision(6)))): string {
  const asOf = rate.asOf ? ` as of ${rate.asOf}` : ' (date not given)';
  return `${normaliseCurrency(rate.currency)} → ${normaliseCurrency(base)} ${formatRate(rate.rate)}${asOf}`;
}

/**
 * The title of the notice that shows {@link unpricedMessage}: what the stocks named lack.
 *
 * @param unpriced - from {@link priceLibraryInBase}
 * @returns e.g. 'Stocks without an exchange rate'; 'Stocks left out of costing and solving' when
 *   stocks with values not yet entered are named beside others
 */
export function unpricedTitle(unpriced: readonly UnpricedStock[]): string {
  const entry = unpriced.some((u) => u.notEntered);
  if (entry) return unpriced.every((u) => u.notEntered && !u.noPrice) ? 'Stocks with values not yet entered' : 'Stocks left out of costing and solving';
  return unpriced.some((u) => u.noPrice) ? 'Stocks without a usable price' : 'Stocks without an exchange rate';
}

/**
 * The user's message for unpriced stocks: those without a price (0), those with measured values not
 * yet entered, then each other stock with its currency that has no rate.
 *
 * @param unpriced - from {@link priceLibraryInBase}
 * @param base - base currency code
 * @param maxCodes - most stock codes named per currency before "and n more" (default 8)
 * @returns one sentence, or '' when every stock is priced
 * @example unpricedMessage([{ code: 'BW-999', currency: 'USD', … }], 'EUR')
 *   // → 'BW-999 is priced in USD, which has no exchange rate to EUR: it is left out of costing and solving until a rate is entered under Settings → Exchange rates.'
 */
export function unpricedMessage(unpriced: readonly UnpricedStock[], base: string, maxCodes = 8): string {
  if (unpriced.length === 0) return '';
  const b = normaliseCurrency(base);
  const list = (codes: string[]) =>
    codes.length > maxCodes
      ? `${codes.slice(0, maxCodes).join(', ')} and ${codes.length - maxCodes} more`
      : codes.length > 1
        ? `${codes.slice(0, -1).join(', ')} and ${codes.at(-1)}`
        : codes.join('');
  const sentences: string[] = [];
  const noPrice = unpriced.filter((u) => u.noPrice).map((u) => u.code);
  if (noPrice.length) {
    sentences.push(
      `${list(noPrice)} ${noPrice.length === 1 ? 'has' : 'have'} no price: ${noPrice.length === 1 ? 'it is' : 'they are'} left out of costing and solving until a price is entered on Stocks.`,
    );
  }
  const notEntered = unpriced.filter((u) => u.notEntered?.length);
  if (notEntered.length) {
    // Stocks missing the same values are named together.
    const byFields = new Map<string, string[]>();
    for (const u of notEntered) {
      const words = entryFieldsInWords(u.notEntered!);
      byFields.set(words, [...(byFields.get(words) ?? []), u.code]);
    }
    const parts = [...byFields].map(([words, codes]) => `${list(codes)} ${codes.length === 1 ? 'has' : 'have'} ${words} not yet entered`);
    const one = notEntered.length === 1;
    const oneValue = one && notEntered[0]!.notEntered!.length === 1;
    sentences.push(
      `${parts.join('; ')}: ${one ? 'it is' : 'they are'} left out of costing and solving until ${oneValue ? 'the value is' : 'the values are'} entered on Stocks.`,
    );
  }
  const noRate = unpriced.filter((u) => !u.noPrice && !u.notEntered);
  if (noRate.length) {
    const byCurrency = new Map<string, string[]>();
    for (const u of noRate) {
      const c = u.currency || '(no currency)';
      byCurrency.set(c, [...(byCurrency.get(c) ?? []), u.code]);
    }
    const parts = [...byCurrency].map(([cur, codes]) =>
      codes.length === 1 ? `${codes[0]} is priced in ${cur}` : `${codes.length > maxCodes ? list(codes) : codes.join(', ')} are priced in ${cur}`,
    );
    const which = byCurrency.size === 1 ? 'which has' : 'which have';
    const it = noRate.length === 1 ? 'it is' : 'they are';
    sentences.push(`${parts.join('; ')}, ${which} no exchange rate to ${b}: ${it} left out of costing and solving until a rate is entered under Settings → Exchange rates.`);
  }
  return sentences.join(' ');
}
