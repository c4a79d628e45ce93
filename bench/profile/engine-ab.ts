/**
 * Two builds of the solver side by side in one process: `npx tsx bench/profile/engine-ab.ts <rootA>
 * <rootB> [rounds]`, each root a checkout of the repository (e.g. a `git worktree` of the commit
 * before). Each build's modules are loaded from its own root (separate module instances and compiled
 * code), and the two take turns round by round (the order swapped every round), so a burst of load
 * from other work falls on both alike; a paired measurement on a shared machine. On the engine
 * bench's seeded 3- and 4-stock problems it prints, per build, the solver with validation and
 * preparation (`preparePlain` + `solvePrepared`) and the solve of a prepared problem, CPU time per
 * problem, fastest of the rounds. No HiGHS and no grid: the solver's own cost, garbage collection
 * included. Running the same root twice (two checkouts of one commit) shows the noise: about
 * ±0.025 µs per 3-stock problem at load 5.
 */
import { randomProblems } from '../engine.bench';
import type { PlainProblem } from '../../src/core/solver/plain';

interface Build {
  prepare: (p: PlainProblem) => unknown;
  solve: (P: unknown) => unknown;
}

function cpuMs(f: () => void): number {
  const c0 = process.cpuUsage();
  f();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1000;
}

async function load(root: string): Promise<Build> {
  const plain = (await import(`${root}/src/core/solver/plain.ts`)) as { preparePlain: Build['prepare'] };
  const engine = (await import(`${root}/src/core/solver/engine.ts`)) as { solvePrepared: Build['solve'] };
  return { prepare: plain.preparePlain, solve: engine.solvePrepared };
}

const [rootA, rootB] = [process.argv[2], process.argv[3]];
if (!rootA || !rootB) throw new Error('usage: engine-ab.ts <rootA> <rootB> [rounds]');
const ROUNDS = Number(process.argv[4] ?? 30);
const REPEAT = 100;
const builds: [string, Build][] = [
  ['A', await load(rootA)],
  ['B', await load(rootB)],
];
for (const [k, count, seed] of [[3, 60, 11], [4, 30, 12]] as const) {
  const problems = randomProblems(count, k, seed);
  const prepared = builds.map(([, b]) => problems.map((p) => b.prepare(p)));
  for (const [, b] of builds) for (let w = 0; w < 200; w++) for (const p of problems) b.solve(b.prepare(p));
  const full = [Infinity, Infinity];
  const solve = [Infinity, Infinity];
  for (let r = 0; r < ROUNDS; r++) {
    for (const s of r % 2 ? [1, 0] : [0, 1]) {
      const b = builds[s]![1];
      full[s] = Math.min(full[s]!, cpuMs(() => { for (let q = 0; q < REPEAT; q++) for (const p of problems) b.solve(b.prepare(p)); }));
      const Ps = prepared[s]!;
      solve[s] = Math.min(solve[s]!, cpuMs(() => { for (let q = 0; q < REPEAT; q++) for (const P of Ps) b.solve(P); }));
    }
  }
  const us = (ms: number) => ((1000 * ms) / REPEAT / count).toFixed(3);
  console.log(`${k} stocks: with validation and preparation A ${us(full[0]!)} B ${us(full[1]!)} µs; prepared solve A ${us(solve[0]!)} B ${us(solve[1]!)} µs`);
}
