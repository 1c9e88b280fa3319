// The default tier rules of hazard-model.md as data: every threshold in SI base units with the place
// its number was read ("memory" where no published text was seen, "common practice" where it is a
// rule of the trade), plus the controls each tier requires. An institution may store stricter rules of
// the same shape; validateRules() is the minimal check such a stored object gets before use.

import { HazardInputError } from "./errors";
import type { ControlRule, Threshold, Tier, TierRules } from "./types";

export const TIER_LABELS: Readonly<Record<Tier, string>> = {
  0: "Touch-safe",
  1: "Sting",
  2: "Reflex injury",
  3: "Lethal shock",
  4: "Arc and blast",
};

const t = (value: number, unit: string, source: string): Threshold => ({ value, unit, source });

const COMMON_PRACTICE = "common practice";
const CAPACITANCE_LEVELS =
  "IEC 60335-1 8.1.4 (quoted text, hazard-references §2b); the same levels in IEC 61010-1 6.3 (memory, §2a)";

export const DEFAULT_RULES: TierRules = {
  rulesVersion: "benchclear-default-1",
  bodyResistance: t(500, "Ω", "worst-case hand to hand, common practice (hazard-references §3b)"),
  safeVoltage: t(60, "V", "IEC 60204-1 6.2.4: residual voltage at or below 60 V (hazard-references §6a)"),
  touchSafe: {
    dcVoltage: t(60, "V", "IEC 62368-1 ES1, 60 V DC (memory; hazard-references §2c)"),
    acVoltageRms: t(30, "V", "IEC 62368-1 ES1, 30 V rms (memory; hazard-references §2c)"),
    dcCurrent: t(
      0.002,
      "A",
      "IEC 61010-1 touch current 2 mA DC (found in an instrument manual, clause 6.3.1 from memory); IEC 60335-1 8.1.4 (hazard-references §2a, §2b)",
    ),
    acCurrentRms: t(
      0.0005,
      "A",
      "IEC 61010-1 touch current 0.5 mA rms (found in an instrument manual); IEC 62368-1 ES1 (memory) (hazard-references §2a, §2c)",
    ),
    capacitanceBandTop: t(450, "V", CAPACITANCE_LEVELS),
    capacitance: t(1e-7, "F", CAPACITANCE_LEVELS),
    chargeBandTop: t(15_000, "V", CAPACITANCE_LEVELS),
    charge: t(45e-6, "C", CAPACITANCE_LEVELS),
    energy: t(0.35, "J", CAPACITANCE_LEVELS),
  },
  reflex: {
    energy: t(0.25, "J", "capacitor discharge guideline: 0.25 J gives a heavy shock (hazard-references §1c)"),
    dcCurrent: t(0.025, "A", "IEC 62368-1 ES2, 25 mA DC (memory; hazard-references §2c)"),
    acCurrentRms: t(
      0.005,
      "A",
      "LBNL Electrical Safety Manual Table 2.2.13, AC shock at 5 mA; IEC 62368-1 ES2, 5 mA rms (memory) (hazard-references §1a, §2c)",
    ),
  },
  lethal: {
    energy: t(
      10,
      "J",
      "LBNL Electrical Safety Manual Table 2.2.13, capacitors at 100 V or more and 10 J or more (hazard-references §1a)",
    ),
    energyMinVoltage: t(100, "V", "LBNL Electrical Safety Manual Table 2.2.13 (hazard-references §1a)"),
    dcCurrent: t(
      0.04,
      "A",
      "LBNL Electrical Safety Manual Table 2.2.13, DC at 100 V or more and 40 mA or more (hazard-references §1a)",
    ),
    dcMinVoltage: t(100, "V", "LBNL Electrical Safety Manual Table 2.2.13 (hazard-references §1a)"),
    acCurrentRms: t(0.03, "A", "IEC 60479-1 fibrillation zone, about 30 mA (memory; hazard-references §3c)"),
    acMinVoltageRms: t(
      50,
      "V",
      "LBNL Electrical Safety Manual Table 2.2.13 and NFPA 70E, 50 V AC (hazard-references §1a)",
    ),
  },
  arc: {
    energy: t(
      10_000,
      "J",
      "LBNL Electrical Safety Manual, arc flash: capacitors at 100 V or more and 10 kJ or more (hazard-references §1a)",
    ),
    energyMinVoltage: t(100, "V", "LBNL Electrical Safety Manual, arc flash (hazard-references §1a)"),
    dcCurrentLimit: t(
      500,
      "A",
      "LBNL Electrical Safety Manual, arc flash: DC at 100 V or more and 500 A or more (hazard-references §1a)",
    ),
    dcMinVoltage: t(100, "V", "LBNL Electrical Safety Manual, arc flash (hazard-references §1a)"),
  },
  flags: {
    thermalMaxVoltage: t(
      100,
      "V",
      "LBNL Electrical Safety Manual, thermal: capacitors below 100 V and above 100 J (hazard-references §1a)",
    ),
    thermalEnergy: t(100, "J", "LBNL Electrical Safety Manual, thermal (hazard-references §1a)"),
    xrayVoltage: t(
      10_000,
      "V",
      "practitioner reports of x-rays from vacuum devices from about 10 kV; no published threshold (hazard-references §6d)",
    ),
    ozoneVoltage: t(
      10_000,
      "V",
      "corona and open sparks make ozone, common practice; OSHA PEL 0.1 ppm (hazard-references §6c)",
    ),
    ignitionEnergy: t(2e-4, "J", "minimum ignition energy of common flammable vapours, about 0.2 mJ (memory)"),
    noBleederEnergy: t(
      0.1,
      "J",
      "capacitor discharge guideline: above 0.1 J provide a means of discharge (hazard-references §1c)",
    ),
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
  for (const [at, unitName] of EXPECTED_UNITS) {
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
  const r = rules as TierRules;
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
