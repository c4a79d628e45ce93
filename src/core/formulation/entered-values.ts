/**
 * Whether a stock's measured values have been entered. A stock just added carries placeholder numbers
 * in ν40, ν100 (ASTM D445, mm²/s) and ρ15 (kg/L) so that the model stays numeric; the fields still to
 * enter are listed on the stock (`Component.notEntered`) and nothing may use those placeholders as if
 * they were measured: the stock is left out of solving and searching (`currency/exchange-rates.ts`
 * reports it with the unpriced stocks) and a recipe holding it is held at release
 * (`release/release-hold.ts`). No equation: bookkeeping only.
 */
import type { Component, EntryField } from './model';

/** The fields in the order they are named (as the Stocks table shows them). */
export const ENTRY_FIELDS: readonly EntryField[] = ['kv40', 'kv100', 'density15'];

/** How each field is named in messages. */
export const ENTRY_FIELD_LABEL: Record<EntryField, string> = {
  kv40: 'ν40',
  kv100: 'ν100',
  density15: 'density',
};

/**
 * The measured values of a stock still to enter, in {@link ENTRY_FIELDS} order, each once.
 *
 * @param c - the stock (only `notEntered` is read)
 * @returns the fields; empty when every value was entered (also for stocks saved before the list existed)
 * @example notEnteredFields({ notEntered: ['density15', 'kv40'] }) // → ['kv40', 'density15']
 */
export function notEnteredFields(c: Pick<Component, 'notEntered'>): EntryField[] {
  const list = c.notEntered;
  if (!list || list.length === 0) return [];
  return ENTRY_FIELDS.filter((f) => list.includes(f));
}

/**
 * The list left once some fields were entered: the value to store as `notEntered`.
 *
 * @param c - the stock before the change
 * @param entered - the fields the blender has just entered
 * @returns the fields still to enter, or undefined when none is left (the stock is complete)
 * @example remainingNotEntered({ notEntered: ['kv40', 'kv100'] }, ['kv40']) // → ['kv100']
 */
export function remainingNotEntered(c: Pick<Component, 'notEntered'>, entered: readonly EntryField[]): EntryField[] | undefined {
  const left = notEnteredFields(c).filter((f) => !entered.includes(f));
  return left.length ? left : undefined;
}

/**
 * The fields in words: "ν40", "ν40 and density", "ν40, ν100 and density".
 *
 * @param fields - from {@link notEnteredFields}
 * @returns the words ('' for none)
 */
export function entryFieldsInWords(fields: readonly EntryField[]): string {
  const words = fields.map((f) => ENTRY_FIELD_LABEL[f]);
  return words.length > 1 ? `${words.slice(0, -1).join(', ')} and ${words.at(-1)}` : (words[0] ?? '');
}

/**
 * The stocks of a recipe whose measured values are not yet entered: those of its lines above 0 %
 * (a line at 0 % charges nothing and is never predicted with), each once, in line order. Any figure
 * made from such a recipe's stock data (prediction, volume, cost) would rest on placeholders.
 *
 * @param lines - the recipe's lines (mass fractions)
 * @param components - the library (a line naming a stock not in it is skipped)
 * @returns the stocks, empty when every used stock is complete
 * @example unenteredStocks([{ componentId: 'new', massFraction: 0.2 }], lib) // → [NEW]
 */
export function unenteredStocks(
  lines: readonly { componentId: string; massFraction: number }[],
  components: readonly Component[],
): Component[] {
  const byId = new Map(components.map((c) => [c.id, c]));
  const out: Component[] = [];
  for (const l of lines) {
    if (!(l.massFraction > 0)) continue;
    const c = byId.get(l.componentId);
    if (c && notEnteredFields(c).length > 0 && !out.includes(c)) out.push(c);
  }
  return out;
}

/**
 * Why a recipe is not predicted, naming each such stock and its missing values — the words every
 * screen uses where a prediction would stand: "Not predicted: NEW has ν40, ν100 and density not yet
 * entered" (several joined by "; "). No final stop, so a screen may add what to do.
 *
 * @param stocks - from {@link unenteredStocks} (non-empty)
 * @returns the sentence without its final stop
 * @example notPredictedWords([NEW]) // → 'Not predicted: NEW has ν40, ν100 and density not yet entered'
 */
export function notPredictedWords(stocks: readonly Pick<Component, 'code' | 'notEntered'>[]): string {
  return `Not predicted: ${stocks.map((c) => `${c.code} has ${entryFieldsInWords(notEnteredFields(c))} not yet entered`).join('; ')}`;
}

/**
 * The stocks among `stocks` whose density at 15 °C is not yet entered: their litres (V = m/ρ) and
 * every volume share of a blend holding them cannot be given.
 *
 * @param stocks - the stocks in question
 * @returns those without an entered density, in the given order
 */
export function densityNotEntered<T extends Pick<Component, 'notEntered'>>(stocks: readonly T[]): T[] {
  return stocks.filter((c) => notEnteredFields(c).includes('density15'));
}
