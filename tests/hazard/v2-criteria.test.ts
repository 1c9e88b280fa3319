import { describe, expect, it } from "vitest";
import { all, create } from "mathjs";
import { assessSetup, DEFAULT_RULES, isPreWiringSetup, upgradeSetup, type SetupInput } from "@/lib/hazard";
import { ac, cap, dc, expectWithin, inputError, setup } from "./support";

// Engine v2's new criteria, bleeders wired across sources and implausible input. Each check names
// where its expected value comes from; none is computed with the engine's own formula.

const math = create(all, { number: "BigNumber", precision: 40 });

/** Bleeder time t = R·C·ln(V/60 V) evaluated by mathjs in 40-digit arithmetic, an independent library. */
const mathjsTime = (R: number, C: number, V: number) =>
  Number(math.evaluate(`${R} * ${C} * log(${V} / 60)`).toString());

describe("AC power at or above 250 V rms is tier 4 (LBNL ESM Table 2.2.13, read in the text)", () => {
  it("puts a 400 V rms, 100 A supply in tier 4 (v1 stopped at tier 3)", () => {
    // the example; the table's arc-flash row: AC power ≥ 250 V
    const result = assessSetup(setup(ac(400, 100)));
    expect(result.tier).toBe(4);
    expect(result.reasons[0]).toMatchObject({ criterion: "arc-voltage-ac", tier: 4, threshold: 250 });
    expect(result.reasons[0].source).toContain("Table 2.2.13");
  });

  it("keeps 230 V rms mains below it", () => {
    // 230 V is below 250 V: 230 V / 500 Ω = 460 mA ≥ 30 mA → tier 3 (IEC 60364-4-41 30 mA, memory)
    expect(assessSetup(setup(ac(230, 16))).tier).toBe(3);
  });
});

describe("DC thermal flag (LBNL ESM Table 2.2.13, thermal: DC below 100 V above 1000 W)", () => {
  it("flags a 48 V, 50 A supply (2.4 kW) and not a 48 V, 10 A one (480 W)", () => {
    // 48 V × 50 A = 2400 W > 1000 W; 48 V × 10 A = 480 W (arithmetic on the table's row)
    expect(assessSetup(setup(dc(48, 50))).flags.map((f) => f.code)).toContain("thermal");
    expect(assessSetup(setup(dc(48, 10))).flags.map((f) => f.code)).not.toContain("thermal");
  });

  it("does not flag at 100 V, where the shock rows apply instead", () => {
    expect(assessSetup(setup(dc(100, 50))).flags.map((f) => f.code)).not.toContain("thermal");
  });
});

describe("5 s discharge (IEC 60204-1 6.2.4, read in the text)", () => {
  it("flags 100 µF at 400 V on a 100 kΩ bleeder (19 s) and names the 26.4 kΩ that meets 5 s", () => {
    // 100 µF from 400 V to 60 V in 5 s needs R ≤ 26.4 kΩ (mathjs: 5 s / (100 µF · ln(400/60)));
    // 100 kΩ takes 19.0 s (mathjs below)
    const result = assessSetup(setup(cap(100e-6, 400, { id: "bank", bleeder_ohm: 100e3 })));
    expectWithin(result.timeToSafe_s as number, mathjsTime(100e3, 100e-6, 400), 1e-12);
    expectWithin(result.timeToSafe_s as number, 19.0, 0.005);
    const flag = result.flags.find((f) => f.code === "discharge-time");
    expect(flag?.message).toContain("26.4 kΩ");
    expect(flag?.message).toContain("19.0 s");
    expect(flag?.source).toContain("IEC 60204-1");
  });

  it("does not flag a bleeder that meets 5 s", () => {
    const result = assessSetup(setup(cap(100e-6, 400, { bleeder_ohm: 26e3 })));
    expect(result.flags.map((f) => f.code)).not.toContain("discharge-time");
  });

  it("exempts a part storing at most 60 µC", () => {
    // 60 µC exemption of 6.2.4: 6 nF at 10 kV holds 60 µC (Q = C·V); 6.1 nF holds 61 µC
    const exempt = assessSetup(setup(cap(6e-9, 10e3, { bleeder_ohm: 1e12 })));
    expect(exempt.flags.map((f) => f.code)).not.toContain("discharge-time");
    const over = assessSetup(setup(cap(6.1e-9, 10e3, { bleeder_ohm: 1e12 })));
    expect(over.flags.map((f) => f.code)).toContain("discharge-time");
  });
});

