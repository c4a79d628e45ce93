import { readFileSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { RECIPES_SPEC, demoRecipesData } from '../../src/state/recipes';
import { DEFAULT_QC_INPUTS, persistedData, recipeActions, resetDemo, useRecipes } from '../../src/state';
import { makeBackupText, parseBackupText } from '../../src/state/backup';

beforeAll(async () => {
  await loadSchemas(); // zod's schemas load on demand
});
beforeEach(() => {
  resetDemo();
  useRecipes.temporal.getState().clear();
});

describe('QC-loop entries in the recipes store (schema 8)', () => {
  it('upgrades a schema-7 record with no entries, and refuses stored entries the field rules refuse', () => {
    const { qc: _q, ...v7 } = demoRecipesData();
    const up = interpretStored(RECIPES_SPEC, { state: v7, version: 7 });
    expect(up.kind === 'ok' && up.data.qc).toEqual({});
    const bad = interpretStored(RECIPES_SPEC, {
      state: { ...v7, qc: { 'demo-vg320': { ...DEFAULT_QC_INPUTS, correction: { ...DEFAULT_QC_INPUTS.correction, kv40: -5 } } } },
      version: 8,
    });
    expect(bad.kind).toBe('problem');
    if (bad.kind === 'problem') expect(bad.problem.message).toMatch(/QC entries of recipe/);
  });

  it('saves entries per recipe (not an undo step), refuses impossible ones naming the field, and backs them up', () => {
    expect(recipeActions.setQcInputs('demo-vg320', { aimKv40: 318, lots: { 'demo-bw-190': { kv40: 470, kv100: null, density15: null } } })).toBeNull();
    const refused = recipeActions.setQcInputs('demo-vg320', { heel: { ...DEFAULT_QC_INPUTS.heel, density15: 9 } });
    expect(refused).toMatch(/density at 15 °C/); // the field rule's range 0.6–1.3 kg/L (field-rules.ts)
    expect(useRecipes.getState().qc['demo-vg320']!.heel.density15).toBeNull();
    expect(useRecipes.getState().qc['demo-vg320']!.aimKv40).toBe(318);
    expect(useRecipes.temporal.getState().pastStates.length).toBe(0);
    expect((persistedData('recipes') as { qc: unknown }).qc).toEqual(useRecipes.getState().qc);
    const parsed = parseBackupText(makeBackupText());
    expect(parsed.ok && parsed.backup.recipes.qc['demo-vg320']!.lots['demo-bw-190']!.kv40).toBe(470);
  });

  it('declares the shape of the QC entries once (field-rules.ts), for the store, its rules and its schema alike', () => {
    // The store (recipes.ts), the field rules and the zod schema all import QcInputs from field-rules.ts;
    // schemas.ts checks at compile time that the schema and the type agree both ways.
    const dir = resolve(__dirname, '..', '..', 'src', 'state');
    const declared = readdirSync(dir)
      .filter((f) => f.endsWith('.ts'))
      .flatMap((f) => [...readFileSync(join(dir, f), 'utf8').matchAll(/^export (?:interface|type) (Qc\w*(?:Inputs|Fields))\b/gm)].map((m) => `${f}:${m[1]}`));
    expect(declared).toEqual(['field-rules.ts:QcInputs']);
  });
});
