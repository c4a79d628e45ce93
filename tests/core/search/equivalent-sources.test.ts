import { describe, expect, it } from 'vitest';
import { equivalentSources, groupCandidates, sourceGroups } from '../../../src/core/search/equivalent-sources';
import { makeComponent, STOCKS } from '../../helpers/formulation-fixtures';

// Invented second sources, values chosen to sit just inside / outside the stated tolerance
// (ν within 8 % of the lower value, density within 0.005 kg/L, aniline within 3 °C; common practice (no source)).
const a = makeComponent(STOCKS.g2heavy!); // ν40 110, ν100 12.0, 0.872, AP 121
const b = makeComponent({ ...STOCKS.g2heavy!, id: 'g2heavy-b', kv40: 105, kv100: 11.7, density15: 0.871, anilinePoint: 120 });
const far = makeComponent({ ...STOCKS.g2heavy!, id: 'g2heavy-far', kv40: 119, kv100: 12.6 }); // 119/110 = 8.2 % apart
const c = makeComponent(STOCKS.g2med!);

describe('equivalent sources', () => {
  it('matches a second source within the tolerance, and nothing across categories or beyond it', () => {
    expect(equivalentSources(a, b)).toBe(true);
    expect(equivalentSources(a, far)).toBe(false);
    expect(equivalentSources(a, { ...b, category: 'group-iii' })).toBe(false);
    expect(equivalentSources(a, { ...b, density15: 0.878 })).toBe(false);
    expect(equivalentSources(a, { ...b, anilinePoint: 125 })).toBe(false);
    expect(equivalentSources(a, c)).toBe(false);
    // a wider tolerance takes the far one in
    expect(equivalentSources(a, far, { viscosityPct: 9, densityKgL: 0.005, anilineC: 3 })).toBe(true);
  });

  it('groups by complete linkage, so a chain of small steps does not join distant stocks', () => {
    // 100 → 106 → 112.4: each step 6 %, the ends 12.4 % apart (by hand)
    const s1 = makeComponent({ ...STOCKS.g2heavy!, id: 's1', kv40: 100, kv100: 11 });
    const s2 = makeComponent({ ...STOCKS.g2heavy!, id: 's2', kv40: 106, kv100: 11.4 });
    const s3 = makeComponent({ ...STOCKS.g2heavy!, id: 's3', kv40: 112.4, kv100: 11.9 });
    const g = sourceGroups([s1, s2, s3]);
    expect(g.get('s1')).toBe(g.get('s2'));
    expect(g.get('s3')).not.toBe(g.get('s1'));
  });

  it('groups candidates that differ only by an equivalent source, keeping order', () => {
    const groupOf = sourceGroups([a, b, c]);
    const cands = [
      { id: 1, componentIds: ['g2heavy', 'g2med'] },
      { id: 2, componentIds: ['g2med'] },
      { id: 3, componentIds: ['g2med', 'g2heavy-b'] },
    ];
    const groups = groupCandidates(cands, groupOf);
    expect(groups.map((g) => [g.lead.id, g.alternatives.map((x) => x.id)])).toEqual([
      [1, [3]],
      [2, []],
    ]);
  });
});
