/**
 * INVENTED DEMO DATA — the demo scenario loaded on first start and restored by "Reset demo".
 *
 * An invented blending plant ("Brackwater Blending Works") whose heavy Group I stocks are about to be
 * withdrawn. Every stock code, name, price and date here is invented. Property values are generic
 * mid-range typicals (from memory, see the project's base-stock typicals table) with small invented
 * variations; they describe no real product and are no specification. Every component's `source`
 * says "invented demo data", and the app labels the demo as invented wherever it shows.
 *
 * Reference recipes VG 220, 320, 460 and 680 are the plant's current (invented) recipes, built on the
 * Group I heavy stocks with the gear additive package at 2 % by mass. Their heavy-stock fractions
 * were solved with the Refutas rule (mass fractions; ν40 target = grade mid-point, additive fixed at
 * 2 %) and rounded to 0.5 %; tests/state/demo.test.ts checks with the core's Refutas blend that each
 * is inside its ISO 3448 band.
 */
import type { BlendTargets, Component, ComponentCategory, PriceBasis, Availability, Recipe, ReleaseSpecification } from '../core/formulation/model';
import { DEFAULT_MAX_POLYMER_FRACTION } from '../core/formulation/model';
import { recordStockBasis } from '../core/recipes/stock-basis';

export const DEMO_LABEL = 'invented demo data';
export const DEMO_PLANT = 'Brackwater Blending Works';
const DEMO_DATE = '2025-03-01';
const DEMO_SOURCE = `${DEMO_LABEL} (${DEMO_PLANT}, an invented plant)`;

interface Row {
  code: string;
  name: string;
  category: ComponentCategory;
  kv40: number;
  kv100: number;
  /** kg/L at 15 °C */
  rho: number;
  pour: number | null;
  flash: number | null;
  aniline: number | null;
  sulfur: number | null;
  saturates: number | null;
  price: number;
  basis: PriceBasis;
  availability?: Availability;
  shear?: number;
  notes?: string;
}

const WITHDRAWAL_NOTE = 'Supplier has announced the withdrawal of this stock at the end of the quarter (invented scenario).';

