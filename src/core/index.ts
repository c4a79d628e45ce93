/**
 * Blendbench calculation core — the public API, grouped by topic.
 * Pure TypeScript: no UI, storage, clock or randomness (enforced by tests/core/purity.test.ts).
 * Add new modules as further grouped `export … from` lines.
 */

// Domain model
export * from './formulation/model';
export { ENTRY_FIELDS, ENTRY_FIELD_LABEL, notEnteredFields, remainingNotEntered, entryFieldsInWords, unenteredStocks, notPredictedWords, densityNotEntered } from './formulation/entered-values';

// Errors (every entry point throws one of these on impossible input)
export {
  BlendbenchInputError,
  InvalidNumberError,
  NonPositiveViscosityError,
  ViscosityOrderError,
  ViscosityOutOfRangeError,
  FractionSumError,
  ImplausibleDensityError,
  BelowAbsoluteZeroError,
  FRACTION_SUM_TOLERANCE,
  DENSITY15_MIN,
  DENSITY15_MAX,
  ABSOLUTE_ZERO_C,
} from './errors';

// Viscosity index — ASTM D2270
export {
  viscosityIndex,
  kv40FromViscosityIndex,
  reportedViscosityIndex,
  referenceViscosities,
  roundHalfEven,
  VI_MIN_KV100,
  VI_TABLE_MAX_KV100,
} from './viscosity/viscosity-index';
export { D2270_KV100, D2270_L, D2270_H, D2270_TABLE1_ROWS } from './viscosity/d2270-table1';

// Viscosity–temperature — ASTM D341-20 (full Z and its published inverse; simple form selectable)
export type { WaltherLine, D341Form } from './viscosity/viscosity-temperature';
export {
  d341Z,
  kvFromD341Z,
  kvFromD341ZPublished,
  d341LogLogZ,
  kvFromD341LogLogZ,
  d341MinKv,
  assessTemperature,
  temperatureForViscosityAssessed,
  D341_FORMS,
  D341_FORM_LABEL,
  D341_FORM_SHORT,
  D341_Z_EQUATION,
  D341_MIN_KV,
  D341_TRUSTED_BAND_C,
  viscosityAtTemperature,
  temperatureForViscosity,
  waltherLine,
  fitWalther,
  kvAtTemperature,
  temperatureAtKv,
  kv40kv100FromPoints,
  WALTHER_MIN_KV,
} from './viscosity/viscosity-temperature';

// Blend viscosity — Refutas, ASTM D7152, any temperature
export { blendViscosityRefutas, refutasVbn, kvFromRefutasVbn, refutasHeavyFraction } from './blending/refutas';
export { blendViscosityAstmD7152, astmLogLog, kvFromAstmLogLog, astmHeavyFraction } from './blending/astm-loglog';
export type { WrightPart } from './blending/wright';
export { blendViscosityWright, wrightBlendLine, wrightHeavyFraction, wrightWeight } from './blending/wright';
export type { BlendMethod, BlendPart, CalibrationMethod } from './blending/blend-viscosity';
export {
  blendViscosityAt,
  blendKv40Kv100,
  BLEND_METHODS,
  BLEND_METHOD_LABEL,
  BLEND_METHOD_STANDARD,
} from './blending/blend-viscosity';

// ISO viscosity grades — ISO 3448, ASTM D2422
export type { IsoGrade } from './viscosity/iso-grades';
export {
  isoViscosityGrade,
  gradeBand,
  isInGrade,
  deviationFromMidPct,
  nearestGrade,
  gradePosition,
  ISO_GRADES,
  ISO_GRADE_NUMBERS,
} from './viscosity/iso-grades';

