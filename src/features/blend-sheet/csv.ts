// CSV export of the blend sheet's component table: the shared CSV writer (formula-injection guard)
// writes the text, a Blob + object URL hands it to the browser's download. No network.
import type { CsvRecord } from '../../core/sheet/blend-sheet';
import { writeCsvRecords } from '../../state/csv';

/** The CSV text of the records (header row from the first record's keys), CRLF line ends. */
export function toCsv(records: readonly CsvRecord[]): string {
  return writeCsvRecords(records);
}

/** A file name safe on every platform: letters, digits, dot, dash and underscore only. */
export function csvFileName(recipeName: string, revision: number, lot: string): string {
  const clean = (s: string) =>
    s
      .trim()
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '');
  const parts = ['blend-sheet', clean(recipeName) || 'recipe', `rev${revision}`];
  const l = clean(lot);
  if (l) parts.push(l);
  return `${parts.join('_')}.csv`;
}

/** Offers `text` as a download named `fileName` (UTF-8 with a byte-order mark for spreadsheets). */
export function downloadCsv(text: string, fileName: string): void {
  const blob = new Blob(['\uFEFF', text], { type: 'text/csv;charset=utf-8' });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before the URL is released.
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
