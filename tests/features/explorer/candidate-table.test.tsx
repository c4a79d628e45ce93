// @vitest-environment jsdom
/**
 * Explorer candidates (issue 10, items 19 and 21): stocks by share, largest first; limited stocks
 * badged; candidates that differ only by an equivalent source grouped into one row that expands;
 * a warning beside any candidate whose polymer share is beyond the cap; the search capped by default.
 */
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { CandidateTable } from '../../../src/features/explorer/CandidateTable';
import { scenarioTargets } from '../../../src/features/explorer/ExplorerScreen';
import { useExplorerStore } from '../../../src/features/explorer/store';
import { demoComponents, demoRecipes } from '../../../src/state/demo';
import type { SubstituteCandidate } from '../../../src/core/search/substitutes';
import { settingsActions } from '../../../src/state';
import { loadUnitConversions } from '../../../src/components/format';

afterEach(cleanup);

const lib = demoComponents();
const byId = new Map(lib.map((c) => [c.id, c]));
const id = (code: string) => `demo-${code.toLowerCase()}`;

/** An invented candidate (numbers are display fixtures, not predictions). */
function cand(rank: number, shares: Array<[string, number]>, cost: number): SubstituteCandidate {
  const lines = shares.map(([code, massFraction]) => ({ componentId: id(code), massFraction }));
  return {
    key: lines.map((l) => l.componentId).join('+'),
    componentIds: lines.map((l) => l.componentId),
    lines,
    objectiveValue: cost,
    costPerLitre: cost,
    anilinePoint: 120,
    kv40: 320,
    kv100: 24,
    vi: 95,
    density15: 0.88,
    oxidationRating: 4,
    rank,
    onFrontier: false,
    foundAt: rank,
  };
}

function renderTable(candidates: SubstituteCandidate[], polymerCap = 0.25) {
  useExplorerStore.setState({ sort: { key: 'rank', dir: 'asc' }, selectedKey: null, adopted: {} });
  render(
    <CandidateTable
      candidates={candidates}
      components={byId}
      referenceCost={null}
      frontierCount={0}
      total={candidates.length}
      forcedIds={[id('BW-901')]}
      polymerCap={polymerCap}
      method="d7152-wright"
    />,
  );
  return screen.getByTestId('candidates');
}

describe('candidate table', () => {
  it('names the blend-viscosity method the candidates were solved with (issue 13)', () => {
    renderTable([cand(1, [['BW-280', 0.7], ['BW-240', 0.28], ['BW-901', 0.02]], 1.5)]);
    expect(screen.getByTestId('method-note').textContent).toBe(
      'Blend viscosity method: D7152 Wright method (two temperatures per component), volume fractions.',
    );
  });

  it('lists stocks by share, largest first, and badges limited stocks', () => {
    // BW-160 is a limited stock in the invented demo.
    const t = renderTable([cand(1, [['BW-240', 0.28], ['BW-160', 0.1], ['BW-280', 0.6], ['BW-901', 0.02]], 1.5)]);
    const cell = t.querySelector('tbody tr .recipe-cell')!;
    const codes = [...cell.querySelectorAll('.chip .code')].map((e) => e.textContent);
    expect(codes).toEqual(['BW-280', 'BW-240', 'BW-160']);
    const limited = [...cell.querySelectorAll('.chip')].filter((ch) => ch.textContent?.includes('limited'));
    expect(limited.map((ch) => ch.querySelector('.code')!.textContent)).toEqual(['BW-160']);
  });

  it('groups candidates that differ only by a second source into one row that expands', () => {
    // BW-240 / BW-241 and BW-280 / BW-281 are first and second sources of one grade (invented demo).
    const t = renderTable([
      cand(1, [['BW-280', 0.7], ['BW-240', 0.28], ['BW-901', 0.02]], 1.5),
      cand(2, [['BW-281', 0.66], ['BW-240', 0.32], ['BW-901', 0.02]], 1.51),
      cand(3, [['BW-280', 0.7], ['BW-306', 0.28], ['BW-901', 0.02]], 1.6),
      cand(4, [['BW-280', 0.7], ['BW-241', 0.28], ['BW-901', 0.02]], 1.62),
    ]);
    expect(within(t).getAllByRole('row')).toHaveLength(1 + 2);
    expect(screen.getByTestId('grouping-note').textContent).toMatch(/within 8 %, density within 0.005 kg\/L, aniline point within 3 °C/);
    const toggle = screen.getByRole('button', { name: /show 2 with equivalent sources/ });
    expect(toggle.getAttribute('aria-expanded')).toBe('false');
    fireEvent.click(toggle);
    expect(within(t).getAllByRole('row')).toHaveLength(1 + 4);
    expect([...t.querySelectorAll('tbody tr')].map((r) => r.querySelector('td')!.textContent)).toEqual(['1', '2', '4', '3']);
  });

  it('warns beside a candidate beyond the polymer cap', () => {
    renderTable([
      cand(1, [['BW-510', 0.55], ['BW-240', 0.43], ['BW-901', 0.02]], 1.4),
      cand(2, [['BW-510', 0.16], ['BW-280', 0.82], ['BW-901', 0.02]], 1.5),
    ]);
    const warnings = screen.getAllByTestId('polymer-warning');
    expect(warnings).toHaveLength(1);
    expect(warnings[0]!.textContent).toBe('polymer 55 % — above the 25 % cap');
  });

  it('caps the search at the default polymer share when the reference recipe has none', () => {
    const ref = demoRecipes()[1]!;
    const uncappedTargets = { ...scenarioTargets(ref, undefined, lib, 'cost'), maxPolymerFraction: null };
    // default cap: 25 %, common practice (no source)
    expect(scenarioTargets(ref, uncappedTargets, lib, 'cost').maxPolymerFraction).toBe(0.25);
    expect(scenarioTargets(ref, { ...uncappedTargets, maxPolymerFraction: 0.3 }, lib, 'cost').maxPolymerFraction).toBe(0.3);
    // cleared for this search: no cap
    expect(scenarioTargets(ref, uncappedTargets, lib, 'cost', null).maxPolymerFraction).toBeNull();
  });
});

describe('candidate table in °F', () => {
  beforeAll(async () => {
    await loadUnitConversions(); // °F conversions (mathjs) load on demand
  });
  afterEach(() => settingsActions.updateSettings({ temperatureUnit: 'C' }));
  it('states the aniline tolerance in the unit chosen in the settings', () => {
    settingsActions.updateSettings({ temperatureUnit: 'F' });
    renderTable([cand(1, [['BW-280', 0.98], ['BW-901', 0.02]], 1.5)]);
    // 3 °C difference = 5.4 °F (ΔF = 1.8 ΔC, by hand)
    expect(screen.getByTestId('grouping-note').textContent).toMatch(/aniline point within 5.4 °F/);
  });
});