// prettier-ignore
const ROWS: Row[] = [
  // Group I — the heavy ones are on their way out.
  { code: 'BW-110', name: 'Group I light solvent neutral (150)', category: 'group-i', kv40: 30.5, kv100: 5.15, rho: 0.868, pour: -12, flash: 215, aniline: 98, sulfur: 0.45, saturates: 78, price: 980, basis: 'per-tonne' },
  { code: 'BW-111', name: 'Group I light solvent neutral (150), second refinery', category: 'group-i', kv40: 29.4, kv100: 5.05, rho: 0.867, pour: -12, flash: 212, aniline: 97, sulfur: 0.5, saturates: 77, price: 965, basis: 'per-tonne' },
  { code: 'BW-160', name: 'Group I heavy solvent neutral (600)', category: 'group-i', kv40: 98, kv100: 10.9, rho: 0.885, pour: -9, flash: 255, aniline: 112, sulfur: 0.7, saturates: 74, price: 1040, basis: 'per-tonne', availability: 'limited', notes: WITHDRAWAL_NOTE },
  { code: 'BW-161', name: 'Group I heavy solvent neutral (600), second refinery', category: 'group-i', kv40: 103, kv100: 11.2, rho: 0.886, pour: -9, flash: 258, aniline: 113, sulfur: 0.75, saturates: 73, price: 1025, basis: 'per-tonne', availability: 'limited', notes: WITHDRAWAL_NOTE },
  { code: 'BW-190', name: 'Group I bright stock', category: 'group-i', kv40: 485, kv100: 31.8, rho: 0.9, pour: -6, flash: 295, aniline: 122, sulfur: 0.9, saturates: 70, price: 1250, basis: 'per-tonne', availability: 'limited', notes: WITHDRAWAL_NOTE },
  { code: 'BW-191', name: 'Group I bright stock, second refinery', category: 'group-i', kv40: 470, kv100: 31.0, rho: 0.899, pour: -6, flash: 292, aniline: 121, sulfur: 0.95, saturates: 69, price: 1230, basis: 'per-tonne', availability: 'withdrawn', notes: 'No longer offered (invented scenario).' },
  // Group II neutrals and a high-viscosity Group II heavy stock.
  { code: 'BW-210', name: 'Group II light neutral', category: 'group-ii', kv40: 20.3, kv100: 4.12, rho: 0.858, pour: -18, flash: 205, aniline: 106, sulfur: 0.01, saturates: 98.5, price: 1050, basis: 'per-tonne' },
  { code: 'BW-211', name: 'Group II light neutral, second source', category: 'group-ii', kv40: 19.6, kv100: 4.05, rho: 0.857, pour: -18, flash: 202, aniline: 105, sulfur: 0.01, saturates: 98.2, price: 1035, basis: 'per-tonne' },
  { code: 'BW-220', name: 'Group II medium neutral', category: 'group-ii', kv40: 42, kv100: 6.4, rho: 0.862, pour: -15, flash: 230, aniline: 113, sulfur: 0.01, saturates: 98.6, price: 1080, basis: 'per-tonne' },
  { code: 'BW-221', name: 'Group II medium neutral, second source', category: 'group-ii', kv40: 44.5, kv100: 6.6, rho: 0.863, pour: -15, flash: 232, aniline: 114, sulfur: 0.01, saturates: 98.3, price: 1070, basis: 'per-tonne' },
  { code: 'BW-240', name: 'Group II heavy neutral', category: 'group-ii', kv40: 110, kv100: 12.0, rho: 0.872, pour: -12, flash: 265, aniline: 121, sulfur: 0.01, saturates: 98.8, price: 1150, basis: 'per-tonne' },
  { code: 'BW-241', name: 'Group II heavy neutral, second source', category: 'group-ii', kv40: 105, kv100: 11.7, rho: 0.871, pour: -12, flash: 262, aniline: 120, sulfur: 0.01, saturates: 98.4, price: 1140, basis: 'per-tonne' },
  { code: 'BW-280', name: 'Group II high-viscosity heavy stock', category: 'group-ii', kv40: 460, kv100: 31, rho: 0.885, pour: -9, flash: 290, aniline: 127, sulfur: 0.01, saturates: 96, price: 1600, basis: 'per-tonne' },
  { code: 'BW-281', name: 'Group II high-viscosity heavy stock, second source', category: 'group-ii', kv40: 495, kv100: 32.6, rho: 0.887, pour: -9, flash: 293, aniline: 128, sulfur: 0.01, saturates: 95.5, price: 1660, basis: 'per-tonne' },
  // Group III.
  { code: 'BW-304', name: 'Group III 4 mm²/s', category: 'group-iii', kv40: 19.5, kv100: 4.2, rho: 0.835, pour: -18, flash: 220, aniline: 117, sulfur: 0.001, saturates: 99.5, price: 1350, basis: 'per-tonne' },
  { code: 'BW-306', name: 'Group III 6 mm²/s', category: 'group-iii', kv40: 34, kv100: 6.3, rho: 0.84, pour: -15, flash: 235, aniline: 123, sulfur: 0.001, saturates: 99.5, price: 1400, basis: 'per-tonne' },
  { code: 'BW-307', name: 'Group III 6 mm²/s, second source', category: 'group-iii', kv40: 33, kv100: 6.2, rho: 0.839, pour: -15, flash: 233, aniline: 122, sulfur: 0.001, saturates: 99.4, price: 1385, basis: 'per-tonne' },
  // Group IV — PAOs.
  { code: 'BW-406', name: 'PAO 6', category: 'group-iv', kv40: 31, kv100: 5.9, rho: 0.827, pour: -60, flash: 240, aniline: 126, sulfur: 0, saturates: 100, price: 2.9, basis: 'per-kg' },
  { code: 'BW-407', name: 'PAO 6, second source', category: 'group-iv', kv40: 30.2, kv100: 5.8, rho: 0.826, pour: -58, flash: 238, aniline: 125, sulfur: 0, saturates: 100, price: 2.85, basis: 'per-kg' },
  { code: 'BW-440', name: 'PAO 40', category: 'group-iv', kv40: 395, kv100: 39.5, rho: 0.85, pour: -38, flash: 280, aniline: 145, sulfur: 0, saturates: 100, price: 4.6, basis: 'per-kg' },
  { code: 'BW-441', name: 'PAO 40, second source', category: 'group-iv', kv40: 410, kv100: 40.6, rho: 0.851, pour: -38, flash: 282, aniline: 146, sulfur: 0, saturates: 100, price: 4.75, basis: 'per-kg' },
  { code: 'BW-499', name: 'PAO 100', category: 'group-iv', kv40: 1240, kv100: 100, rho: 0.853, pour: -30, flash: 285, aniline: 160, sulfur: 0, saturates: 100, price: 5.2, basis: 'per-kg' },
  // Polymer thickener.
  { code: 'BW-510', name: 'Polyisobutylene thickener, mid molecular weight', category: 'polymer', kv40: 6500, kv100: 210, rho: 0.89, pour: 3, flash: 220, aniline: 120, sulfur: 0, saturates: 100, price: 2.4, basis: 'per-kg', shear: 1.5, notes: 'Near-Newtonian at this molecular weight; confirm the blend viscosity with a trial blend (polymers blend non-ideally).' },
  // Group V solvency boosters.
  { code: 'BW-605', name: 'Alkylated naphthalene 5 mm²/s', category: 'group-v', kv40: 29, kv100: 4.7, rho: 0.908, pour: -36, flash: 222, aniline: 35, sulfur: 0, saturates: null, price: 4.1, basis: 'per-kg' },
  { code: 'BW-606', name: 'Alkylated naphthalene 5 mm²/s, second source', category: 'group-v', kv40: 28, kv100: 4.6, rho: 0.906, pour: -36, flash: 220, aniline: 37, sulfur: 0, saturates: null, price: 4.0, basis: 'per-kg' },
  { code: 'BW-612', name: 'Alkylated naphthalene 12 mm²/s', category: 'group-v', kv40: 109, kv100: 12.4, rho: 0.89, pour: -33, flash: 260, aniline: 90, sulfur: 0, saturates: null, price: 4.4, basis: 'per-kg' },
  { code: 'BW-620', name: 'Trimethylolpropane ester, saturated', category: 'group-v', kv40: 20, kv100: 4.4, rho: 0.94, pour: -50, flash: 250, aniline: 8, sulfur: 0, saturates: null, price: 4.5, basis: 'per-litre' },
  { code: 'BW-621', name: 'Trimethylolpropane ester, saturated, second source', category: 'group-v', kv40: 21, kv100: 4.5, rho: 0.942, pour: -50, flash: 252, aniline: 9, sulfur: 0, saturates: null, price: 4.6, basis: 'per-litre' },
  // Additive package.
  { code: 'BW-901', name: 'Industrial gear EP additive package (sulfur–phosphorus)', category: 'additive-package', kv40: 250, kv100: 15, rho: 1.05, pour: -24, flash: 130, aniline: null, sulfur: null, saturates: null, price: 5.5, basis: 'per-kg', notes: 'Treat at 2 % by mass. Can release hydrogen sulfide when overheated: follow the safety data sheet.' },
];

