// @vitest-environment jsdom
// s25 walk: "Reset the demo library and recipes" asked "(Undo on the Stocks screen brings them back.)",
// but that Undo brings back the library only: the recipes have their own Undo on the Recipes screen,
// and the company name it sets has none. The question now says what each Undo brings back.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { recipeActions, resetDemo, settingsActions, useLibrary, useRecipes } from '../../../src/state';

beforeEach(() => {
  resetDemo();
  useLibrary.temporal.getState().clear();
  useRecipes.temporal.getState().clear();
});
afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe('Settings: reset the demo', () => {
  it('says which Undo brings back what, and each does', () => {
    const copy = recipeActions.duplicateRecipe('demo-vg320', 'Plant trial (invented)')!;
    settingsActions.updateSettings({ companyName: 'Invented plant name' });
    const asked: string[] = [];
    vi.spyOn(window, 'confirm').mockImplementation((m) => {
      asked.push(String(m));
      return true;
    });
    render(<SettingsScreen />);
    fireEvent.click(screen.getByRole('button', { name: 'Reset the demo library and recipes' }));
    expect(asked).toHaveLength(1);
    expect(asked[0]).toMatch(/Undo on the Stocks screen brings back the library, Undo on the Recipes screen the recipes/);
    expect(asked[0]).toMatch(/company name/);
    expect(useRecipes.getState().recipes.some((r) => r.id === copy)).toBe(false);
    // what the question says holds: the Recipes screen's Undo brings the recipes back
    useRecipes.temporal.getState().undo();
    expect(useRecipes.getState().recipes.some((r) => r.id === copy)).toBe(true);
  });
});
