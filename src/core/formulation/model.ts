/**
 * The Blendbench domain model: components (stocks), recipes, targets.
 *
 * Plain data only (JSON-serialisable), so the same objects are stored in IndexedDB, exported as
 * JSON, sent to a Web Worker and fed to the solver. Units are fixed and stated on every field;
 * conversions to the user's display units happen at the boundary (`units.ts`).
 */

/** API base-stock category (API 1509 Appendix E) or a non-base-stock role. */
export type ComponentCategory =
  | 'group-i'
  | 'group-ii'
  | 'group-iii'
  | 'group-iv' // PAO
  | 'group-v' // esters, alkylated naphthalene, alkylbenzene, naphthenics, PAG …
  | 'polymer' // polyisobutylene, polymethacrylate, olefin copolymer (thickener / VI improver)
  | 'additive-package';

export const COMPONENT_CATEGORIES: readonly ComponentCategory[] = [
  'group-i',
  'group-ii',
  'group-iii',
  'group-iv',
  'group-v',
  'polymer',
  'additive-package',
];

export const CATEGORY_LABEL: Record<ComponentCategory, string> = {
  'group-i': 'Group I',
  'group-ii': 'Group II',
  'group-iii': 'Group III',
  'group-iv': 'Group IV (PAO)',
  'group-v': 'Group V',
  polymer: 'Polymer',
  'additive-package': 'Additive package',
};

/** Whether a stock can still be bought. Withdrawn stocks are excluded from every solve. */
export type Availability = 'available' | 'limited' | 'withdrawn';

/** The basis on which a supplier quotes a price. */
export type PriceBasis = 'per-kg' | 'per-litre' | 'per-tonne';

/** Display label of each price basis. */
export const PRICE_BASIS_LABEL: Record<PriceBasis, string> = {
  'per-kg': 'per kg',
  'per-litre': 'per litre at 15 °C',
  'per-tonne': 'per tonne',
};

export interface Price {
  /** Amount in `currency` per `basis` unit. */
  amount: number;
  basis: PriceBasis;
  /** A currency code or symbol the user names (e.g. "EUR", "USD"); never converted between currencies. */
  currency: string;
}

/** One measured kinematic viscosity (ASTM D445). */
export interface ViscosityPoint {
  /** Temperature [°C]. */
  tempC: number;
  /** Kinematic viscosity [mm²/s]. */
  kv: number;
}

/**
 * An effective blending viscosity for a non-ideal component (typically a polymer), solved from a
 * measured trial blend so that the prediction matches the laboratory result. When present, blends
 * use `effectiveKv40` / `effectiveKv100` in place of the component's own viscosities.
 */
export interface Calibration {
  /** Effective blending viscosity at 40 °C [mm²/s]. */
  effectiveKv40: number;
  /** Effective blending viscosity at 100 °C [mm²/s]. */
  effectiveKv100: number;
  /** The trial blend the values were solved from (provenance). */
  trial: {
    /** Mass fractions of the trial blend, by component id, summing to 1. */
    massFractions: Record<string, number>;
    /** Measured ν40 of the trial blend [mm²/s]. */
    measuredKv40: number;
    /** Measured ν100 of the trial blend [mm²/s]. */
    measuredKv100: number;
    /** Laboratory reference, e.g. sample or report number. */
    labReference: string;
  };
  /** Blending rule the calibration is valid for (the one used to solve it). */
  method: 'refutas' | 'astm-d7152' | 'd7152-wright';
  /** ISO date (YYYY-MM-DD) the calibration was made. */
  calibratedOn: string;
}

/**
 * A measured value a stock needs before it is used: ν40, ν100 (ASTM D445) and density at 15 °C.
 * A stock just added has none of them yet (`Component.notEntered`).
 */
export type EntryField = 'kv40' | 'kv100' | 'density15';

