import { all, create } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  assessSetup,
  coaxialCapacitance_F,
  DEFAULT_RULES,
  parallelPlateCapacitance_F,
  sphereCapacitance_F,
  type TierRules,
} from "@/lib/hazard";
import { ac, cap, dc, expectWithin, setup } from "./support";

// The engine's physics checked against values from outside the code: published worked examples and
// standards' figures where they exist, otherwise the quantity evaluated by mathjs (an independent
// library, with its own units and CODATA constants) from the physical definition. Each check names
// its source; tolerances are those of the printed figure (three digits: ±0.5 %) unless the source
// states its own.

const THREE_DIGITS = 0.005;
const math = create(all, {});
/** A quantity evaluated by mathjs with units, e.g. mj("0.5 * 1 uF * (10 kV)^2", "J"). */
const mj = (expression: string, unit: string): number => math.evaluate(expression).toNumber(unit);

describe("capacitance of shapes", () => {
  it("gives 111.3 pF for an isolated sphere of radius 1 m", () => {
    // mathjs: 4·π·ε0·1 m with mathjs's electricConstant (111.265 pF)
    expectWithin(sphereCapacitance_F(1), mj("4 * pi * electricConstant * 1 m", "F"), 1e-6);
  });

  it("gives 11.1 pF for radius 0.1 m and 5.56 pF for a 10 cm diameter", () => {
    // a physics study guide's worked example: an isolated sphere of radius 10 cm has 11.1 pF
    expectWithin(sphereCapacitance_F(0.1), 11.1e-12, THREE_DIGITS);
    // mathjs: 4·π·ε0·5 cm
    expectWithin(sphereCapacitance_F(0.05), mj("4 * pi * electricConstant * 5 cm", "F"), 1e-6);
  });

  it("gives 88.5 pF for 10 × 10 cm plates 1 mm apart in air", () => {
    // the same study guide's worked example: 10 cm × 10 cm plates 1 mm apart in air, 88.5 pF
    expectWithin(parallelPlateCapacitance_F(0.1 * 0.1, 0.001), 88.5e-12, THREE_DIGITS);
  });

  it("gives 1.06 nF for the jar example, and 1.04 nF by the flat-plate estimate", () => {
    // mathjs: coaxial cylinders 2·π·ε0·εr·L / ln(b/a), a = 5 cm, b = 5.2 cm (2 mm glass), L = 15 cm, εr = 5
    expectWithin(
      coaxialCapacitance_F(0.15, 0.05, 0.052, 5),
      mj("2 * pi * electricConstant * 5 * 15 cm / log(5.2 / 5)", "F"),
      1e-6,
    );
    // mathjs: the flat-plate estimate ε0·εr·(2·π·a·L) / 2 mm; within 2 % of the coaxial value, as thin glass should be
    expectWithin(
      parallelPlateCapacitance_F(2 * Math.PI * 0.05 * 0.15, 0.002, 5),
      mj("electricConstant * 5 * 2 * pi * 5 cm * 15 cm / 2 mm", "F"),
      1e-6,
    );
  });

  it("counts a sphere terminal with C = 4·π·ε0·r", () => {
    const result = assessSetup(setup({ kind: "sphere-terminal", radius_m: 0.1, voltage_V: 1000 }));
    // the study guide's 11.1 pF for a 10 cm radius
    expectWithin(result.capacitance_F, 11.1e-12, THREE_DIGITS);
  });
});

