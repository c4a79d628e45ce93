import { describe, expect, it } from 'vitest';
import {
  binomial,
  CombinationCursor,
  createSubstituteSearch,
  mergeSubstituteResults,
  searchSubstitutes,
  type SubstituteSearchResult,
} from '../../../src/core/search/substitutes';
import { prepareComponents, solvePrepared } from '../../../src/core/solver/solve-blend';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import type { BlendTargets, Component } from '../../../src/core/formulation/model';
import { benchTargets, inventedAdditive, inventedLibrary40 } from '../../../bench/fixtures/invented-library-40';
import { isClose } from '../../helpers/tolerance';

// Invented library (bench/fixtures/invented-library-40.ts: generic typicals, from memory).
const additive = inventedAdditive();
const full: Component[] = [...inventedLibrary40(), additive];
const targets = benchTargets(additive.id);
// A smaller library keeps the exhaustive checks fast: the first 16 stocks + the additive.
const small: Component[] = [...inventedLibrary40().slice(0, 16), additive];

describe('combinations', () => {
  it('visits every combination once, size ascending, and counts them by the binomial', () => {
    // combinatorics: Σ C(m, s) (exact arithmetic)
    const cur = new CombinationCursor(6, 1, 3);
    const seen = new Set<string>();
    let prevSize = 0;
    for (let c = cur.next(); c; c = cur.next()) {
      expect(c.length).toBeGreaterThanOrEqual(prevSize);
      prevSize = c.length;
      for (let i = 1; i < c.length; i++) expect(c[i]!).toBeGreaterThan(c[i - 1]!);
      seen.add(c.join(','));
    }
    expect(seen.size).toBe(binomial(6, 1) + binomial(6, 2) + binomial(6, 3));
    expect(binomial(40, 4)).toBe(91390); // C(40,4), arithmetic
  });
});

/** Unpruned brute force: every combination solved by the engine; best objective value per used set. */
function bruteForce(lib: Component[], k: number, withdrawn: string[] = [], tg: BlendTargets = targets): Map<string, number> {
  const libW = lib.map((c) => (withdrawn.includes(c.id) ? { ...c, availability: 'withdrawn' as const } : c));
  const P = prepareComponents(libW, tg);
  const sense = tg.objective === 'oxidation' ? -1 : 1;
  const forced = new Set(P.forced);
  const pool = P.usableIndices.filter((i) => !forced.has(i));
  const best = new Map<string, number>();
  const rec = (start: number, chosen: number[]): void => {
    if (chosen.length > 0 || forced.size > 0) {
      const r = solvePrepared(P, chosen);
      if (r.status === 'optimal') {
        const key = libW
          .filter((_, i) => r.massFractions[i]! > 1e-6)
          .map((c) => c.id)
          .join('+');
        const value = tg.objective === 'cost' ? r.costPerLitre : r.objectiveValue;
        const prev = best.get(key);
        if (prev === undefined || sense * value < sense * prev) best.set(key, value);
      }
    }
    if (chosen.length === k) return;
    for (let j = start; j < pool.length; j++) rec(j + 1, [...chosen, pool[j]!]);
  };
  rec(0, []);
  return best;
}

function expectSameCandidates(r: SubstituteSearchResult, want: Map<string, number>): void {
  expect(r.candidates.map((c) => c.key).sort()).toEqual([...want.keys()].sort());
  for (const c of r.candidates) expect(isClose(c.objectiveValue, want.get(c.key)!, 1e-9)).toBe(true);
}

