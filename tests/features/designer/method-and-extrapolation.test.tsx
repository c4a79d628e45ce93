// @vitest-environment jsdom
// Issue 13: the designer's predicted properties name the blend-viscosity method, and a flash or pour
// estimate beyond its blending index's fitted range says so beside its value.
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import { PropertiesPanel, buildRows } from '../../../src/features/designer/PropertiesPanel';
import { predictRecipe } from '../../../src/features/designer/predict';
import { makeFormatter } from '../../../src/components/format';
import { BLEND_METHODS, BLEND_METHOD_LABEL } from '../../../src/core/blending/blend-viscosity';
import { resetDemo, useSettingsState } from '../../../src/state';
import { demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';

const components = demoComponents();
const r320 = () => demoRecipes().find((r) => r.grade === 320)!;

afterEach(cleanup);

describe('designer: method named, index extrapolation marked', () => {
  it('names the method the prediction used, for each of the three methods', () => {
    resetDemo();
    const r = r320();
    for (const m of BLEND_METHODS) {
      const pred = predictRecipe(r.lines, components, m, { grade: 320 });
      render(<PropertiesPanel prediction={pred} targets={demoTargets()[r.id]!} />);
      expect(within(screen.getByTestId('predicted')).getByTestId('method-note').textContent).toBe(
        `Blend viscosity method: ${BLEND_METHOD_LABEL[m]}. Viscosity at other temperatures: ASTM D341-20 line through ν40 and ν100.`,
      );
      cleanup();
    }
  });

  it('names the D341 form of the line behind the viscosities at temperature (note and show working)', () => {
    resetDemo();
    const r = r320();
    const pred = predictRecipe(r.lines, components, 'refutas', { grade: 320, operatingTempC: 65, d341Form: 'walther-simple' });
    render(<PropertiesPanel prediction={pred} targets={demoTargets()[r.id]!} />);
    expect(within(screen.getByTestId('predicted')).getByTestId('method-note').textContent).toContain(
      'Viscosity at other temperatures: ASTM D341 (Z = ν + 0.7) line through ν40 and ν100.',
    );
    expect(pred.ok && pred.props.explain.kvAtTemperature!.standard).toBe('ASTM D341 (Z = ν + 0.7)');
    expect(pred.ok && pred.props.explain.kvAtTemperature!.equation).toContain('Z = ν + 0.7, through');
    expect(pred.ok && pred.props.kvAtOperating!.form).toBe('walther-simple');
  });

  it('marks a gear-oil flash point (200–300 °C) as beyond the index fitted range', () => {
    resetDemo();
    const r = r320();
    const pred = predictRecipe(r.lines, components, 'd7152-wright', { grade: 320 });
    if (!pred.ok) throw new Error(pred.message);
    // Invented demo stocks flash above 200 °C, the upper end of the Wickey–Chittenden fit (from memory, flash-point.ts).
    expect(pred.props.flashPoint).toBeGreaterThan(200);
    expect(pred.props.flashPointExtrapolated).toBe(true);
    const rows = buildRows(pred, demoTargets()[r.id]!, makeFormatter(useSettingsState.getState().settings));
    expect(rows.find((x) => x.key === 'flash')!.statusText).toMatch(/extrapolated beyond the index's fitted range/);
    // Pour points of the demo stocks (about −6 to −15 °C) lie inside the Hu–Burns range: not marked.
    expect(pred.props.pourPointExtrapolated).toBe(false);
    expect(rows.find((x) => x.key === 'pour')!.statusText).not.toMatch(/extrapolated/);
  });
});
