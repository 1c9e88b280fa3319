import { describe, expect, it } from "vitest";
import {
  assessSetup,
  DEFAULT_RULES,
  readableAssessment,
  requiredControls,
  TIER_LABELS,
  type EnergySource,
  type SetupInput,
  type TierRules,
} from "@/lib/hazard";
import { ac, cap, dc, inputError, setup } from "./support";

// Both sides of every tier threshold of hazard-model.md's default table. "≤" belongs to the lower
// tier and "≥" to the higher, so each bound is checked exactly and just past it.

const tierOf = (input: SetupInput, rules?: TierRules) => assessSetup(input, rules).tier;
const tierOfSource = (source: EnergySource) => tierOf(setup(source));
const criteria = (input: SetupInput) => assessSetup(input).reasons.map((r) => r.criterion);

describe("labels", () => {
  it("names the tiers in the product's words", () => {
    expect(TIER_LABELS).toEqual({
      0: "Touch-safe",
      1: "Sting",
      2: "Reflex injury",
      3: "Lethal shock",
      4: "Arc and blast",
    });
    expect(assessSetup(setup(cap(1e-6, 10e3))).tierLabel).toBe("Lethal shock");
  });
});

describe("touch-safe voltage: 60 V DC, 30 V rms (IEC 62368-1 ES1, memory)", () => {
  it("keeps any stored energy at 60 V in tier 0 and raises the thermal flag instead", () => {
    // IEC 62368-1 ES1 60 V DC (memory); LBNL thermal: < 100 V and > 100 J
    const result = assessSetup(setup(cap(1, 60)));
    expect(result.tier).toBe(0);
    expect(result.energy_J).toBe(1800);
    expect(result.flags.map((f) => f.code)).toContain("thermal");
    expect(result.reasons[0].criterion).toBe("touch-safe-voltage-dc");
  });

  it("applies the energy criteria just above 60 V", () => {
    // 1 F at 60.1 V holds 1.8 kJ: ≥ 0.25 J is tier 2; below 100 V the lethal criterion does not apply
    expect(tierOfSource(cap(1, 60.1))).toBe(2);
  });

  it("keeps a DC supply at 60 V in tier 0 whatever its current, and applies current criteria above", () => {
    // IEC 62368-1 ES1 60 V DC (memory)
    expect(tierOfSource(dc(60, 100))).toBe(0);
    // 60.1 V / 500 Ω = 120 mA ≥ 25 mA: tier 2; below 100 V the 40 mA criterion does not apply
    expect(tierOfSource(dc(60.1, 100))).toBe(2);
  });

  it("keeps an AC supply at 30 V rms in tier 0, and applies current criteria above", () => {
    // IEC 62368-1 ES1 30 V rms (memory)
    expect(tierOfSource(ac(30, 10))).toBe(0);
    // 30.1 V / 500 Ω = 60 mA rms ≥ 5 mA: tier 2; below 50 V rms the 30 mA criterion does not apply
    expect(tierOfSource(ac(30.1, 10))).toBe(2);
  });
});