describe('substitute search', () => {
  it('equals an unpruned brute force (16 stocks, up to 4, VI and polymer cap active)', () => {
    // exhaustive enumeration, each combination solved with no lower-bound pruning (issue 3 item 5)
    const r = searchSubstitutes({ components: small, targets, maxComponents: 4 });
    expect(r.done).toBe(true);
    expect(r.evaluated).toBe(r.total);
    expect(r.skipped).toBeGreaterThan(0);
    expectSameCandidates(r, bruteForce(small, 4));
  });

  it('equals an unpruned brute force on the 40-stock library, up to 3, with a withdrawn heavy stock', () => {
    // exhaustive enumeration (issue 3 item 5); withdrawn stock excluded
    const withdrawn = ['g2x-1', 'nope'];
    const r = searchSubstitutes({ components: full, targets, maxComponents: 3, withdrawn });
    expectSameCandidates(r, bruteForce(full, 3, ['g2x-1']));
    for (const c of r.candidates) expect(c.componentIds).not.toContain('g2x-1');
    expect(r.excludedIds).toContain('g2x-1');
  });

  it('always includes the fixed additive and never counts it', () => {
    // issue 3 item 5: "combination of up to k remaining components plus the fixed additive"
    const r = searchSubstitutes({ components: small, targets, maxComponents: 2 });
    expect(r.forcedIds).toEqual([additive.id]);
    for (const c of r.candidates) {
      expect(c.componentIds).toContain(additive.id);
      expect(c.componentIds.length).toBeLessThanOrEqual(3);
    }
  });

  it('a chunked run equals the one-shot run, and runs are deterministic', () => {
    // determinism of the pure core (brief: no randomness); chunking must not change the answer
    const oneShot = searchSubstitutes({ components: small, targets, maxComponents: 3 });
    const s = createSubstituteSearch({ components: small, targets, maxComponents: 3 });
    let steps = 0;
    let last = s.progress();
    while (!last.done) {
      const p = s.step(7);
      expect(p.evaluated).toBeGreaterThan(last.evaluated);
      expect(p.evaluated).toBeLessThanOrEqual(p.total);
      last = p;
      steps++;
    }
    expect(steps).toBeGreaterThan(10);
    expect(s.result()).toEqual(oneShot);
    expect(searchSubstitutes({ components: small, targets, maxComponents: 3 })).toEqual(oneShot);
  });

  it('ranks by cost, one candidate per set of used components, each feasible when recomputed', () => {
    // recomputation by the core's predictBlend; ISO 3448 band and issue 3 item 7 tolerances
    const r = searchSubstitutes({ components: small, targets, maxComponents: 3 });
    expect(new Set(r.candidates.map((c) => c.key)).size).toBe(r.candidates.length);
    r.candidates.forEach((c, i) => {
      expect(c.rank).toBe(i + 1);
      if (i > 0) expect(c.costPerLitre).toBeGreaterThanOrEqual(r.candidates[i - 1]!.costPerLitre);
    });
    for (const c of r.candidates.slice(0, 30)) {
      const p = predictBlend(small, c.lines);
      expect(isClose(p.costPerLitre!, c.costPerLitre, 1e-9)).toBe(true);
      expect(p.kv40).toBeGreaterThanOrEqual(r.band.min * (1 - 1e-4));
      expect(p.kv40).toBeLessThanOrEqual(r.band.max * (1 + 1e-4));
      expect(p.vi!).toBeGreaterThanOrEqual(targets.minVi! - 0.01);
      expect(p.polymerFraction).toBeLessThanOrEqual(targets.maxPolymerFraction! + 1e-6);
    }
  });

  it('returns a non-dominated cost–aniline frontier that dominates every other candidate', () => {
    // definition of Pareto dominance (both criteria minimised)
    const r = searchSubstitutes({ components: small, targets, maxComponents: 3 });
    const f = r.frontier;
    expect(f.length).toBeGreaterThan(1);
    for (const a of f) {
      for (const b of f) {
        if (a === b) continue;
        const dominates = a.costPerLitre <= b.costPerLitre && a.anilinePoint! <= b.anilinePoint! && (a.costPerLitre < b.costPerLitre || a.anilinePoint! < b.anilinePoint!);
        expect(dominates).toBe(false);
      }
    }
    for (const c of r.candidates) {
      if (c.onFrontier || c.anilinePoint === null) continue;
      expect(f.some((a) => a.costPerLitre <= c.costPerLitre && a.anilinePoint! <= c.anilinePoint!)).toBe(true);
    }
    expect(f[0]!.key).toBe(r.candidates[0]!.key); // the cheapest is always on the frontier
  });

  it('ranks by aniline point for the solvency objective', () => {
    // objective semantics (issue 3 item 3: best solvency = lowest blend aniline point)
    const r = searchSubstitutes({ components: small, targets: { ...targets, objective: 'solvency' }, maxComponents: 2 });
    for (let i = 1; i < r.candidates.length; i++) {
      expect(r.candidates[i]!.anilinePoint!).toBeGreaterThanOrEqual(r.candidates[i - 1]!.anilinePoint! - 1e-9);
    }
  });

  it('equals an unpruned brute force up to 5 stocks with an aniline limit and a capped stock (support bound)', () => {
    // exhaustive enumeration; the sizes the support bound settles whole must hide no recipe
    const twelve = [...inventedLibrary40().slice(0, 12), additive];
    const tg: BlendTargets = { ...targets, maxAnilinePoint: 118, bounds: { [twelve[4]!.id]: { min: 0, max: 0.3 } } };
    const r = searchSubstitutes({ components: twelve, targets: tg, maxComponents: 5 });
    expect(r.skipped).toBeGreaterThan(0);
    expectSameCandidates(r, bruteForce(twelve, 5, [], tg));
  });

  it('equals an unpruned brute force for the solvency objective, up to 4', () => {
    // exhaustive enumeration; the tie-break row counts toward the support bound
    const tg: BlendTargets = { ...targets, objective: 'solvency' };
    const r = searchSubstitutes({ components: small.slice(0, 12).concat(additive), targets: tg, maxComponents: 4 });
    expectSameCandidates(r, bruteForce(small.slice(0, 12).concat(additive), 4, [], tg));
  });

  it('settles whole sizes the support bound rules out: up to 5 finds what up to 4 finds', () => {
    // support bound (src/core/search/support.ts): band + VI + polymer cap → at most 4 free stocks
    const four = searchSubstitutes({ components: small, targets, maxComponents: 4 });
    const five = searchSubstitutes({ components: small, targets, maxComponents: 5 });
    expect(five.total).toBeGreaterThan(four.total);
    expect(five.lpCount).toBe(four.lpCount);
    expect(five.candidates.map((c) => [c.key, c.costPerLitre])).toEqual(four.candidates.map((c) => [c.key, c.costPerLitre]));
  });

  it('shards merge into the one-run result', () => {
    // determinism: parallel shards must not change the answer (the merge keeps the earlier find on exact ties)
    const oneShot = searchSubstitutes({ components: small, targets, maxComponents: 4 });
    for (const count of [2, 3]) {
      const parts: SubstituteSearchResult[] = [];
      for (let index = 0; index < count; index++) {
        const s = createSubstituteSearch({ components: small, targets, maxComponents: 4, shard: { index, count } });
        while (!s.step(500).done) {
          /* solve */
        }
        parts.push(s.result());
      }
      expect(parts.reduce((n, p) => n + p.total, 0)).toBe(oneShot.total);
      const merged = mergeSubstituteResults(parts);
      expect(merged.evaluated).toBe(oneShot.total);
      expect(merged.done).toBe(true);
      const strip = (r: SubstituteSearchResult) => r.candidates.map(({ foundAt: _f, ...c }) => c);
      expect(strip(merged)).toEqual(strip(oneShot));
      expect(merged.frontier.map((c) => c.key)).toEqual(oneShot.frontier.map((c) => c.key));
    }
    expect(() => createSubstituteSearch({ components: small, targets, shard: { index: 2, count: 2 } })).toThrow(/shard/);
  });

  it('candidates of up to completedSize stocks are final while the search runs', () => {
    // streaming contract (issue 9 item 2): ranked results after each stock count
    const final = searchSubstitutes({ components: small, targets, maxComponents: 4 });
    const free = (c: { componentIds: string[] }) => c.componentIds.filter((id) => id !== additive.id).length;
    const s = createSubstituteSearch({ components: small, targets, maxComponents: 4 });
    let seen = 0;
    for (;;) {
      const p = s.step(25);
      if (p.completedSize > seen) {
        seen = p.completedSize;
        const partial = new Map(s.result().candidates.map((c) => [c.key, c.costPerLitre]));
        for (const c of final.candidates) if (free(c) <= seen) expect(partial.get(c.key), c.key).toBe(c.costPerLitre);
      }
      if (p.done) break;
    }
    expect(seen).toBe(4);
  });

  it('rejects a bad maxComponents and limits the list on request', () => {
    expect(() => createSubstituteSearch({ components: small, targets, maxComponents: -1 })).toThrow(/maxComponents/);
    const r = searchSubstitutes({ components: small, targets, maxComponents: 3, limit: 5 });
    expect(r.candidates).toHaveLength(5);
    expect(r.distinct).toBeGreaterThan(5);
  });
});
