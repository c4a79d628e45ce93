import { afterEach, describe, expect, it } from 'vitest';
import { setWorkerFactory, startSearch } from '../../../src/features/explorer/search-client';
import { searchSubstitutes, type SubstituteSearchProgress } from '../../../src/core/search/substitutes';
import { demoComponents, defaultTargets, demoRecipes, DEMO_ADDITIVE_ID, demoComponentId } from '../../../src/state/demo';
import { inThreadWorker } from './in-thread-worker';

afterEach(() => setWorkerFactory(null));

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