describe("tier 0 capacitance levels (IEC 60335-1 8.1.4; IEC 61010-1 6.3, memory)", () => {
  it("≤ 0.1 µF from 60 V to 450 V", () => {
    // IEC 60335-1 8.1.4: 0.1 µF for 42.4–450 V
    expect(tierOfSource(cap(0.1e-6, 100))).toBe(0);
    expect(tierOfSource(cap(0.1001e-6, 100))).toBe(1);
    expect(tierOfSource(cap(0.1e-6, 450))).toBe(0);
  });

  it("≤ 45 µC from 450 V to 15 kV: exactly 45 µC at 10 kV is tier 0, just above tier 1", () => {
    // IEC 60335-1 8.1.4: 45 µC for 450 V–15 kV; 4.5 nF at 10 kV holds 45 µC
    expect(tierOfSource(cap(4.5e-9, 10e3))).toBe(0);
    expect(tierOfSource(cap(4.51e-9, 10e3))).toBe(1);
    // 45 nF at 1 kV (½·C·V² = 350 mJ)
    expect(tierOfSource(cap(45e-9, 1000))).toBe(0);
    expect(tierOfSource(cap(45.1e-9, 1000))).toBe(1);
    // 0.45 µF at 100 V holds 45 µC too, but at 100 V the 0.1 µF level applies (½·C·V² = 350 mJ)
    expect(tierOfSource(cap(0.45e-6, 100))).toBe(1);
  });

  it("≤ 350 mJ above 15 kV, visible when the 0.25 J criterion is moved out of the way", () => {
    // IEC 60335-1 8.1.4: 350 mJ above 15 kV; 280 pF at 50 kV (½·C·V² = 350 mJ)
    const loose: TierRules = {
      ...DEFAULT_RULES,
      rulesVersion: "test-loose-reflex",
      reflex: { ...DEFAULT_RULES.reflex, energy: { ...DEFAULT_RULES.reflex.energy, value: 1 } },
    };
    expect(tierOf(setup(cap(280e-12, 50e3)), loose)).toBe(0);
    expect(tierOf(setup(cap(281e-12, 50e3)), loose)).toBe(1);
  });

  it("with the default rules the 0.25 J criterion governs above 15 kV before 350 mJ is reached", () => {
    // 280 pF at 50 kV = 350 mJ: within the level (tier 0 reason) but ≥ 0.25 J (tier 2)
    const result = assessSetup(setup(cap(280e-12, 50e3)));
    expect(result.tier).toBe(2);
    expect(result.reasons.find((r) => r.criterion === "capacitance-level")?.tier).toBe(0);
    // 199 pF at 50 kV = 249 mJ: tier 0
    expect(tierOfSource(cap(199e-12, 50e3))).toBe(0);
  });

  it("keeps an electrostatic sphere terminal with a small charge in tier 0", () => {
    // 10 cm sphere (5.56 pF, 4·π·ε0·5 cm) at 100 kV: 27.8 mJ ≤ 350 mJ
    expect(tierOfSource({ kind: "sphere-terminal", radius_m: 0.05, voltage_V: 100e3 })).toBe(0);
  });

  it("keeps the tighter of the charge and energy levels just above 15 kV, so more voltage never lowers a combination", () => {
    // 2 nF at 15 kV (30 µC, 2/3 of 45 µC) with 0.035 µF at 100 V (0.35 of 0.1 µF): 102 % of the level
    const below = setup(cap(2e-9, 15e3), cap(0.035e-6, 100));
    const above = setup(cap(2e-9, 15.001e3), cap(0.035e-6, 100));
    expect(tierOf(below)).toBe(1);
    // by energy alone the first would fall to 225 mJ / 350 mJ = 64 % and the pair to 99 %: tier 0
    expect(tierOf(above)).toBe(1);
  });

  it("sums the shares of several charged sources", () => {
    // two 0.06 µF capacitors at 100 V: 0.12 µF together, above the 0.1 µF level
    expect(tierOf(setup(cap(0.06e-6, 100), cap(0.06e-6, 100)))).toBe(1);
    const mixed = assessSetup(setup(cap(0.06e-6, 100), cap(30e-9, 1000)));
    // 0.6 of the 0.1 µF level plus 30 µC / 45 µC = 0.667 of the charge level: 127 %
    const level = mixed.reasons.find((r) => r.criterion === "capacitance-level");
    expect(level?.unit).toBe("%");
    expect(level?.value).toBeCloseTo(126.67, 1);
    expect(mixed.tier).toBe(1);
  });
});

