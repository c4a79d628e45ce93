import { afterEach, describe, expect, it } from 'vitest';
import { searchWorkerCount, setWorkerCount, setWorkerFactory, startSearch } from '../../../src/features/explorer/search-client';
import { searchSubstitutes, type SubstituteSearchProgress, type SubstituteSearchResult } from '../../../src/core/search/substitutes';
import { demoComponents, defaultTargets, demoRecipes, DEMO_ADDITIVE_ID, demoComponentId } from '../../../src/state/demo';
import { inThreadWorker } from './in-thread-worker';

afterEach(() => {
  setWorkerFactory(null);
  setWorkerCount(null);
});

const input = () => {
  const ref = demoRecipes().find((r) => r.grade === 320)!;
  return {
    components: demoComponents(),
    targets: defaultTargets(320, DEMO_ADDITIVE_ID, ref.id),
    reference: ref,
    withdrawn: [demoComponentId('BW-190')],
    maxComponents: 3,
  };
};

describe('substitute search client', () => {
  it('reports rising progress and ends with the same answer as a one-shot search', async () => {
    setWorkerFactory(inThreadWorker({ sliceMs: 2 }));
    const seen: SubstituteSearchProgress[] = [];
    const h = startSearch(input(), (p) => seen.push(p));
    const o = await h.outcome;
    expect(o.kind).toBe('done');
    if (o.kind !== 'done') return;
    expect(seen.length).toBeGreaterThan(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!.evaluated).toBeGreaterThanOrEqual(seen[i - 1]!.evaluated);
    expect(seen.at(-1)!.done).toBe(true);
    // chunked == one-shot: identity of the two ways of running the core search (no source needed)
    const direct = searchSubstitutes(input());
    expect(o.result.candidates.map((c) => c.key)).toEqual(direct.candidates.map((c) => c.key));
    expect(o.result.candidates.length).toBeGreaterThan(0);
    // withdrawn stock never used
    for (const c of o.result.candidates) expect(c.componentIds).not.toContain(demoComponentId('BW-190'));
  });

  it('runs in several workers, streams ranked candidates per stock count, and merges to the one-shot answer', async () => {
    // identity: sharded + merged == one search (no source needed); streaming contract of issue 9 item 2
    setWorkerFactory(inThreadWorker({ sliceMs: 1 }));
    setWorkerCount(3);
    const ranked: SubstituteSearchResult[] = [];
    const seen: SubstituteSearchProgress[] = [];
    const h = startSearch({ ...input(), maxComponents: 4 }, (p) => seen.push(p), (r) => ranked.push(r));
    expect(h.workers).toBe(3);
    const o = await h.outcome;
    expect(o.kind).toBe('done');
    if (o.kind !== 'done') return;
    const direct = searchSubstitutes({ ...input(), maxComponents: 4 });
    expect(o.result.candidates.map((c) => [c.key, c.costPerLitre])).toEqual(direct.candidates.map((c) => [c.key, c.costPerLitre]));
    expect(o.result.evaluated).toBe(direct.total);
    expect(seen.at(-1)!.evaluated).toBe(direct.total);
    expect(ranked.length).toBeGreaterThan(0);
    for (let i = 1; i < ranked.length; i++) expect(ranked[i]!.completedSize).toBeGreaterThan(ranked[i - 1]!.completedSize);
    // Candidates of up to completedSize free stocks are already final when streamed.
    for (const r of ranked) {
      const got = new Map(r.candidates.map((c) => [c.key, c.costPerLitre]));
      for (const c of direct.candidates) {
        const free = c.componentIds.filter((id) => id !== DEMO_ADDITIVE_ID).length;
        if (free <= r.completedSize) expect(got.get(c.key), c.key).toBe(c.costPerLitre);
      }
    }
    // The list limit applies to the merged list.
    setWorkerCount(2);
    const limited = await startSearch({ ...input(), maxComponents: 4, limit: 5 }, () => {}).outcome;
    expect(limited.kind === 'done' && limited.result.candidates.map((c) => c.key)).toEqual(direct.candidates.slice(0, 5).map((c) => c.key));
  });

  it('uses one worker per core but the main thread, at least one', () => {
    expect(searchWorkerCount()).toBeGreaterThanOrEqual(1);
    setWorkerCount(0);
    expect(searchWorkerCount()).toBe(1);
  });

  it('cancels promptly', async () => {
    setWorkerFactory(inThreadWorker({ sliceMs: 1 }));
    let cancelAfterFirst: (() => void) | null = null;
    const h = startSearch({ ...input(), maxComponents: 4 }, () => cancelAfterFirst?.());
    cancelAfterFirst = () => h.cancel();
    const o = await h.outcome;
    expect(o.kind).toBe('cancelled');
  });

  it('reports an error for impossible input instead of throwing', async () => {
    setWorkerFactory(inThreadWorker());
    const bad = { ...input(), maxComponents: -1 };
    const o = await startSearch(bad, () => {}).outcome;
    expect(o.kind).toBe('error');
  });
});

