// The default tier rules of hazard-model.md as data: every threshold in SI base units with the place
// its number was read ("memory" where no published text was seen, "common practice" where it is a
// rule of the trade), plus the controls each tier requires. An institution may store stricter rules of
// the same shape; validateRules() is the minimal check such a stored object gets before use.

import { HazardInputError } from "./errors";
import { citation } from "./references";
import type { ControlRule, Threshold, Tier, TierRules } from "./types";

export const TIER_LABELS: Readonly<Record<Tier, string>> = {
  0: "Touch-safe",
  1: "Sting",
  2: "Reflex injury",
  3: "Lethal shock",
  4: "Arc and blast",
};

/** A threshold whose source text is the reference's citation, plus what the value is there. */
const t = (value: number, unit: string, ref: string, what = ""): Threshold => ({
  value,
  unit,
  source: what ? `${citation(ref)}: ${what}` : citation(ref),
  ref,
});

const COMMON_PRACTICE = "common practice";

export const DEFAULT_RULES: TierRules = {
  rulesVersion: "benchclear-default-2",
  bodyResistance: t(500, "Ω", "iec-60479-1-impedance", "500 Ω hand to hand, the cautious end"),
  safeVoltage: t(60, "V", "iec-60204-1-6-2-4", "residual voltage at or below 60 V"),
  touchSafe: {
    dcVoltage: t(60, "V", "iec-62368-1-es1", "60 V DC"),
    acVoltageRms: t(30, "V", "iec-62368-1-es1", "30 V rms"),
    dcCurrent: t(0.002, "A", "iec-61010-1-6-3", "touch current 2 mA DC (the same in IEC 60335-1 8.1.4)"),
    acCurrentRms: t(0.0005, "A", "iec-61010-1-6-3", "touch current 0.5 mA rms"),
    capacitanceBandTop: t(450, "V", "iec-60335-1-8-1-4", "0.1 µF band up to 450 V"),
    capacitance: t(1e-7, "F", "iec-60335-1-8-1-4", "0.1 µF from 42.4 V to 450 V"),
    chargeBandTop: t(15_000, "V", "iec-60335-1-8-1-4", "45 µC band up to 15 kV"),
    charge: t(45e-6, "C", "iec-60335-1-8-1-4", "45 µC from 450 V to 15 kV"),
    energy: t(0.35, "J", "iec-60335-1-8-1-4", "350 mJ above 15 kV"),
  },
  reflex: {
    energy: t(0.25, "J", "capacitor-discharge-guideline", "0.25 J gives a heavy shock"),
    dcCurrent: t(0.025, "A", "iec-62368-1-es2", "25 mA DC, the ES2 limit"),
    acCurrentRms: t(0.005, "A", "lbnl-esm-2-2-13", "AC shock hazard from 5 mA (ES2 of IEC 62368-1 is also 5 mA rms)"),
  },
  lethal: {
    energy: t(10, "J", "lbnl-esm-2-2-13", "capacitors at 100 V or more and 10 J or more"),
    energyMinVoltage: t(100, "V", "lbnl-esm-2-2-13", "capacitors at 100 V or more"),
    dcCurrent: t(0.04, "A", "lbnl-esm-2-2-13", "DC at 100 V or more and 40 mA or more"),
    dcMinVoltage: t(100, "V", "lbnl-esm-2-2-13", "DC at 100 V or more"),
    acCurrentRms: t(0.03, "A", "iec-60364-4-41-rcd", "30 mA rms"),
    acMinVoltageRms: t(50, "V", "lbnl-esm-2-2-13", "AC at 50 V or more"),
  },
  arc: {
    energy: t(10_000, "J", "lbnl-esm-2-2-13", "arc flash: capacitors at 100 V or more and 10 kJ or more"),
    energyMinVoltage: t(100, "V", "lbnl-esm-2-2-13", "arc flash: capacitors at 100 V or more"),
    dcCurrentLimit: t(500, "A", "lbnl-esm-2-2-13", "arc flash: DC at 100 V or more and 500 A or more"),
    dcMinVoltage: t(100, "V", "lbnl-esm-2-2-13", "arc flash: DC at 100 V or more"),
    acMinVoltageRms: t(250, "V", "lbnl-esm-2-2-13", "arc flash: AC power at 250 V or more"),
  },
  flags: {
    thermalMaxVoltage: t(100, "V", "lbnl-esm-2-2-13", "thermal: capacitors below 100 V"),
    thermalEnergy: t(100, "J", "lbnl-esm-2-2-13", "thermal: capacitors above 100 J"),
    xrayVoltage: t(10_000, "V", "xray-practice", "x-rays reported from about 10 kV"),
    ozoneVoltage: t(10_000, "V", "osha-ozone", "corona from about 10 kV"),
    ignitionEnergy: t(2e-4, "J", "min-ignition-energy", "0.2 mJ, below methane (0.28 mJ) and propane (0.25 mJ)"),
    noBleederEnergy: t(0.1, "J", "capacitor-discharge-guideline", "above 0.1 J provide a means of discharge"),
    dcThermalMaxVoltage: t(100, "V", "lbnl-esm-2-2-13", "thermal: DC below 100 V"),
    dcThermalPower: t(1000, "W", "lbnl-esm-2-2-13", "thermal: DC above 1000 W"),
  },
  impulse: {
    specificEnergy: t(0.0025, "A²s", "iec-60479-2-impulse", "fibrillation possible from 0.0025 A²s"),
    minDuration: t(1e-4, "s", "iec-60479-2-impulse", "data for impulses of 0.1 ms or longer"),
  },
  discharge: {
    time: t(5, "s", "iec-60204-1-6-2-4", "discharged to 60 V within 5 s"),
    exemptCharge: t(60e-6, "C", "iec-60204-1-6-2-4", "parts storing 60 µC or less are exempt"),
  },
  plausibility: {
    bleederPower: t(1000, "W", "benchclear-plausibility", "a bleeder dissipating more than 1 kW"),
    minTimeToSafe: t(1e-6, "s", "benchclear-plausibility", "a discharge to 60 V in under 1 µs"),
  },
  controls: [
    { id: "warning-sign", fromTier: 1, text: "Warning sign at the bench.", source: COMMON_PRACTICE },
    { id: "grounding-hook", fromTier: 1, text: "Grounding (shorting) hook within reach.", source: COMMON_PRACTICE },
    {
      id: "discharge-after-use",
      fromTier: 1,
      text: "Discharge and short every capacitor after use and before touching.",
      source: COMMON_PRACTICE,
    },
    {
      id: "audience-distance",
      fromTier: 1,
      text: "Audience kept outside the limited approach distance.",
      source: COMMON_PRACTICE,
    },
    {
      id: "implant-warning",
      fromTier: 1,
      text: "People with implanted medical devices warned.",
      source: COMMON_PRACTICE,
    },
    { id: "bleeder", fromTier: 2, text: "Bleeder or automatic shorting when idle.", source: COMMON_PRACTICE },
    { id: "insulated-barrier", fromTier: 2, text: "Insulated barrier.", source: COMMON_PRACTICE },
    { id: "named-operator", fromTier: 2, text: "Operator trained and named.", source: COMMON_PRACTICE },
    { id: "second-person", fromTier: 3, text: "Second trained person present.", source: COMMON_PRACTICE },
    {
      id: "barrier-at-limited-approach",
      fromTier: 3,
      text: "Barrier at the limited approach distance.",
      source: COMMON_PRACTICE,
    },
    {
      id: "written-discharge-procedure",
      fromTier: 3,
      text: "Written discharge procedure at the bench.",
      source: COMMON_PRACTICE,
    },
    { id: "lockout", fromTier: 3, text: "Supply with key switch or lockout.", source: COMMON_PRACTICE },
    { id: "hook-inspected", fromTier: 3, text: "Grounding hook inspected.", source: COMMON_PRACTICE },
    {
      id: "interlock-or-remote",
      fromTier: 4,
      text: "Interlocked enclosure or remote firing.",
      source: COMMON_PRACTICE,
    },
    { id: "eye-hearing-protection", fromTier: 4, text: "Eye and hearing protection.", source: COMMON_PRACTICE },
    { id: "officer-pre-use-check", fromTier: 4, text: "The officer's pre-use check.", source: COMMON_PRACTICE },
  ],
};