describe("∫i²dt of a capacitor discharge (IEC 60479-2, threshold from memory)", () => {
  it("puts 1999 µF at 100 V (9.99 J, τ = 1 s) in tier 3 by its ∫i²dt", () => {
    // ∫i²dt by trapezoid integration of i(t) = (V/R)·e^(−t/RC), R = 500 Ω: about 0.02 A²s, above the
    // 0.0025 A²s (500 mA for 10 ms, IEC 60479-1 curve c1, read in a textbook reproduction)
    const R = 500;
    const C = 1999e-6;
    const i = (t: number) => (100 / R) * Math.exp(-t / (R * C));
    let integral = 0;
    const steps = 100_000;
    const span = 30 * R * C;
    for (let k = 0; k < steps; k++) {
      const a = (k * span) / steps;
      const b = ((k + 1) * span) / steps;
      integral += ((i(a) ** 2 + i(b) ** 2) / 2) * (b - a);
    }
    const result = assessSetup(setup(cap(C, 100)));
    expect(result.tier).toBe(3);
    const reason = result.reasons.find((r) => r.criterion === "impulse-specific-energy");
    expectWithin(reason?.value as number, integral, 1e-6);
    expect(reason?.source).toContain("IEC 60479-2");
    expect(reason?.source).toContain("from memory");
  });

  it("leaves discharges shorter than 0.1 ms to the energy criteria", () => {
    // 10 nF at 20 kV: τ = 5 µs, outside the standard's 0.1–10 ms data: 2 J stays tier 2
    const result = assessSetup(setup(cap(10e-9, 20e3)));
    expect(result.reasons.map((r) => r.criterion)).not.toContain("impulse-specific-energy");
    expect(result.tier).toBe(2);
  });
});

describe("bleeders wired across sources", () => {
  const terminal = { id: "T", kind: "sphere-terminal", radius_m: 0.15, voltage_V: 100e3 } as const;
  const jars = cap(1e-9, 25e3, { id: "J", count: 4 });

  it("discharges a sphere terminal and a jar bank through one 200 MΩ bleeder (v1: 'no bleeder')", () => {
    const input: SetupInput = {
      sources: [terminal, jars],
      bleeders: [{ id: "B1", resistance_ohm: 200e6, across: ["T", "J"] }],
    };
    const result = assessSetup(input);
    expect(result.flags.map((f) => f.code)).not.toContain("no-bleeder");
    // the bleeder sees both capacitances: 4·π·ε0·0.15 m (16.7 pF) + 4 nF, from the highest voltage 100 kV
    const C = Number(math.evaluate("4 * pi * 8.8541878128e-12 * 0.15 + 4e-9").toString());
    expectWithin(result.timeToSafe_s as number, mathjsTime(200e6, C, 100e3), 1e-9);
  });

  it("refuses a bleeder across nothing, an unknown source or an AC supply, naming the field", () => {
    expect(
      inputError(() => assessSetup({ sources: [jars], bleeders: [{ resistance_ohm: 1e6, across: [] }] })).field,
    ).toBe("bleeders[0].across");
    expect(
      inputError(() => assessSetup({ sources: [jars], bleeders: [{ resistance_ohm: 1e6, across: ["J", "X"] }] })).field,
    ).toBe("bleeders[0].across[1]");
    expect(
      inputError(() =>
        assessSetup({
          sources: [jars, { ...ac(230, 1), id: "mains" }],
          bleeders: [{ resistance_ohm: 1e6, across: ["mains"] }],
        }),
      ).field,
    ).toBe("bleeders[0].across[0]");
  });
});

