import { describe, expect, it } from 'vitest';
import { rowSegments } from '../../src/components/row-window';

const keys = (n: number) => Array.from({ length: n }, (_, i) => `k${i}`);
const even = (h: number) => () => h;

describe('rowSegments (windowed table rows)', () => {
  it('draws the rows overlapping the viewport widened by the overscan, and one spacer for the rest', () => {
    // 1000 rows of 20 px; viewport 0–100 px, overscan 40 px: rows 0..6 overlap 0–140 px (by hand: 7·20 = 140)
    const s = rowSegments(keys(1000), even(20), 0, 100, 40, new Set());
    expect(s).toEqual([
      { kind: 'rows', start: 0, end: 7 },
      { kind: 'gap', start: 7, end: 1000, height: 993 * 20 },
    ]);
  });

  it('puts a spacer before and after a viewport in the middle, as tall as the rows it stands for', () => {
    // viewport 10 000–10 100 px, overscan 0: rows 500..504 (by hand: 10 000 / 20 = 500)
    const s = rowSegments(keys(1000), even(20), 10_000, 10_100, 0, new Set());
    expect(s).toEqual([
      { kind: 'gap', start: 0, end: 500, height: 500 * 20 },
      { kind: 'rows', start: 500, end: 505 },
      { kind: 'gap', start: 505, end: 1000, height: 495 * 20 },
    ]);
    // the spacers and drawn rows add up to the whole table (by hand: 1000 · 20)
    const total = s.reduce((a, x) => a + (x.kind === 'gap' ? x.height : (x.end - x.start) * 20), 0);
    expect(total).toBe(20_000);
  });

  it('always draws pinned rows (the focused row, open details), far from the viewport', () => {
    const s = rowSegments(keys(100), even(20), 0, 40, 0, new Set([90]));
    expect(s).toEqual([
      { kind: 'rows', start: 0, end: 2 },
      { kind: 'gap', start: 2, end: 90, height: 88 * 20 },
      { kind: 'rows', start: 90, end: 91 },
      { kind: 'gap', start: 91, end: 100, height: 9 * 20 },
    ]);
  });

  it('uses each row’s own height where measured', () => {
    const h = (k: string) => (k === 'k0' ? 200 : 20);
    // row 0 is 200 px tall: viewport 0–210 px holds rows 0 and 1 (by hand: 200 + 20 > 210 > 200)
    expect(rowSegments(keys(10), h, 0, 210, 0, new Set())[0]).toEqual({ kind: 'rows', start: 0, end: 2 });
  });

  it('returns nothing for an empty table and ignores pinned rows outside it', () => {
    expect(rowSegments([], even(20), 0, 100, 0, new Set([3]))).toEqual([]);
    expect(rowSegments(keys(2), even(20), 0, 100, 0, new Set([-1, 7]))).toEqual([{ kind: 'rows', start: 0, end: 2 }]);
  });
});
