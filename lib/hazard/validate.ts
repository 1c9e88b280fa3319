// Refusing input the engine cannot compute with honestly, before any arithmetic: every refusal names
// the field's path. The upper bounds sit far beyond any teaching or research bench; they exist so that
// every product (E = ½·C·V², bleeder times, currents) stays a finite double.

import { HazardInputError } from "./errors";
import { gapBreakdown, type GapBreakdown } from "./gaps";
import type { SetupInput, SparkGap } from "./types";

export const INPUT_LIMITS = {
  /** Per unit, F: the largest supercapacitor cells hold a few thousand farads. */
  capacitance_F: 1e4,
  /** V: 100 MV, above the largest electrostatic accelerators. */
  voltage_V: 1e8,
  /** Units in one bank. */
  count: 1e5,
  /** m: a sphere terminal 200 m across is not apparatus. */
  radius_m: 100,
  /** Ω, for bleeders and series resistors: 1 PΩ is already an open circuit. */
  resistance_ohm: 1e15,
  /** Ω: a body model below 1 Ω is a short circuit, not a body. */
  bodyResistanceMin_ohm: 1,
  /** Ω: above 1 GΩ nothing is touched. */
  bodyResistanceMax_ohm: 1e9,
  /** A: 1 MA exceeds any laboratory supply's limit. */
  current_A: 1e6,
  /** Hz: 1 THz is light, not a supply. */
  frequency_Hz: 1e12,
} as const;

type Path = (string | number)[];

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function positive(value: unknown, path: Path, max: number, unitWord: string): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new HazardInputError(path, `must be a positive finite number of ${unitWord} (got ${describe(value)})`);
  }
  if (value > max) throw new HazardInputError(path, `must be at most ${max} ${unitWord} (got ${value})`);
}

function nonNegative(value: unknown, path: Path, max: number, unitWord: string): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value < 0) {
    throw new HazardInputError(path, `must be a finite number of ${unitWord}, zero or more (got ${describe(value)})`);
  }
  if (value > max) throw new HazardInputError(path, `must be at most ${max} ${unitWord} (got ${value})`);
}

function describe(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (value === undefined) return "nothing";
  if (value === null) return "null";
  return typeof value;
}

function optional(value: unknown, check: () => void): void {
  if (value !== undefined) check();
}

const KINDS = ["capacitor", "custom-capacitance", "sphere-terminal", "dc-supply", "ac-supply"] as const;

function checkSource(source: unknown, index: number, namedByGap: boolean): void {
  const at = (field: string): Path => ["sources", index, field];
  if (!isRecord(source)) throw new HazardInputError(["sources", index], "must be an energy source object");
  if (source.id !== undefined && typeof source.id !== "string")
    throw new HazardInputError(at("id"), "must be a string");
  const L = INPUT_LIMITS;
  switch (source.kind) {
    case "capacitor": {
      positive(source.capacitance_F, at("capacitance_F"), L.capacitance_F, "farads");
      positive(source.voltage_V, at("voltage_V"), L.voltage_V, "volts");
      const arrangement = source.arrangement;
      if (arrangement !== undefined && arrangement !== "parallel" && arrangement !== "series") {
        throw new HazardInputError(at("arrangement"), 'must be "parallel" or "series"');
      }
      const count = source.count;
      if (count !== undefined) {
        if (typeof count !== "number" || !Number.isInteger(count) || count < 1) {
          throw new HazardInputError(at("count"), `must be a whole number of 1 or more (got ${describe(count)})`);
        }
        if (count > L.count) throw new HazardInputError(at("count"), `must be at most ${L.count}`);
      }
      if (arrangement === "series" && (count ?? 1) < 2) {
        throw new HazardInputError(at("count"), "a series bank needs at least 2 capacitors");
      }
      optional(source.ratedVoltage_V, () =>
        positive(source.ratedVoltage_V, at("ratedVoltage_V"), L.voltage_V, "volts"),
      );
      optional(source.bleeder_ohm, () => positive(source.bleeder_ohm, at("bleeder_ohm"), L.resistance_ohm, "ohms"));
      optional(source.seriesResistance_ohm, () =>
        nonNegative(source.seriesResistance_ohm, at("seriesResistance_ohm"), L.resistance_ohm, "ohms"),
      );
      return;
    }
    case "custom-capacitance":
      positive(source.capacitance_F, at("capacitance_F"), L.capacitance_F, "farads");
      positive(source.voltage_V, at("voltage_V"), L.voltage_V, "volts");
      optional(source.bleeder_ohm, () => positive(source.bleeder_ohm, at("bleeder_ohm"), L.resistance_ohm, "ohms"));
      return;
    case "sphere-terminal":
      positive(source.radius_m, at("radius_m"), L.radius_m, "metres");
      if (source.voltage_V === undefined) {
        if (!namedByGap) {
          throw new HazardInputError(
            at("voltage_V"),
            "a sphere terminal needs a voltage, or a spark gap connected across it whose breakdown sets its voltage",
          );
        }
      } else {
        positive(source.voltage_V, at("voltage_V"), L.voltage_V, "volts");
      }
      return;
    case "dc-supply":
      positive(source.voltage_V, at("voltage_V"), L.voltage_V, "volts");
      positive(source.currentLimit_A, at("currentLimit_A"), L.current_A, "amperes");
      optional(source.seriesResistance_ohm, () =>
        nonNegative(source.seriesResistance_ohm, at("seriesResistance_ohm"), L.resistance_ohm, "ohms"),
      );
      optional(source.outputCapacitance_F, () =>
        positive(source.outputCapacitance_F, at("outputCapacitance_F"), L.capacitance_F, "farads"),
      );
      return;
    case "ac-supply":
      positive(source.voltageRms_V, at("voltageRms_V"), L.voltage_V, "volts");
      positive(source.frequency_Hz, at("frequency_Hz"), L.frequency_Hz, "hertz");
      positive(source.currentLimit_A, at("currentLimit_A"), L.current_A, "amperes");
      return;
    default:
      throw new HazardInputError(at("kind"), `must be one of ${KINDS.join(", ")} (got ${describe(source.kind)})`);
  }
}