/** The controls a tier requires: every control whose `fromTier` is at or below it, in rule order. */
export function requiredControls(tier: number, rules: TierRules = DEFAULT_RULES): ControlRule[] {
  return rules.controls.filter((control) => control.fromTier <= tier);
}

type ThresholdPath = readonly [group: string, key: string];

/** Each threshold's expected unit, used to refuse a stored rule set that mixes, say, mA into A. */
const EXPECTED_UNITS: ReadonlyArray<readonly [ThresholdPath, string]> = [
  [["bodyResistance", ""], "Ω"],
  [["safeVoltage", ""], "V"],
  [["touchSafe", "dcVoltage"], "V"],
  [["touchSafe", "acVoltageRms"], "V"],
  [["touchSafe", "dcCurrent"], "A"],
  [["touchSafe", "acCurrentRms"], "A"],
  [["touchSafe", "capacitanceBandTop"], "V"],
  [["touchSafe", "capacitance"], "F"],
  [["touchSafe", "chargeBandTop"], "V"],
  [["touchSafe", "charge"], "C"],
  [["touchSafe", "energy"], "J"],
  [["reflex", "energy"], "J"],
  [["reflex", "dcCurrent"], "A"],
  [["reflex", "acCurrentRms"], "A"],
  [["lethal", "energy"], "J"],
  [["lethal", "energyMinVoltage"], "V"],
  [["lethal", "dcCurrent"], "A"],
  [["lethal", "dcMinVoltage"], "V"],
  [["lethal", "acCurrentRms"], "A"],
  [["lethal", "acMinVoltageRms"], "V"],
  [["arc", "energy"], "J"],
  [["arc", "energyMinVoltage"], "V"],
  [["arc", "dcCurrentLimit"], "A"],
  [["arc", "dcMinVoltage"], "V"],
  [["flags", "thermalMaxVoltage"], "V"],
  [["flags", "thermalEnergy"], "J"],
  [["flags", "xrayVoltage"], "V"],
  [["flags", "ozoneVoltage"], "V"],
  [["flags", "ignitionEnergy"], "J"],
  [["flags", "noBleederEnergy"], "J"],
];

