import { describe, expect, it } from 'vitest';
import {
  binomial,
  CombinationCursor,
  createSubstituteSearch,
  searchSubstitutes,
  type SubstituteSearchResult,
} from '../../../src/core/search/substitutes';
import { prepareComponents, solvePrepared } from '../../../src/core/solver/solve-blend';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import type { Component } from '../../../src/core/formulation/model';
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

/** Unpruned brute force: every combination solved by the engine; best cost per used set. */
function bruteForce(lib: Component[], k: number, withdrawn: string[] = []): Map<string, number> {
  const libW = lib.map((c) => (withdrawn.includes(c.id) ? { ...c, availability: 'withdrawn' as const } : c));
  const P = prepareComponents(libW, targets);
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
        const prev = best.get(key);
        if (prev === undefined || r.costPerLitre < prev) best.set(key, r.costPerLitre);
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
  for (const c of r.candidates) expect(isClose(c.costPerLitre, want.get(c.key)!, 1e-9)).toBe(true);
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

  it('rejects a bad maxComponents and limits the list on request', () => {
    expect(() => createSubstituteSearch({ components: small, targets, maxComponents: -1 })).toThrow(/maxComponents/);
    const r = searchSubstitutes({ components: small, targets, maxComponents: 3, limit: 5 });
    expect(r.candidates).toHaveLength(5);
    expect(r.distinct).toBeGreaterThan(5);
  });
});