describe("RC body model against the discharge models of the ESD standards", () => {
  it("human-body model 100 pF / 1500 Ω at 2 kV: 0.2 mJ, 0.2 µC, 1.33 A, 150 ns", () => {
    const result = assessSetup({ sources: [cap(100e-12, 2000)], bodyResistance_ohm: 1500 });
    // mathjs: ½·C·V², C·V, V/R and R·C with units
    expectWithin(result.energy_J, mj("0.5 * 100 pF * (2 kV)^2", "J"), 1e-9);
    expectWithin(result.charge_C, mj("100 pF * 2 kV", "C"), 1e-9);
    expectWithin(result.peakCurrent_A, mj("2 kV / 1500 ohm", "A"), 1e-9);
    expectWithin(result.timeConstant_s, mj("1500 ohm * 100 pF", "s"), 1e-9);
    // ANSI/ESDA/JEDEC JS-001 human-body-model waveform at 2000 V (memory): peak current 1.20–1.48 A,
    // decay time 130–170 ns. The RC model of the same network must fall inside both bands.
    expect(result.peakCurrent_A).toBeGreaterThanOrEqual(1.2);
    expect(result.peakCurrent_A).toBeLessThanOrEqual(1.48);
    expect(result.timeConstant_s).toBeGreaterThanOrEqual(130e-9);
    expect(result.timeConstant_s).toBeLessThanOrEqual(170e-9);
  });

  it("IEC 61000-4-2, 150 pF / 330 Ω at 8 kV: 4.8 mJ, 1.2 µC, 24.2 A, 49.5 ns", () => {
    const result = assessSetup({ sources: [cap(150e-12, 8000)], bodyResistance_ohm: 330 });
    // mathjs: ½·C·V², C·V, V/R and R·C with units
    expectWithin(result.energy_J, mj("0.5 * 150 pF * (8 kV)^2", "J"), 1e-9);
    expectWithin(result.charge_C, mj("150 pF * 8 kV", "C"), 1e-9);
    expectWithin(result.peakCurrent_A, mj("8 kV / 330 ohm", "A"), 1e-9);
    expectWithin(result.timeConstant_s, mj("330 ohm * 150 pF", "s"), 1e-9);
    // IEC 61000-4-2 (2008) Table 1, contact discharge at 8 kV: first peak 30 A ±15 %, 16 A ±30 % at
    // 30 ns, 8 A ±30 % at 60 ns. The first peak is the fast spike of the generator's own stray
    // capacitance, which the RC model leaves out, so the model stays below it; the tail after it is the
    // 150 pF / 330 Ω network's own, so the model's current i = I_peak·e^(−t/τ) falls inside both bands.
    expect(result.peakCurrent_A).toBeLessThan(30 * 0.85);
    const at = (t: number) => result.peakCurrent_A * Math.exp(-t / result.timeConstant_s);
    expect(at(30e-9)).toBeGreaterThanOrEqual(16 * 0.7);
    expect(at(30e-9)).toBeLessThanOrEqual(16 * 1.3);
    expect(at(60e-9)).toBeGreaterThanOrEqual(8 * 0.7);
    expect(at(60e-9)).toBeLessThanOrEqual(8 * 1.3);
  });

  it("series resistance adds to the body resistance (HBM network as 500 Ω body + 1000 Ω)", () => {
    const result = assessSetup(setup(cap(100e-12, 2000, { seriesResistance_ohm: 1000 })));
    // mathjs: 2 kV across 500 Ω + 1000 Ω in series
    expectWithin(result.peakCurrent_A, mj("2 kV / (500 ohm + 1000 ohm)", "A"), 1e-9);
  });

  it("sphere R = 0.1 m at 300 kV into 1 kΩ: 0.50 J, 3.34 µC, 300 A, 11 ns", () => {
    const result = assessSetup({
      sources: [{ kind: "sphere-terminal", radius_m: 0.1, voltage_V: 300e3 }],
      bodyResistance_ohm: 1000,
    });
    // mathjs: C = 4·π·ε0·0.1 m, then ½·C·V², C·V, V/R, R·C
    const C = "(4 * pi * electricConstant * 0.1 m)";
    expectWithin(result.energy_J, mj(`0.5 * ${C} * (300 kV)^2`, "J"), 1e-6);
    expectWithin(result.charge_C, mj(`${C} * 300 kV`, "C"), 1e-6);
    expectWithin(result.peakCurrent_A, mj("300 kV / 1 kohm", "A"), 1e-9);
    expectWithin(result.timeConstant_s, mj(`1 kohm * ${C}`, "s"), 1e-6);
  });

  it("1 µF at 10 kV into 1 kΩ: 50 J, 10 mC, 10 A, 1 ms", () => {
    const result = assessSetup({ sources: [cap(1e-6, 10e3)], bodyResistance_ohm: 1000 });
    // mathjs: ½·C·V², C·V, V/R and R·C with units
    expectWithin(result.energy_J, mj("0.5 * 1 uF * (10 kV)^2", "J"), 1e-9);
    expectWithin(result.charge_C, mj("1 uF * 10 kV", "C"), 1e-9);
    expectWithin(result.peakCurrent_A, mj("10 kV / 1 kohm", "A"), 1e-9);
    expectWithin(result.timeConstant_s, mj("1 kohm * 1 uF", "s"), 1e-9);
  });

  it("∫i²dt = V²·C/(2R) matches a numerical integral of the RC discharge", () => {
    const V = 10e3;
    const C = 1e-6;
    const R = 1000;
    const result = assessSetup({ sources: [cap(C, V)], bodyResistance_ohm: R });
    // numerical integration of i(t)² for i(t) = (V/R)·e^(−t/RC), trapezoid over 20 τ, not the closed form
    const tau = R * C;
    const steps = 20_000;
    const dt = (20 * tau) / steps;
    let integral = 0;
    for (let k = 0; k < steps; k++) {
      const i0 = (V / R) * Math.exp((-k * dt) / tau);
      const i1 = (V / R) * Math.exp((-(k + 1) * dt) / tau);
      integral += ((i0 * i0 + i1 * i1) / 2) * dt;
    }
    expectWithin(result.specificEnergy_A2s, integral, 1e-4);
    // conservation of energy: all the stored energy ends in the body resistance, R·∫i²dt = ½CV² (mathjs)
    expectWithin(result.specificEnergy_A2s * R, mj("0.5 * 1 uF * (10 kV)^2", "J"), 1e-4);
  });

  it.each([
    // [capacitance F, voltage V, energy J]: the capacitance that stores 1 J or 10 J at each voltage
    [200e-6, 100, 1],
    [2000e-6, 100, 10],
    [12.5e-6, 400, 1],
    [125e-6, 400, 10],
    [2e-6, 1000, 1],
    [20e-6, 1000, 10],
    [0.02e-6, 10e3, 1],
    [0.2e-6, 10e3, 10],
  ])("%s F at %s V stores %s J", (C, V, E) => {
    // mathjs: ½·C·V² with units gives the round energy of the row
    expectWithin(mj(`0.5 * ${C} F * (${V} V)^2`, "J"), E, 1e-9);
    expectWithin(assessSetup(setup(cap(C, V))).energy_J, E, 1e-9);
  });

  it.each([
    // [capacitance F, voltage V]: the capacitance that holds the 45 µC level at each voltage
    [0.45e-6, 100],
    [45e-9, 1000],
    [4.5e-9, 10e3],
  ])("%s F at %s V holds 45 µC", (C, V) => {
    // mathjs: C·V with units gives 45 µC
    expectWithin(mj(`${C} F * ${V} V`, "C"), 45e-6, 1e-9);
    expectWithin(assessSetup(setup(cap(C, V))).charge_C, 45e-6, 1e-9);
  });

  it.each([
    // the capacitance that stores the 350 mJ level at 10 kV and 50 kV
    [7e-9, 10e3],
    [280e-12, 50e3],
  ])("%s F at %s V stores 350 mJ", (C, V) => {
    // mathjs: ½·C·V² with units gives 350 mJ
    expectWithin(mj(`0.5 * ${C} F * (${V} V)^2`, "J"), 0.35, 1e-9);
    expectWithin(assessSetup(setup(cap(C, V))).energy_J, 0.35, 1e-9);
  });
});

