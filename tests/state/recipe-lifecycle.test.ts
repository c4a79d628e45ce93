/**
 * Recipe lifecycle (issue 10, item 15): status, revisions that supersede, never overwriting an
 * approved recipe, saving constraints alone, rename / archive / delete with undo, and the schema
 * 3 → 4 migration. Also the stock data recorded with a recipe (item 14).
 */
import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { RECIPES_SPEC, demoRecipesData } from '../../src/state/recipes';
import { RecipeChangedError, RecipeVersionUnknownError, UNKNOWN_VERSION, defaultTargets, recipeActions, resetDemo, useLibrary, useRecipes } from '../../src/state';
import { BLANK_SPECIFICATION } from '../../src/core/formulation/model';
import { clockPast } from '../helpers/settle';
import { identityChangeWords, stockBasisChanges } from '../../src/core/recipes/stock-basis';

const get = (id: string) => useRecipes.getState().recipes.find((r) => r.id === id)!;

beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
});


beforeAll(async () => {
  await loadSchemas(); // zod and the stored-data schemas load on demand
});

describe('recipe lifecycle', () => {
  it('does not save a draft over a version saved after the edits began (two tabs, s19 defect hunt)', async () => {
    const id = recipeActions.duplicateRecipe('demo-vg320')!;
    const began = get(id).updatedAt;
    await clockPast(); // the next save carries a later stamp (ms)
    expect(recipeActions.saveChanges(id, { name: 'Renamed in the other tab' }, '', began)).toBe(id);
    const theirs = structuredClone(get(id));
    const lines = theirs.lines.map((l) => ({ ...l }));
    lines.reverse();
    expect(() => recipeActions.saveChanges(id, { lines }, '', began)).toThrow(RecipeChangedError);
    expect(get(id)).toEqual(theirs);
    // Based on the version as saved now, or with no stamp (a caller that read it just now), it saves.
    expect(recipeActions.saveChanges(id, { lines }, '', theirs.updatedAt)).toBe(id);
    expect(get(id).lines).toEqual(lines);
  });

  it('a copy of a recipe whose name is at its limit keeps the " (copy)" mark within the limit (s24 defect hunt)', () => {
    const long = 'N'.repeat(200); // the recipe-name limit of field-rules.ts (200 characters)
    expect(recipeActions.saveChanges('demo-vg220', { name: long }, 'test', get('demo-vg220').updatedAt)).toBeTruthy();
    const source = useRecipes.getState().recipes.find((r) => r.name === long)!;
    const id = recipeActions.duplicateRecipe(source.id)!;
    expect(get(id).name).toHaveLength(200);
    expect(get(id).name.endsWith(' (copy)')).toBe(true);
    expect(get(id).name).not.toBe(long);
  });

  it('does not save a draft over its recipe when the version the changes began from is unknown (a draft kept by workspace schema 1, s20 defect 1)', () => {
    const id = recipeActions.duplicateRecipe('demo-vg320')!;
    const before = structuredClone(get(id));
    expect(() => recipeActions.saveChanges(id, { name: 'From an old kept draft' }, '', UNKNOWN_VERSION)).toThrow(RecipeVersionUnknownError);
    expect(get(id)).toEqual(before);
    // An approved recipe is never overwritten anyway: the changes make a new draft revision.
    const rev = recipeActions.saveChanges('demo-vg320', { name: 'From an old kept draft' }, 'reason', UNKNOWN_VERSION);
    expect(rev).not.toBe('demo-vg320');
  });

  it('never overwrites an approved recipe: saving changes makes a draft revision that supersedes it', () => {
    const old = get('demo-vg320');
    expect(old.status).toBe('approved');
    const lines = [
      { componentId: 'demo-bw-280', massFraction: 0.7 },
      { componentId: 'demo-bw-240', massFraction: 0.28 },
      { componentId: 'demo-bw-901', massFraction: 0.02 },
    ];
    const id = recipeActions.saveChanges('demo-vg320', { lines }, 'bright stock withdrawn');
    expect(id).not.toBe('demo-vg320');
    // The approved recipe is untouched.
    expect(get('demo-vg320')).toEqual(old);
    const rev = get(id);
    expect([rev.status, rev.revision, rev.supersedes, rev.reasonForChange]).toEqual(['draft', 2, 'demo-vg320', 'bright stock withdrawn']);
    expect(rev.lines).toEqual(lines);
    expect(rev.name).toBe(old.name);
    // It carries the targets and specification of the recipe it revises.
    expect(useRecipes.getState().targets[id]).toEqual(useRecipes.getState().targets['demo-vg320']);
    expect(rev.specification).toEqual(old.specification);
    // Direct writes to the approved recipe's content are refused.
    expect(recipeActions.setLines('demo-vg320', lines)).toMatch(/is approved: it is never overwritten/);
    expect(recipeActions.setTargets('demo-vg320', defaultTargets(320, null, null))).toMatch(/never overwritten/);
    expect(recipeActions.updateRecipe('demo-vg320', { grade: 460 })).toMatch(/never overwritten/);
    expect(get('demo-vg320')).toEqual(old);
  });

  it('approving the new revision supersedes the old one and hands over the production mark', () => {
    const id = recipeActions.saveRevision('demo-vg320', { notes: 'x' }, 'reason')!;
    recipeActions.approveRecipe(id);
    expect(get(id).status).toBe('approved');
    expect(get(id).approvedAt).not.toBeNull();
    expect(get(id).isReference).toBe(true);
    expect(get('demo-vg320').status).toBe('superseded');
    expect(get('demo-vg320').isReference).toBe(false);
    // Approving is one undo step.
    useRecipes.temporal.getState().undo();
    expect(get('demo-vg320').status).toBe('approved');
    expect(get(id).status).toBe('draft');
  });

  it('numbers a second revision of the same recipe after the first', () => {
    const a = recipeActions.saveRevision('demo-vg320', {}, 'one')!;
    const b = recipeActions.saveRevision('demo-vg320', {}, 'two')!;
    expect([get(a).revision, get(b).revision]).toEqual([2, 3]);
  });

  it('changes a draft in place, and saves a change of constraints alone', () => {
    const id = recipeActions.addRecipe({ name: 'trial', grade: 320, lines: [{ componentId: 'demo-bw-280', massFraction: 1 }] });
    expect(get(id).status).toBe('draft');
    const t = { ...defaultTargets(320, null, null), minVi: 95 };
    expect(recipeActions.saveChanges(id, { targets: t }, 'VI floor')).toBe(id);
    expect(useRecipes.getState().targets[id]!.minVi).toBe(95);
    expect(get(id).revision).toBe(1);
    // On an approved recipe the same constraints-only change is saved as a new revision.
    const rev = recipeActions.saveChanges('demo-vg220', { targets: t }, 'VI floor');
    expect(rev).not.toBe('demo-vg220');
    expect(useRecipes.getState().targets[rev]!.minVi).toBe(95);
    expect(useRecipes.getState().targets['demo-vg220']!.minVi).toBeNull();
  });

  it('renames, archives and deletes with undo', () => {
    recipeActions.renameRecipe('demo-vg460', 'Gear 460 (plant)');
    expect(get('demo-vg460').name).toBe('Gear 460 (plant)');
    expect(get('demo-vg460').status).toBe('approved');
    recipeActions.setArchived('demo-vg460', true);
    expect(get('demo-vg460').archived).toBe(true);
    recipeActions.removeRecipe('demo-vg460');
    expect(useRecipes.getState().recipes.some((r) => r.id === 'demo-vg460')).toBe(false);
    useRecipes.temporal.getState().undo();
    expect(get('demo-vg460').archived).toBe(true);
    expect(useRecipes.getState().targets['demo-vg460']).toBeDefined();
  });

  it('migrates schema 3: the production reference becomes approved, every other recipe a draft', () => {
    const v4 = demoRecipesData();
    const strip = (r: (typeof v4.recipes)[number]) => ({
      id: r.id, name: r.name, grade: r.grade, lines: r.lines, revision: r.revision, isReference: r.isReference, notes: r.notes, updatedAt: r.updatedAt,
    });
    const v3 = { ...v4, recipes: [strip(v4.recipes[0]!), { ...strip(v4.recipes[1]!), id: 'cand', isReference: false }] };
    const up = interpretStored(RECIPES_SPEC, { state: v3, version: 3 });
    expect(up.kind).toBe('ok');
    if (up.kind !== 'ok') return;
    expect(up.migratedFrom).toBe(3);
    expect(up.data.recipes.map((r) => r.status)).toEqual(['approved', 'draft']);
    // Blank, and (schema 9) linked to the recipe's own grade: a blank specification fits every grade.
    expect(up.data.recipes[0]!.specification).toEqual({ ...BLANK_SPECIFICATION, grade: v4.recipes[0]!.grade });
    expect(up.data.recipes[0]!.stockBasis).toBeNull();
    expect(up.data.recipes[0]!.lines).toEqual(v4.recipes[0]!.lines);
  });
});

