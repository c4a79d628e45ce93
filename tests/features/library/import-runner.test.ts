// The sliced import check shared by the Web Worker and the in-page fallback (issue 10 item 2).
import { describe, expect, it } from 'vitest';
import { runImportPreview } from '../../../src/features/library/import-runner';
import type { FromImportWorker } from '../../../src/features/library/import-protocol';
import { largeLibraryCsv } from '../../helpers/large-library';

const fakeClock = () => {
  let t = 0;
  return () => (t += 10); // every slice "takes" 10 ms, so slices grow until they reach sliceMs
};

describe('import runner', () => {
  it('reports progress slice by slice and ends with the preview', async () => {
    const msgs: FromImportWorker[] = [];
    await runImportPreview(1, 'lib.csv', largeLibraryCsv(2000), [], (m) => msgs.push(m), () => false, { now: fakeClock(), yieldNow: async () => {} });
    const progress = msgs.filter((m) => m.type === 'progress');
    expect(progress.length).toBeGreaterThan(3);
    expect(progress.at(-1)).toMatchObject({ done: 2000, total: 2000 });
    const last = msgs.at(-1)!;
    expect(last.type).toBe('result');
    if (last.type === 'result') expect(last.preview.adds).toBe(2000);
  });

  it('stops at the next slice when cancelled', async () => {
    const msgs: FromImportWorker[] = [];
    let slices = 0;
    await runImportPreview(2, 'lib.csv', largeLibraryCsv(2000), [], (m) => msgs.push(m), () => slices >= 2, {
      now: fakeClock(),
      yieldNow: async () => void slices++,
    });
    expect(msgs.at(-1)!.type).toBe('cancelled');
    expect(msgs.some((m) => m.type === 'result')).toBe(false);
  });
});
