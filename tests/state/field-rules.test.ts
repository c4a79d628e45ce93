// Field rules: one set of limits for entry, storage, import, backup and load (issue 10, items 1, 2, 6).
import { describe, expect, it } from 'vitest';
import {
  COLLECTION_LIMITS,
  NUMBER_RULES,
  TEXT_RULES,
  checkBoundPair,
  checkCount,
  checkDate,
  checkFractions,
  checkNumber,
  checkText,
  recipeProblems,
  sheetProblems,
  stockProblems,
  stockWho,
  recipeWho,
} from '../../src/state/field-rules';
import { componentSchema, recipeSchema, recipesDataSchema, libraryDataSchema, describeStoredIssues } from '../../src/state/schemas';
import { demoComponents, demoRecipes } from '../../src/state/demo';
import { DENSITY15_MAX, DENSITY15_MIN } from '../../src/core/errors';

describe('text rules', () => {
  it('refuses over-long text with the field and the record named (issue 10 item 1: a 5,000-character recipe name)', () => {
    const m = checkText('recipeName', 'x'.repeat(5000), recipeWho('VG 320 plant'));
    expect(m).toBe('Recipe “VG 320 plant”: the recipe name is 5000 characters long; at most 200 can be saved');
    expect(checkText('recipeName', 'x'.repeat(TEXT_RULES.recipeName.max), 'recipe')).toBeNull();
    expect(checkText('lot', 'L'.repeat(500))).toMatch(/^The lot number is 500 characters long; at most 120/);
    expect(checkText('vessel', 'V'.repeat(500))).toMatch(/vessel is 500 characters/);
    expect(checkText('instructions', 'i'.repeat(25_000))).toMatch(/text of the blending instructions is 25000 characters long; at most 20000/);
  });

  it('requires a stock code and refuses control characters in one-line fields, but not line breaks in notes', () => {
    expect(checkText('stockCode', '   ', stockWho('BW-1'))).toBe('Stock BW-1: the stock code is required');
    expect(checkText('stockName', 'A\tB')).toMatch(/contains a tab/);
    expect(checkText('stockName', 'A\u0007B')).toMatch(/control character/);
    expect(checkText('stockNotes', 'line 1\nline 2\tindented')).toBeNull();
    expect(checkText('stockNotes', 'bell \u0007')).toMatch(/control character/);
  });
});

