// @vitest-environment jsdom
// Known defects of session 19 on the Recipes screen: a specification of another grade is flagged (1),
// a second draft of one approved revision cannot be approved (4), Duplicate at the recipe limit and a
// refused rename say why at the click (5). Rules: common practice (no source); limits from field-rules.ts.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import RecipesScreen from '../../../src/features/recipes/RecipesScreen';
import { recipeActions, resetDemo, useRecipes } from '../../../src/state';
import { COLLECTION_LIMITS } from '../../../src/state/field-rules';

const get = (id: string) => useRecipes.getState().recipes.find((r) => r.id === id)!;

beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
});
afterEach(cleanup);

function select(name: string) {
  fireEvent.click(within(screen.getByTestId('recipe-list')).getByRole('button', { name }));
}

describe('Recipes screen — session 19 defects', () => {
  it('flags a recipe whose specification was written for another grade, in the list and the detail; confirming the grade clears it', () => {
    const id = recipeActions.addRecipe({ name: 'VG 460 trial', grade: 460, lines: get('demo-vg460').lines, specification: { ...get('demo-vg320').specification } });
    recipeActions.setActiveRecipe(id);
    render(<RecipesScreen />);
    const row = within(screen.getByTestId('recipe-list')).getByRole('button', { name: 'VG 460 trial' }).closest('tr')!;
    expect(within(row).getByTestId('spec-grade-tag').textContent).toBe('specification of VG 320');
    expect(screen.getByTestId('spec-grade-flag').textContent).toMatch(/written for VG 320, not for this VG 460 recipe/);
    // The release check holds it with the same reason (and approval waits for it).
    expect(screen.getByTestId('release-check').textContent).toMatch(/written for VG 320/);
    expect(screen.getByTestId('spec-grade-link').textContent).toMatch(/Written for: VG 320 — not this recipe’s grade \(VG 460\)/);
    fireEvent.click(screen.getByRole('button', { name: 'It is the VG 460 specification' }));
    fireEvent.click(screen.getByRole('button', { name: 'Save specification' }));
    expect(get(id).specification.grade).toBe(460);
    expect(screen.queryByTestId('spec-grade-flag')).toBeNull();
    expect(within(screen.getByTestId('recipe-list')).queryByTestId('spec-grade-tag')).toBeNull();
  });

  it('a specification of unknown grade is flagged "grade of specification unknown — check"', () => {
    act(() => useRecipes.setState((s) => ({ recipes: s.recipes.map((r) => (r.id === 'demo-vg680' ? { ...r, specification: { ...r.specification, grade: null } } : r)) })));
    render(<RecipesScreen />);
    const row = within(screen.getByTestId('recipe-list')).getByRole('button', { name: get('demo-vg680').name }).closest('tr')!;
    expect(within(row).getByTestId('spec-grade-tag').textContent).toBe('grade of specification unknown — check');
  });

  it('refuses to approve a second draft of the same approved revision, saying why beside the disabled Approve button', () => {
    const a = recipeActions.saveRevision('demo-vg320', { notes: 'a' }, 'one')!;
    const b = recipeActions.saveRevision('demo-vg320', { notes: 'b' }, 'two')!;
    recipeActions.approveRecipe(a);
    recipeActions.setActiveRecipe(b);
    render(<RecipesScreen />);
    expect(screen.getByTestId('approval-refused').textContent).toMatch(/only one revision of a recipe is approved at a time/);
    const approve = screen.getByRole('button', { name: 'Approve' }) as HTMLButtonElement;
    expect(approve.disabled).toBe(true);
    expect(get(b).status).toBe('draft');
  });

  it('Duplicate at the 10,000-recipe limit says why where it was clicked and keeps everything saved', () => {
    const base = get('demo-vg220');
    const fill = Array.from({ length: COLLECTION_LIMITS.recipes - useRecipes.getState().recipes.length }, (_, i) => ({ ...base, id: `fill-${i}`, name: `filler ${i}`, isReference: false, archived: true }));
    act(() => useRecipes.setState((s) => ({ recipes: [...s.recipes, ...fill] })));
    recipeActions.setActiveRecipe('demo-vg320');
    render(<RecipesScreen />);
    const before = useRecipes.getState().recipes;
    fireEvent.click(screen.getByRole('button', { name: 'Duplicate' }));
    expect(screen.getByTestId('recipe-action-refused').textContent).toMatch(/^Not duplicated: .*more than Blendbench keeps \(at most 10.?000\)\. Nothing was changed/);
    expect(useRecipes.getState().recipes).toBe(before);
  });

  it('a refused rename says why', () => {
    // A stored record the rules no longer accept (an invented over-long note): renaming it is refused.
    act(() => useRecipes.setState((s) => ({ recipes: s.recipes.map((r) => (r.id === 'demo-vg460' ? { ...r, notes: 'n'.repeat(100_000) } : r)) })));
    recipeActions.setActiveRecipe('demo-vg460');
    render(<RecipesScreen />);
    select(get('demo-vg460').name);
    const name = screen.getByLabelText('Name') as HTMLInputElement;
    fireEvent.focus(name);
    fireEvent.change(name, { target: { value: 'Gear 460 (plant)' } });
    fireEvent.blur(name);
    expect(get('demo-vg460').name).not.toBe('Gear 460 (plant)');
    expect(screen.getByTestId('rename-refused').textContent).toMatch(/^Not renamed: .*notes/);
  });
});
