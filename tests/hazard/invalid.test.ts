import { describe, expect, it } from "vitest";
import { assessSetup, HazardInputError, type SetupInput } from "@/lib/hazard";
import { setupInputSchema, toSetupInput } from "@/lib/apparatus/setup-schema";
import { cap, dc, inputError } from "./support";

// Input the engine refuses: each case must throw HazardInputError naming the field, never return a
// NaN or an Infinity. The zod schema behind POST /api/assess must refuse the same input at the same
// path (so the API answers 422 naming the field).

const gap = { sphereDiameter_m: 0.05, spacing_m: 0.01 };

const refused: ReadonlyArray<readonly [string, unknown, ReadonlyArray<string | number>]> = [
  ["no sources", { sources: [] }, ["sources"]],
  ["sources missing", {}, ["sources"]],
  [
    "zero capacitance",
    { sources: [{ kind: "capacitor", capacitance_F: 0, voltage_V: 100 }] },
    ["sources", 0, "capacitance_F"],
  ],
  [
    "negative capacitance",
    { sources: [{ kind: "capacitor", capacitance_F: -1e-6, voltage_V: 100 }] },
    ["sources", 0, "capacitance_F"],
  ],
  [
    "NaN capacitance",
    { sources: [{ kind: "custom-capacitance", capacitance_F: Number.NaN, voltage_V: 100 }] },
    ["sources", 0, "capacitance_F"],
  ],
  ["infinite voltage", { sources: [cap(1e-6, 100), cap(1e-6, Number.POSITIVE_INFINITY)] }, ["sources", 1, "voltage_V"]],
  ["zero voltage", { sources: [cap(1e-6, 0)] }, ["sources", 0, "voltage_V"]],
  ["negative voltage", { sources: [cap(1e-6, -5)] }, ["sources", 0, "voltage_V"]],
  [
    "voltage as text",
    { sources: [{ kind: "capacitor", capacitance_F: 1e-6, voltage_V: "100" }] },
    ["sources", 0, "voltage_V"],
  ],
  ["zero radius", { sources: [{ kind: "sphere-terminal", radius_m: 0, voltage_V: 1e5 }] }, ["sources", 0, "radius_m"]],
  [
    "negative radius",
    { sources: [{ kind: "sphere-terminal", radius_m: -0.1, voltage_V: 1e5 }] },
    ["sources", 0, "radius_m"],
  ],
  [
    "sphere with neither voltage nor gap",
    { sources: [{ kind: "sphere-terminal", radius_m: 0.1 }] },
    ["sources", 0, "voltage_V"],
  ],
  ["zero count", { sources: [cap(1e-6, 100, { count: 0 })] }, ["sources", 0, "count"]],
  ["fractional count", { sources: [cap(1e-6, 100, { count: 2.5 })] }, ["sources", 0, "count"]],
  ["series bank of one", { sources: [cap(1e-6, 100, { count: 1, arrangement: "series" })] }, ["sources", 0, "count"]],
  ["series bank without a count", { sources: [cap(1e-6, 100, { arrangement: "series" })] }, ["sources", 0, "count"]],
  ["unknown arrangement", { sources: [{ ...cap(1e-6, 100), arrangement: "star" }] }, ["sources", 0, "arrangement"]],
  ["zero bleeder", { sources: [cap(1e-6, 100, { bleeder_ohm: 0 })] }, ["sources", 0, "bleeder_ohm"]],
  [
    "negative series resistance",
    { sources: [cap(1e-6, 100, { seriesResistance_ohm: -1 })] },
    ["sources", 0, "seriesResistance_ohm"],
  ],
  ["zero rating", { sources: [cap(1e-6, 100, { ratedVoltage_V: 0 })] }, ["sources", 0, "ratedVoltage_V"]],
  ["zero current limit", { sources: [dc(100, 0)] }, ["sources", 0, "currentLimit_A"]],
  [
    "zero output capacitance",
    { sources: [dc(100, 1, { outputCapacitance_F: 0 })] },
    ["sources", 0, "outputCapacitance_F"],
  ],
  [
    "zero frequency",
    { sources: [{ kind: "ac-supply", voltageRms_V: 230, frequency_Hz: 0, currentLimit_A: 1 }] },
    ["sources", 0, "frequency_Hz"],
  ],
  [
    "negative rms voltage",
    { sources: [{ kind: "ac-supply", voltageRms_V: -230, frequency_Hz: 50, currentLimit_A: 1 }] },
    ["sources", 0, "voltageRms_V"],
  ],
  ["unknown kind", { sources: [{ kind: "battery", voltage_V: 12 }] }, ["sources", 0, "kind"]],
  ["absurd capacitance", { sources: [cap(1e300, 100)] }, ["sources", 0, "capacitance_F"]],
  ["absurd voltage", { sources: [cap(1e-6, 1e300)] }, ["sources", 0, "voltage_V"]],
  ["body resistance below 1 Ω", { sources: [cap(1e-6, 100)], bodyResistance_ohm: 1e-300 }, ["bodyResistance_ohm"]],
  ["zero body resistance", { sources: [cap(1e-6, 100)], bodyResistance_ohm: 0 }, ["bodyResistance_ohm"]],
  [
    "gap spacing beyond 100 cm",
    { sources: [cap(1e-6, 100)], gaps: [gap, { sphereDiameter_m: 0.5, spacing_m: 1.2 }] },
    ["gaps", 1, "spacing_m"],
  ],
  [
    "gap too small for either method",
    { sources: [cap(1e-6, 100)], gaps: [{ sphereDiameter_m: 0.05, spacing_m: 1e-5 }] },
    ["gaps", 0, "spacing_m"],
  ],
  [
    "negative gap diameter",
    { sources: [cap(1e-6, 100)], gaps: [{ sphereDiameter_m: -1, spacing_m: 0.01 }] },
    ["gaps", 0, "sphereDiameter_m"],
  ],
  ["gap pressure zero", { sources: [cap(1e-6, 100)], gaps: [{ ...gap, pressure_Pa: 0 }] }, ["gaps", 0, "pressure_Pa"]],
  [
    "gap below absolute zero",
    { sources: [cap(1e-6, 100)], gaps: [{ ...gap, temperature_C: -274 }] },
    ["gaps", 0, "temperature_C"],
  ],
];

