// @vitest-environment jsdom
// Issue 10 item 1: over-long text typed or pasted on the Recipes screen is refused where it is entered,
// with the stored field's own limit (state/field-rules.ts), and nothing is stored.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import RecipesScreen from '../../../src/features/recipes/RecipesScreen';
import { recipeActions, resetDemo, useRecipes } from '../../../src/state';
import { TEXT_RULES } from '../../../src/state/field-rules';

const REF = 'demo-vg320';
const recipe = () => useRecipes.getState().recipes.find((r) => r.id === REF)!;

function paste(el: HTMLElement, text: string) {
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.keyDown(el, { key: 'Enter' });
  fireEvent.blur(el);
}

beforeEach(() => {
  resetDemo();
  recipeActions.setActiveRecipe(REF);
});
afterEach(cleanup);

describe('Recipes screen: text limits at entry', () => {
  it('refuses a 5,000-character name with the limit of the stored name, and keeps the saved name', () => {
    render(<RecipesScreen />);
    const was = recipe().name;
    const name = screen.getByLabelText('Name') as HTMLInputElement;
    expect(name.maxLength).toBe(-1); // no silent cut: the message says what is wrong
    paste(name, 'n'.repeat(5000));
    expect(screen.getByRole('alert').textContent).toMatch(`recipe name is 5000 characters long; at most ${TEXT_RULES.recipeName.max} can be saved`);
    expect(name.getAttribute('aria-invalid')).toBe('true');
    expect(recipe().name).toBe(was);
  });

  it('refuses an over-long specification reference, copper and foam limit, and reason for change', () => {
    render(<RecipesScreen />);
    const before = structuredClone(recipe().specification);
    paste(screen.getByLabelText('Specification reference'), 'S'.repeat(500));
    expect(screen.getByText(/specification reference is 500 characters long; at most 120/)).toBeTruthy();
    paste(screen.getByLabelText('Copper strip corrosion (ASTM D130)'), 'C'.repeat(61));
    expect(screen.getByText(/specification limit is 61 characters long; at most 60/)).toBeTruthy();
    // A change that can be saved (an approved recipe: as a new revision, with a reason).
    paste(screen.getByLabelText('Foaming (ASTM D892)'), 'nil');
    const reason = screen.getByLabelText(/Reason for change/) as HTMLInputElement;
    fireEvent.change(reason, { target: { value: 'r'.repeat(1500) } });
    expect(screen.getByText(/reason for change is 1500 characters long; at most 1000/)).toBeTruthy();
    expect((screen.getByText(/Save as draft revision/) as HTMLButtonElement).disabled).toBe(true);
    expect(recipe().specification).toEqual(before);
    expect(useRecipes.getState().recipes.some((r) => r.supersedes === REF)).toBe(false);
  });
});
