// CSV export of the blend sheet's component table: the shared CSV writer (formula-injection guard)
// writes the text, a Blob + object URL hands it to the browser's download. No network.
import type { CsvRecord } from '../../core/sheet/blend-sheet';
import { RELEASE_HOLD_LABEL } from '../../core/release/release-hold';
import { writeCsvRecords } from '../../state/csv';

/** The CSV text of the records (header row from the first record's keys), CRLF line ends. */
export function toCsv(records: readonly CsvRecord[]): string {
  return writeCsvRecords(records);
}

/**
 * The first line of the file of a sheet on hold: every column of `like` empty but the code `HOLD` and, in the
 * name, "HOLD — not for release: " and the reasons. A plant system reading the table meets a stock code it
 * cannot charge; a person reading it meets the hold before the first component.
 */
export function holdCsvRecord(like: CsvRecord, reasons: readonly string[]): CsvRecord {
  const rec: CsvRecord = {};
  for (const key of Object.keys(like)) rec[key] = null;
  rec.Code = 'HOLD';
  rec.Name = `${RELEASE_HOLD_LABEL}: ${reasons.join(' ')}`;
  return rec;
}

/** A file name safe on every platform: letters, digits, dot, dash and underscore only; `_ON-HOLD` ends a held sheet's. */
export function csvFileName(recipeName: string, revision: number, lot: string, held = false): string {
  const clean = (s: string) =>
    s
      .trim()
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '');
  const parts = ['blend-sheet', clean(recipeName) || 'recipe', `rev${revision}`];
  const l = clean(lot);
  if (l) parts.push(l);
  if (held) parts.push('ON-HOLD');
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