describe("stored-energy thresholds", () => {
  it("exactly 0.25 J is tier 2, just below tier 1", () => {
    // capacitor discharge guideline: 0.25 J heavy shock; E=½CV² at 1 kV
    expect(tierOfSource(cap(0.5e-6, 1000))).toBe(2);
    expect(tierOfSource(cap(0.499e-6, 1000))).toBe(1);
  });

  it("exactly 10 J at 100 V is tier 3; just below 10 J, a discharge shorter than 0.1 ms is tier 2", () => {
    // LBNL ESM Table 2.2.13: capacitors ≥ 100 V and ≥ 10 J (read in the text); 2000 µF at 100 V holds 10 J
    expect(tierOfSource(cap(2000e-6, 100))).toBe(3);
    // 49.95 nF at 20 kV holds 9.99 J; τ = 500 Ω × 49.95 nF = 25 µs, shorter than the 0.1 ms from which
    // IEC 60479-2's impulse data apply, so only the energy criteria decide (v2: a slower 9.99 J
    // discharge, 1999 µF at 100 V, is tier 3 by its ∫i²dt, checked in impulse.test.ts)
    expect(tierOfSource(cap(49.95e-9, 20e3))).toBe(2);
  });

  it.each([
    // capacitances that store 10 J (½·C·V²)
    [125e-6, 400],
    [20e-6, 1000],
    [0.2e-6, 10e3],
  ])("%s F at %s V (10 J) is tier 3", (C, V) => {
    // LBNL ESM Table 2.2.13
    expect(tierOfSource(cap(C, V))).toBe(3);
  });

  it("below 100 V a large energy stays tier 2 (lethal criterion needs ≥ 100 V)", () => {
    // LBNL ESM Table 2.2.13: the capacitor shock threshold needs ≥ 100 V
    expect(tierOfSource(cap(1, 99.9))).toBe(2);
    // 1 F at 100 V holds 5 kJ: lethal, not yet arc flash
    expect(tierOfSource(cap(1, 100))).toBe(3);
  });

  it("exactly 10 kJ at 100 V is tier 4, just below tier 3", () => {
    // LBNL ESM arc flash: capacitors ≥ 100 V and ≥ 10 kJ; E = ½ × 2 F × (100 V)²
    expect(tierOfSource(cap(2, 100))).toBe(4);
    expect(tierOfSource(cap(1.999, 100))).toBe(3);
  });

  it("sums the energy of sources at or above the criterion's voltage", () => {
    // two 6 J banks at 20 kV (30 nF each, τ = 15 µs, too short for the ∫i²dt criterion): 12 J together
    // ≥ 10 J (LBNL ESM Table 2.2.13, read in the text)
    expect(tierOf(setup(cap(30e-9, 20e3), cap(30e-9, 20e3)))).toBe(3);
    // a 5 kJ bank at 99 V adds nothing to the 100 V criteria: 6 J at 20 kV stays tier 2
    expect(tierOf(setup(cap(30e-9, 20e3), cap(1.02, 99)))).toBe(2);
  });
});

describe("DC supply thresholds", () => {
  it("2 mA is tier 0, just above tier 1", () => {
    // IEC 61010-1 touch current 2 mA DC (found in an instrument manual)
    expect(tierOfSource(dc(1000, 2e-3))).toBe(0);
    expect(tierOfSource(dc(1000, 2.01e-3))).toBe(1);
  });

  it("25 mA is tier 2, 24.9 mA tier 1", () => {
    // IEC 62368-1 ES2 25 mA DC (memory)
    expect(tierOfSource(dc(1000, 25e-3))).toBe(2);
    expect(tierOfSource(dc(1000, 24.9e-3))).toBe(1);
  });

  it("40 mA at 100 V is tier 3; 39.9 mA, or any current below 100 V, is not", () => {
    // LBNL ESM Table 2.2.13: DC ≥ 100 V and ≥ 40 mA
    expect(tierOfSource(dc(100, 40e-3))).toBe(3);
    expect(tierOfSource(dc(100, 39.9e-3))).toBe(2);
    expect(tierOfSource(dc(99.9, 1))).toBe(2);
  });

  it("counts the current through the body, not the limit alone", () => {
    // 100 V into 500 Ω + 4.5 kΩ = 20 mA, below 25 mA, whatever the 1 A limit
    expect(tierOfSource(dc(100, 1, { seriesResistance_ohm: 4500 }))).toBe(1);
    expect(tierOf({ sources: [dc(100, 1)], bodyResistance_ohm: 5000 })).toBe(1);
  });

  it("a current limit of 500 A at 100 V is tier 4, 499 A tier 3", () => {
    // LBNL ESM arc flash: DC ≥ 100 V and ≥ 500 A
    expect(tierOfSource(dc(100, 500))).toBe(4);
    expect(tierOfSource(dc(100, 499))).toBe(3);
    expect(tierOfSource(dc(99, 1000))).toBe(2);
  });
});

