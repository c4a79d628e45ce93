import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { RECIPES_SPEC, demoRecipesData } from '../../src/state/recipes';
import { adoptPlanRevisions, emptyLinePlan, linePlanActions, persistedData, resetDemo, useRecipes } from '../../src/state';
import { makeBackupText, parseBackupText } from '../../src/state/backup';
import { plannedGrades } from '../../src/features/lineplan/derive';

beforeAll(async () => {
  await loadSchemas(); // zod and the stored-data schemas load on demand
});

beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
});

describe('the line plan in the recipes store (schema 6)', () => {
  it('upgrades a schema-5 record with an empty plan and refuses impossible stored values by field', () => {
    const { linePlan: _p, ...v5 } = demoRecipesData();
    const up = interpretStored(RECIPES_SPEC, { state: v5, version: 5 });
    expect(up.kind).toBe('ok');
    if (up.kind === 'ok') {
      expect(up.migratedFrom).toBe(5);
      expect(up.data.linePlan).toEqual(emptyLinePlan());
    }
    const plan = { ...emptyLinePlan(), demands: { 'demo-vg320': 400_000 }, supplies: { 'demo-bw-190': 250_000, 'demo-bw-160': null }, maxStocks: 6 };
    const cur = interpretStored(RECIPES_SPEC, { state: { ...v5, linePlan: plan }, version: 6 });
    expect(cur.kind === 'ok' && cur.data.linePlan).toEqual(plan);
    const bad = interpretStored(RECIPES_SPEC, { state: { ...v5, linePlan: { ...plan, demands: { 'demo-vg320': -5 } } }, version: 6 });
    expect(bad.kind).toBe('problem');
    if (bad.kind === 'problem') expect(bad.problem.message).toContain('demand');
    const half = interpretStored(RECIPES_SPEC, { state: { ...v5, linePlan: { ...plan, maxStocks: 2.5 } }, version: 6 });
    expect(half.kind).toBe('problem');
  });

  it('refuses what the field rules refuse, changing nothing', () => {
    expect(linePlanActions.setDemand('demo-vg220', -1)).toMatch(/demand/);
    expect(linePlanActions.setMaxStocks(0)).toMatch(/number of stocks/);
    expect(useRecipes.getState().linePlan).toEqual(emptyLinePlan());
    const before = useRecipes.getState().recipes;
    const bad = adoptPlanRevisions(
      [
        { recipeId: 'demo-vg220', lines: [{ componentId: 'demo-bw-280', massFraction: 1 }], stockBasis: null },
        { recipeId: 'demo-vg320', lines: [{ componentId: 'demo-bw-280', massFraction: 0.5 }], stockBasis: null },
      ],
      'test',
    );
    expect(bad.ok).toBe(false);
    expect(useRecipes.getState().recipes).toBe(before);
    expect(useRecipes.temporal.getState().pastStates.length).toBe(0);
  });

  it('each edit is one undo step and is saved', () => {
    linePlanActions.setDemand('demo-vg220', 300_000);
    linePlanActions.setSupply('demo-bw-190', 250_000);
    linePlanActions.setMaxStocks(6);
    expect(useRecipes.getState().linePlan.demands).toEqual({ 'demo-vg220': 300_000 });
    expect((persistedData('recipes') as { linePlan: unknown }).linePlan).toEqual(useRecipes.getState().linePlan);
    expect(useRecipes.temporal.getState().pastStates.length).toBe(3);
    useRecipes.temporal.getState().undo();
    expect(useRecipes.getState().linePlan.maxStocks).toBeNull();
    linePlanActions.setDemand('demo-vg220', null);
    expect(useRecipes.getState().linePlan.demands).toEqual({});
  });

  it('adopts draft revisions of every planned recipe in one undo step, superseding them', () => {
    const before = useRecipes.getState().recipes;
    const lines = [
      { componentId: 'demo-bw-280', massFraction: 0.98 },
      { componentId: 'demo-bw-901', massFraction: 0.02 },
    ];
    const r = adoptPlanRevisions(
      [
        { recipeId: 'demo-vg460', lines, stockBasis: null },
        { recipeId: 'demo-vg680', lines, stockBasis: null },
      ],
      'Whole-line plan (test).',
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const rev = useRecipes.getState().recipes.find((x) => x.id === r.ids['demo-vg460'])!;
    expect(rev).toMatchObject({ lines, revision: 2, status: 'draft', supersedes: 'demo-vg460', reasonForChange: 'Whole-line plan (test).' });
    expect(useRecipes.getState().recipes.find((x) => x.id === 'demo-vg460')!.status).toBe('approved'); // until the draft is approved
    expect(useRecipes.temporal.getState().pastStates.length).toBe(1);
    useRecipes.temporal.getState().undo();
    expect(useRecipes.getState().recipes).toEqual(before);
  });

  it('a demand follows its recipe to the approved revision that supersedes it', () => {
    linePlanActions.setDemand('demo-vg460', 250_000);
    const r = adoptPlanRevisions([{ recipeId: 'demo-vg460', lines: [{ componentId: 'demo-bw-280', massFraction: 0.98 }, { componentId: 'demo-bw-901', massFraction: 0.02 }], stockBasis: null }], 'x');
    if (!r.ok) throw new Error(r.message);
    const recipes = () => useRecipes.getState().recipes;
    expect(plannedGrades(recipes(), useRecipes.getState().linePlan).map((g) => g.recipe.id)).toEqual(['demo-vg460']); // draft: not yet
    useRecipes.getState().approveRecipe(r.ids['demo-vg460']!);
    const planned = plannedGrades(recipes(), useRecipes.getState().linePlan);
    expect(planned.map((g) => [g.recipe.id, g.demandKg])).toEqual([[r.ids['demo-vg460'], 250_000]]);
  });

  it('travels in the backup file and back', () => {
    linePlanActions.setDemand('demo-vg320', 400_000);
    linePlanActions.setKeep('demo-bw-220', 50_000);
    const text = makeBackupText(new Date('2025-06-01T00:00:00Z'));
    const parsed = parseBackupText(text);
    expect(parsed.ok).toBe(true);
    if (parsed.ok) expect(parsed.backup.recipes.linePlan).toEqual(useRecipes.getState().linePlan);
  });
});