describe('number rules', () => {
  it('refuses absurd numbers, naming the field, the value and the range (issue 10 item 6)', () => {
    // 0.6–1.3 kg/L: the core's density range for an oil at 15 °C (src/core/errors.ts)
    expect(NUMBER_RULES.density15.min).toBe(DENSITY15_MIN);
    expect(NUMBER_RULES.density15.max).toBe(DENSITY15_MAX);
    expect(checkNumber('density15', 1e-300, stockWho('BW-190'))).toBe(
      'Stock BW-190: the density at 15 °C 1e−300 kg/L is outside the possible range (from 0.6 kg/L to 1.3 kg/L)',
    );
    expect(checkNumber('price', 1e300)).toMatch(/^The price 1e\+300 is outside the possible range/);
    expect(checkNumber('density15', 0.86)).toBeNull();
    expect(checkNumber('density15', Number.NaN)).toMatch(/finite number/);
    expect(checkNumber('density15', null)).toMatch(/is required/);
    expect(checkNumber('anilinePoint', null)).toBeNull();
  });

  it('holds ν100 to 2.0 mm²/s and up (ASTM D2270 scope) and a viscosity above zero', () => {
    // ASTM D2270 covers ν100 ≥ 2.0 mm²/s (scope)
    expect(checkNumber('kv100', 0.001)).toMatch(/ν100 0\.001 mm²\/s is outside the possible range \(from 2 mm²\/s/);
    expect(checkNumber('kv100', 2)).toBeNull();
    expect(checkNumber('kv', 0)).toMatch(/above 0 mm²\/s/);
  });

  it('prints fractions in %, and checks whole numbers', () => {
    expect(checkNumber('massFraction', 3)).toBe('The share 300 % is outside the possible range (from 0 % to 100 %)');
    expect(checkNumber('revision', 1.5)).toMatch(/whole number/);
    expect(checkNumber('batchSize', 1e40)).toMatch(/batch size 1e\+40 is outside/);
  });
});

describe('collections, dates, fractions, limits', () => {
  it('keeps at least 20,000 stocks (issue 10 item 2)', () => {
    expect(COLLECTION_LIMITS.stocks).toBeGreaterThanOrEqual(20_000);
    expect(COLLECTION_LIMITS.importRows).toBe(COLLECTION_LIMITS.stocks);
    expect(checkCount('stocks', 20_000)).toBeNull();
    expect(checkCount('stocks', COLLECTION_LIMITS.stocks + 1)).toMatch(/more than Blendbench keeps/);
  });

  it('checks real calendar dates', () => {
    expect(checkDate('sourceDate', '')).toBeNull();
    expect(checkDate('sourceDate', '2024-02-29')).toBeNull(); // 2024 is a leap year (Gregorian calendar)
    expect(checkDate('sourceDate', '2023-02-29')).toMatch(/not a date/);
  });

  it('refuses a recipe summing to 300 % and a stock listed twice', () => {
    expect(checkFractions([{ componentId: 'a', massFraction: 1 }, { componentId: 'b', massFraction: 1 }, { componentId: 'c', massFraction: 1 }], recipeWho('R'))).toBe(
      'Recipe “R”: the shares add up to 300 %, not 100 %',
    );
    expect(checkFractions([{ componentId: 'a', massFraction: 0.5 }, { componentId: 'a', massFraction: 0.5 }])).toMatch(/twice/);
    expect(checkFractions([])).toBeNull();
    expect(checkFractions([{ componentId: 'a', massFraction: 0.3 }, { componentId: 'b', massFraction: 0.7 }])).toBeNull();
  });

  it('refuses a lower limit above the upper limit', () => {
    expect(checkBoundPair(0.5, 0.2, stockWho('BW-280'))).toBe('Stock BW-280: the lower limit 50 % is above the upper limit 20 %');
    expect(checkBoundPair(1.5, undefined)).toMatch(/lower limit 150 %/);
    expect(checkBoundPair(0.1, 0.2)).toBeNull();
  });

  it('checks blend-sheet inputs, with the entry form’s number reader when given', () => {
    const ok = { lot: 'L-1', batchSize: '1000', vessel: 'T-3', instructions: null };
    expect(sheetProblems(ok)).toEqual([]);
    expect(sheetProblems({ ...ok, batchSize: '1'.repeat(40) }).map((p) => p.path)).toEqual([['batchSize']]);
    expect(sheetProblems({ ...ok, batchSize: '1e9' }, undefined, Number)[0]!.message).toMatch(/batch size 1000000000 is outside/);
    expect(sheetProblems({ ...ok, batchSize: 'ten' })[0]!.message).toMatch(/not a number/);
  });
});

describe('the schemas apply the same rules', () => {
  it('every demo stock and recipe passes the rules (so the demo is storable)', () => {
    for (const c of demoComponents()) expect(stockProblems(c)).toEqual([]);
    for (const r of demoRecipes()) expect(recipeProblems(r)).toEqual([]);
  });

  it('what a rule refuses, the schema refuses with the same message', () => {
    const c = { ...demoComponents()[0]!, density15: 1e-300, name: 'n'.repeat(201) };
    const parsed = componentSchema.safeParse(c);
    expect(parsed.success).toBe(false);
    const msgs = parsed.error!.issues.map((i) => i.message);
    expect(msgs).toContain(checkNumber('density15', 1e-300));
    expect(msgs).toContain(checkText('stockName', 'n'.repeat(201)));
    const r = { ...demoRecipes()[0]!, name: 'x'.repeat(5000) };
    expect(recipeSchema.safeParse(r).error!.issues[0]!.message).toBe(checkText('recipeName', r.name));
  });

  it('names the record and the field of every refused value in stored data', () => {
    const comps = demoComponents();
    const code = comps[2]!.code;
    comps[2] = { ...comps[2]!, density15: 1e-300 };
    comps[4] = { ...comps[4]!, price: { ...comps[4]!.price, amount: 1e300 } };
    const data = { components: comps };
    const parsed = libraryDataSchema.safeParse(data);
    const text = describeStoredIssues(parsed.error!, data);
    expect(text).toContain(`Stock ${code} (entry 3): the density at 15 °C 1e−300 kg/L`);
    expect(text).toContain(`Stock ${comps[4]!.code} (entry 5): the price 1e+300`);
    const recipes = demoRecipes();
    recipes[1] = { ...recipes[1]!, lines: recipes[1]!.lines.slice(0, 3).map((l) => ({ ...l, massFraction: 1 })) };
    const rdata = { recipes, targets: {}, activeRecipeId: null, sheets: { [recipes[0]!.id]: { lot: 'L'.repeat(500), batchSize: '1', batchUnit: 'kg', vessel: '', instructions: null } } };
    const rtext = describeStoredIssues(recipesDataSchema.safeParse(rdata).error!, rdata);
    const clip = (n: string) => (n.length > 40 ? `${n.slice(0, 40)}…` : n);
    expect(rtext).toContain(`Recipe “${clip(recipes[1]!.name)}” (entry 2): the shares add up to 300 %, not 100 %`);
    expect(rtext).toContain(`The blend sheet of recipe “${clip(recipes[0]!.name)}”: the lot number is 500 characters long`);
  });
});
