import {
  DEFAULT_RULES,
  HazardInputError,
  validateRules,
  type Dimension,
  type Threshold,
  type TierRules,
} from "@/lib/hazard";

// The engine's tier thresholds as rows of a form: what each number means in plain words, the unit it
// is typed in (the application form's SI notation, lib/hazard/units.ts) and its group. The rows follow
// TierRules (lib/hazard/types.ts); a test checks that every threshold of the defaults has exactly one
// row, so a threshold added to the engine cannot be left off the form. Pure: the admin form and the
// server's 422 messages both use it.

export type ThresholdPath = readonly [group: string, key: string | null];

export type ThresholdRow = {
  /** "lethal.energy"; the form's field name and the path under "rules" in a 422. */
  key: string;
  path: ThresholdPath;
  group: string;
  /** What the number decides, in plain words. */
  meaning: string;
  dimension: Dimension;
};

type GroupSpec = {
  group: string;
  title: string;
  rows: Array<[key: string | null, dimension: Dimension, meaning: string]>;
};

const GROUPS: Record<string, GroupSpec> = {
  bodyResistance: {
    group: "bodyResistance",
    title: "Body model",
    rows: [[null, "resistance", "Resistance of the body between the touched parts, when a set-up gives none"]],
  },
  safeVoltage: {
    group: "safeVoltage",
    title: "Body model",
    rows: [[null, "voltage", "Voltage a bleeder must bring a part down to before it counts as safe to touch"]],
  },
  touchSafe: {
    group: "touchSafe",
    title: "Tier 0 · touch-safe up to",
    rows: [
      ["dcVoltage", "voltage", "DC voltage at or below which a part is touch-safe"],
      ["acVoltageRms", "voltage", "AC voltage (rms) at or below which a part is touch-safe"],
      ["dcCurrent", "current", "DC current through the body that is still touch-safe"],
      ["acCurrentRms", "current", "AC current (rms) through the body that is still touch-safe"],
      ["capacitanceBandTop", "voltage", "Top of the voltage band in which the capacitance is what is limited"],
      ["capacitance", "capacitance", "Largest touch-safe capacitance in that band"],
      ["chargeBandTop", "voltage", "Top of the voltage band in which the charge is what is limited"],
      ["charge", "charge", "Largest touch-safe charge in that band"],
      ["energy", "energy", "Largest touch-safe stored energy above the charge band"],
    ],
  },
  reflex: {
    group: "reflex",
    title: "Tier 2 · reflex injury from",
    rows: [
      ["energy", "energy", "Stored energy from which a discharge gives a heavy shock"],
      ["dcCurrent", "current", "DC current through the body from which tier 2 applies"],
      ["acCurrentRms", "current", "AC current (rms) through the body from which tier 2 applies"],
    ],
  },
  lethal: {
    group: "lethal",
    title: "Tier 3 · lethal shock from",
    rows: [
      ["energy", "energy", "Stored energy from which a discharge can kill"],
      ["energyMinVoltage", "voltage", "…counted only at or above this voltage"],
      ["dcCurrent", "current", "DC current through the body from which tier 3 applies"],
      ["dcMinVoltage", "voltage", "…counted only at or above this DC voltage"],
      ["acCurrentRms", "current", "AC current (rms) through the body from which tier 3 applies"],
      ["acMinVoltageRms", "voltage", "…counted only at or above this AC voltage (rms)"],
    ],
  },
  arc: {
    group: "arc",
    title: "Tier 4 · arc and blast from",
    rows: [
      ["energy", "energy", "Stored energy from which an arc flash or blast is possible"],
      ["energyMinVoltage", "voltage", "…counted only at or above this voltage"],
      ["dcCurrentLimit", "current", "DC supply current limit from which an arc flash is possible"],
      ["dcMinVoltage", "voltage", "…counted only at or above this DC voltage"],
      ["acMinVoltageRms", "voltage", "AC power supply voltage (rms) from which an arc flash is possible"],
    ],
  },
  impulse: {
    group: "impulse",
    title: "Tier 3 · impulse through the body",
    rows: [
      ["specificEnergy", "specific energy", "Specific energy ∫i²dt of a discharge from which fibrillation is possible"],
      ["minDuration", "time", "Shortest discharge for which the published impulse data hold"],
    ],
  },
  discharge: {
    group: "discharge",
    title: "Discharge after use",
    rows: [
      ["time", "time", "Longest time a bleeder may take to bring a part to the safe voltage"],
      ["exemptCharge", "charge", "Charge at or below which a part needs no bleeder time"],
    ],
  },
  flags: {
    group: "flags",
    title: "Flags beside the tier",
    rows: [
      ["thermalMaxVoltage", "voltage", "Capacitors below this voltage are flagged as a burn hazard…"],
      ["thermalEnergy", "energy", "…when they store more than this energy"],
      ["dcThermalMaxVoltage", "voltage", "DC supplies below this voltage are flagged as a burn hazard…"],
      ["dcThermalPower", "power", "…when they can deliver more than this power"],
      ["xrayVoltage", "voltage", "Voltage from which a vacuum device is flagged for x-rays"],
      ["ozoneVoltage", "voltage", "Voltage from which corona and ozone are flagged"],
      ["ignitionEnergy", "energy", "Spark energy from which flammable vapours are flagged"],
      ["noBleederEnergy", "energy", "Stored energy from which a set-up without a bleeder is flagged"],
    ],
  },
  plausibility: {
    group: "plausibility",
    title: "Figures that look mistyped",
    rows: [
      ["bleederPower", "power", "A bleeder dissipating more than this is asked about"],
      ["minTimeToSafe", "time", "A discharge to the safe voltage faster than this is asked about"],
    ],
  },
};

