// The blend sheet of a recipe holding a stock whose measured values are not yet entered
// (`core/formulation/entered-values.ts`): no figure is made from its placeholders. The QC table keeps
// its release targets and methods but predicts nothing; a stock without its density has no litres
// (V = m/ρ), and then no volume share or litre total of the batch can be given either.
import type { Component } from '../../core/formulation/model';
import { densityNotEntered, notEnteredFields, notPredictedWords } from '../../core/formulation/entered-values';
import type { CsvRecord, QcRow, SheetPrediction } from '../../core/sheet/blend-sheet';

/** A prediction that holds no number: the QC table built from it prints its targets only. */
export const NO_PREDICTION: SheetPrediction = {
  kv40: Number.NaN,
  kv100: Number.NaN,
  reportedVi: null,
  density15: Number.NaN,
  anilinePoint: null,
  flashPoint: null,
  pourPoint: null,
  operating: null,
};

/** The QC rows with nothing in the Predicted column ("—") and none flagged outside its target. */
export function withoutPrediction(rows: readonly QcRow[]): QcRow[] {
  return rows.map((r) => ({ ...r, predicted: '—', predictedOutsideTarget: false }));
}

/** "Not predicted: NEW has ν40, ν100 and density not yet entered. Enter the values on Stocks." */
export function notPredictedSentence(stocks: readonly Component[]): string {
  const count = stocks.reduce((n, c) => n + notEnteredFields(c).length, 0);
  return `${notPredictedWords(stocks)}. Enter the ${count === 1 ? 'value' : 'values'} on Stocks.`;
}

/** "BW-160 has density not yet entered", "A and B have density not yet entered". */
function densityWords(stocks: readonly Component[]): string {
  const codes = stocks.map((c) => c.code);
  const named = codes.length > 1 ? `${codes.slice(0, -1).join(', ')} and ${codes.at(-1)}` : codes[0]!;
  return `${named} ${codes.length > 1 ? 'have' : 'has'} density not yet entered`;
}

/**
 * Why the sheet gives no litres: null when every stock of the recipe has its density entered.
 *
 * @param stocks - the recipe's stocks with values not yet entered (`unenteredStocks`)
 */
export function litresNotGivenSentence(stocks: readonly Component[]): string | null {
  const without = densityNotEntered(stocks);
  if (without.length === 0) return null;
  return `Litres and volume % not given: ${densityWords(without)} (litres = kg ÷ density at 15 °C). Enter ${without.length > 1 ? 'them' : 'it'} on Stocks.`;
}

/**
 * Why a batch given in litres cannot be charged (its mass M = V·ρ needs every density), or null.
 *
 * @param stocks - the recipe's stocks with values not yet entered
 */
export function litreBatchRefusal(stocks: readonly Component[]): string | null {
  const without = densityNotEntered(stocks);
  if (without.length === 0) return null;
  return `the batch is given in litres and ${densityWords(without)}, so its mass cannot be worked out. Give the batch in kg, or enter the density on Stocks.`;
}

/**
 * The CSV records without a litre or volume figure that needs a density not entered: the litres
 * (15 °C and metering) of those stocks, every volume %, and the litre totals; on the costing copy,
 * without the price per kg of a stock priced per litre without its density, nor the line cost of a
 * stock left out of costing. Other cells unchanged.
 *
 * @param records - from `blendSheetCsvRows`
 * @param codes - codes of the stocks whose density is not entered (none → no litre cell changed)
 * @param costing - codes whose price per kg, and whose line cost, are left empty
 */
export function csvWithoutLitres(
  records: readonly CsvRecord[],
  codes: ReadonlySet<string>,
  costing: { noPrice?: ReadonlySet<string>; noCost?: ReadonlySet<string> } = {},
): CsvRecord[] {
  const noPrice = costing.noPrice ?? new Set<string>();
  const noCost = costing.noCost ?? new Set<string>();
  if (codes.size === 0 && noPrice.size === 0 && noCost.size === 0) return [...records];
  return records.map((rec) => {
    const out: CsvRecord = { ...rec };
    const code = String(rec.Code ?? '');
    const total = code === 'TOTAL' || code === 'TOTAL ADDED';
    if (codes.size > 0) {
      if ('Volume %' in out && code !== 'HEEL') out['Volume %'] = null;
      if (total || codes.has(code)) {
        for (const k of Object.keys(out)) if (k.startsWith('Litres at ')) out[k] = null;
      }
    }
    for (const k of Object.keys(out)) {
      if (noPrice.has(code) && k.startsWith('Price per kg')) out[k] = null;
      if (noCost.has(code) && k.startsWith('Line cost')) out[k] = null;
    }
    return out;
  });
}