describe("AC supply thresholds", () => {
  it("0.5 mA rms is tier 0, just above tier 1", () => {
    // IEC 61010-1 touch current 0.5 mA rms (found in an instrument manual)
    expect(tierOfSource(ac(230, 0.5e-3))).toBe(0);
    expect(tierOfSource(ac(230, 0.51e-3))).toBe(1);
  });

  it("5 mA rms is tier 2, 4.99 mA tier 1", () => {
    // LBNL ESM Table 2.2.13 AC ≥ 5 mA; IEC 62368-1 ES2 5 mA rms (memory)
    expect(tierOfSource(ac(230, 5e-3))).toBe(2);
    expect(tierOfSource(ac(230, 4.99e-3))).toBe(1);
  });

  it("30 mA rms at 50 V rms is tier 3; 29.9 mA, or below 50 V rms, is not", () => {
    // 30 mA rms: the rated residual current of the RCD IEC 60364-4-41 411.3.3 asks for (memory); LBNL ESM Table 2.2.13: AC ≥ 50 V
    expect(tierOfSource(ac(230, 30e-3))).toBe(3);
    expect(tierOfSource(ac(230, 29.9e-3))).toBe(2);
    expect(tierOfSource(ac(50, 1))).toBe(3);
    expect(tierOfSource(ac(49.9, 1))).toBe(2);
  });
});

describe("reasons", () => {
  it("lists every criterion that holds, highest tier first, each with value, unit, threshold, meaning and source", () => {
    const result = assessSetup(setup(cap(2, 100)));
    expect(result.reasons.slice(0, 4).map((r) => [r.criterion, r.tier])).toEqual([
      ["stored-energy-arc", 4],
      ["stored-energy-lethal", 3],
      ["impulse-specific-energy", 3],
      ["stored-energy-heavy-shock", 2],
    ]);
    for (const reason of result.reasons) {
      expect(reason.meaning.length).toBeGreaterThan(20);
      expect(reason.source.length).toBeGreaterThan(5);
      expect(Number.isFinite(reason.value) && Number.isFinite(reason.threshold)).toBe(true);
    }
    const lethal = result.reasons.find((r) => r.criterion === "stored-energy-lethal");
    expect(lethal).toMatchObject({ value: 10000, unit: "J", threshold: 10, tier: 3 });
    expect(lethal?.source).toContain("LBNL");
  });

  it("puts a 230 V rms supply driving 30 mA in tier 3 beside smaller sources, by the AC current criterion", () => {
    const result = assessSetup(setup(dc(1000, 1e-3), ac(230, 30e-3), cap(1e-9, 1000)));
    // 230 V rms driving 30 mA: ≥ 30 mA rms at ≥ 50 V rms (IEC 60364-4-41 RCD rating, memory; LBNL ESM
    // Table 2.2.13 for the 50 V) is tier 3, whatever the smaller DC supply and capacitor add
    expect(result.tier).toBe(3);
    expect(result.reasons.find((r) => r.tier === 3)?.criterion).toBe("fibrillation-current-ac");
    expect(criteria(setup(dc(1000, 1e-3), ac(230, 30e-3)))).toEqual(
      expect.arrayContaining(["fibrillation-current-ac", "let-go-current-ac", "touch-current-dc"]),
    );
  });

  it("keeps one reason per criterion, the one that weighs most", () => {
    const result = assessSetup(setup(dc(1000, 30e-3), dc(1000, 26e-3)));
    const letGo = result.reasons.filter((r) => r.criterion === "let-go-current-dc");
    expect(letGo).toHaveLength(1);
    expect(letGo[0].value).toBe(30e-3);
  });

  it("gives each source its own tier", () => {
    const result = assessSetup(
      setup(cap(1e-9, 1000), dc(100, 1), { kind: "sphere-terminal", radius_m: 0.1, voltage_V: 1e4 }),
    );
    expect(result.perSource.map((s) => s.tier)).toEqual([0, 3, 0]);
    expect(result.perSource.map((s) => s.id)).toEqual(["source-1", "source-2", "source-3"]);
  });
});