describe("capacitor banks", () => {
  it("a parallel bank is n·C1 at the bank voltage", () => {
    const result = assessSetup(setup(cap(1e-6, 1000, { count: 4, arrangement: "parallel" })));
    // four 1 µF units in parallel: the energy of four separate units, each ½·1 µF·(1 kV)² (mathjs)
    expectWithin(result.capacitance_F, mj("1 uF + 1 uF + 1 uF + 1 uF", "F"), 1e-9);
    expectWithin(result.energy_J, mj("4 * 0.5 * 1 uF * (1 kV)^2", "J"), 1e-9);
  });

  it("a series bank is C1/n with the bank voltage shared", () => {
    const result = assessSetup(setup(cap(1e-6, 1000, { count: 4, arrangement: "series" })));
    // four 1 µF units in series: 1/C = Σ 1/C1, and each unit holds a quarter of 1 kV, so the bank
    // stores four times ½·1 µF·(250 V)² (mathjs)
    expectWithin(result.capacitance_F, mj("1 / (1 / (1 uF) + 1 / (1 uF) + 1 / (1 uF) + 1 / (1 uF))", "F"), 1e-9);
    expectWithin(result.energy_J, mj("4 * 0.5 * 1 uF * (250 V)^2", "J"), 1e-9);
  });

  it("count alone means a parallel bank", () => {
    // three 1 µF units side by side (mathjs)
    expectWithin(assessSetup(setup(cap(1e-6, 1000, { count: 3 }))).capacitance_F, mj("3 * 1 uF", "F"), 1e-9);
  });
});