describe("implausible input asks to be confirmed", () => {
  it("flags a 200 mΩ bleeder on a 40 kV bank: 8 GW in the resistor", () => {
    // P = V²/R = (40 kV)² / 0.2 Ω = 8 GW, far above 1 kW (arithmetic)
    const result = assessSetup(setup(cap(1e-6, 40e3, { bleeder_ohm: 0.2 })));
    const flag = result.flags.find((f) => f.code === "implausible");
    expect(flag?.field).toBe("sources[0].bleeder_ohm");
    expect(flag?.message).toContain("8.00 GW");
  });

  it("flags a discharge to 60 V faster than 1 µs", () => {
    // 1 nF at 1 kV through 100 Ω: 100 ns × ln(1000/60) = 281 ns (mathjs); 10 kW → the power flag
    // comes first, so use 10 kΩ at 1 kV: 100 W, 28 µs — no flag; and 10 pF through 10 kΩ: 281 ns
    const fast = assessSetup(setup(cap(10e-12, 1000, { bleeder_ohm: 10e3 })));
    expectWithin(fast.timeToSafe_s as number, mathjsTime(10e3, 10e-12, 1000), 1e-9);
    expect(fast.flags.find((f) => f.code === "implausible")?.message).toContain("under 1.00 µs");
    const slow = assessSetup(setup(cap(1e-9, 1000, { bleeder_ohm: 10e3 })));
    expect(slow.flags.map((f) => f.code)).not.toContain("implausible");
  });

  it("flags a sphere terminal set beyond what air lets it hold, and a capacitor of 1 F at 40 kV", () => {
    // 3 MV/m × 5 cm = 150 kV (air's electric strength, about 30 kV/cm, AMS Glossary, read in the text)
    const sphere = assessSetup(setup({ kind: "sphere-terminal", radius_m: 0.05, voltage_V: 1e6 }));
    expect(sphere.flags.find((f) => f.code === "implausible")?.field).toBe("sources[0].voltage_V");
    const huge = assessSetup(setup(cap(1, 40e3)));
    expect(huge.flags.find((f) => f.code === "implausible")?.field).toBe("sources[0].capacitance_F");
  });
});

describe("older set-ups and rule sets", () => {
  it("wires an old set-up's gaps across its voltage-less sphere terminals only, and says so", () => {
    const old: SetupInput = {
      sources: [{ id: "Terminal", kind: "sphere-terminal", radius_m: 0.3 }, cap(1e-6, 10e3, { id: "bank" })],
      gaps: [{ sphereDiameter_m: 0.25, spacing_m: 0.08 }],
    };
    expect(isPreWiringSetup(old)).toBe(true);
    const { setup: upgraded, rewired } = upgradeSetup(old);
    expect(rewired).toBe(true);
    expect(upgraded.gaps?.[0].across).toEqual(["Terminal"]);
    // the bank is no longer capped: 50 J at 10 kV, tier 3
    expect(assessSetup(upgraded).perSource[1].voltage_V).toBe(10e3);
    expect(upgradeSetup(upgraded).rewired).toBe(false);
  });

  it("assesses with a stored rule set adopted before v2's thresholds, taking their defaults", () => {
    const older = structuredClone(DEFAULT_RULES) as unknown as Record<string, Record<string, unknown>>;
    delete older.impulse;
    delete older.discharge;
    delete older.plausibility;
    delete older.arc.acMinVoltageRms;
    older.rulesVersion = "older-1" as never;
    const result = assessSetup(setup(ac(400, 100)), older as never);
    expect(result.tier).toBe(4);
    expect(result.rulesVersion).toBe("older-1");
  });
});