describe("flags", () => {
  const codes = (input: SetupInput) => assessSetup(input).flags.map((f) => f.code);

  it("thermal: below 100 V and above 100 J (LBNL ESM)", () => {
    expect(codes(setup(cap(0.03, 99)))).toContain("thermal"); // 147 J at 99 V
    expect(codes(setup(cap(0.08, 50)))).not.toContain("thermal"); // exactly 100 J: not above
    expect(codes(setup(cap(1, 100)))).not.toContain("thermal"); // 5 kJ at 100 V: not below 100 V
  });

  it("x-ray: a vacuum device at 10 kV or more (practitioner reports)", () => {
    expect(codes({ sources: [dc(10e3, 1e-3)], vacuumDevice: true })).toContain("x-ray");
    expect(codes({ sources: [dc(9.99e3, 1e-3)], vacuumDevice: true })).not.toContain("x-ray");
    expect(codes({ sources: [dc(30e3, 1e-3)] })).not.toContain("x-ray");
  });

  it("ozone: any gap, or 10 kV and more (common practice)", () => {
    expect(codes({ sources: [cap(1e-9, 1000)], gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.01 }] })).toContain(
      "ozone",
    );
    expect(codes(setup(dc(10e3, 1e-3)))).toContain("ozone");
    expect(codes(setup(dc(9e3, 1e-3)))).not.toContain("ozone");
  });

  it("ignition: stored energy of 0.2 mJ or more (below methane's 0.28 mJ and propane's 0.25 mJ, NFPA 921 as quoted)", () => {
    // HBM 100 pF at 2 kV stores exactly 0.2 mJ
    expect(codes(setup(cap(100e-12, 2000)))).toContain("ignition");
    expect(codes(setup(cap(100e-12, 1900)))).not.toContain("ignition");
  });

  it("overvoltage: a capacitor above its rating, per unit in a series bank (common practice)", () => {
    expect(codes(setup(cap(1e-6, 10e3, { ratedVoltage_V: 8e3 })))).toContain("overvoltage");
    expect(codes(setup(cap(1e-6, 8e3, { ratedVoltage_V: 8e3 })))).not.toContain("overvoltage");
    // 10 kV over two units in series is 5 kV each
    expect(codes(setup(cap(1e-6, 10e3, { ratedVoltage_V: 6e3, count: 2, arrangement: "series" })))).not.toContain(
      "overvoltage",
    );
    expect(codes(setup(cap(1e-6, 12.1e3, { ratedVoltage_V: 6e3, count: 2, arrangement: "series" })))).toContain(
      "overvoltage",
    );
  });

  it("no-bleeder: more than 0.1 J stored without a bleeder (capacitor discharge guideline)", () => {
    // 0.2 µF at 1 kV = 0.1 J exactly: not above
    expect(codes(setup(cap(0.2e-6, 1000)))).not.toContain("no-bleeder");
    expect(codes(setup(cap(0.22e-6, 1000)))).toContain("no-bleeder");
    expect(codes(setup(cap(0.22e-6, 1000, { bleeder_ohm: 1e7 })))).not.toContain("no-bleeder");
  });

  it("each flag names its source", () => {
    const result = assessSetup({
      sources: [cap(0.03, 99), cap(1e-6, 10e3, { ratedVoltage_V: 5e3 })],
      vacuumDevice: true,
    });
    expect(result.flags.map((f) => f.code).sort()).toEqual([
      // v2: 10 mC at 10 kV with no bleeder is far above IEC 60204-1 6.2.4's 60 µC exemption
      "discharge-time",
      "ignition",
      "no-bleeder",
      "overvoltage",
      "ozone",
      "thermal",
      "x-ray",
    ]);
    for (const flag of result.flags) {
      expect(flag.source.length).toBeGreaterThan(5);
      expect(flag.message.length).toBeGreaterThan(20);
    }
  });
});

