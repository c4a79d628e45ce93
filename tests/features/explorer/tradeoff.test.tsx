// @vitest-environment jsdom
// Cost–solvency trade-off of one candidate's combination: the pure helper on the invented demo
// library, and the button in the comparison panel.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import ExplorerScreen from '../../../src/features/explorer/ExplorerScreen';
import { setWorkerFactory } from '../../../src/features/explorer/search-client';
import { useExplorerStore } from '../../../src/features/explorer/store';
import { combinationTradeOff } from '../../../src/features/explorer/tradeoff';
import { searchSubstitutes } from '../../../src/core/search/substitutes';
import { resetDemo } from '../../../src/state';
import { FILE_NUMBERS } from '../../../src/state/checks';
import { DEMO_ADDITIVE_ID, demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';
import { inThreadWorker } from './in-thread-worker';

const components = demoComponents();
const reference = demoRecipes().find((r) => r.grade === 320 && r.isReference)!;
const targets = demoTargets()[reference.id]!;
const candidates = searchSubstitutes({ components, targets, reference, withdrawn: ['demo-bw-190'], maxComponents: 3 }).candidates;

describe('combinationTradeOff', () => {
  it('starts at the candidate itself when the candidate is the least-cost blend of its combination', () => {
    const best = candidates[0]!;
    const r = combinationTradeOff(components, targets, best.componentIds, 'refutas', FILE_NUMBERS);
    expect(r.kind).toBe('points');
    if (r.kind !== 'points') return;
    expect(r.points.length).toBeGreaterThanOrEqual(1);
    // property (no source): the sweep's first point is the least-cost solve of the same problem
    expect(r.points[0]!.costPerLitre).toBeCloseTo(best.costPerLitre, 6);
    // the fixed additive is in every recipe although the helper drops it from the ids it passes on
    for (const p of r.points) expect(p.lines.some((l) => l.componentId === DEMO_ADDITIVE_ID)).toBe(true);
  });

  it('gives a non-dominated series: cost rises as the aniline point falls', () => {
    const multi = candidates
      .map((c) => combinationTradeOff(components, targets, c.componentIds, 'refutas', FILE_NUMBERS))
      .find((r) => r.kind === 'points' && r.points.length > 1);
    expect(multi?.kind).toBe('points');
    if (multi?.kind !== 'points') return;
    for (let i = 1; i < multi.points.length; i++) {
      // property (no source): Pareto frontier order, cost ascending and aniline point descending
      expect(multi.points[i]!.costPerLitre).toBeGreaterThan(multi.points[i - 1]!.costPerLitre);
      expect(multi.points[i]!.anilinePoint).toBeLessThan(multi.points[i - 1]!.anilinePoint);
    }
  });

  it('reports an unknown component as an error, not a throw', () => {
    const r = combinationTradeOff(components, targets, ['no-such-stock'], 'refutas', FILE_NUMBERS);
    expect(r.kind).toBe('error');
  });
});

describe('trade-off in the comparison panel', () => {
  beforeEach(() => {
    resetDemo();
    setWorkerFactory(inThreadWorker());
    useExplorerStore.setState({ referenceId: null, withdrawn: [], maxComponents: 3, status: 'idle', result: null, resultFor: null, progress: null, selectedKey: null, adopted: {} });
  });
  afterEach(() => {
    cleanup();
    setWorkerFactory(null);
  });

  it('shows the sweep as a table with the approximation stated', async () => {
    render(<ExplorerScreen />);
    fireEvent.click(screen.getByLabelText('Treat BW-190 as withdrawn'));
    fireEvent.click(screen.getByText('Run search'));
    await screen.findByTestId('candidates', {}, { timeout: 30000 });
    const section = screen.getByTestId('tradeoff');
    fireEvent.click(within(section).getByRole('button', { name: 'Cost–solvency trade-off of this combination' }));
    const table = within(section).getByRole('table');
    expect(table.querySelectorAll('tbody tr').length).toBeGreaterThanOrEqual(1);
    expect(section.textContent).toMatch(/volume-basis approximation/);
    expect(section.textContent).toMatch(/Estimates/);
  });
});
