// @vitest-environment jsdom
// Session 21 item 4: the specification form's fields and the list of limits that differ after a save
// elsewhere are drawn from one list, so every limit the form shows is named in that list by the same
// label. Limits are invented demo values (common practice (no source)).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, render, screen } from '@testing-library/react';
import RecipesScreen from '../../../src/features/recipes/RecipesScreen';
import { recipeActions, resetDemo, settingsActions, useRecipes } from '../../../src/state';
import { enter } from '../../helpers/enter-field';

const get = (id: string) => useRecipes.getState().recipes.find((r) => r.id === id)!;

let draft = '';
beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', thousandsGrouping: false });
  draft = recipeActions.duplicateRecipe('demo-vg320', 'VG 320 spec fields')!;
  recipeActions.setActiveRecipe(draft);
});
afterEach(cleanup);

/** A value for every field of the form, by the label it shows (invented). */
const TYPED: Record<string, string> = {
  'Specification reference': 'Plant spec 21',
  'ν100 minimum': '21.5',
  'ν100 maximum': '26.5',
  'VI minimum': '97',
  'Density at 15 °C, minimum': '0.87',
  'Density at 15 °C, maximum': '0.91',
  'Flash point minimum': '231',
  'Pour point maximum': '-18',
  'Copper strip corrosion (ASTM D130)': '1a max',
  'Foaming (ASTM D892)': 'seq I 50/0',
};

describe('Recipes screen — the specification form and its difference list share one list of limits', () => {
  it('names every limit of the form, by the form’s label, when a save elsewhere differs from what was typed', () => {
    render(<RecipesScreen />);
    const form = document.querySelector('fieldset.spec-form')!;
    const labels = [...form.querySelectorAll('label.field-label')]
      .filter((l) => !l.closest('[data-testid="spec-grade-pick"]'))
      .map((l) => (l.firstChild?.textContent ?? '').trim());
    // The form shows exactly these limits (a new one needs a value here, and so a line in the list).
    expect(labels).toEqual(Object.keys(TYPED));
    for (const [label, text] of Object.entries(TYPED)) enter(label, text);
    // Another tab saves a specification that differs from every typed limit.
    act(() => void recipeActions.saveChanges(draft, { specification: { ...get(draft).specification, reference: 'Other', kv100Min: 20, viMin: 90 } }, ''));
    const note = screen.getByTestId('spec-changed-elsewhere').textContent!;
    for (const label of Object.keys(TYPED)) {
      const short = label.replace(/ \(ASTM D\d+\)$/, '');
      expect(note, short).toContain(`${short}: saved `);
    }
  });
});
