// @vitest-environment jsdom
// Issue 10 item 1: a product specification's limits are refused where typed with the stored
// specification's own ranges (state/field-rules.ts): what the form accepts, storage accepts.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import RecipesScreen from '../../../src/features/recipes/RecipesScreen';
import { recipeActions, resetDemo, settingsActions, useRecipes } from '../../../src/state';
import { specificationProblems } from '../../../src/state/field-rules';
import { enter } from '../../helpers/enter-field';

const REF = 'demo-vg320';
const recipe = () => useRecipes.getState().recipes.find((r) => r.id === REF)!;

const alerts = () => screen.queryAllByRole('alert').map((a) => a.textContent).join('\n');

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', thousandsGrouping: false });
  recipeActions.setActiveRecipe(REF);
});
afterEach(cleanup);

describe('Recipes screen: specification limits at entry', () => {
  it('refuses ν100, density, VI, flash and pour limits outside the stored ranges, naming the limit', () => {
    render(<RecipesScreen />);
    const before = structuredClone(recipe().specification);
    // Ranges from src/state/field-rules.ts: ν100 from 2.0 mm²/s (ASTM D2270 scope), density 0.6–1.3 kg/L,
    // VI −100…500, flash −50…500 °C, pour −100…100 °C.
    const kv = enter('ν100 minimum', '0.5');
    expect(alerts()).toContain('The specification ν100 limit 0.5 mm²/s is outside the possible range');
    expect(kv.getAttribute('aria-invalid')).toBe('true');
    enter('Density at 15 °C, maximum', '1.9');
    expect(alerts()).toContain('The specification density limit 1.9 kg/L is outside the possible range (from 0.6 kg/L to 1.3 kg/L)');
    enter('VI minimum', '450');
    expect(alerts()).not.toMatch(/VI minimum 450/); // inside −100…500: accepted
    enter('Flash point minimum', '-80');
    expect(alerts()).toContain('The specification flash-point minimum −80 °C is outside the possible range (from −50 °C to 500 °C)');
    enter('Pour point maximum', '150');
    expect(alerts()).toContain('The specification pour-point maximum 150 °C is outside the possible range (from −100 °C to 100 °C)');
    // Only the accepted VI limit is pending; what the form would save passes the stored rules.
    expect(recipe().specification).toEqual(before);
  });

  it('a limit the form accepts is one the stored specification accepts', () => {
    render(<RecipesScreen />);
    enter('ν100 minimum', '2.5');
    enter('Pour point maximum', '-9');
    enter('Flash point minimum', '200');
    fireEvent.change(screen.getByLabelText(/Reason for change/), { target: { value: 'release limits entered' } });
    fireEvent.click(screen.getByRole('button', { name: /Save as draft revision/ }));
    const saved = useRecipes.getState().recipes.find((r) => r.supersedes === REF)!;
    expect(saved.specification).toMatchObject({ kv100Min: 2.5, pourMax: -9, flashMin: 200 });
    expect(specificationProblems(saved.specification)).toEqual([]);
  });
});
