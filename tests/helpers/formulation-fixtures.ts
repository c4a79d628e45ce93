/**
 * Invented test components for the formulation tests (scoring, calibration, shear, substitutes).
 * Properties are the generic mid-range typicals of tests/reference/base-stock-typicals.md (all from
 * memory, demo data only); codes and prices are invented. Not check values: tests that use them
 * check identities, orderings and agreement between independent computations.
 */
import type { Component, ComponentCategory } from '../../src/core/formulation/model';

export interface StockSpec {
  id: string;
  category: ComponentCategory;
  kv40: number;
  kv100: number;
  density15: number;
  anilinePoint: number | null;
  pricePerKg: number;
  shearLossPct?: number | null;
  oxidationRating?: number | null;
}

export function makeComponent(s: StockSpec): Component {
  return {
    id: s.id,
    code: s.id.toUpperCase(),
    name: `Invented ${s.id}`,
    category: s.category,
    viscosityPoints: [
      { tempC: 40, kv: s.kv40 },
      { tempC: 100, kv: s.kv100 },
    ],
    density15: s.density15,
    anilinePoint: s.anilinePoint,
    pourPoint: null,
    flashPoint: null,
    sulfurPct: null,
    saturatesPct: null,
    price: { amount: s.pricePerKg, basis: 'per-kg', currency: 'EUR' },
    availability: 'available',
    oxidationRating: s.oxidationRating ?? null,
    shearLossPct: s.shearLossPct ?? null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: 'invented test data',
    sourceDate: '2024-01-01',
    notes: '',
  };
}

/** Generic typicals (base-stock-typicals.md, from memory) with invented ids and prices. */
export const STOCKS: Record<string, StockSpec> = {
  g1sn150: { id: 'g1sn150', category: 'group-i', kv40: 30, kv100: 5.1, density15: 0.868, anilinePoint: 98, pricePerKg: 1.1 },
  g1sn600: { id: 'g1sn600', category: 'group-i', kv40: 100, kv100: 11.0, density15: 0.885, anilinePoint: 112, pricePerKg: 1.2 },
  g1bs: { id: 'g1bs', category: 'group-i', kv40: 480, kv100: 31.5, density15: 0.9, anilinePoint: 122, pricePerKg: 1.5 },
  g2light: { id: 'g2light', category: 'group-ii', kv40: 20, kv100: 4.1, density15: 0.858, anilinePoint: 106, pricePerKg: 1.15 },
  g2med: { id: 'g2med', category: 'group-ii', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.2 },
  g2heavy: { id: 'g2heavy', category: 'group-ii', kv40: 110, kv100: 12.0, density15: 0.872, anilinePoint: 121, pricePerKg: 1.3 },
  g2hv: { id: 'g2hv', category: 'group-ii', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.9 },
  g3six: { id: 'g3six', category: 'group-iii', kv40: 34, kv100: 6.3, density15: 0.84, anilinePoint: 123, pricePerKg: 1.6 },
  pao6: { id: 'pao6', category: 'group-iv', kv40: 31, kv100: 5.9, density15: 0.827, anilinePoint: 126, pricePerKg: 3.2 },
  pao40: { id: 'pao40', category: 'group-iv', kv40: 395, kv100: 39.5, density15: 0.85, anilinePoint: 145, pricePerKg: 5.5 },
  pao100: { id: 'pao100', category: 'group-iv', kv40: 1240, kv100: 100, density15: 0.853, anilinePoint: 160, pricePerKg: 6.5 },
  pib: {
    id: 'pib',
    category: 'polymer',
    kv40: 6500,
    kv100: 210,
    density15: 0.89,
    anilinePoint: 120,
    pricePerKg: 2.8,
    shearLossPct: 2,
  },
  an5: { id: 'an5', category: 'group-v', kv40: 29, kv100: 4.7, density15: 0.908, anilinePoint: 35, pricePerKg: 4.0, oxidationRating: 3 },
  an12: { id: 'an12', category: 'group-v', kv40: 109, kv100: 12.4, density15: 0.89, anilinePoint: 90, pricePerKg: 4.5, oxidationRating: 3 },
  tmp: { id: 'tmp', category: 'group-v', kv40: 20, kv100: 4.4, density15: 0.94, anilinePoint: 8, pricePerKg: 4.2, oxidationRating: 2 },
  add: { id: 'add', category: 'additive-package', kv40: 250, kv100: 15, density15: 1.05, anilinePoint: null, pricePerKg: 6.0 },
};

export const stock = (id: keyof typeof STOCKS | string): Component => makeComponent(STOCKS[id]!);
