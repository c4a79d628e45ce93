// @vitest-environment jsdom
// "In grade after shear" in the designer's predicted properties: the row built from the core's
// blendAfterShear, and its working on demand.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import DesignerScreen from '../../../src/features/designer/DesignerScreen';
import { useDesignerStore } from '../../../src/features/designer/store';
import { predictRecipe } from '../../../src/features/designer/predict';
import { shearRow } from '../../../src/features/designer/PropertiesPanel';
import { makeFormatter } from '../../../src/components/format';
import { blendAfterShear, SHEAR_ASSUMPTION } from '../../../src/core/formulation/shear-blend';
import { recipeActions, resetDemo, useSettingsState, useWorkspaceStore } from '../../../src/state';
import { demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';

const components = demoComponents();
const recipe = (grade: number) => demoRecipes().find((r) => r.grade === grade)!;
const fmt = () => makeFormatter(useSettingsState.getState().settings);

describe('shearRow', () => {
  beforeEach(() => resetDemo());

  it('a polymer-thickened blend: ν40 after shear from the core, yes/no against the grade band', () => {
    const r = recipe(680); // invented demo VG 680: bright stock + PIB thickener (stated KRL loss) + additive
    const targets = demoTargets()[r.id]!;
    const pred = predictRecipe(r.lines, components, 'refutas', { grade: 680 });
    if (!pred.ok) throw new Error(pred.message);
    const row = shearRow(pred, targets, fmt());
    const core = blendAfterShear(components, r.lines, { method: 'refutas', grade: 680 });
    expect(core.unchanged).toBe(false);
    // the row shows the core's result (no number of its own)
    expect(row.value).toBe(`${core.inGradeAfter ? 'yes' : 'no'}, ν40 ${fmt().num(core.kv40After, 1)} mm²/s`);
    expect(row.status).toBe(core.inGradeAfter ? 'ok' : 'fail');
    // property (domain doc §7, no check value): shear only thins the blend
    expect(core.kv40After).toBeLessThan(core.kv40Before);
    expect(row.explain?.note).toBe(SHEAR_ASSUMPTION);
    expect(row.explain?.standard).toMatch(/ISO 26422/);
  });

  it('a blend without polymer is unchanged and says so', () => {
    const r = recipe(320);
    const pred = predictRecipe(r.lines, components, 'refutas', { grade: 320 });
    if (!pred.ok) throw new Error(pred.message);
    const row = shearRow(pred, demoTargets()[r.id]!, fmt());
    expect(row.value).toMatch(/^yes, ν40 /);
    expect(row.statusText).toMatch(/no polymer with a stated shear loss/);
  });

  it('checks against the target grade, not the grade the blend happens to fall in', () => {
    const r = recipe(320);
    const pred = predictRecipe(r.lines, components, 'refutas', { grade: 460 });
    if (!pred.ok) throw new Error(pred.message);
    const row = shearRow(pred, { ...demoTargets()[r.id]!, grade: 460 }, fmt());
    // the VG 320 demo blend is far below the VG 460 band (ISO 3448: 414–506, tests/reference/check-values.md G2)
    expect(row.value).toMatch(/^no, /);
    expect(row.status).toBe('fail');
  });
});

describe('designer: In grade after shear row', () => {
  beforeEach(() => {
    resetDemo();
    useDesignerStore.setState({ initialised: false, basis: 'mass', rebalanceMode: 'proportional' });
    useWorkspaceStore.setState({ drafts: {}, habits: null }); // no draft kept from an earlier test
  });
  afterEach(cleanup);

  it('shows the row with its working (the stated assumption) on demand', () => {
    recipeActions.setActiveRecipe(recipe(680).id);
    render(<DesignerScreen />);
    const predicted = screen.getByTestId('predicted');
    expect(within(predicted).getByText('In grade after shear')).toBeTruthy();
    expect(screen.getByTestId('prop-shear').textContent).toMatch(/^(yes|no), ν40 \d/);
    fireEvent.click(within(predicted).getByRole('button', { name: 'show working for In grade after shear' }));
    expect(predicted.textContent).toContain(SHEAR_ASSUMPTION);
    expect(predicted.textContent).toMatch(/ISO 26422/);
  });
});
