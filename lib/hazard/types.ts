// The hazard engine's contract (docs: hazard-model.md). Every quantity is a plain number in SI base
// units and every field name ends in its unit, so a figure can never be read in the wrong unit.

export type SetupInput = {
  /** At least one. */
  sources: EnergySource[];
  /** Spark gaps; each caps only the sources named in its `across` (v2). */
  gaps?: SparkGap[];
  /** Bleeders wired across one or more sources (v2), beside the per-source `bleeder_ohm`. */
  bleeders?: Bleeder[];
  /** Body model between the touched parts; default 500 Ω (worst-case hand to hand, common practice). */
  bodyResistance_ohm?: number;
  /** A tube or vacuum gap is driven: field-emitted electrons can make x-rays (x-ray flag). */
  vacuumDevice?: boolean;
};

export type CapacitorSource = {
  id?: string;
  kind: "capacitor";
  /** Capacitance of ONE unit of the bank. */
  capacitance_F: number;
  /** Voltage across the whole bank. */
  voltage_V: number;
  /** Number of identical units; default 1. A series bank needs at least 2. */
  count?: number;
  /** Default "parallel". */
  arrangement?: "parallel" | "series";
  /** Rating of ONE unit; in a series bank each unit sees voltage_V / count. */
  ratedVoltage_V?: number;
  /** Bleeder across the whole bank. */
  bleeder_ohm?: number;
  /** Resistance in series with the bank's terminals, added to the body resistance. */
  seriesResistance_ohm?: number;
};

export type CustomCapacitanceSource = {
  id?: string;
  kind: "custom-capacitance";
  capacitance_F: number;
  voltage_V: number;
  bleeder_ohm?: number;
};

export type SphereTerminalSource = {
  id?: string;
  kind: "sphere-terminal";
  /** Isolated conductor, C = 4·π·ε0·r. */
  radius_m: number;
  /** With no voltage the terminal charges until the lowest gap breaks down (a gap is then required). */
  voltage_V?: number;
};

export type DcSupplySource = {
  id?: string;
  kind: "dc-supply";
  voltage_V: number;
  currentLimit_A: number;
  seriesResistance_ohm?: number;
  /** Counted as stored energy: it discharges through a body without the supply's current limit. */
  outputCapacitance_F?: number;
};

export type AcSupplySource = {
  id?: string;
  kind: "ac-supply";
  voltageRms_V: number;
  frequency_Hz: number;
  /** An rms value. */
  currentLimit_A: number;
};

export type EnergySource =
  CapacitorSource | CustomCapacitanceSource | SphereTerminalSource | DcSupplySource | AcSupplySource;

export type SourceKind = EnergySource["kind"];

export type SparkGap = {
  id?: string;
  sphereDiameter_m: number;
  spacing_m: number;
  /** Default 101325 Pa (one standard atmosphere). */
  pressure_Pa?: number;
  /** Default 20 °C. */
  temperature_C?: number;
  /** Ids of the sources this gap is connected across (v2). A gap across nothing caps nothing. */
  across?: string[];
};

/** A bleeder resistor wired across one or more sources (v2); it discharges all of them together. */
export type Bleeder = { id?: string; resistance_ohm: number; across: string[] };

export type Tier = 0 | 1 | 2 | 3 | 4;

export type Reason = {
  /** Stable identifier, e.g. "stored-energy-lethal", "gap-ceiling", "approach-distance-dc". */
  criterion: string;
  value: number;
  unit: string;
  threshold: number;
  /**
   * For a tier criterion: the tier it places the set-up in (only criteria that hold are listed, so the
   * assessment's tier is the highest of these). For the entries that inform rather than decide, the
   * set-up's tier: "gap-ceiling" (value: the highest voltage a source is set to, threshold: the lowest
   * gap breakdown) and "approach-distance-dc" / "-ac" (value: the voltage looked up, threshold: the
   * upper voltage of the table row used).
   */
  tier: number;
  /** Plain English, with the figures and units. */
  meaning: string;
  /** Publication, edition and clause, and whether read, from memory or common practice. */
  source: string;
  /** Id of the entry in the list of references (lib/hazard/references.ts), for a link. */
  ref?: string;
};

export type FlagCode =
  "thermal" | "x-ray" | "ozone" | "ignition" | "overvoltage" | "no-bleeder" | "discharge-time" | "implausible";

export type Flag = {
  code: FlagCode;
  message: string;
  source: string;
  ref?: string;
  /** "implausible" flags: the field that looks mistyped, e.g. "sources[0].bleeder_ohm". */
  field?: string;
};

