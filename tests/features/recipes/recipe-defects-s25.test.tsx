// @vitest-environment jsdom
// s25 walk, Recipes screen: after the toolbar's Undo the notice of the undone action stayed up ("Restored …")
// with an Undo button that would now undo the step before it (the archive).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import RecipesScreen from '../../../src/features/recipes/RecipesScreen';
import { recipeActions, resetDemo, useRecipes } from '../../../src/state';

const get = (id: string) => useRecipes.getState().recipes.find((r) => r.id === id)!;

let draft = '';
beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
  draft = recipeActions.duplicateRecipe('demo-vg320', 'VG 320 archive trial')!;
  recipeActions.setActiveRecipe(draft);
});
afterEach(cleanup);

describe('Recipes screen — session 25 walk', () => {
  it('the toolbar Undo takes the undone action’s notice away, so no notice names an action that is no longer in effect', () => {
    render(<RecipesScreen />);
    fireEvent.click(screen.getByRole('button', { name: 'Archive' }));
    expect(get(draft).archived).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Restore from archive' }));
    expect(get(draft).archived).toBe(false);
    expect(screen.getByText(/^Restored “VG 320 archive trial”/)).toBeTruthy();
    const toolbar = screen.getByRole('button', { name: 'Redo' }).parentElement!;
    fireEvent.click(within(toolbar).getByRole('button', { name: 'Undo' }));
    expect(get(draft).archived).toBe(true);
    expect(screen.queryByText(/^Restored “VG 320 archive trial”/)).toBeNull();
    // the only Undo left is the toolbar's
    expect(screen.getAllByRole('button', { name: 'Undo' })).toHaveLength(1);
    fireEvent.click(within(toolbar).getByRole('button', { name: 'Redo' }));
    expect(get(draft).archived).toBe(false);
    expect(screen.getAllByRole('button', { name: 'Undo' })).toHaveLength(1);
  });

  it('Find reads a grade typed without its space ("VG320", "vg 320") the same way (s25 walk)', () => {
    // Before: "VG320" found nothing, though the field's hint reads "name or VG 320".
    render(<RecipesScreen />);
    const find = screen.getByPlaceholderText('name or VG 320');
    const listed = () => [...screen.getByTestId('recipe-list').querySelectorAll('tbody th button')].map((b) => b.textContent);
    fireEvent.change(find, { target: { value: 'VG320' } });
    const a = listed();
    fireEvent.change(find, { target: { value: 'vg 320' } });
    expect(a).toEqual(listed());
    expect(a).toContain('VG 320 archive trial');
    expect(a.every((n) => /VG 320/.test(n ?? ''))).toBe(true);
  });

  it('the specification form says where predictions stand beside the limits: on the blend sheet, not in this form (s25 walk)', () => {
    // Before: "Predictions are shown beside the limits for information only." — none is shown in the form.
    render(<RecipesScreen />);
    const form = screen.getByRole('group', { name: 'Product specification (release limits)' });
    expect(form.textContent).toMatch(/The blend sheet’s QC table shows the predictions beside the limits, for information only\./);
    expect(form.textContent).not.toMatch(/Predictions are shown beside the limits for information only/);
  });

  it('after Delete or Duplicate the focus is on the notice’s Undo, not lost to the page’s start (s25 walk, keyboard)', () => {
    render(<RecipesScreen />);
    fireEvent.click(screen.getByRole('button', { name: 'Duplicate' }));
    expect(screen.getByText(/^Copied as a new draft: “VG 320 archive trial \(copy\)”/)).toBeTruthy();
    let active = document.activeElement as HTMLElement;
    expect(active.tagName).toBe('BUTTON');
    expect(active.textContent).toBe('Undo');
    expect(active.closest('.notice')).not.toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Delete' }));
    expect(screen.getByText(/^Deleted “VG 320 archive trial \(copy\)”/)).toBeTruthy();
    active = document.activeElement as HTMLElement;
    expect(active.textContent).toBe('Undo');
    expect(active.closest('.notice')).not.toBeNull();
  });

  it('Duplicate names in its notice the copy’s name as saved, also for a name at the 200-character limit (s25 walk)', () => {
    const long = 'L'.repeat(200); // the recipe-name limit (state/field-rules.ts TEXT_RULES.recipeName)
    recipeActions.renameRecipe(draft, long);
    render(<RecipesScreen />);
    fireEvent.click(screen.getByRole('button', { name: 'Duplicate' }));
    const copy = useRecipes.getState().recipes.at(-1)!;
    expect(copy.name).toHaveLength(200);
    expect(screen.getByText(`Copied as a new draft: “${copy.name}”.`)).toBeTruthy();
  });
});
