/**
 * Bench: substitute search over an invented 40-stock library (plus a fixed 2 % additive package),
 * every combination of up to 4 stocks, VG 320 ± 5 %, VI ≥ 90, polymer ≤ 10 %, least cost per litre.
 *
 * Lines: wall time of the whole search in Node (goal ≤ 2 s; median of three runs, each from
 * `createSubstituteSearch` to `result()`, chunked as the Web Worker runs it), and LPs per second
 * during the search. The library is invented (bench/fixtures/invented-library-40.ts).
 */
import { performance } from 'node:perf_hooks';
import { createSubstituteSearch, type SubstituteSearchResult } from '../src/core/search/substitutes';
import { benchTargets, inventedAdditive, inventedLibrary40 } from './fixtures/invented-library-40';
import type { BenchLine } from './types';

export async function run(): Promise<BenchLine[]> {
  const additive = inventedAdditive();
  const components = [...inventedLibrary40(), additive];
  const targets = benchTargets(additive.id);
  const times: number[] = [];
  let last: SubstituteSearchResult | null = null;
  for (let rep = 0; rep < 3; rep++) {
    const t0 = performance.now();
    const search = createSubstituteSearch({ components, targets, maxComponents: 4 });
    while (!search.step(2000).done) {
      /* chunks of 2000 combinations, as in the worker */
    }
    last = search.result();
    times.push(performance.now() - t0);
  }
  const sorted = [...times].sort((a, b) => a - b);
  const median = sorted[1]!;
  const r = last!;
  return [
    {
      name: 'substitute search 40 stocks, up to 4 (Node)',
      measured: median / 1000,
      unit: 's',
      op: '<=',
      goal: 2,
      note:
        `runs ${times.map((t) => t.toFixed(0)).join(', ')} ms; ${r.total} combinations, ${r.skipped} settled by the ` +
        `lower bound, ${r.lpCount} LPs, ${r.feasible} feasible solves, ${r.distinct} distinct candidates, ` +
        `${r.frontier.length} on the cost–aniline frontier`,
    },
    {
      name: 'substitute search LPs per second (Node)',
      measured: r.lpCount / (median / 1000),
      unit: 'LP/s',
      op: '>=',
      goal: 20000,
      note: `${r.lpCount} LPs in ${median.toFixed(0)} ms (median run)`,
    },
  ];
}