export type SourceResult = {
  /** The input id, or "source-N" (1-based) when none was given. */
  id: string;
  kind: string;
  /** After gap ceilings. For an AC supply, the crest value √2·V_rms (what a gap or a body sees). */
  voltage_V: number;
  capacitance_F: number;
  charge_C: number;
  energy_J: number;
  peakCurrent_A: number;
  timeConstant_s: number;
  /** Supplies only (AC as rms); 0 for stored-energy sources. */
  continuousCurrent_A: number;
  /** The tier this source would have on its own. */
  tier: number;
};

export type Assessment = {
  engineVersion: string;
  /** Version of the tier rules applied (default or an institution's stricter set). */
  rulesVersion: string;
  tier: Tier;
  tierLabel: string;
  /** Highest voltage any source reaches, after gap ceilings (AC supplies as crest value). */
  maxVoltage_V: number;
  /** Lowest ceiling a gap puts on a source it is across: the breakdown's upper bound,
   * nominal × (1 + tolerance); null when no gap is across any source. */
  gapCeiling_V: number | null;
  /** Total stored-energy capacitance. */
  capacitance_F: number;
  charge_C: number;
  /** Total stored energy, ½·C·V² summed over sources. */
  energy_J: number;
  /** V / (R_body + R_series) of the worst source (the one with the highest peak current). */
  peakCurrent_A: number;
  /** (R_body + R_series)·C, largest over capacitive sources (v2); 0 when none stores charge. */
  timeConstant_s: number;
  /** ∫i²dt into the body = V²·C / (2·R), largest over capacitive sources (v2). */
  specificEnergy_A2s: number;
  /** Highest over supplies of min(limit, V / (R_body + R_series)); AC as rms. */
  continuousCurrent_A: number;
  /** Longest bleeder time to 60 V; 0 when every source is at or below 60 V; null when a source above
   * 60 V has no bleeder. */
  timeToSafe_s: number | null;
  approach: { limited_m: number | null; restricted_m: number | null };
  reasons: Reason[];
  flags: Flag[];
  perSource: SourceResult[];
};

/** One threshold of the tier rules, in SI base units, with where the number comes from. */
export type Threshold = { value: number; unit: string; source: string; ref?: string };

/** A control the tier requires, from `fromTier` upwards. */
export type ControlRule = { id: string; fromTier: 1 | 2 | 3 | 4; text: string; source: string };

/**
 * The tier rules as plain JSON-serialisable data, so an institution can store stricter local rules.
 * Each group holds the thresholds of one tier of hazard-model.md's table.
 */
export type TierRules = {
  rulesVersion: string;
  /** Default body model when the input gives none. */
  bodyResistance: Threshold;
  /** Target of the bleeder calculation. */
  safeVoltage: Threshold;
  touchSafe: {
    dcVoltage: Threshold;
    acVoltageRms: Threshold;
    dcCurrent: Threshold;
    acCurrentRms: Threshold;
    /** Upper end of the band where the capacitance itself is limited. */
    capacitanceBandTop: Threshold;
    capacitance: Threshold;
    /** Upper end of the band where the charge is limited. */
    chargeBandTop: Threshold;
    charge: Threshold;
    /** Above chargeBandTop. */
    energy: Threshold;
  };
  reflex: { energy: Threshold; dcCurrent: Threshold; acCurrentRms: Threshold };
  lethal: {
    energy: Threshold;
    energyMinVoltage: Threshold;
    dcCurrent: Threshold;
    dcMinVoltage: Threshold;
    acCurrentRms: Threshold;
    acMinVoltageRms: Threshold;
  };
  arc: {
    energy: Threshold;
    energyMinVoltage: Threshold;
    dcCurrentLimit: Threshold;
    dcMinVoltage: Threshold;
    /** v2: AC power at or above this rms voltage is an arc-flash hazard. */
    acMinVoltageRms: Threshold;
  };
  flags: {
    thermalMaxVoltage: Threshold;
    thermalEnergy: Threshold;
    xrayVoltage: Threshold;
    ozoneVoltage: Threshold;
    ignitionEnergy: Threshold;
    noBleederEnergy: Threshold;
    /** v2: DC supply below this voltage delivering more than dcThermalPower. */
    dcThermalMaxVoltage: Threshold;
    dcThermalPower: Threshold;
  };
  /** v2: ∫i²dt of a capacitor discharge into the body against fibrillation data (tier 3). */
  impulse: { specificEnergy: Threshold; minDuration: Threshold };
  /** v2: discharge within a time to the safe voltage; charges at or below exemptCharge are exempt. */
  discharge: { time: Threshold; exemptCharge: Threshold };
  /** v2: figures a part cannot plausibly have: asked to be confirmed. */
  plausibility: { bleederPower: Threshold; minTimeToSafe: Threshold };
  controls: ControlRule[];
};
