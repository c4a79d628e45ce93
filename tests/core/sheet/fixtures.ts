// Invented components and recipes for the blend-sheet tests (core and properties): only the fields the
// sheet reads matter; no value here is a check value.
import { newRecipeLifecycle } from '../../../src/core/formulation/model';
import type { Component, ComponentCategory, Recipe } from '../../../src/core/formulation/model';

/** An invented component: ν40 as given, ν100 = ν40 / 12, price 1 EUR/kg unless overridden. */
export function sheetComponent(id: string, category: ComponentCategory, kv40: number, density15: number, over: Partial<Component> = {}): Component {
  return {
    id,
    code: id.toUpperCase(),
    name: `Invented ${id}`,
    category,
    viscosityPoints: [
      { tempC: 40, kv: kv40 },
      { tempC: 100, kv: kv40 / 12 },
    ],
    density15,
    anilinePoint: null,
    pourPoint: null,
    flashPoint: null,
    sulfurPct: null,
    saturatesPct: null,
    price: { amount: 1, basis: 'per-kg', currency: 'EUR' },
    availability: 'available',
    oxidationRating: null,
    shearLossPct: null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: 'invented test data',
    sourceDate: '2025-01-01',
    notes: '',
    ...over,
  };
}

/** An invented VG 320 recipe of the given (component id, mass fraction) lines. */
export function sheetRecipe(lines: readonly (readonly [string, number])[], over: Partial<Recipe> = {}): Recipe {
  return {
    id: 'r1',
    name: 'Invented test recipe',
    grade: 320,
    lines: lines.map(([componentId, massFraction]) => ({ componentId, massFraction })),
    revision: 3,
    isReference: false,
    notes: '',
    updatedAt: '2025-01-01T00:00:00Z',
    ...newRecipeLifecycle(),
    ...over,
  };
}