// Density, fractions, cost, batch quantities
export { blendDensity, massToVolumeFractions, volumeToMassFractions } from './blending/density';
export type { BatchSize } from './formulation/cost';
export { pricePerKg, blendCostPerKg, blendCostPerLitre, blendCostPerLitreAt, batchQuantities } from './formulation/cost';
// Density and volume at a temperature — ASTM D1250-80 / ISO 91-1 Table 54D (lubricating oils)
export {
  lubeThermalExpansion15,
  lubeVolumeCorrectionFactor,
  tableThermalExpansion,
  tableCtl,
  densityAtTemperature,
  blendDensityAtTemperature,
  lubeTableInRange,
  LUBE_OIL_TABLE_54D,
  REFERENCE_TEMP_C,
} from './blending/density-temperature';

// API base-stock categories — API 1509 Appendix E
export type { ApiGroupIssue } from './classification/api-1509';
export {
  apiGroupIssues,
  API_SATURATES_MIN_PCT,
  API_SULFUR_MAX_PCT,
  API_VI_MIN,
  API_VI_GROUP_III,
} from './classification/api-1509';

// Other blend properties (estimates)
export { blendAnilinePoint } from './blending/aniline';
export {
  flashBlendingIndex,
  flashPointFromIndex,
  blendFlashPoint,
  flashIndexExtrapolated,
  FLASH_INDEX_FITTED_MAX_C,
} from './blending/flash-point';
export {
  pourBlendingIndex,
  pourPointFromIndex,
  blendPourPoint,
  pourIndexExtrapolated,
  POUR_INDEX_FITTED_C,
} from './blending/pour-point';
export { krlShearLossPct, shearedKv, inGradeAfterShear } from './viscosity/shear';

// Numbers in text the core writes (the user's decimal separator, grouping, temperature unit)
export type { NumberDisplay, DisplayWords } from './words/display';
export { formatFixed, sayNumber, decimalsOf, displayWords } from './words/display';
export type { VerdictLimits, VerdictDigits } from './words/verdict-digits';
export { verdictDigits } from './words/verdict-digits';
export { printedSign, signedText } from './words/signed';

// Units at the boundary
export { cToF, fToC, cToK, cStToMm2s, mm2sToCSt, convertPrice, PRICE_BASIS_LABEL } from './units';

// Blend sheet for the plant: component table, charging order, instructions, QC release targets
export type {
  BlendSheet,
  BlendSheetRow,
  BlendSheetOptions,
  BatchCosting,
  ChargeRole,
  InstructionOptions,
  SheetPrediction,
  QcOptions,
  QcKey,
  QcRow,
  CsvFixed,
  CsvRecord,
} from './sheet/blend-sheet';
export {
  buildBlendSheet,
  largestRemainderUnits,
  quantityDecimals,
  chargeRole,
  CHARGE_ROLE_LABEL,
  defaultBlendingInstructions,
  qcReleaseTargets,
  sheetPrediction,
  blendSheetCsvRows,
  BLEND_SHEET_CAUTIONS,
  PER_SPECIFICATION,
} from './sheet/blend-sheet';

// Predicted blend properties (with "show working" explanations)
export type { BlendProperties, BlendPropertyLine, PropertyExplain, ExplainValue, PredictOptions, KvAtTemperature } from './formulation/blend-properties';
export { predictBlend, blendingViscosities } from './formulation/blend-properties';

// Solver: recipes to a grade (least cost per litre, solvency, oxidation, closest), fast path, plain API
export type {
  SolveBlendInput,
  SolveResult,
  SolveOptimal,
  SolveInfeasible,
  SolveInvalidInput,
  ConstraintCheck,
  PreparedBlend,
  EngineResult,
  EngineOptimal,
  EngineInfeasible,
} from './solver/solve-blend';
export { solveBlend, prepareComponents, solvePrepared, checkConstraints, checkInWords, CHECK_TOLERANCE } from './solver/solve-blend';
export type { PlainComponent, PlainProblem, PlainBlend, PlainSolveResult } from './solver/plain';
export { solveBlendPlain } from './solver/plain';

