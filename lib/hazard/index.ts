// The hazard engine's public face. Pure TypeScript with no framework, no I/O and no runtime-specific
// imports, so the same code computes the live figures in the browser and the stored assessment on
// the server.

export { assessSetup, ENGINE_VERSION } from "./assess";
export { DEFAULT_RULES, TIER_LABELS, requiredControls, validateRules } from "./rules";
export { HazardInputError, formatInputPath, type InputPath } from "./errors";
export { INPUT_LIMITS, validateSetupInput } from "./validate";
export {
  gapBreakdown,
  pchip,
  readSphereGapTable,
  relativeAirDensity,
  uniformFieldBreakdown_kV,
  SPHERE_GAP_TABLE,
  TABLE_AIR_DENSITY,
  MAX_GAP_SPACING_M,
  MIN_REDUCED_SPACING_CM,
  type GapBreakdown,
  type GapMethod,
  type SphereGapColumn,
} from "./gaps";
export {
  REFERENCES,
  citation,
  readableAssessment,
  readableSource,
  referenceAnchor,
  referenceById,
  shortCitation,
  statusText,
  type Reference,
  type ReferenceStatus,
} from "./references";
export { isPreWiringSetup, upgradeSetup, type UpgradedSetup } from "./upgrade";
export {
  approachDistances,
  AC_APPROACH_TABLE,
  DC_APPROACH_TABLE,
  type ApproachLookup,
  type ApproachSystem,
} from "./approach";
export {
  EPSILON_0_F_PER_M,
  coaxialCapacitance_F,
  parallelPlateCapacitance_F,
  sphereCapacitance_F,
} from "./capacitance";
export {
  BASE_UNIT,
  formatPlain,
  formatQuantity,
  formatSI,
  parseQuantity,
  siParts,
  type Dimension,
  type ParseQuantityResult,
  type QuantityErrorCode,
  type QuantityParseError,
  type SIParts,
} from "./units";
export type {
  AcSupplySource,
  Bleeder,
  Assessment,
  CapacitorSource,
  ControlRule,
  CustomCapacitanceSource,
  DcSupplySource,
  EnergySource,
  Flag,
  FlagCode,
  Reason,
  SetupInput,
  SourceKind,
  SourceResult,
  SparkGap,
  SphereTerminalSource,
  Threshold,
  Tier,
  TierRules,
} from "./types";
export { wayDown, type WayDown, type WayDownChange, type WayDownSuggestion } from "./way-down";
