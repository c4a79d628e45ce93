/**
 * Writing CSV: the one place every CSV Blendbench writes goes through (library export, blend-sheet
 * component table), so every file is guarded against spreadsheet formula injection the same way.
 *
 * A spreadsheet evaluates a cell whose text starts with `=`, `+`, `-` or `@` (and some also a
 * leading tab or carriage return, or the full-width and small forms of those signs, which they fold
 * to ASCII). A text cell starting like that — also after leading blanks — gets a leading apostrophe,
 * which spreadsheets show as text and do not evaluate (OWASP "CSV Injection", common practice).
 * Numbers are passed as numbers and written as plain numerals: a negative number stays a number.
 */
import Papa from 'papaparse';

/**
 * A cell a spreadsheet would evaluate: leading tab or CR, or (after optional blanks) one of
 * = + - @, their full-width forms (U+FF1D, U+FF0B, U+FF0D, U+FF20) or small forms (U+FE66, U+FE62,
 * U+FE63, U+FE6B).
 */
const FORMULA_START = /^(?:[\t\r]|[ \u00a0\u3000\n]*[=+\-@\uff1d\uff0b\uff0d\uff20\ufe66\ufe62\ufe63\ufe6b])/;

/** True when a spreadsheet would treat this text as a formula. */
export function isFormulaLike(text: string): boolean {
  return FORMULA_START.test(text);
}

/** A text cell made safe for spreadsheets: formula-like text gets a leading apostrophe. */
export function neutraliseCsvText(text: string): string {
  return isFormulaLike(text) ? `'${text}` : text;
}

/** Undo {@link neutraliseCsvText} when reading back a file Blendbench wrote ('=x → =x). */
export function restoreCsvText(text: string): string {
  return text.startsWith("'") && isFormulaLike(text.slice(1)) ? text.slice(1) : text;
}

/** A number written with a fixed number of decimals (e.g. 400.0 kg as printed on the sheet). */
export interface CsvFixedNumber {
  readonly value: number;
  readonly decimals: number;
}

/**
 * A CSV cell: text (guarded), a number (written as a plain numeral with a dot, never guarded;
 * non-finite → empty), a number with fixed decimals, or empty.
 */
export type CsvCell = string | number | CsvFixedNumber | null | undefined;

function cell(v: CsvCell): string | number {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? v : '';
  if (typeof v === 'object') return Number.isFinite(v.value) ? v.value.toFixed(v.decimals) : '';
  return neutraliseCsvText(v);
}

/**
 * The CSV text of a header and rows: comma-separated, quoted where needed, CRLF line ends, dot as
 * decimal point; every text cell (header included) through {@link neutraliseCsvText}.
 */
export function writeCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return Papa.unparse(
    { fields: header.map((h) => neutraliseCsvText(h)), data: rows.map((r) => r.map(cell)) },
    { newline: '\r\n' },
  );
}

/** The CSV text of records (header = the first record's keys, in order). */
export function writeCsvRecords(records: readonly Readonly<Record<string, CsvCell>>[]): string {
  const header = records.length ? Object.keys(records[0]!) : [];
  return writeCsv(
    header,
    records.map((r) => header.map((h) => r[h])),
  );
}