/** A blending component: a base stock, a polymer, or an additive package. */
export interface Component {
  /** Stable internal identifier (never shown; survives renames and code changes). */
  id: string;
  /** The plant's stock code, unique in a library (invented in the demo). */
  code: string;
  name: string;
  category: ComponentCategory;
  /** Measured viscosities: at least two points at different temperatures, usually 40 and 100 °C. */
  viscosityPoints: ViscosityPoint[];
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline point, ASTM D611 [°C]; null where not meaningful (additive package). */
  anilinePoint: number | null;
  /** Pour point, ASTM D97 [°C]; null if unknown. */
  pourPoint: number | null;
  /** Flash point, ASTM D92 open cup [°C]; null if unknown. */
  flashPoint: number | null;
  /** Sulfur [mass %]; optional. */
  sulfurPct: number | null;
  /** Saturates [mass %]; optional. */
  saturatesPct: number | null;
  price: Price;
  availability: Availability;
  /**
   * Oxidation-stability rating override on Blendbench's own ordinal scale (see `oxidation.ts`);
   * null → the default for the category.
   */
  oxidationRating: number | null;
  /** Expected permanent shear loss of ν100, KRL (ISO 26422 / CEC L-45) [%]; polymers; null → 0. */
  shearLossPct: number | null;
  /**
   * Lot-to-lot relative standard deviation of ν40 [%] (`qc/lot-spread.ts`); null → the category's
   * common-practice default.
   */
  kv40LotSpreadPct: number | null;
  /**
   * Measured permanent shear loss of ν40 [%] (ISO 26422 allows measuring the loss at 40 °C as well as
   * at 100 °C); polymers; absent or null → not measured. Used directly at 40 °C when given.
   */
  shearLoss40Pct?: number | null;
  calibration: Calibration | null;
  /**
   * Measured values not yet entered (a stock just added): their fields hold placeholders only, and the
   * stock is left out of solving, searching, the line plan and release until each is entered
   * (`formulation/entered-values.ts`). Absent or empty → every value was entered (older saved data,
   * imports). Cleared field by field as the blender enters each value.
   */
  notEntered?: EntryField[];
  /** Where the data come from (datasheet, lab report, "invented demo data"). */
  source: string;
  /** ISO date (YYYY-MM-DD) of the data. */
  sourceDate: string;
  notes: string;
}

/** One line of a recipe. */
export interface RecipeLine {
  componentId: string;
  /** Mass fraction, 0–1. A recipe's lines sum to 1. */
  massFraction: number;
}

/**
 * Where a recipe stands in its life: a `draft` may be edited and is not for release; an `approved`
 * recipe is never overwritten (a change makes a new draft revision that supersedes it); a
 * `superseded` recipe was replaced by an approved later revision and is kept for the record.
 */
export type RecipeStatus = 'draft' | 'approved' | 'superseded';

export const RECIPE_STATUSES: readonly RecipeStatus[] = ['draft', 'approved', 'superseded'];

export const RECIPE_STATUS_LABEL: Record<RecipeStatus, string> = {
  draft: 'Draft',
  approved: 'Approved',
  superseded: 'Superseded',
};

/**
 * The product specification's release limits for a recipe, as the user enters them. Every limit is
 * optional: a blank one (null, or '' for the text limits) prints as "per specification". The ν40
 * limits are not here: they come from the grade (ISO 3448) and the plant's aim band.
 */
export interface ReleaseSpecification {
  /**
   * The ISO viscosity grade the specification was written for (recipes schema 9). A specification
   * belongs to its grade: one linked to another grade than its recipe's, or with no link (null: saved
   * before the link and not inferable), is flagged and never printed (`core/recipes/specification-grade.ts`).
   */
  grade: number | null;
  /** Name or number of the specification document, printed on the sheet; '' → none given. */
  reference: string;
  /** ν100 limits, ASTM D445 [mm²/s]. */
  kv100Min: number | null;
  kv100Max: number | null;
  /** Minimum viscosity index, ASTM D2270 (reported, whole number). */
  viMin: number | null;
  /** Density at 15 °C limits, ASTM D4052 [kg/L]. */
  density15Min: number | null;
  density15Max: number | null;
  /** Minimum flash point, open cup, ASTM D92 [°C]. */
  flashMin: number | null;
  /** Maximum pour point, ASTM D97 [°C]. */
  pourMax: number | null;
  /** Copper strip corrosion limit, ASTM D130, as the specification words it (e.g. "1b max"). */
  copper: string;
  /** Foaming limit, ASTM D892, as the specification words it. */
  foam: string;
}

/** A specification with every limit blank ("per specification"). */
export const BLANK_SPECIFICATION: Readonly<ReleaseSpecification> = Object.freeze({
  grade: null,
  reference: '',
  kv100Min: null,
  kv100Max: null,
  viMin: null,
  density15Min: null,
  density15Max: null,
  flashMin: null,
  pourMax: null,
  copper: '',
  foam: '',
});

/**
 * The data of one stock as a recipe was saved with it: the inputs its predictions depend on. A later
 * difference from the library (a new measurement, a calibration) means the recipe's predictions have
 * moved since it was saved.
 */
