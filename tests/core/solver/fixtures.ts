/**
 * Invented scenario stocks for the solver tests. Properties are generic typicals
 * (from memory, tests/reference/base-stock-typicals.md); codes, prices and the plant are invented.
 */
import type { BlendTargets, Component, ComponentCategory } from '../../../src/core/formulation/model';

export function stock(
  id: string,
  category: ComponentCategory,
  kv40: number,
  kv100: number,
  density15: number,
  anilinePoint: number | null,
  pricePerKg: number,
  extra: Partial<Component> = {},
): Component {
  return {
    id,
    code: id.toUpperCase(),
    name: `Invented ${id}`,
    category,
    viscosityPoints: [
      { tempC: 40, kv: kv40 },
      { tempC: 100, kv: kv100 },
    ],
    density15,
    anilinePoint,
    pourPoint: -12,
    flashPoint: 230,
    sulfurPct: null,
    saturatesPct: null,
    price: { amount: pricePerKg, basis: 'per-kg', currency: 'EUR' },
    availability: 'available',
    oxidationRating: null,
    shearLossPct: null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: 'invented test data; typicals from memory (tests/reference/base-stock-typicals.md)',
    sourceDate: '2024-01-01',
    notes: '',
    ...extra,
  };
}

// Typicals: from memory, tests/reference/base-stock-typicals.md (ρ15 kg/m³ ÷ 1000; ν40, ν100 mm²/s;
// aniline °C; pour and flash °C). Prices invented.
export const G2_LIGHT = stock('g2l', 'group-ii', 20, 4.1, 0.858, 106, 1.05, { pourPoint: -18, flashPoint: 205 });
export const G2_MEDIUM = stock('g2m', 'group-ii', 42, 6.4, 0.862, 113, 1.1, { pourPoint: -15, flashPoint: 230 });
export const G2_HEAVY = stock('g2h', 'group-ii', 110, 12.0, 0.872, 121, 1.2, { pourPoint: -12, flashPoint: 265 });
export const G2_HVY_STOCK = stock('g2x', 'group-ii', 460, 31, 0.885, 127, 1.6, { pourPoint: -9, flashPoint: 290 });
export const G1_BRIGHT = stock('bs', 'group-i', 480, 31.5, 0.9, 122, 1.3, { pourPoint: -6, flashPoint: 295, availability: 'withdrawn' });
export const G1_HEAVY_NEUTRAL = stock('g1h', 'group-i', 100, 11.0, 0.885, 112, 1.0, { pourPoint: -9, flashPoint: 255 });
export const G3_6 = stock('g3', 'group-iii', 34, 6.3, 0.84, 123, 1.5, { pourPoint: -15, flashPoint: 235 });
export const PAO_6 = stock('pao6', 'group-iv', 31, 5.9, 0.827, 126, 3.0, { pourPoint: -60, flashPoint: 240 });
export const PAO_40 = stock('pao40', 'group-iv', 395, 39.5, 0.85, 145, 4.0, { pourPoint: -38, flashPoint: 280 });
export const PAO_100 = stock('pao100', 'group-iv', 1240, 100, 0.853, 160, 5.0, { pourPoint: -30, flashPoint: 285 });
export const PIB = stock('pib', 'polymer', 6500, 210, 0.89, 120, 2.5, { pourPoint: 3, flashPoint: 220 });
export const AN_5 = stock('an5', 'group-v', 29, 4.7, 0.908, 35, 3.5, { pourPoint: -36, flashPoint: 222 });
export const AN_12 = stock('an12', 'group-v', 109, 12.4, 0.89, 90, 4.2, { pourPoint: -33, flashPoint: 260 });
export const EP_PACKAGE = stock('ep', 'additive-package', 250, 15, 1.05, null, 5.5, { pourPoint: -20, flashPoint: 130 });

export const LIBRARY: Component[] = [
  G2_LIGHT,
  G2_MEDIUM,
  G2_HEAVY,
  G2_HVY_STOCK,
  G1_BRIGHT,
  G1_HEAVY_NEUTRAL,
  G3_6,
  PAO_6,
  PAO_40,
  PAO_100,
  PIB,
  AN_5,
  AN_12,
  EP_PACKAGE,
];

export function targets(over: Partial<BlendTargets> = {}): BlendTargets {
  return {
    grade: 320,
    targetKv40: null,
    tolerancePct: 5,
    minVi: null,
    maxAnilinePoint: null,
    maxPolymerFraction: null,
    maxPourPoint: null,
    minFlashPoint: null,
    additive: { componentId: 'ep', massFraction: 0.02 },
    bounds: {},
    objective: 'cost',
    referenceRecipeId: null,
    minInBandProbability: null,
    ...over,
  };
}
