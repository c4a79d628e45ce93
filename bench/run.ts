/**
 * `npm run bench` — runs every benchmark module and prints one line per measurement:
 *
 *   bench <name>: <measured> <unit> goal <op> <value> <pass|MISS>
 *
 * and finally `bench summary: <P> pass, <M> miss`.
 *
 * Modules: every `bench/*.bench.ts` file exporting `async function run(): Promise<BenchLine[]>`
 * (see bench/types.ts) is found and run in file-name order — add a benchmark by adding a file.
 * Arguments filter the modules by file name: `npm run bench -- engine substitute`.
 * A module that throws is reported as one MISS line (`bench <file>: error …`) and the rest still run;
 * notes and errors go to stderr so that stdout holds only bench lines. Exit code: 1 only when a
 * module threw (a MISS is a measurement, not a failure of the run).
 * Each module runs in a fresh Node process (this file again with `--module <file>`), so one module's
 * heap, garbage and compiled code do not bias the next one's timings — as in the app, where the
 * search runs in workers of its own.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { BenchLine, BenchModule } from './types';

const here = dirname(fileURLToPath(import.meta.url));

/** A number for a bench line: up to 4 significant figures, no exponent for ordinary sizes. */
export function formatMeasured(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a === 0) return '0';
  if (a >= 1000) return x.toFixed(0);
  if (a >= 1) return Number(x.toPrecision(4)).toString();
  return Number(x.toPrecision(3)).toString();
}

/** Whether a line meets its goal. */
export function passes(line: BenchLine): boolean {
  return line.op === '<=' ? line.measured <= line.goal : line.measured >= line.goal;
}

/** The printed form of a line. */
export function formatLine(line: BenchLine): string {
  return `bench ${line.name}: ${formatMeasured(line.measured)} ${line.unit} goal ${line.op} ${formatMeasured(line.goal)} ${passes(line) ? 'pass' : 'MISS'}`;
}

/** Runs one module in this process, printing its lines; returns false when it threw. */
async function runModule(file: string): Promise<boolean> {
  let lines: BenchLine[];
  try {
    const mod = (await import(pathToFileURL(join(here, file)).href)) as BenchModule;
    lines = await mod.run();
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    process.stderr.write(`bench ${file} failed: ${msg}\n`);
    console.log(`bench ${file.replace(/\.bench\.ts$/, '')}: error - goal >= 0 MISS`);
    return false;
  }
  for (const line of lines) {
    console.log(formatLine(line));
    if (line.note) process.stderr.write(`  (${line.name}: ${line.note})\n`);
  }
  return true;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  if (args[0] === '--module' && args[1]) {
    process.exitCode = (await runModule(args[1])) ? 0 : 1;
    return;
  }
  const files = readdirSync(here)
    .filter((f) => f.endsWith('.bench.ts'))
    .filter((f) => args.length === 0 || args.some((s) => f.includes(s)))
    .sort();
  let pass = 0;
  let miss = 0;
  let crashed = false;
  for (const file of files) {
    const child = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), '--module', file], {
      stdio: ['ignore', 'pipe', 'inherit'],
      encoding: 'utf8',
      maxBuffer: 16 * 1024 * 1024,
    });
    const out = child.stdout ?? '';
    process.stdout.write(out);
    for (const row of out.split('\n')) {
      if (!row.startsWith('bench ')) continue;
      if (row.endsWith(' pass')) pass++;
      else if (row.endsWith(' MISS')) miss++;
    }
    if (child.status !== 0) {
      if (!out.includes(' MISS') && !out.includes(' pass')) {
        console.log(`bench ${file.replace(/\.bench\.ts$/, '')}: error - goal >= 0 MISS`);
        miss++;
      }
      crashed = true;
    }
  }
  console.log(`bench summary: ${pass} pass, ${miss} miss`);
  process.exitCode = crashed ? 1 : 0;
}

await main();
