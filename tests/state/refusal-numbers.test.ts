/**
 * The stores' refusals (the field rules broken by a change, a save, a backup) write their numbers as
 * every other message does: with the user's decimal separator and temperature unit, through the one
 * formatter the app hands over (`setRefusalWords`, issue 10). One rule per store at least.
 */
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { loadUnitConversions, makeFormatter, type Formatter } from '../../src/components/format';
import { loadSchemas } from '../../src/state/persistence';
import { DEFAULT_SETTINGS, useSettingsStore } from '../../src/state/settings';
import { linePlanActions, recipeActions, resetDemo, setRefusalWords, useLibrary, useRecipes } from '../../src/state';
import { makeBackupText, parseBackupText } from '../../src/state/backup';
import { defaultTargets } from '../../src/state/demo';

let commaF: Formatter;
beforeAll(async () => {
  await loadSchemas();
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
  commaF = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',', temperatureUnit: 'F' });
});
beforeEach(() => {
  resetDemo();
  setRefusalWords(commaF);
});
afterEach(() => setRefusalWords(null));

/** A number written with "." (the rules' file format) — never in a refusal shown with comma decimals. */
const POINT_DECIMAL = /\d\.\d/;

describe('store refusals in the user’s numbers (comma decimals, °F)', () => {
  it('library: a stock’s density and pour point', () => {
    const id = useLibrary.getState().components[0]!.id;
    const density = useLibrary.getState().updateComponent(id, { density15: 2.5 });
    // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale)
    expect(density).toMatch(/density at 15 °C 2,5 kg\/L is outside the possible range/);
    expect(density).not.toMatch(POINT_DECIMAL);
    const pour = useLibrary.getState().updateComponent(id, { pourPoint: 150.5 });
    // 150.5 °C = 302.9 °F; the range −100…100 °C = −148…212 °F (definition of the Fahrenheit scale)
    expect(pour).toMatch(/pour point 302,9 °F is outside the possible range \(from −148 °F to 212 °F\)/);
    expect(pour).not.toMatch(/°C/);
  });

  it('recipes: a target temperature, a specification pair, QC heel and sheet entries', () => {
    const recipe = useRecipes.getState().recipes.find((r) => r.status === 'draft') ?? useRecipes.getState().recipes[0]!;
    const draftId = recipeActions.addRecipe({ name: 'Refusal test', grade: 320, lines: recipe.lines });
    const targets = { ...defaultTargets(320, null, null), maxPourPoint: 120.5 };
    // 120.5 °C = 248.9 °F (definition of the Fahrenheit scale)
    expect(useRecipes.getState().setTargets(draftId, targets)).toMatch(/highest pour point 248,9 °F/);
    const spec = { ...useRecipes.getState().recipes.find((r) => r.id === draftId)!.specification, kv100Min: 30.5, kv100Max: 25.5 };
    const pair = useRecipes.getState().updateRecipe(draftId, { specification: spec });
    expect(pair).toMatch(/minimum 30,5 mm²\/s is above its maximum 25,5 mm²\/s/);
    const heel = useRecipes.getState().setQcInputs(draftId, { heel: { massKg: 100, kv40: null, kv100: null, density15: 2.5, additiveFraction: null, source: '' } });
    expect(heel).toMatch(/density at 15 °C 2,5 kg\/L/);
    expect(heel).not.toMatch(POINT_DECIMAL);
    const sheet = useRecipes.getState().setSheetInputs(draftId, { batchSize: '-2,5' }, () => -2.5);
    expect(sheet).toMatch(/batch size −2,5 is outside the possible range/);
  });

  it('line plan: a least use above the supply', () => {
    const id = useLibrary.getState().components[0]!.id;
    expect(linePlanActions.setSupply(id, 1000.5)).toBeNull();
    const keep = linePlanActions.setKeep(id, 1500.5);
    expect(keep).toMatch(/least use \(1500,5 kg\) is above the stock's supply \(1000,5 kg\)/);
  });

  it('settings: an operating temperature', () => {
    const m = useSettingsStore.getState().updateSettings({ operatingTempC: 250.5 });
    // 250.5 °C = 482.9 °F; −60…200 °C = −76…392 °F (definition of the Fahrenheit scale)
    expect(m).toMatch(/operating temperature 482,9 °F is outside the possible range \(from −76 °F to 392 °F\)/);
  });

  it('backup: a refused stored value', () => {
    const text = makeBackupText();
    const broken = text.replace(/"density15":\s*([0-9.]+)/, '"density15": 2.5');
    expect(broken).not.toBe(text);
    const r = parseBackupText(broken);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const line = r.errors.find((e) => /density/.test(e));
    expect(line).toMatch(/2,5 kg\/L/);
    expect(line).not.toMatch(POINT_DECIMAL);
  });

  it('what the user named stays as typed: a stock code, a recipe name, a typed value', () => {
    const id = useLibrary.getState().components[0]!.id;
    expect(useLibrary.getState().updateComponent(id, { code: 'SN 1.5' })).toBeNull();
    expect(useLibrary.getState().updateComponent(id, { density15: 2.5 })).toMatch(/^Stock SN 1\.5: the density at 15 °C 2,5 kg\/L/);
    const lines = useRecipes.getState().recipes[0]!.lines;
    const rid = recipeActions.addRecipe({ name: 'Plant 2.5', grade: 320, lines });
    expect(useRecipes.getState().setTargets(rid, { ...defaultTargets(320, null, null), tolerancePct: 150.5 })).toMatch(
      /^Recipe “Plant 2\.5”: the tolerance 150,5 % is outside/,
    );
    const sheet = useRecipes.getState().setSheetInputs(rid, { batchSize: '1.2.3' }, () => null);
    expect(sheet).toMatch(/“1\.2\.3” is not a number/);
  });

  it('without the app’s formatter the rules keep "." and °C (text meant for files)', () => {
    setRefusalWords(null);
    const id = useLibrary.getState().components[0]!.id;
    expect(useLibrary.getState().updateComponent(id, { pourPoint: 150.5 })).toMatch(/pour point 150\.5 °C/);
  });
});