describe("the engine refuses invalid input with HazardInputError and the field's path", () => {
  it.each(refused)("%s", (_name, input, path) => {
    const error = inputError(() => assessSetup(input as SetupInput));
    expect(error).toBeInstanceOf(HazardInputError);
    expect(error.name).toBe("HazardInputError");
    expect(error.path).toEqual(path);
    expect(error.message.startsWith(error.field)).toBe(true);
  });

  it("names the field as text, e.g. sources[0].capacitance_F", () => {
    const error = inputError(() => assessSetup(cast({ sources: [cap(-1, 100)] })));
    expect(error.field).toBe("sources[0].capacitance_F");
    expect(error.message).toContain("sources[0].capacitance_F");
  });

  it("refuses something that is not a set-up at all", () => {
    expect(inputError(() => assessSetup(null as unknown as SetupInput)).path).toEqual([]);
    expect(inputError(() => assessSetup(cast({ sources: "capacitor" }))).path).toEqual(["sources"]);
    expect(inputError(() => assessSetup(cast({ sources: [null] }))).path).toEqual(["sources", 0]);
    expect(inputError(() => assessSetup(cast({ sources: [cap(1e-6, 100)], gaps: [7] }))).path).toEqual(["gaps", 0]);
  });
});

describe("setupInputSchema (POST /api/assess answers 422 with these paths)", () => {
  it.each(refused)("refuses %s at the same path", (_name, input, path) => {
    const result = setupInputSchema.safeParse(input);
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((issue) => issue.path)).toContainEqual(path);
  });

  it("reports a cross-field problem once, with a readable message", () => {
    const result = setupInputSchema.safeParse({ sources: [{ kind: "sphere-terminal", radius_m: 0.1 }] });
    expect(result.error?.issues).toHaveLength(1);
    expect(result.error?.issues[0].message).toMatch(/^A sphere terminal needs a voltage/);
  });

  it("refuses unknown fields, so a mistyped bleeder is never silently ignored", () => {
    const result = setupInputSchema.safeParse({ sources: [{ ...cap(1e-6, 1000), bleeder_Ohm: 1e6 }] });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].path).toEqual(["sources", 0]);
    expect(result.error?.issues[0].code).toBe("unrecognized_keys");
  });

  it("accepts every source kind and hands the engine a SetupInput", () => {
    const input = {
      sources: [
        {
          id: "bank",
          kind: "capacitor",
          capacitance_F: 1e-6,
          voltage_V: 1e4,
          count: 2,
          arrangement: "series",
          ratedVoltage_V: 6e3,
          bleeder_ohm: 1e8,
          seriesResistance_ohm: 0,
        },
        { kind: "custom-capacitance", capacitance_F: 1e-9, voltage_V: 5e3, bleeder_ohm: 1e9 },
        { kind: "sphere-terminal", radius_m: 0.1 },
        {
          kind: "dc-supply",
          voltage_V: 3e4,
          currentLimit_A: 1e-3,
          seriesResistance_ohm: 1e6,
          outputCapacitance_F: 1e-9,
        },
        { kind: "ac-supply", voltageRms_V: 230, frequency_Hz: 50, currentLimit_A: 10 },
      ],
      gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.01, pressure_Pa: 101325, temperature_C: 20, across: ["source-3"] }],
      bodyResistance_ohm: 1000,
      vacuumDevice: false,
    };
    const parsed = setupInputSchema.parse(input);
    expect(parsed).toEqual(input);
    expect(assessSetup(toSetupInput(parsed)).perSource).toHaveLength(5);
  });

  it("refuses more than 200 sources", () => {
    const many = Array.from({ length: 201 }, () => cap(1e-9, 100));
    expect(setupInputSchema.safeParse({ sources: many }).error?.issues[0].path).toEqual(["sources"]);
  });
});

function cast(value: unknown): SetupInput {
  return value as SetupInput;
}
