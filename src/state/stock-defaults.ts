/** Defaults for a new stock and free stock codes (plain functions, no store: used by imports and workers). */
import type { Component } from '../core/formulation/model';
import { newId, today } from './ids';

/** A blank component with safe placeholder values (a Group II medium neutral-like stock). */
export function blankComponent(init: Partial<Omit<Component, 'id'>> = {}): Component {
  return {
    id: newId('c'),
    code: '',
    name: '',
    category: 'group-ii',
    viscosityPoints: [
      { tempC: 40, kv: 40 },
      { tempC: 100, kv: 6.3 },
    ],
    density15: 0.86,
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
    ...init,
  };
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