export interface StockSnapshot {
  componentId: string;
  /** Stock code when recorded (for messages if the stock is later deleted). */
  code: string;
  /**
   * Category when recorded: it sets the blend sheet's charging order (base stocks first, the
   * additive package last). Absent in snapshots recorded before it was kept (then not compared).
   */
  category?: ComponentCategory;
  viscosityPoints: ViscosityPoint[];
  /** Effective blending viscosities of a calibration [mm²/s]; null → not calibrated. */
  calibratedKv40: number | null;
  calibratedKv100: number | null;
  /** Density at 15 °C [kg/L]. */
  density15: number;
  /** Aniline, pour and flash points [°C]. */
  anilinePoint: number | null;
  pourPoint: number | null;
  flashPoint: number | null;
  /**
   * The stock's measured values not yet entered when recorded (their numbers are placeholders, compared
   * as "not given"); absent → all entered (also in snapshots recorded before the list existed).
   */
  notEntered?: EntryField[];
}

/** The stock data a recipe was solved or saved with. */
export interface StockBasis {
  /** ISO date-time it was recorded. */
  recordedAt: string;
  /** One snapshot per component the recipe names. */
  stocks: StockSnapshot[];
}

export interface Recipe {
  id: string;
  name: string;
  /** ISO viscosity grade the recipe is made to (e.g. 320). */
  grade: number;
  lines: RecipeLine[];
  /** Revision number, starting at 1; a new revision of an approved recipe is the next number. */
  revision: number;
  /** True for the recipe currently made at the plant (the one a candidate replaces). */
  isReference: boolean;
  notes: string;
  /** ISO date-time of the last change. */
  updatedAt: string;
  status: RecipeStatus;
  /** ISO date-time of approval; null while a draft, or when approved before this was recorded. */
  approvedAt: string | null;
  /** Hidden from the pickers (kept, shown under "archived"). */
  archived: boolean;
  /** Id of the recipe this one replaces (its earlier revision); null → none. */
  supersedes: string | null;
  /** Why this revision was made (printed on the blend sheet with the change from the recipe it supersedes). */
  reasonForChange: string;
  /** Release limits of the product specification. */
  specification: ReleaseSpecification;
  /** The stock data the recipe was saved with; null → not recorded. */
  stockBasis: StockBasis | null;
}

/** The lifecycle fields of a recipe as first created: a draft, current, with a blank specification and no stock data recorded. */
export function newRecipeLifecycle(): Pick<
  Recipe,
  'status' | 'approvedAt' | 'archived' | 'supersedes' | 'reasonForChange' | 'specification' | 'stockBasis'
> {
  return {
    status: 'draft',
    approvedAt: null,
    archived: false,
    supersedes: null,
    reasonForChange: '',
    specification: { ...BLANK_SPECIFICATION },
    stockBasis: null,
  };
}

/**
 * What the solver optimises: least cost per litre (at 15 °C), least cost per kg, best solvency,
 * highest oxidation class, or closest to a reference recipe.
 */
export type Objective = 'cost' | 'cost-kg' | 'solvency' | 'oxidation' | 'closest';

/** Per-component mass-fraction bounds (0–1). */
export interface FractionBounds {
  min?: number;
  max?: number;
}

/** Targets and constraints for solving a recipe. */
export interface BlendTargets {
  /** ISO viscosity grade (ISO 3448 / ASTM D2422). The blend's ν40 always stays inside its band. */
  grade: number;
  /** Target ν40 [mm²/s]; null → the grade mid-point. */
  targetKv40: number | null;
  /** Half-width of the band around the target [% of target]; clipped to the ISO band. */
  tolerancePct: number;
  /** Minimum viscosity index (unrounded, ASTM D2270); null → none. */
  minVi: number | null;
  /** Maximum blend aniline point [°C] (solvency floor); null → none. */
  maxAnilinePoint: number | null;
  /** Maximum total mass fraction of polymer components (0–1); null → none (default {@link DEFAULT_MAX_POLYMER_FRACTION}). */
  maxPolymerFraction: number | null;
  /** Maximum pour point estimate [°C]; null → none. */
  maxPourPoint: number | null;
  /** Minimum flash point estimate [°C]; null → none. */
  minFlashPoint: number | null;
  /** The additive package at a fixed treat rate (mass fraction 0–1); null → none. */
  additive: { componentId: string; massFraction: number } | null;
  /** Per-component bounds by component id. */
  bounds: Record<string, FractionBounds>;
  objective: Objective;
  /** Reference recipe for the 'closest' objective and for comparisons; null → none. */
  referenceRecipeId: string | null;
  /**
   * Minimum probability (0 to below 1) that a batch lands in the target band under the stocks' lot
   * spread (`qc/robust.ts`); null → none (the nominal recipe).
   */
  minInBandProbability: number | null;
}

/**
 * Default cap on the total polymer thickener share of a recipe (mass fraction). Common practice
 * (no source): industrial gear oils thickened with polymer rarely carry more than about a quarter of
 * it; above that, shear loss, cost and cold flow usually argue for a heavier base stock instead.
 * Editable per recipe.
 */
export const DEFAULT_MAX_POLYMER_FRACTION = 0.25;