describe("supplies", () => {
  it("a DC supply drives min(limit, V/R) through the body", () => {
    // Ohm's law would give 10 kV / 500 Ω = 20 A; the supply's own 5 mA limit holds it there
    expectWithin(assessSetup(setup(dc(10e3, 5e-3))).continuousCurrent_A, 5e-3, 1e-12);
    // mathjs: 100 V / (500 Ω + 500 Ω), below the 1 A limit
    expectWithin(
      assessSetup(setup(dc(100, 1, { seriesResistance_ohm: 500 }))).continuousCurrent_A,
      mj("100 V / (500 ohm + 500 ohm)", "A"),
      1e-9,
    );
  });

  it("an AC supply uses rms: 230 V rms into 500 Ω is 460 mA rms, crest √2 higher", () => {
    const result = assessSetup(setup(ac(230, 10)));
    // mathjs: 230 V / 500 Ω; a sine's crest is √2 times its rms
    expectWithin(result.continuousCurrent_A, mj("230 V / 500 ohm", "A"), 1e-9);
    expectWithin(result.peakCurrent_A, mj("sqrt(2) * 230 V / 500 ohm", "A"), 1e-9);
    expectWithin(result.perSource[0].voltage_V, mj("sqrt(2) * 230 V", "V"), 1e-9);
    expect(result.energy_J).toBe(0);
  });

  it("counts a DC supply's output capacitance as stored energy that bypasses the current limit", () => {
    const result = assessSetup(setup(dc(5000, 1e-3, { outputCapacitance_F: 1e-9 })));
    // mathjs: ½ × 1 nF × (5 kV)²
    expectWithin(result.energy_J, mj("0.5 * 1 nF * (5 kV)^2", "J"), 1e-9);
    // the capacitor discharges at V/R, not at the 1 mA limit (mathjs: 5 kV / 500 Ω)
    expectWithin(result.peakCurrent_A, mj("5 kV / 500 ohm", "A"), 1e-9);
    expectWithin(result.continuousCurrent_A, 1e-3, 1e-12);
  });

  it("takes τ and ∫i²dt from the capacitive sources even when a supply has the highest peak current", () => {
    // v1 defect: both were 0 here, taken from the supply. 1 F at 100 V into 500 Ω: ∫i²dt by a
    // numerical integration of i(t) = (V/R)·e^(−t/RC) (trapezoid, not the closed form) — 10 A²s as the
    // issue states; τ = 500 s is the time at which the current has fallen to 1/e, found by bisection.
    const result = assessSetup(setup(cap(1, 100), dc(1000, 10)));
    const R = 500;
    const i = (t: number) => (100 / R) * Math.exp(-t / (R * 1));
    let integral = 0;
    const steps = 200_000;
    const span = 20 * R;
    for (let k = 0; k < steps; k++) {
      const a = (k * span) / steps;
      const b = ((k + 1) * span) / steps;
      integral += ((i(a) ** 2 + i(b) ** 2) / 2) * (b - a);
    }
    expectWithin(result.specificEnergy_A2s, integral, 1e-6);
    expectWithin(result.specificEnergy_A2s, 10, 1e-6);
    let lo = 0;
    let hi = 10_000;
    for (let k = 0; k < 100; k++) {
      const mid = (lo + hi) / 2;
      if (i(mid) > (100 / R) * Math.exp(-1)) lo = mid;
      else hi = mid;
    }
    expectWithin(result.timeConstant_s, lo, 1e-9);
    // the supply still gives the peak current: 1000 V / 500 Ω = 2 A, limited to 10 A, beats 0.2 A
    expectWithin(result.peakCurrent_A, 2, 1e-12);
  });
});