/** The form's sections in order, each with its rows. */
export const THRESHOLD_SECTIONS: ReadonlyArray<{ title: string; rows: ThresholdRow[] }> = (() => {
  const sections: { title: string; rows: ThresholdRow[] }[] = [];
  for (const spec of Object.values(GROUPS)) {
    let section = sections.find((s) => s.title === spec.title);
    if (!section) {
      section = { title: spec.title, rows: [] };
      sections.push(section);
    }
    for (const [key, dimension, meaning] of spec.rows) {
      section.rows.push({
        key: key ? `${spec.group}.${key}` : spec.group,
        path: [spec.group, key],
        group: spec.group,
        meaning,
        dimension,
      });
    }
  }
  return sections;
})();

export const THRESHOLD_ROWS: readonly ThresholdRow[] = THRESHOLD_SECTIONS.flatMap((s) => s.rows);

const BY_KEY = new Map(THRESHOLD_ROWS.map((row) => [row.key, row]));

export function thresholdRow(key: string): ThresholdRow | undefined {
  return BY_KEY.get(key);
}

/** The threshold at a row's path (undefined when an older stored set lacks it). */
export function thresholdAt(rules: TierRules, path: ThresholdPath): Threshold | undefined {
  const outer = (rules as unknown as Record<string, unknown>)[path[0]];
  if (!outer || typeof outer !== "object") return undefined;
  const found = path[1] === null ? outer : (outer as Record<string, unknown>)[path[1]];
  return found && typeof found === "object" ? (found as Threshold) : undefined;
}

/** A rule set with the threshold at `path` replaced (a copy; the input is not changed). */
export function withThreshold(rules: TierRules, path: ThresholdPath, threshold: Threshold): TierRules {
  const out = structuredClone(rules) as unknown as Record<string, Record<string, unknown>>;
  if (path[1] === null) (out as Record<string, unknown>)[path[0]] = threshold;
  else out[path[0]] = { ...(out[path[0]] ?? {}), [path[1]]: threshold };
  return out as unknown as TierRules;
}

/** "Tier 3 · lethal shock from: Stored energy from which a discharge can kill" — a row named for people. */
export function thresholdName(key: string): string {
  const row = BY_KEY.get(key);
  if (!row) return `rules.${key}`;
  const title = GROUPS[row.group].title;
  return `${title}: ${row.meaning.replace(/^…/, "")}`;
}

/** The default threshold of a row (the engine's built-in value and source). */
export function defaultThreshold(row: ThresholdRow): Threshold {
  const found = thresholdAt(DEFAULT_RULES, row.path);
  if (!found) throw new Error(`no default for ${row.key}`);
  return found;
}

/** A finding about a rule set: its path under the rule set (no leading "rules") and what is wrong. */
export type RulesIssue = { path: (string | number)[]; message: string };

/**
 * The engine's check (validateRules) with its finding named for people: "rules.lethal.energy.value"
 * keeps its path, and the message says which threshold and, for tier order, which one it must exceed.
 */
export function checkTierRules(rules: unknown): RulesIssue | null {
  try {
    validateRules(rules);
    return null;
  } catch (error) {
    if (!(error instanceof HazardInputError)) throw error;
    const path = error.path[0] === "rules" ? error.path.slice(1) : error.path;
    const rowKey = path
      .map(String)
      .filter((p) => p !== "value" && p !== "unit" && p !== "source")
      .join(".");
    const named = BY_KEY.has(rowKey) ? `${thresholdName(rowKey)} (rules.${rowKey}) ` : "";
    // "must be above rules.reflex.energy (tiers ascend)": name the other threshold too.
    const problem = error.problem.replace(/rules\.([A-Za-z]+(?:\.[A-Za-z]+)?)/g, (whole, key: string) =>
      BY_KEY.has(key) ? `${thresholdName(key)} (${whole})` : whole,
    );
    return { path, message: `${named}${problem}` };
  }
}