describe("rules as data", () => {
  it("is plain JSON: a stored copy assesses the same", () => {
    const stored = JSON.parse(JSON.stringify(DEFAULT_RULES)) as TierRules;
    expect(stored).toEqual(DEFAULT_RULES);
    const input = setup(cap(1e-6, 10e3), dc(1000, 30e-3));
    expect(assessSetup(input, stored)).toEqual(assessSetup(input));
  });

  it("carries a value, a unit and a source on every threshold, marking memory and common practice", () => {
    type T = { value: number; unit: string; source: string };
    const { rulesVersion: _version, controls: _controls, bodyResistance, safeVoltage, ...groups } = DEFAULT_RULES;
    const thresholds: T[] = [
      bodyResistance,
      safeVoltage,
      ...Object.values(groups).flatMap((group) => Object.values(group as Record<string, T>)),
    ];
    expect(thresholds.length).toBeGreaterThanOrEqual(30);
    for (const t of thresholds) {
      expect(Number.isFinite(t.value) && t.value > 0).toBe(true);
      expect(t.unit).toMatch(/^(V|A|F|C|J|Ω|W|s|A²s)$/);
      expect(t.source).not.toBe("");
    }
    expect(DEFAULT_RULES.touchSafe.dcVoltage.source).toContain("memory");
    expect(DEFAULT_RULES.lethal.acCurrentRms.source).toContain("memory");
    expect(DEFAULT_RULES.impulse.specificEnergy.source).toContain("memory");
    // the ignition energy was read (NFPA 921 values as quoted): methane 0.28 mJ, propane 0.25 mJ
    expect(DEFAULT_RULES.flags.ignitionEnergy.source).toContain("read in the text");
    // v2: the 500 Ω body model is IEC 60479-1's, not common practice
    expect(DEFAULT_RULES.bodyResistance.source).toContain("IEC TS 60479-1");
    expect(DEFAULT_RULES.controls.every((c) => c.source === "common practice")).toBe(true);
  });

  it("names the publication each corrected threshold comes from (issue 12's mis-sourced values)", () => {
    // 30 mA rms is the rated residual current of the RCD in IEC 60364-4-41 411.3.3, not an IEC 60479-1 zone
    expect(DEFAULT_RULES.lethal.acCurrentRms.source).toContain("IEC 60364-4-41");
    expect(DEFAULT_RULES.lethal.acCurrentRms.source).not.toContain("60479-1");
    // 25 mA DC is IEC 62368-1's ES2 limit, not a let-go threshold
    expect(DEFAULT_RULES.reflex.dcCurrent.source).toContain("IEC 62368-1");
    expect(DEFAULT_RULES.reflex.dcCurrent.source).toContain("ES2");
    expect(DEFAULT_RULES.reflex.dcCurrent.source).not.toMatch(/let-go/i);
    // the ±3 % belongs to IEC 60052, which every sphere-gap reason names beside the table it read
    const gap = assessSetup({
      sources: [cap(1e-9, 100e3, { id: "bank" })],
      gaps: [{ sphereDiameter_m: 0.1, spacing_m: 0.01, across: ["bank"] }],
    }).reasons.find((r) => r.criterion === "gap-ceiling");
    expect(gap?.source).toContain("IEC 60052");
  });

  it("never points a reader at a working file: no reason, flag or threshold names one", () => {
    // "(hazard-references §1c)" in every reason of engine 1 pointed at a document no user has
    const internal = /hazard-references|hazard-model|§|\.md\b/;
    const setups = [
      setup(cap(2, 100)),
      setup(dc(1000, 0.1), ac(400, 100)),
      { sources: [cap(100e-6, 400, { bleeder_ohm: 100e3 })], gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.01 }] },
      setup({ kind: "sphere-terminal", radius_m: 1, voltage_V: 900e3 }),
      setup(cap(1e-6, 40e3, { bleeder_ohm: 0.2 })),
    ];
    for (const input of setups) {
      const result = assessSetup(input);
      for (const r of result.reasons) expect(`${r.meaning} ${r.source}`).not.toMatch(internal);
      for (const f of result.flags) expect(`${f.message} ${f.source}`).not.toMatch(internal);
    }
    const { rulesVersion: _v, controls, bodyResistance, safeVoltage, ...groups } = DEFAULT_RULES;
    const sources = [
      bodyResistance.source,
      safeVoltage.source,
      ...Object.values(groups).flatMap((g) =>
        Object.values(g as Record<string, { source: string }>).map((t) => t.source),
      ),
      ...controls.map((c) => c.source),
    ];
    for (const source of sources) expect(source).not.toMatch(internal);
  });

  it("reads an engine 1 snapshot without its pointers, and passes engine 2's text unchanged", () => {
    const fresh = assessSetup(setup(cap(2, 100)));
    expect(readableAssessment(fresh)).toEqual(fresh);
    const old = {
      ...fresh,
      reasons: fresh.reasons.map((r) => ({ ...r, source: "LBNL Electrical Safety Manual (hazard-references §1a)" })),
      flags: fresh.flags.map((f) => ({ ...f, source: "hazard-references §6a, §1c" })),
    };
    const read = readableAssessment(old);
    for (const r of read.reasons) expect(r.source).toBe("LBNL Electrical Safety Manual");
    for (const f of read.flags) expect(f.source).not.toMatch(/hazard-references|§/);
  });

  it("stamps the rules' version beside the engine's", () => {
    const result = assessSetup(setup(cap(1e-9, 100)));
    expect(result.rulesVersion).toBe(DEFAULT_RULES.rulesVersion);
    expect(result.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it("lets an institution adopt stricter rules", () => {
    const strict: TierRules = {
      ...DEFAULT_RULES,
      rulesVersion: "example-university-2",
      lethal: { ...DEFAULT_RULES.lethal, energy: { value: 1, unit: "J", source: "local rule" } },
    };
    // 2 J at 20 kV (10 nF, τ = 5 µs): tier 2 by default, tier 3 under the stricter 1 J rule
    expect(tierOf(setup(cap(10e-9, 20e3)))).toBe(2);
    const result = assessSetup(setup(cap(10e-9, 20e3)), strict);
    expect(result.tier).toBe(3);
    expect(result.rulesVersion).toBe("example-university-2");
    expect(result.reasons[0].source).toBe("local rule");
  });

  it("refuses a rules object with a non-finite number, a wrong unit or tiers out of order", () => {
    const broken = (patch: (r: TierRules) => void) => {
      const rules = structuredClone(DEFAULT_RULES) as TierRules;
      patch(rules);
      return inputError(() => assessSetup(setup(cap(1e-9, 100)), rules)).path;
    };
    expect(broken((r) => (r.reflex.energy.value = Number.NaN))).toEqual(["rules", "reflex", "energy", "value"]);
    expect(broken((r) => (r.reflex.energy.value = Number.POSITIVE_INFINITY))).toEqual([
      "rules",
      "reflex",
      "energy",
      "value",
    ]);
    expect(broken((r) => (r.touchSafe.dcCurrent.unit = "mA"))).toEqual(["rules", "touchSafe", "dcCurrent", "unit"]);
    expect(broken((r) => (r.lethal.energy.value = 0.1))).toEqual(["rules", "lethal", "energy", "value"]);
    expect(broken((r) => (r.arc.dcCurrentLimit.value = 0.01))).toEqual(["rules", "arc", "dcCurrentLimit", "value"]);
    expect(broken((r) => (r.controls[0].fromTier = 7 as 1))).toEqual(["rules", "controls", 0, "fromTier"]);
    expect(broken((r) => (r.rulesVersion = ""))).toEqual(["rules", "rulesVersion"]);
  });
});

describe("required controls (common practice)", () => {
  it("requires nothing at tier 0", () => {
    expect(requiredControls(0)).toEqual([]);
  });

  it("adds controls tier by tier", () => {
    const ids = (tier: number) => requiredControls(tier).map((c) => c.id);
    expect(ids(1)).toEqual([
      "warning-sign",
      "grounding-hook",
      "discharge-after-use",
      "audience-distance",
      "implant-warning",
    ]);
    expect(ids(2)).toEqual([...ids(1), "bleeder", "insulated-barrier", "named-operator"]);
    expect(ids(3)).toEqual([
      ...ids(2),
      "second-person",
      "barrier-at-limited-approach",
      "written-discharge-procedure",
      "lockout",
      "hook-inspected",
    ]);
    expect(ids(4)).toEqual([...ids(3), "interlock-or-remote", "eye-hearing-protection", "officer-pre-use-check"]);
  });

  it("reads the controls from the rules given", () => {
    const rules: TierRules = {
      ...DEFAULT_RULES,
      controls: [{ id: "local", fromTier: 2, text: "Local control.", source: "local rule" }],
    };
    expect(requiredControls(1, rules)).toEqual([]);
    expect(requiredControls(2, rules).map((c) => c.id)).toEqual(["local"]);
  });
});