describe("bleeders and time to safe", () => {
  const rulesWithTarget = (safe_V: number): TierRules => ({
    ...DEFAULT_RULES,
    rulesVersion: "test-target",
    safeVoltage: { ...DEFAULT_RULES.safeVoltage, value: safe_V },
  });

  it("1 µF from 10 kV to 50 V in 5 min needs at most 56.6 MΩ", () => {
    // A power-capacitor design target is 50 V within 5 min (a trade reference on bleeder design); the
    // time is found here by stepping the discharge dV/dt = −V/(R·C) numerically (Euler, 1 ms steps),
    // not from the engine's logarithm.
    const R = 56.6e6;
    const result = assessSetup(setup(cap(1e-6, 10e3, { bleeder_ohm: R })), rulesWithTarget(50));
    const stepped = (target_V: number) => {
      let v = 10e3;
      let t = 0;
      const dt = 1e-3;
      while (v > target_V) {
        v -= (v / (R * 1e-6)) * dt;
        t += dt;
      }
      return t;
    };
    expectWithin(result.timeToSafe_s as number, stepped(50), 1e-3);
    expectWithin(result.timeToSafe_s as number, 300, THREE_DIGITS);
    // the default target is 60 V (IEC 60204-1 6.2.4), reached sooner with the same bleeder
    const sixty = assessSetup(setup(cap(1e-6, 10e3, { bleeder_ohm: R }))).timeToSafe_s as number;
    expectWithin(sixty, stepped(60), 1e-3);
    expect(sixty).toBeLessThan(300);
  });

  it("100 µF from 400 V to 60 V in 5 s needs at most 26.4 kΩ", () => {
    // IEC 60204-1 6.2.4 asks for 60 V within 5 s; mathjs: R·C·ln(400 V / 60 V) with 26.4 kΩ and 100 µF
    expectWithin(mj("26.4 kohm * 100 uF * log(400 / 60)", "s"), 5, THREE_DIGITS);
    const result = assessSetup(setup(cap(100e-6, 400, { bleeder_ohm: 26.4e3 })));
    expectWithin(result.timeToSafe_s as number, 5, THREE_DIGITS);
  });

  it("is 0 when every source is at or below 60 V, and for AC supplies", () => {
    // IEC 60204-1 6.2.4: 60 V is the safe residual voltage
    expect(assessSetup(setup(cap(1, 60), dc(12, 5))).timeToSafe_s).toBe(0);
    expect(assessSetup(setup(ac(230, 1))).timeToSafe_s).toBe(0);
  });

  it("is null when a source above 60 V has no bleeder (capacitor, sphere terminal or supply)", () => {
    expect(assessSetup(setup(cap(1e-6, 1000, { bleeder_ohm: 1e6 }), cap(1e-9, 61))).timeToSafe_s).toBeNull();
    expect(assessSetup(setup({ kind: "sphere-terminal", radius_m: 0.1, voltage_V: 1e5 })).timeToSafe_s).toBeNull();
    expect(assessSetup(setup(dc(1000, 1e-3))).timeToSafe_s).toBeNull();
  });

  it("is the longest over sources", () => {
    const result = assessSetup(setup(cap(1e-6, 1000, { bleeder_ohm: 1e6 }), cap(1e-6, 1000, { bleeder_ohm: 2e6 })));
    // mathjs: the slower of the two, 2 MΩ·1 µF·ln(1000 V / 60 V)
    expectWithin(result.timeToSafe_s as number, mj("2 Mohm * 1 uF * log(1000 / 60)", "s"), 1e-9);
  });
});
