// The stock import's "could be 1.25 or 1250" refusal (s20 defect 4) writes both readings in the
// notation of the file (its other numbers' decimal mark), or, when the file does not tell, in the
// settings' decimal separator, so the blender recognises them. Cell values are invented; the readings
// are exact (no calculation).
import { describe, expect, it } from 'vitest';
import { demoComponents } from '../../src/state/demo';
import { previewCsv } from '../../src/state/library-import';

const lib = demoComponents();
const SEMI = 'code;category;kv40_mm2s;kv100_mm2s;density15_kg_per_l;price;price_basis';

describe('ambiguous thousands / decimal mark, written in the file’s notation', () => {
  it('a decimal-comma file: "1.250" could mean 1,25 or 1250', () => {
    const p = previewCsv(`${SEMI}\nNEW-1;group-ii;100;11;0,87;1.250;per-tonne\n`, lib);
    expect(p.rows[0]!.errors).toEqual([expect.stringMatching(/^price: “1\.250” could mean 1,25 or 1250 \(this file’s other numbers use “,” as the decimal mark\)/)]);
  });

  it('a decimal-point file (tab-separated): "1,250" could mean 1.25 or 1250', () => {
    const p = previewCsv('code\tcategory\tkv40_mm2s\tkv100_mm2s\tdensity15_kg_per_l\tprice\nNEW-1\tgroup-ii\t100\t11\t0.87\t1,250\n', lib);
    expect(p.rows[0]!.errors).toEqual([expect.stringMatching(/^price: “1,250” could mean 1\.25 or 1250 \(/)]);
  });

  it('a file whose other numbers do not tell: the settings’ decimal separator', () => {
    const text = `${SEMI}\nNEW-1;group-ii;100;11;1;1.250;per-tonne\n`;
    expect(previewCsv(text, lib, { decimalSeparator: ',' }).rows[0]!.errors).toEqual([expect.stringMatching(/could mean 1,25 or 1250 \(the file’s other numbers do not tell/)]);
    expect(previewCsv(text, lib, { decimalSeparator: '.' }).rows[0]!.errors).toEqual([expect.stringMatching(/could mean 1\.25 or 1250 \(the file’s other numbers do not tell/)]);
    // A negative group keeps its sign in both readings.
    const neg = previewCsv(`code;category;kv40_mm2s;kv100_mm2s;density15_kg_per_l;price;pour_point_c\nNEW-1;group-ii;100;11;1;1;-1.250\n`, lib, { decimalSeparator: ',' });
    expect(neg.rows[0]!.errors.join(' ')).toMatch(/could mean −1,25 or −1250/);
  });
});

// s24 hunt: a new stock imported without a currency was priced in EUR whatever the base currency, so a
// supplier's list in the base currency was restated at the EUR rate unseen. Values invented; no calculation.
describe('a new stock without a currency column or cell', () => {
  const H = 'code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price';
  it('is priced in the base currency of the settings', () => {
    const p = previewCsv(`${H}\nNEW-1,group-ii,100,11,0.87,1250\n`, lib, { baseCurrency: 'USD' });
    expect(p.valid).toBe(true);
    expect(p.rows[0]!.component!.price.currency).toBe('USD');
    const blank = previewCsv(`${H},currency\nNEW-1,group-ii,100,11,0.87,1250,\n`, lib, { baseCurrency: 'USD' });
    expect(blank.rows[0]!.component!.price.currency).toBe('USD');
  });
  it('keeps a currency the row gives, and a stored stock keeps its own when the row gives none', () => {
    const p = previewCsv(`${H},currency\nNEW-1,group-ii,100,11,0.87,1250,GBP\nBW-190,group-i,485,31.8,0.9,1250,\n`, lib, { baseCurrency: 'USD' });
    expect(p.rows.map((r) => r.component!.price.currency)).toEqual(['GBP', 'EUR']);
  });
});

// s24 hunt: a header with units in the names ("kv40 [mm²/s]") was refused as "Missing columns" without
// saying that those columns were seen but not read, so the blender could not tell what to rename.
describe('a header naming columns Blendbench does not read, with a required one missing', () => {
  it('names the columns it found but does not read beside the missing ones', () => {
    const p = previewCsv('code,name,category,kv40 [mm²/s],kv100 [mm²/s],density15_kg_per_l,price\nX-1,a,group-ii,40,6.3,0.86,1000\n', lib);
    expect(p.fileErrors).toEqual([
      expect.stringMatching(/^Missing columns: kv40_mm2s, kv100_mm2s\. The file’s columns “kv40 \[mm²\/s\]”, “kv100 \[mm²\/s\]” are not read; if one holds a missing column, give it that column’s name \(values in its units\)\. The first row must name the columns/),
    ]);
  });
});