/** Stable id of a demo component, from its stock code (e.g. `demo-bw-190`). */
export const demoComponentId = (code: string): string => `demo-${code.toLowerCase()}`;

/** The invented demo library (a fresh copy on every call). */
export function demoComponents(): Component[] {
  return ROWS.map((r) => ({
    id: demoComponentId(r.code),
    code: r.code,
    name: r.name,
    category: r.category,
    viscosityPoints: [
      { tempC: 40, kv: r.kv40 },
      { tempC: 100, kv: r.kv100 },
    ],
    density15: r.rho,
    anilinePoint: r.aniline,
    pourPoint: r.pour,
    flashPoint: r.flash,
    sulfurPct: r.sulfur,
    saturatesPct: r.saturates,
    price: { amount: r.price, basis: r.basis, currency: 'EUR' },
    availability: r.availability ?? 'available',
    oxidationRating: null,
    shearLossPct: r.shear ?? null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: DEMO_SOURCE,
    sourceDate: DEMO_DATE,
    notes: r.notes ?? '',
  }));
}

const BS = demoComponentId('BW-190');
const HSN = demoComponentId('BW-160');
const PIB = demoComponentId('BW-510');
export const DEMO_ADDITIVE_ID = demoComponentId('BW-901');
const EP_TREAT = 0.02;

