// @vitest-environment jsdom
// Second defect hunt: the explorer's viscosity–temperature chart draws the candidate's line dotted
// below its estimated pour point, as it does for the reference (README, Charts).
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import ExplorerCharts from '../../../src/features/explorer/ExplorerCharts';
import { assess } from '../../../src/features/explorer/compare';
import { demoComponents, demoRecipes } from '../../../src/state/demo';
import { DEFAULT_SETTINGS } from '../../../src/state/settings';
import type { SubstituteCandidate } from '../../../src/core/search/substitutes';

afterEach(cleanup);

describe('Explorer charts', () => {
  it('gives the candidate’s line its estimated pour point, like the reference’s', () => {
    const components = demoComponents();
    const reference = demoRecipes()[1]!;
    const opts = { method: DEFAULT_SETTINGS.blendMethod, grade: reference.grade, operatingTempC: 65, coldTempC: -10 };
    const a = assess(components, reference.lines, opts)!;
    expect(a.props.pourPoint).not.toBeNull();
    // The reference's own recipe stands in as candidate 1 (no calculation: its lines as saved in the invented demo).
    const candidate: SubstituteCandidate = {
      key: 'c1',
      componentIds: reference.lines.map((l) => l.componentId),
      lines: reference.lines,
      objectiveValue: a.props.costPerLitre ?? 0,
      costPerLitre: a.props.costPerLitre ?? 0,
      anilinePoint: a.props.anilinePoint?.value ?? null,
      kv40: a.props.kv40,
      kv100: a.props.kv100,
      vi: a.props.vi,
      density15: a.props.density15,
      oxidationRating: a.props.oxidationRating,
      rank: 1,
      onFrontier: true,
    } as SubstituteCandidate;
    const { container } = render(
      <ExplorerCharts
        candidates={[candidate]}
        frontier={[candidate]}
        selected={candidate}
        reference={reference}
        refAssessed={a}
        referenceCost={a.props.costPerLitre}
        components={components}
        settings={DEFAULT_SETTINGS}
        onSelect={() => {}}
      />,
    );
    const vt = [...container.querySelectorAll('[role="img"]')].find((e) => (e.getAttribute('aria-label') ?? '').startsWith('Viscosity against temperature'))!;
    const said = vt.getAttribute('aria-label') ?? '';
    const candidatePart = said.slice(said.indexOf('candidate 1:'));
    expect(candidatePart).toMatch(/^candidate 1: [^;]*, pour point [−-]?\d+ °C/);
  });
});
