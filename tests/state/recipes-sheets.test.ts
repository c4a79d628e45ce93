import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { RECIPES_SPEC, demoRecipesData } from '../../src/state/recipes';
import { DEFAULT_SHEET_INPUTS, persistedData, recipeActions, resetDemo, useRecipes } from '../../src/state';

beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
});


beforeAll(async () => {
  await loadSchemas(); // zod and the stored-data schemas load on demand
});

describe('blend-sheet inputs in the recipes store (schema 3)', () => {
  it('upgrades a schema-2 record by adding empty sheet inputs, and reads schema 3 back', () => {
    const { sheets: _s, ...v2 } = demoRecipesData();
    const up = interpretStored(RECIPES_SPEC, { state: v2, version: 2 });
    expect(up.kind).toBe('ok');
    if (up.kind === 'ok') {
      expect(up.migratedFrom).toBe(2);
      expect(up.data.sheets).toEqual({});
    }
    const sheets = { 'demo-vg320': { ...DEFAULT_SHEET_INPUTS, lot: 'L-7', vessel: 'Kettle 2', instructions: 'Step one.' } };
    const cur = interpretStored(RECIPES_SPEC, { state: { ...v2, sheets }, version: 3 });
    expect(cur.kind === 'ok' && cur.data.sheets).toEqual(sheets);
    const bad = interpretStored(RECIPES_SPEC, { state: { ...v2, sheets: { x: { ...DEFAULT_SHEET_INPUTS, batchUnit: 'gallons' } } }, version: 3 });
    expect(bad.kind).toBe('problem');
  });

  it('merges edits per recipe, saves them, keeps them out of undo, and keeps them through a deletion that is undone', () => {
    recipeActions.setSheetInputs('demo-vg320', { lot: 'L-0042' });
    recipeActions.setSheetInputs('demo-vg320', { batchSize: '2500', batchUnit: 'litres' });
    expect(useRecipes.getState().sheets['demo-vg320']).toEqual({ ...DEFAULT_SHEET_INPUTS, lot: 'L-0042', batchSize: '2500', batchUnit: 'litres' });
    expect(useRecipes.getState().sheets['demo-vg220']).toBeUndefined();
    expect((persistedData('recipes') as { sheets: unknown }).sheets).toEqual(useRecipes.getState().sheets);
    expect(useRecipes.temporal.getState().pastStates.length).toBe(0);
    recipeActions.removeRecipe('demo-vg320');
    expect(useRecipes.getState().recipes.some((r) => r.id === 'demo-vg320')).toBe(false);
    // Delete is undoable (issue 10, item 15): the sheet fields survive, so undo restores everything.
    useRecipes.temporal.getState().undo();
    expect(useRecipes.getState().recipes.some((r) => r.id === 'demo-vg320')).toBe(true);
    expect(useRecipes.getState().sheets['demo-vg320']!.lot).toBe('L-0042');
  });
});
