import { describe, expect, it } from 'vitest';
import { shareChanges } from '../../../src/core/recipes/share-changes';
import { expectClose } from '../../helpers/tolerance';

describe('shareChanges', () => {
  it('lists each stock old → new, largest later share first, removed stocks last', () => {
    const rows = shareChanges(
      [
        { componentId: 'bs', massFraction: 0.755 },
        { componentId: 'hsn', massFraction: 0.225 },
        { componentId: 'add', massFraction: 0.02 },
      ],
      [
        { componentId: 'hv', massFraction: 0.7 },
        { componentId: 'hsn', massFraction: 0.28 },
        { componentId: 'add', massFraction: 0.02 },
      ],
    );
    expect(rows.map((r) => [r.componentId, r.kind])).toEqual([
      ['hv', 'added'],
      ['hsn', 'changed'],
      ['add', 'same'],
      ['bs', 'removed'],
    ]);
    // 0.28 − 0.225 = 0.055 (by hand)
    expectClose(rows[1]!.delta, 0.055, 1e-12);
    expect(rows[3]!).toMatchObject({ from: 0.755, to: 0 });
  });

  it('sums a stock named twice, and is empty for two empty recipes', () => {
    const rows = shareChanges([{ componentId: 'a', massFraction: 1 }], [
      { componentId: 'a', massFraction: 0.5 },
      { componentId: 'a', massFraction: 0.5 },
    ]);
    expect(rows).toEqual([{ componentId: 'a', from: 1, to: 1, delta: 0, kind: 'same' }]);
    expect(shareChanges([], [])).toEqual([]);
  });
});
