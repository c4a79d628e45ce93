// Shared by the app benches: one production build of Blendbench into a temporary folder per bench run.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

let built: string | null = null;

/** Use an already built folder instead (diagnostic scripts that build with their own options). */
export function setBuiltDir(dir: string): void {
  built = dir;
}

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