// Solvency, oxidation stability, deposit propensity (Blendbench's own ordinal scales; estimates)
export type { OxidationClass, BlendOxidation, OxidationContribution } from './scoring/oxidation';
export {
  oxidationRating,
  oxidationClass,
  blendOxidationRating,
  isBaseFluid,
  DEFAULT_OXIDATION_RATING,
  OXIDATION_CLASSES,
  OXIDATION_CLASS_LABEL,
  OXIDATION_RATING_MIN,
  OXIDATION_RATING_MAX,
  ESTER_HYDROLYSIS_CAVEAT,
} from './scoring/oxidation';
export type { SolvencyBand, SolvencyScore, BlendSolvency, SolvencyContribution } from './scoring/solvency';
export { solvencyScore, blendSolvency, SOLVENCY_BANDS, SOLVENCY_BAND_LABEL, SOLVENCY_THRESHOLDS } from './scoring/solvency';
export type { DepositPropensity, DepositPattern, DepositAssessment, DepositDriver } from './scoring/deposit';
export {
  assessDeposit,
  explainDeposit,
  depositPropensity,
  DEPOSIT_PROPENSITIES,
  DEPOSIT_PROPENSITY_LABEL,
  DEPOSIT_PATTERN_LABEL,
} from './scoring/deposit';

// Non-ideal components: effective blending viscosity from a measured trial blend
export type { CalibrationInput } from './formulation/calibration';
export { calibrateComponent, MIN_CALIBRATION_FRACTION, MIN_EFFECTIVE_KV } from './formulation/calibration';

// Blend after permanent shear (KRL) — in grade after shear
export type { BlendAfterShear, ShearedPolymer, ShearStatedAt } from './formulation/shear-blend';
export { blendAfterShear, SHEAR_ASSUMPTION, VI_AFTER_SHEAR_NOTE } from './formulation/shear-blend';

// Substitute search (chunked, for a Web Worker), Pareto frontier, ε-constraint sweep, comparison
export type {
  SubstituteSearchInput,
  SubstituteSearch,
  SubstituteSearchProgress,
  SubstituteSearchResult,
  SubstituteCandidate,
  SearchShard,
} from './search/substitutes';
export {
  createSubstituteSearch,
  searchSubstitutes,
  mergeSubstituteResults,
  rankCandidates,
  DEFAULT_MAX_COMPONENTS,
} from './search/substitutes';
export type { SupportBound } from './search/support';
export { supportBound, sizeCanMatter, combinationCanMatter } from './search/support';
export type { FrontierPoint, FrontierSweepInput } from './search/frontier';
export { paretoFrontier, epsilonConstraintSweep } from './search/frontier';
export type { ComparisonInput, Comparison, Delta, Change, RecipeAssessment } from './formulation/comparison';
export { compareRecipes, assessRecipe } from './formulation/comparison';
export type { PlainSubstituteRequest, PlainSubstituteResult } from './search/substitutes-plain';
export { searchSubstitutesPlain } from './search/substitutes-plain';

// Line plan: every grade of a line at once, least total cost over a period, shared limited supplies,
// stocks that must stay in use, an exact tank limit; both plans of a withdrawal and marginal values
export type {
  LinePlanInput,
  LinePlanGradeInput,
  LinePlanResult,
  LinePlanOptimal,
  LinePlanInfeasible,
  LinePlanInvalid,
  LinePlanGradeResult,
  LinePlanStockUse,
  LinePlanCost,
  LinePlanScenarios,
  MarginalValue,
  PreparedLinePlan,
} from './lineplan/plan';
export {
  planLine,
  planLineScenarios,
  prepareLinePlan,
  solvePreparedLinePlan,
  MARGINAL_STEP_KG,
  SUPPLY_CHECK_TOLERANCE,
  supplyCheckLimitKg,
  leastUseCheckFloorKg,
} from './lineplan/plan';
export type { PlainLineComponent, PlainLineGrade, PlainLineProblem, PlainLineResult, PlainLineGradeResult } from './lineplan/plain';
export { planLinePlain } from './lineplan/plain';

