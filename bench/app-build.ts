// Shared by the app benches: one production build of Blendbench into a temporary folder per bench run.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

let built: string | null = null;

/** Build the app once (vite build into a fresh temp folder) and return that folder. Removed at exit. */
export function buildAppOnce(): string {
  if (built) return built;
  const outDir = mkdtempSync(join(tmpdir(), 'blendbench-bench-dist-'));
  process.once('exit', () => rmSync(outDir, { recursive: true, force: true }));
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error', '--outDir', outDir, '--emptyOutDir'], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  built = outDir;
  return outDir;
}

/**
 * One result line of an app bench, printed by bench/run.ts as
 * `bench <name>: <measured> <unit> goal <op> <goal> <pass|MISS>`.
 */
export interface AppBenchLine {
  name: string;
  measured: number;
  unit: string;
  op: '<=' | '>=';
  goal: number;
  /** Extra context (not part of the line format). */
  note?: string;
}