/**
 * Throws HazardInputError (with the offending field's path) unless `input` is a SetupInput the engine
 * can assess. The zod schema in lib/apparatus/setup-schema.ts runs this too, so the API and the engine refuse
 * the same things.
 */
export function validateSetupInput(input: unknown): asserts input is SetupInput {
  checkSetupInput(input);
}

/** The id the engine gives a source: its own, or "source-N" (1-based) when it has none. */
export function sourceId(source: unknown, index: number): string {
  return isRecord(source) && typeof source.id === "string" && source.id !== "" ? source.id : `source-${index + 1}`;
}

/**
 * Checks a wiring list (`gaps[i].across`, `bleeders[i].across`): each entry a source id that exists
 * once, named once. Returns the source indexes it names.
 */
function checkAcross(value: unknown, path: Path, ids: readonly string[], required: boolean): number[] {
  if (value === undefined) {
    if (required) throw new HazardInputError(path, "must list the ids of the sources it is connected across");
    return [];
  }
  if (!Array.isArray(value)) throw new HazardInputError(path, "must be a list of source ids");
  if (required && value.length === 0) {
    throw new HazardInputError(path, "must name at least one source it is connected across");
  }
  const seen = new Set<string>();
  return value.map((entry, j) => {
    const at = [...path, j];
    if (typeof entry !== "string") throw new HazardInputError(at, "must be a source id");
    const matches = ids.flatMap((id, index) => (id === entry ? [index] : []));
    if (matches.length === 0) {
      throw new HazardInputError(at, `names "${entry}", which is not a source of this set-up (${ids.join(", ")})`);
    }
    if (matches.length > 1) {
      throw new HazardInputError(
        at,
        `names "${entry}", which ${matches.length} sources share: give each source its own id`,
      );
    }
    if (seen.has(entry)) throw new HazardInputError(at, `names "${entry}" twice`);
    seen.add(entry);
    return matches[0];
  });
}

export type CheckedSetup = {
  gaps: GapBreakdown[];
  /** Per gap, the indexes of the sources it is across. */
  gapAcross: number[][];
  /** Per bleeder of `bleeders`, the indexes of the sources it is across. */
  bleederAcross: number[][];
};

/** validateSetupInput that also hands back each gap's breakdown and the wiring, found while checking. */
export function checkSetupInput(input: unknown): CheckedSetup {
  if (!isRecord(input)) throw new HazardInputError([], "must be a set-up object with sources");
  const { sources, gaps, bleeders } = input;
  if (!Array.isArray(sources)) throw new HazardInputError(["sources"], "must be a list of energy sources");
  if (sources.length === 0) throw new HazardInputError(["sources"], "must hold at least one energy source");
  if (gaps !== undefined && !Array.isArray(gaps)) throw new HazardInputError(["gaps"], "must be a list of spark gaps");
  if (bleeders !== undefined && !Array.isArray(bleeders)) {
    throw new HazardInputError(["bleeders"], "must be a list of bleeders");
  }
  const ids = sources.map((source, index) => sourceId(source, index));
  const gapList = (gaps ?? []) as unknown[];
  const breakdowns = gapList.map((gap, index) => {
    if (!isRecord(gap)) throw new HazardInputError(["gaps", index], "must be a spark gap object");
    if (gap.id !== undefined && typeof gap.id !== "string") {
      throw new HazardInputError(["gaps", index, "id"], "must be a string");
    }
    return gapBreakdown(gap as SparkGap, index);
  });
  const gapAcross = gapList.map((gap, index) =>
    checkAcross((gap as Record<string, unknown>).across, ["gaps", index, "across"], ids, false),
  );
  const named = new Set(gapAcross.flat());
  sources.forEach((source, index) => checkSource(source, index, named.has(index)));
  const bleederAcross = ((bleeders ?? []) as unknown[]).map((bleeder, index) => {
    const at: Path = ["bleeders", index];
    if (!isRecord(bleeder)) throw new HazardInputError(at, "must be a bleeder object { resistance_ohm, across }");
    if (bleeder.id !== undefined && typeof bleeder.id !== "string") {
      throw new HazardInputError([...at, "id"], "must be a string");
    }
    positive(bleeder.resistance_ohm, [...at, "resistance_ohm"], INPUT_LIMITS.resistance_ohm, "ohms");
    const across = checkAcross(bleeder.across, [...at, "across"], ids, true);
    for (const [j, sourceIndex] of across.entries()) {
      const kind = (sources[sourceIndex] as Record<string, unknown>).kind;
      if (kind === "ac-supply") {
        throw new HazardInputError([...at, "across", j], "names an AC supply, which stores no charge to bleed");
      }
    }
    return across;
  });
  if (input.bodyResistance_ohm !== undefined) {
    const r = input.bodyResistance_ohm;
    positive(r, ["bodyResistance_ohm"], INPUT_LIMITS.bodyResistanceMax_ohm, "ohms");
    if ((r as number) < INPUT_LIMITS.bodyResistanceMin_ohm) {
      throw new HazardInputError(
        ["bodyResistance_ohm"],
        "must be at least 1 Ω: below that it models a short, not a body",
      );
    }
  }
  if (input.vacuumDevice !== undefined && typeof input.vacuumDevice !== "boolean") {
    throw new HazardInputError(["vacuumDevice"], "must be true or false");
  }
  return { gaps: breakdowns, gapAcross, bleederAcross };
}