// Equivalent sources (first and second source of a grade) and grouping of candidates
export type { EquivalenceTolerance, CandidateGroup } from './search/equivalent-sources';
export { equivalentSources, sourceGroups, groupCandidates, DEFAULT_EQUIVALENCE_TOLERANCE } from './search/equivalent-sources';

// Recipe lifecycle: the stock data a recipe was saved with, the change between revisions
export type { StockFieldChange, StockChange } from './recipes/stock-basis';
export { stockSnapshot, recordStockBasis, stockBasisChanges } from './recipes/stock-basis';
export type { ShareChange } from './recipes/share-changes';
export { shareChanges } from './recipes/share-changes';
export type { RecipeImpact, ImpactPrediction } from './recipes/impact';
export { predictionImpact } from './recipes/impact';
export type { SpecificationGradeIssue } from './recipes/specification-grade';
export {
  specificationGradeIssue,
  specificationGradeMessage,
  printableSpecification,
  isBlankSpecification,
  gradeNamedIn,
  inferSpecificationGrades,
  gradeFromKv100Limits,
  gradeAmongFromKv100Limits,
  specificationGradeChoices,
  TYPICAL_GEAR_OIL_VI,
  UNKNOWN_SPECIFICATION_GRADE,
} from './recipes/specification-grade';
export type { SpecificationHolder } from './recipes/specification-grade';
export { approvalRefusal, currentApprovedRevision } from './recipes/approval';

// Release hold: why a blend sheet is not for release
export type { HoldKind, HoldReason, ReleaseHoldInput, ReleaseAssessment } from './release/release-hold';
export { releaseHoldReasons, assessRelease, correctionHoldReasons, RELEASE_HOLD_LABEL } from './release/release-hold';

// Exchange rates at the boundary (prices restated in one base currency)
export type { ExchangeRate, UnpricedStock, PricedLibrary } from './currency/exchange-rates';
export {
  normaliseCurrency,
  currencyCodeProblem,
  rateToBase,
  priceInBase,
  priceLibraryInBase,
  solvableLibrary,
  describeRate,
  unpricedMessage,
  unpricedTitle,
  pricingFor,
  rateDecimals,
} from './currency/exchange-rates';

// The plant's QC loop: lot spread and probability in band, robust recipes, lot-adjusted recipe,
// vessel heel, batch correction (`qc/`)
export { erfc, standardNormalCdf, standardNormalPdf, standardNormalQuantile } from './qc/normal';
export type { SpreadPart, Kv40Distribution } from './qc/lot-spread';
export {
  DEFAULT_KV40_LOT_SPREAD_PCT,
  MAX_KV40_LOT_SPREAD_PCT,
  kv40LotSpreadPct,
  batchKv40Distribution,
  kv40InBandProbability,
  kv40Quantile,
  kv40Density,
  probabilityInInterval,
} from './qc/lot-spread';
export type { MonteCarloKv40, MonteCarloLots } from './qc/monte-carlo';
export { monteCarloKv40, monteCarloLots, blendLots, countBlendedLots, shareInBand, seededUniform, seededNormal } from './qc/monte-carlo';
export { allowedDeviation, maxSdForProbability, ROBUST_CUT_MARGIN } from './qc/robust';
export type { RobustAnswer } from './qc/robust-solve';
export { solveRobustAndNominal, highestInBandProbability } from './qc/robust-solve';
export { inBandProbabilityPlain } from './qc/probability-plain';
export type { CorrectionProblem, CorrectionResult, CorrectionVessel, CorrectionComponent } from './qc/correction';
export { correctBatchPlain, correctionBand, CORRECTION_EDGE_MARGIN_PCT } from './qc/correction';
export type { AdjustInput, AdjustResult, AdjustStock, AdjustHeel, AdjustVolumeInput } from './qc/adjust';
export { adjustRecipe, adjustRecipeToVolume } from './qc/adjust';