describe('stock data recorded with a recipe (issue 10, item 14)', () => {
  it('flags a recipe whose stock was calibrated after it was saved', () => {
    const before = get('demo-vg680');
    expect(stockBasisChanges(before.stockBasis, useLibrary.getState().components)).toEqual([]);
    const pib = useLibrary.getState().components.find((c) => c.id === 'demo-bw-510')!;
    useLibrary.getState().updateComponent(pib.id, {
      calibration: {
        effectiveKv40: 9000,
        effectiveKv100: 260,
        trial: { massFractions: { 'demo-bw-510': 0.2, 'demo-bw-190': 0.8 }, measuredKv40: 900, measuredKv100: 55, labReference: 'T-1' },
        method: 'refutas',
        calibratedOn: '2026-01-01',
      },
    });
    const changes = stockBasisChanges(get('demo-vg680').stockBasis, useLibrary.getState().components);
    expect(changes.map((c) => c.code)).toEqual(['BW-510']);
    expect(changes[0]!.fields.map((f) => [f.property, f.from, f.to])).toEqual([
      ['calibrated ν40', null, 9000],
      ['calibrated ν100', null, 260],
    ]);
    // The VG 320 recipe does not use BW-510: not flagged.
    expect(stockBasisChanges(get('demo-vg320').stockBasis, useLibrary.getState().components)).toEqual([]);
  });

  it('flags a recipe whose stock was given another code after it was saved, with no data change (s23 defect hunt)', () => {
    useLibrary.getState().updateComponent('demo-bw-160', { code: 'BW-169' });
    const changes = stockBasisChanges(get('demo-vg460').stockBasis, useLibrary.getState().components);
    expect(changes).toEqual([{ componentId: 'demo-bw-160', code: 'BW-169', kind: 'changed', fields: [], codeWas: 'BW-160' }]);
    // The VG 680 recipe does not use BW-160: not flagged.
    expect(stockBasisChanges(get('demo-vg680').stockBasis, useLibrary.getState().components)).toEqual([]);
  });

  it('flags a recipe whose stock moved to another category (it sets the charging order), in words (s23)', () => {
    useLibrary.getState().updateComponent('demo-bw-160', { category: 'additive-package' });
    const changes = stockBasisChanges(get('demo-vg460').stockBasis, useLibrary.getState().components);
    expect(changes).toEqual([
      { componentId: 'demo-bw-160', code: 'BW-160', kind: 'changed', fields: [], categoryWas: 'group-i', category: 'additive-package' },
    ]);
    expect(identityChangeWords(changes[0]!)).toEqual(['category Group I → Additive package']);
    // A snapshot recorded before the category was kept has none: nothing to compare, nothing flagged.
    const basis = get('demo-vg460').stockBasis!;
    const old = { ...basis, stocks: basis.stocks.map(({ category: _c, ...rest }) => rest) };
    expect(stockBasisChanges(old, useLibrary.getState().components)).toEqual([]);
  });

  it('records the library as the stock basis of recipes saved before it was kept', () => {
    const id = recipeActions.addRecipe({ name: 'old', grade: 320, lines: [{ componentId: 'demo-bw-280', massFraction: 1 }] });
    expect(get(id).stockBasis).toBeNull();
    expect(useRecipes.getState().recordMissingStockBasis(useLibrary.getState().components)).toBe(1);
    expect(get(id).stockBasis!.stocks.map((s) => s.code)).toEqual(['BW-280']);
  });
});
