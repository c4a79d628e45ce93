/**
 * Where the engine bench's time per problem goes: validation and preparation (`preparePlain`), the
 * first solve of a fresh prepared problem (its lazily computed numbers included) and a solve of an
 * already prepared problem, on the bench's own seeded 3- and 4-stock problems. CPU time, fastest of
 * `ROUNDS` rounds taken in turns. `npx tsx bench/profile/engine-phases.ts [rounds]`
 */
import { preparePlain } from '../../src/core/solver/plain';
import { solvePrepared } from '../../src/core/solver/engine';
import { randomProblems } from '../engine.bench';

function cpuMs(f: () => void): number {
  const c0 = process.cpuUsage();
  f();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1000;
}

const ROUNDS = Number(process.argv[2] ?? 25);
const REPEAT = 200;
for (const [k, count, seed] of [[3, 60, 11], [4, 30, 12]] as const) {
  const problems = randomProblems(count, k, seed);
  const prepared = problems.map((p) => preparePlain(p));
  for (let w = 0; w < 200; w++) for (const p of problems) solvePrepared(preparePlain(p));
  let prep = Infinity, full = Infinity, solve = Infinity;
  for (let r = 0; r < ROUNDS; r++) {
    prep = Math.min(prep, cpuMs(() => { for (let q = 0; q < REPEAT; q++) for (const p of problems) preparePlain(p); }));
    full = Math.min(full, cpuMs(() => { for (let q = 0; q < REPEAT; q++) for (const p of problems) solvePrepared(preparePlain(p)); }));
    solve = Math.min(solve, cpuMs(() => { for (let q = 0; q < REPEAT; q++) for (const P of prepared) solvePrepared(P); }));
  }
  const us = (ms: number) => ((1000 * ms) / REPEAT / problems.length).toFixed(3);
  console.log(`${k} stocks: preparePlain ${us(prep)} µs, first solve of a fresh problem ${us(full - prep)} µs (prepare + solve ${us(full)}), solve of a prepared problem ${us(solve)} µs`);
}
