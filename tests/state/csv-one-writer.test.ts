/**
 * Issue 10, item 16: every CSV the app writes goes through the one guarded writer (`src/state/csv.ts`),
 * so no export — stocks, blend sheet, or any added later (line plan, QC, correction) — can write a
 * formula-like cell raw. Reads every source file under src/: a file that offers a `.csv` download or
 * builds CSV text must take it from the guarded writer.
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const SRC = resolve(__dirname, '..', '..', 'src');

function listTs(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return listTs(p);
    return /\.(ts|tsx)$/.test(name) ? [p] : [];
  });
}

const files = listTs(SRC).map((f) => ({ path: relative(SRC, f).split('\\').join('/'), code: readFileSync(f, 'utf8') }));

describe('one CSV writer (formula-injection guard) for every CSV the app writes', () => {
  it('only src/state/csv.ts turns rows into CSV text', () => {
    const writers = files.filter((f) => /\bunparse\s*\(|\.join\(\s*['"],['"]\s*\)\s*\)?\s*\.join\(\s*['"]\\r?\\n['"]/.test(f.code)).map((f) => f.path);
    expect(writers).toEqual(['state/csv.ts']);
  });

  it('every file offering a .csv download takes its text from the guarded writer', () => {
    // Lines naming a CSV file or type, other than a file picker's accept list and comments.
    const offersCsv = (code: string) =>
      code.split('\n').some((l) => /\.csv[`'"]|text\/csv/.test(l) && !/accept=|^\s*(?:\/\/|\*)/.test(l));
    const offering = files.filter((f) => f.path !== 'state/csv.ts' && !f.path.startsWith('core/') && offersCsv(f.code));
    expect(offering.length).toBeGreaterThan(0);
    for (const f of offering) {
      const usesWriter = /from ['"][./]*(?:state\/)?csv['"]|from ['"][./]*(?:state\/)?library-io['"]|\blibraryToCsv\b|\bwriteCsv(?:Records)?\b|\btoCsv\b/.test(f.code);
      expect(usesWriter, `${f.path} offers a CSV without the guarded writer`).toBe(true);
    }
  });
});