/** v2 thresholds: a rule set adopted before them may lack them, and then takes the defaults. */
const V2_UNITS: ReadonlyArray<readonly [ThresholdPath, string]> = [
  [["arc", "acMinVoltageRms"], "V"],
  [["flags", "dcThermalMaxVoltage"], "V"],
  [["flags", "dcThermalPower"], "W"],
  [["impulse", "specificEnergy"], "A²s"],
  [["impulse", "minDuration"], "s"],
  [["discharge", "time"], "s"],
  [["discharge", "exemptCharge"], "C"],
  [["plausibility", "bleederPower"], "W"],
  [["plausibility", "minTimeToSafe"], "s"],
];

/**
 * A rule set with every v2 threshold present: those an older stored set lacks come from the
 * defaults. Returns the same object when nothing is missing.
 */
export function completeRules(rules: TierRules): TierRules {
  const loose = rules as unknown as Record<string, Record<string, unknown> | undefined>;
  const missing = V2_UNITS.filter(([[group, key]]) => loose[group]?.[key] === undefined);
  if (missing.length === 0) return rules;
  const out = { ...rules } as unknown as Record<string, Record<string, unknown>>;
  const defaults = DEFAULT_RULES as unknown as Record<string, Record<string, unknown>>;
  for (const [[group, key]] of missing) out[group] = { ...(out[group] ?? {}), [key]: defaults[group][key] };
  return out as unknown as TierRules;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function thresholdAt(rules: Record<string, unknown>, [group, key]: ThresholdPath): unknown {
  const outer = rules[group];
  if (!key) return outer;
  return isRecord(outer) ? outer[key] : undefined;
}

function pathOf([group, key]: ThresholdPath): string[] {
  return key ? ["rules", group, key] : ["rules", group];
}

/**
 * Minimal check of a rule set (e.g. one loaded from the database): every threshold a positive finite
 * number in the expected unit with a source, the tiers' thresholds ascending, the controls well formed.
 * Throws HazardInputError with a path under "rules".
 */
export function validateRules(rules: unknown): asserts rules is TierRules {
  if (!isRecord(rules)) throw new HazardInputError(["rules"], "must be a tier-rules object");
  if (typeof rules.rulesVersion !== "string" || rules.rulesVersion.trim() === "") {
    throw new HazardInputError(["rules", "rulesVersion"], "must be a non-empty string");
  }
  const present = V2_UNITS.filter(([at]) => thresholdAt(rules, at) !== undefined);
  for (const [at, unitName] of [...EXPECTED_UNITS, ...present]) {
    const path = pathOf(at);
    const threshold = thresholdAt(rules, at);
    if (!isRecord(threshold)) throw new HazardInputError(path, "must be a threshold { value, unit, source }");
    if (typeof threshold.value !== "number" || !Number.isFinite(threshold.value) || threshold.value <= 0) {
      throw new HazardInputError([...path, "value"], "must be a positive finite number");
    }
    if (threshold.unit !== unitName) throw new HazardInputError([...path, "unit"], `must be "${unitName}"`);
    if (typeof threshold.source !== "string" || threshold.source.trim() === "") {
      throw new HazardInputError([...path, "source"], "must name where the number comes from");
    }
  }
  const r = completeRules(rules as TierRules);
  // Each chain runs from the lowest tier's threshold to the highest; a higher tier reached at a lower
  // value would make the lower tier unreachable.
  const chains: ReadonlyArray<ReadonlyArray<readonly [ThresholdPath, number]>> = [
    [
      [["touchSafe", "dcCurrent"], r.touchSafe.dcCurrent.value],
      [["reflex", "dcCurrent"], r.reflex.dcCurrent.value],
      [["lethal", "dcCurrent"], r.lethal.dcCurrent.value],
      [["arc", "dcCurrentLimit"], r.arc.dcCurrentLimit.value],
    ],
    [
      [["touchSafe", "acCurrentRms"], r.touchSafe.acCurrentRms.value],
      [["reflex", "acCurrentRms"], r.reflex.acCurrentRms.value],
      [["lethal", "acCurrentRms"], r.lethal.acCurrentRms.value],
    ],
    [
      [["reflex", "energy"], r.reflex.energy.value],
      [["lethal", "energy"], r.lethal.energy.value],
      [["arc", "energy"], r.arc.energy.value],
    ],
    [
      [["touchSafe", "dcVoltage"], r.touchSafe.dcVoltage.value],
      [["touchSafe", "capacitanceBandTop"], r.touchSafe.capacitanceBandTop.value],
      [["touchSafe", "chargeBandTop"], r.touchSafe.chargeBandTop.value],
    ],
  ];
  for (const chain of chains) {
    for (let i = 1; i < chain.length; i++) {
      if (!(chain[i][1] > chain[i - 1][1])) {
        throw new HazardInputError(
          [...pathOf(chain[i][0]), "value"],
          `must be above rules.${chain[i - 1][0].join(".")} (tiers ascend)`,
        );
      }
    }
  }
  // The touch-safe voltage must not sit above the voltages at which the higher tiers start.
  const floors: ReadonlyArray<readonly [ThresholdPath, ThresholdPath, number, number]> = [
    [
      ["touchSafe", "dcVoltage"],
      ["lethal", "energyMinVoltage"],
      r.touchSafe.dcVoltage.value,
      r.lethal.energyMinVoltage.value,
    ],
    [["touchSafe", "dcVoltage"], ["lethal", "dcMinVoltage"], r.touchSafe.dcVoltage.value, r.lethal.dcMinVoltage.value],
    [
      ["touchSafe", "dcVoltage"],
      ["arc", "energyMinVoltage"],
      r.touchSafe.dcVoltage.value,
      r.arc.energyMinVoltage.value,
    ],
    [["touchSafe", "dcVoltage"], ["arc", "dcMinVoltage"], r.touchSafe.dcVoltage.value, r.arc.dcMinVoltage.value],
    [
      ["touchSafe", "acVoltageRms"],
      ["lethal", "acMinVoltageRms"],
      r.touchSafe.acVoltageRms.value,
      r.lethal.acMinVoltageRms.value,
    ],
  ];
  for (const [lowerPath, higherPath, lower, higher] of floors) {
    if (!(lower <= higher)) {
      throw new HazardInputError([...pathOf(lowerPath), "value"], `must not exceed rules.${higherPath.join(".")}`);
    }
  }
  if (!Array.isArray(rules.controls)) throw new HazardInputError(["rules", "controls"], "must be a list of controls");
  rules.controls.forEach((control: unknown, index: number) => {
    const path = ["rules", "controls", index];
    if (!isRecord(control)) throw new HazardInputError(path, "must be { id, fromTier, text, source }");
    if (typeof control.id !== "string" || control.id === "")
      throw new HazardInputError([...path, "id"], "must be a non-empty string");
    if (![1, 2, 3, 4].includes(control.fromTier as number)) {
      throw new HazardInputError([...path, "fromTier"], "must be 1, 2, 3 or 4");
    }
    if (typeof control.text !== "string" || control.text.trim() === "") {
      throw new HazardInputError([...path, "text"], "must be a non-empty string");
    }
    if (typeof control.source !== "string") throw new HazardInputError([...path, "source"], "must be a string");
  });
}
