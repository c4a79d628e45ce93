import { describe, expect, it } from 'vitest';
import { inBandRows } from '../../../src/features/explorer/ComparisonPanel';
import { makeFormatter } from '../../../src/components/format';
import { useSettingsState } from '../../../src/state';

const fmt = makeFormatter({ ...useSettingsState.getState().settings, decimalSeparator: '.', thousandsGrouping: false });

describe('comparison rows of the probability in band', () => {
  it('states the change in points, toned; a change that does not show at one decimal is "same", untoned', () => {
    // probabilities are inputs here (no calculation checked)
    const rows = inBandRows({ reference: { plant: 0.5, iso: 0.99999 }, candidate: { plant: 0.99, iso: 0.999995 } }, fmt);
    expect(rows.map((r) => [r.ref, r.cand, r.change, r.tone])).toEqual([
      ['50.0 %', '99.0 %', '+49.0 points', 'better'],
      ['> 99.99 %', '> 99.99 %', 'same', undefined],
    ]);
    const worse = inBandRows({ reference: { plant: 0.99, iso: 1 }, candidate: { plant: 0.95, iso: 1 } }, fmt);
    expect(worse[0]!.change).toBe('−4.0 points');
    expect(worse[0]!.tone).toBe('worse');
    expect(inBandRows(null, fmt)).toEqual([]);
  });
});
