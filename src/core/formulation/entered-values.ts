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