/** Mass fractions of the reference recipes (Refutas-solved, rounded to 0.5 %; see the header). */
export const DEMO_REFERENCE_LINES: Record<220 | 320 | 460 | 680, Array<[string, number]>> = {
  220: [[BS, 0.53], [HSN, 0.45], [DEMO_ADDITIVE_ID, EP_TREAT]],
  320: [[BS, 0.755], [HSN, 0.225], [DEMO_ADDITIVE_ID, EP_TREAT]],
  460: [[BS, 0.96], [HSN, 0.02], [DEMO_ADDITIVE_ID, EP_TREAT]],
  680: [[BS, 0.82], [PIB, 0.16], [DEMO_ADDITIVE_ID, EP_TREAT]],
};

export const demoRecipeId = (grade: number): string => `demo-vg${grade}`;

/**
 * The invented plant's release specification for each demo grade (invented demo limits, not any
 * published or customer specification): set with a margin around the demo recipes' predictions.
 */
function demoSpecification(grade: 220 | 320 | 460 | 680): ReleaseSpecification {
  return {
    grade,
    reference: `BBW-SPEC-VG${grade} (invented demo specification)`,
    kv100Min: null,
    kv100Max: null,
    viMin: 90,
    density15Min: 0.88,
    density15Max: 0.915,
    flashMin: 220,
    pourMax: grade >= 460 ? -3 : -6,
    copper: '1b max',
    foam: 'Sequence I: 50/0 mL max',
  };
}

/** The invented plant's current reference recipes (fresh copies): approved, with their stock data recorded. */
export function demoRecipes(): Recipe[] {
  const lib = demoComponents();
  return ([220, 320, 460, 680] as const).map((grade) => {
    const lines = DEMO_REFERENCE_LINES[grade].map(([componentId, massFraction]) => ({ componentId, massFraction }));
    return {
      id: demoRecipeId(grade),
      name: `Gear oil VG ${grade} — current recipe (invented demo)`,
      grade,
      lines,
      revision: 1,
      isReference: true,
      notes:
        grade === 680
          ? 'Invented demo recipe: bright stock thickened with polyisobutylene, EP package at 2 % by mass.'
          : 'Invented demo recipe built on the Group I heavy stocks being withdrawn; EP package at 2 % by mass.',
      updatedAt: `${DEMO_DATE}T08:00:00.000Z`,
      status: 'approved',
      approvedAt: `${DEMO_DATE}T08:00:00.000Z`,
      archived: false,
      supersedes: null,
      reasonForChange: '',
      specification: demoSpecification(grade),
      stockBasis: recordStockBasis(lib, lines, `${DEMO_DATE}T08:00:00.000Z`),
    };
  });
}

/** Default solve targets for a grade (all limits off except the additive treat and the default polymer cap). */
export function defaultTargets(grade: number, additiveId: string | null, referenceRecipeId: string | null): BlendTargets {
  return {
    grade,
    targetKv40: null,
    tolerancePct: 5,
    minVi: null,
    maxAnilinePoint: null,
    maxPolymerFraction: DEFAULT_MAX_POLYMER_FRACTION,
    maxPourPoint: null,
    minFlashPoint: null,
    additive: additiveId ? { componentId: additiveId, massFraction: EP_TREAT } : null,
    bounds: {},
    objective: 'cost',
    referenceRecipeId,
    minInBandProbability: null,
  };
}

/** Targets for each demo recipe, keyed by recipe id. */
export function demoTargets(): Record<string, BlendTargets> {
  const out: Record<string, BlendTargets> = {};
  for (const grade of [220, 320, 460, 680]) {
    const id = demoRecipeId(grade);
    out[id] = defaultTargets(grade, DEMO_ADDITIVE_ID, id);
  }
  return out;
}

/**
 * Settings of the demo (company name invented). Typed structurally so that this module does not
 * import the settings store (which imports this one).
 */
export function demoSettingsPatch(): { companyName: string } {
  return { companyName: `${DEMO_PLANT} (invented demo plant)` };
}

/** True when a component carries the demo label (so the app can say so). */
export const isDemoComponent = (c: Pick<Component, 'source'>): boolean => c.source.includes(DEMO_LABEL);
