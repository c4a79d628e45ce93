/** Defaults for a new stock and free stock codes (plain functions, no store: used by imports and workers). */
import type { Component, EntryField } from '../core/formulation/model';
import { notEnteredFields, remainingNotEntered } from '../core/formulation/entered-values';
import { newId, today } from './ids';

/** The placeholders of a stock just added (never used: listed as not entered). */
const PLACEHOLDER = { kv40: 40, kv100: 6.3, density15: 0.86 } as const;

/**
 * A blank component. Its ν40, ν100 and density hold placeholders (a Group II medium neutral-like
 * stock, so the model stays numeric and the checks pass) and are listed as not yet entered: the
 * stock is left out of solving and release until the blender enters each (`core/formulation/entered-values.ts`).
 * `init` may give real values and its own `notEntered` (undefined there → complete).
 */
export function blankComponent(init: Partial<Omit<Component, 'id'>> = {}): Component {
  return {
    id: newId('c'),
    code: '',
    name: '',
    category: 'group-ii',
    viscosityPoints: [
      { tempC: 40, kv: PLACEHOLDER.kv40 },
      { tempC: 100, kv: PLACEHOLDER.kv100 },
    ],
    density15: PLACEHOLDER.density15,
    anilinePoint: null,
    pourPoint: null,
    flashPoint: null,
    sulfurPct: null,
    saturatesPct: null,
    price: { amount: 0, basis: 'per-kg', currency: 'EUR' },
    availability: 'available',
    oxidationRating: null,
    shearLossPct: null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: '',
    sourceDate: today(),
    notes: '',
    notEntered: ['kv40', 'kv100', 'density15'],
    ...init,
  };
}

/**
 * A patch as the blender entered it: when the stock lists values not yet entered, `entered` are struck
 * from the list (`notEntered` undefined once none is left). Unchanged for a complete stock.
 */
export function enteredPatch<P extends Partial<Omit<Component, 'id'>>>(c: Component, entered: readonly EntryField[], patch: P): P {
  return c.notEntered?.length ? { ...patch, notEntered: remainingNotEntered(c, entered) } : patch;
}

function setKv(points: Component['viscosityPoints'], tempC: number, kv: number): Component['viscosityPoints'] {
  const has = points.some((p) => p.tempC === tempC);
  const pts = has ? points.map((p) => (p.tempC === tempC ? { ...p, kv } : p)) : [...points, { tempC, kv }];
  return [...pts].sort((a, b) => a.tempC - b.tempC);
}

/**
 * The patch that stores a ν40 or ν100 the blender entered (replacing the point at 40 or 100 °C, or
 * adding one) and strikes it from the values to enter. While the other of the two is still a
 * placeholder, that placeholder is moved when needed so the pair stays ordered (ν100 below ν40, at the
 * blank stock's ratio): it stays listed as not entered, so it is still never used.
 *
 * @example enteredKvPatch(blank, 'kv40', 4.6) // → { viscosityPoints: [{40, 4.6}, {100, 0.724}], notEntered: ['kv100', 'density15'] }
 */
export function enteredKvPatch(c: Component, which: 'kv40' | 'kv100', kv: number): Partial<Omit<Component, 'id'>> {
  let points = setKv(c.viscosityPoints, which === 'kv40' ? 40 : 100, kv);
  const other = which === 'kv40' ? 'kv100' : 'kv40';
  if (notEnteredFields(c).includes(other)) {
    const at = other === 'kv40' ? 40 : 100;
    const held = points.find((p) => p.tempC === at);
    const ratio = PLACEHOLDER.kv40 / PLACEHOLDER.kv100;
    if (held && (other === 'kv100' ? held.kv >= kv : held.kv <= kv)) {
      points = setKv(points, at, Number((other === 'kv100' ? kv / ratio : kv * ratio).toPrecision(3)));
    }
  }
  return enteredPatch(c, [which], { viscosityPoints: points });
}

/**
 * The fields a stock saved or exported by an older schema may lack, with the value each takes: the
 * optional scoring fields and texts (schema 1) and the lot spread of ν40 (before schema 4; null = the
 * category's default). The library's migrations and the JSON import both fill them in.
 */
export const OLDER_SCHEMA_STOCK_DEFAULTS = {
  sulfurPct: null,
  saturatesPct: null,
  oxidationRating: null,
  shearLossPct: null,
  calibration: null,
  source: '',
  sourceDate: '',
  notes: '',
  kv40LotSpreadPct: null,
} as const satisfies Partial<Component>;

/** The first code of the form `<base>`, `<base>-2`, `<base>-3` … not used in `components`. */
export function freeCode(components: readonly Component[], base: string): string {
  const used = new Set(components.map((c) => c.code.trim().toLowerCase()));
  if (base && !used.has(base.toLowerCase())) return base;
  for (let i = 2; ; i++) {
    const code = `${base || 'NEW'}-${i}`;
    if (!used.has(code.toLowerCase())) return code;
  }
}
