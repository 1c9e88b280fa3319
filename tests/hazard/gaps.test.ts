import { describe, expect, it } from "vitest";
import {
  approachDistances,
  assessSetup,
  gapBreakdown,
  relativeAirDensity,
  SPHERE_GAP_TABLE,
  TABLE_AIR_DENSITY,
  uniformFieldBreakdown_kV,
} from "@/lib/hazard";
import { ac, cap, expectWithin, inputError, setup } from "./support";

// Voltage ceilings and distances. Spark-gap ceilings: the sphere-gap table inside its range, the
// uniform-field law outside it, both corrected for air density (hazard-references §4). Shock approach
// boundaries: the NFPA 70E tables (§6b), limited boundary from the "fixed part" column, "avoid
// contact" rows giving a restricted distance of 0 with a note.

const TORR_PA = 101325 / 760;
/** The table's stated uncertainty (IEC 60052, hazard-references §4c). */
const TABLE_TOLERANCE = 0.03;

describe("air density δ (hazard-references §4d)", () => {
  it("is 1 at 101325 Pa and 20 °C", () => {
    expect(relativeAirDensity(101325, 20)).toBe(1);
  });

  it("is 0.916 at 720 Torr and 30 °C", () => {
    // computed example, pe2bz "Spark Gap Correction Factors" formula (hazard-references §4d)
    expectWithin(relativeAirDensity(720 * TORR_PA, 30), 0.916, 0.0005);
  });

  it.each([
    // [Torr, °C, factor] — correction factors printed on the AIEE sheet (hazard-references §4c)
    [760, 20, 1.02],
    [720, 20, 0.96],
    [760, 0, 1.09],
  ])("gives the sheet's correction factor at %s Torr and %s °C (%s)", (torr, celsius, factor) => {
    // printed with two or three digits: ±0.5 %
    expectWithin(relativeAirDensity(torr * TORR_PA, celsius) / TABLE_AIR_DENSITY, factor, 0.005);
  });
});

describe("uniform-field law (hazard-references §4b)", () => {
  it.each([
    // [gap cm, kV] — computed from V = 24.22·x + 6.08·√x, x = d at δ = 1 (hazard-references §4b)
    [0.1, 4.34],
    [0.5, 16.4],
    [1, 30.3],
    [2, 57.0],
    [5, 134.7],
  ])("gives %s cm → %s kV", (gap_cm, kV) => {
    expectWithin(uniformFieldBreakdown_kV(gap_cm), kV, 0.005);
    // through the engine: 50 cm spheres are outside the table, so the law applies
    const result = gapBreakdown({ sphereDiameter_m: 0.5, spacing_m: gap_cm / 100 });
    expect(result.method).toBe("uniform-field law");
    expectWithin(result.breakdown_V, kV * 1000, 0.005);
  });

  it("scales the spacing by δ: x = δ·d", () => {
    const thin = gapBreakdown({
      sphereDiameter_m: 0.5,
      spacing_m: 0.01,
      pressure_Pa: 720 * TORR_PA,
      temperature_C: 30,
    });
    const delta = relativeAirDensity(720 * TORR_PA, 30);
    expectWithin(thin.breakdown_V, uniformFieldBreakdown_kV(delta * 1) * 1000, 1e-12);
    expectWithin(thin.delta, 0.916, 0.0005);
  });

  it("says which method, which formula and which δ", () => {
    const result = gapBreakdown({ sphereDiameter_m: 0.5, spacing_m: 0.01 });
    expect(result.detail).toContain("uniform-field law");
    expect(result.detail).toContain("24.22");
    expect(result.detail).toContain("δ = 1.000");
    expect(result.detail).toContain("diameter is outside");
    expect(result.source).toContain("hazard-references §4b");
  });

  it("notes that the law errs high for spheres spaced wider than their radius", () => {
    const result = gapBreakdown({ sphereDiameter_m: 0.01, spacing_m: 0.05 });
    expect(result.method).toBe("uniform-field law");
    expect(result.detail).toContain("errs high");
  });
});

describe("sphere-gap table (hazard-references §4c)", () => {
  const cells = SPHERE_GAP_TABLE.columns.flatMap((column) =>
    column.gap_cm.map((gap_cm, row) => [column.diameter_cm, gap_cm, SPHERE_GAP_TABLE.peak_kV[row]] as const),
  );

  it.each(cells)("%s cm spheres at %s cm spark over at %s kV in the table's air (±3 %)", (diameter_cm, gap_cm, kV) => {
    // AIEE sphere-gap table, 760 mmHg and 25 °C, ±3 % (hazard-references §4c)
    const result = gapBreakdown({
      sphereDiameter_m: diameter_cm / 100,
      spacing_m: gap_cm / 100,
      pressure_Pa: 101325,
      temperature_C: 25,
    });
    expect(result.method).toBe("sphere-gap table");
    expectWithin(result.breakdown_V, kV * 1000, TABLE_TOLERANCE);
    expect(result.detail).toContain(`the ${kV} kV row`);
    expect(result.detail).toContain(`${diameter_cm} cm column`);
  });

  it.each(cells)("%s cm spheres at %s cm stay within ±3 % of %s kV in default air (20 °C)", (d, gap, kV) => {
    // AIEE table ±3 % (hazard-references §4c); the 20 °C correction is 1.7 %
    const result = gapBreakdown({ sphereDiameter_m: d / 100, spacing_m: gap / 100 });
    expectWithin(result.breakdown_V, kV * 1000, TABLE_TOLERANCE);
  });

  it("interpolates linearly in spacing between rows", () => {
    // 5 cm column: 30 kV at 0.94 cm, 50 kV at 1.71 cm (hazard-references §4c)
    const result = gapBreakdown({ sphereDiameter_m: 0.05, spacing_m: 0.01, temperature_C: 25 });
    const expected_kV = 30 + ((1 - 0.94) / (1.71 - 0.94)) * 20;
    expectWithin(result.breakdown_V, expected_kV * 1000, 1e-9);
    expect(result.detail).toContain("between the 30 kV row (0.94 cm) and the 50 kV row (1.71 cm)");
    expect(result.detail).toMatch(/δ = 0\.983 for air at 101 kPa and 25\.0 °C/);
  });

  it("interpolates between the two neighbouring columns for a diameter between them", () => {
    // 7 cm spheres lie between the 5 cm and 10 cm columns (hazard-references §4c)
    const result = gapBreakdown({ sphereDiameter_m: 0.07, spacing_m: 0.01, temperature_C: 25 });
    expect(result.method).toBe("sphere-gap table");
    expect(result.detail).toContain("5 cm column");
    expect(result.detail).toContain("10 cm column");
    const five = gapBreakdown({ sphereDiameter_m: 0.05, spacing_m: 0.01, temperature_C: 25 }).breakdown_V;
    const ten = gapBreakdown({ sphereDiameter_m: 0.1, spacing_m: 0.01, temperature_C: 25 }).breakdown_V;
    expect(result.breakdown_V).toBeGreaterThanOrEqual(Math.min(five, ten));
    expect(result.breakdown_V).toBeLessThanOrEqual(Math.max(five, ten));
  });

  it("scales by δ relative to the table's air", () => {
    const result = gapBreakdown({
      sphereDiameter_m: 0.1,
      spacing_m: 0.0165,
      pressure_Pa: 720 * TORR_PA,
      temperature_C: 30,
    });
    // 10 cm column, 50 kV row (hazard-references §4c) × δ / δ_table
    expectWithin(result.breakdown_V, 50e3 * (relativeAirDensity(720 * TORR_PA, 30) / TABLE_AIR_DENSITY), 1e-9);
  });

  it("falls back to the law outside a column's spacings", () => {
    // 2.5 cm column stops at 2.00 cm (50 kV); 25 cm column starts at 0.32 cm
    expect(gapBreakdown({ sphereDiameter_m: 0.025, spacing_m: 0.03 }).method).toBe("uniform-field law");
    const short = gapBreakdown({ sphereDiameter_m: 0.25, spacing_m: 0.002 });
    expect(short.method).toBe("uniform-field law");
    expect(short.detail).toContain("spacing is outside");
    // 3 cm spheres at 2.5 cm: inside the 5 cm column but beyond the 2.5 cm column
    expect(gapBreakdown({ sphereDiameter_m: 0.03, spacing_m: 0.025 }).method).toBe("uniform-field law");
  });
});

describe("refused gaps", () => {
  it("refuses spacing beyond 100 cm", () => {
    const error = inputError(() => gapBreakdown({ sphereDiameter_m: 0.5, spacing_m: 1.5 }, 2));
    expect(error.path).toEqual(["gaps", 2, "spacing_m"]);
    expect(error.message).toContain("gaps[2].spacing_m");
  });

  it("refuses gaps below δ·d = 0.01 cm, where the law undershoots the minimum sparking voltage", () => {
    // measured minimum about 327 V (hazard-references §4b): the law gives less below 0.01 cm
    expect(inputError(() => gapBreakdown({ sphereDiameter_m: 0.05, spacing_m: 5e-5 })).path).toEqual([
      "gaps",
      0,
      "spacing_m",
    ]);
    // thin air: 1 mm at 500 Pa is δ·d ≈ 0.0005 cm
    expect(inputError(() => gapBreakdown({ sphereDiameter_m: 0.05, spacing_m: 1e-3, pressure_Pa: 500 })).path).toEqual([
      "gaps",
      0,
      "spacing_m",
    ]);
  });

  it.each([
    [{ sphereDiameter_m: 0, spacing_m: 0.01 }, "sphereDiameter_m"],
    [{ sphereDiameter_m: -0.05, spacing_m: 0.01 }, "sphereDiameter_m"],
    [{ sphereDiameter_m: Number.NaN, spacing_m: 0.01 }, "sphereDiameter_m"],
    [{ sphereDiameter_m: 0.05, spacing_m: 0 }, "spacing_m"],
    [{ sphereDiameter_m: 0.05, spacing_m: Number.POSITIVE_INFINITY }, "spacing_m"],
    [{ sphereDiameter_m: 0.05, spacing_m: 0.01, pressure_Pa: 0 }, "pressure_Pa"],
    [{ sphereDiameter_m: 0.05, spacing_m: 0.01, temperature_C: -300 }, "temperature_C"],
    [{ sphereDiameter_m: 0.05, spacing_m: 0.01, temperature_C: Number.NaN }, "temperature_C"],
  ])("refuses %j at %s", (gap, field) => {
    expect(inputError(() => assessSetup({ sources: [cap(1e-9, 1000)], gaps: [gap] })).path).toEqual(["gaps", 0, field]);
  });
});

describe("gap ceilings in an assessment", () => {
  const gap = { sphereDiameter_m: 0.05, spacing_m: 0.01 };
  const ceiling = gapBreakdown(gap).breakdown_V;

  it("caps every source's voltage and the figures computed from it", () => {
    const result = assessSetup({ sources: [cap(1e-9, 50e3)], gaps: [gap] });
    expect(result.gapCeiling_V).toBe(ceiling);
    expect(result.maxVoltage_V).toBe(ceiling);
    // computed from E=½CV² at the capped voltage
    expectWithin(result.energy_J, 0.5 * 1e-9 * ceiling * ceiling, 1e-12);
    const reason = result.reasons.find((r) => r.criterion === "gap-ceiling");
    expect(reason?.meaning).toContain("held to");
    expect(reason?.meaning).toContain("sphere-gap table");
  });

  it("leaves sources below the ceiling alone", () => {
    const result = assessSetup({ sources: [cap(1e-9, 10e3)], gaps: [gap] });
    expect(result.maxVoltage_V).toBe(10e3);
    expect(result.reasons.find((r) => r.criterion === "gap-ceiling")?.meaning).toContain("caps nothing");
  });

  it("charges a sphere terminal given no voltage up to the ceiling", () => {
    const result = assessSetup({ sources: [{ kind: "sphere-terminal", radius_m: 0.1 }], gaps: [gap] });
    expect(result.perSource[0].voltage_V).toBe(ceiling);
    expect(result.reasons.find((r) => r.criterion === "gap-ceiling")?.meaning).toContain("charges up to it");
  });

  it("caps an AC supply's crest, so its rms falls by √2 below the ceiling", () => {
    const result = assessSetup({ sources: [ac(30e3, 1e-3)], gaps: [gap] });
    expect(result.perSource[0].voltage_V).toBe(ceiling);
    expectWithin(result.continuousCurrent_A, Math.min(1e-3, ceiling / Math.SQRT2 / 500), 1e-12);
  });

  it("takes the lowest of several gaps", () => {
    const wide = { sphereDiameter_m: 0.5, spacing_m: 0.1 };
    const result = assessSetup({ sources: [cap(1e-9, 1e6)], gaps: [wide, gap] });
    expect(result.gapCeiling_V).toBe(ceiling);
    expect(result.reasons.find((r) => r.criterion === "gap-ceiling")?.meaning).toContain(
      "The other gap sparks over higher",
    );
  });

  it("reports no ceiling without gaps", () => {
    expect(assessSetup({ sources: [cap(1e-9, 1e3)] }).gapCeiling_V).toBeNull();
  });
});

describe("DC table, NFPA 70E Table 130.4(E)(b)", () => {
  it.each([
    // [volts, limited m, restricted m, row]
    [100, 1.0, 0, "100–300 V"], // memory (hazard-references §6b): avoid contact
    [300, 1.0, 0, "100–300 V"], // memory
    [301, 1.0, 0.3, "301 V–1 kV"], // found: 500 V DC example (hazard-references §6b)
    [500, 1.0, 0.3, "301 V–1 kV"], // found
    [1000, 1.0, 0.3, "301 V–1 kV"], // found
    [3000, 1.5, 0.5, "1.1–5 kV"], // memory
    [10e3, 1.5, 0.7, "5–15 kV"], // memory
    [30e3, 2.5, 0.8, "15.1–45 kV"], // memory
    [60e3, 2.5, 1.0, "45.1–75 kV"], // memory
    [150e3, 3.0, 1.2, "75.1–150 kV"], // memory
  ])("%s V DC: limited %s m, restricted %s m", (volts, limited, restricted, row) => {
    const lookup = approachDistances(volts, "dc");
    expect(lookup.limited_m).toBe(limited);
    expect(lookup.restricted_m).toBe(restricted);
    expect(lookup.row).toBe(row);
    expect(lookup.beyondTable).toBe(false);
    expect(lookup.note).toContain("fixed-part column");
  });

  it("gives nothing below 100 V DC", () => {
    const lookup = approachDistances(99.9, "dc");
    expect(lookup.limited_m).toBeNull();
    expect(lookup.restricted_m).toBeNull();
  });

  it("says 'avoid contact' where the table gives no restricted distance", () => {
    const lookup = approachDistances(200, "dc");
    expect(lookup.avoidContact).toBe(true);
    expect(lookup.note).toContain("avoid contact");
  });

  it("returns the last row above 150 kV and says nothing is extrapolated", () => {
    const lookup = approachDistances(300e3, "dc");
    expect(lookup.limited_m).toBe(3.0);
    expect(lookup.restricted_m).toBe(1.2);
    expect(lookup.beyondTable).toBe(true);
    expect(lookup.note).toContain("nothing is extrapolated");
  });
});

describe("AC table, NFPA 70E Table 130.4(E)(a)", () => {
  it.each([
    [120, 1.0, 0, "50–150 V"], // memory; older table's 50–300 V row has the same distances (found)
    [208, 1.0, 0.3, "151–750 V"], // found: 208 V example (hazard-references §6b)
    [480, 1.0, 0.3, "151–750 V"], // found: 480 V example
    [10e3, 1.5, 0.7, "751 V–15 kV"], // found: older table
    [20e3, 1.8, 0.8, "15.1–36 kV"], // found: older table
  ])("%s V rms: limited %s m, restricted %s m", (volts, limited, restricted, row) => {
    const lookup = approachDistances(volts, "ac");
    expect(lookup.limited_m).toBe(limited);
    expect(lookup.restricted_m).toBe(restricted);
    expect(lookup.row).toBe(row);
  });

  it("gives nothing below 50 V AC", () => {
    expect(approachDistances(49, "ac").limited_m).toBeNull();
  });

  it("returns the last row above 36 kV", () => {
    const lookup = approachDistances(50e3, "ac");
    expect(lookup.limited_m).toBe(1.8);
    expect(lookup.beyondTable).toBe(true);
  });
});

describe("approach distances in an assessment", () => {
  it("looks up the highest DC voltage and explains the row in a reason", () => {
    const result = assessSetup(setup(cap(1e-9, 500), cap(1e-9, 10e3)));
    expect(result.approach).toEqual({ limited_m: 1.5, restricted_m: 0.7 });
    const reason = result.reasons.find((r) => r.criterion === "approach-distance-dc");
    expect(reason?.value).toBe(10e3);
    expect(reason?.threshold).toBe(15e3);
    expect(reason?.meaning).toContain("fixed-part column");
  });

  it("uses the AC table for AC supplies, by rms voltage", () => {
    const result = assessSetup(setup(ac(230, 1)));
    expect(result.approach).toEqual({ limited_m: 1.0, restricted_m: 0.3 });
  });

  it("takes the larger distances when both tables apply", () => {
    const result = assessSetup(setup(ac(20e3, 1e-3), cap(1e-9, 500)));
    expect(result.approach).toEqual({ limited_m: 1.8, restricted_m: 0.8 });
  });

  it("is null below both tables", () => {
    const result = assessSetup(setup(cap(1, 50), ac(24, 1)));
    expect(result.approach).toEqual({ limited_m: null, restricted_m: null });
    expect(result.reasons.some((r) => r.criterion.startsWith("approach-distance"))).toBe(false);
  });

  it("raises the beyond-the-table text in the reasons above 150 kV DC", () => {
    const result = assessSetup(setup({ kind: "sphere-terminal", radius_m: 0.1, voltage_V: 300e3 }));
    expect(result.approach).toEqual({ limited_m: 3.0, restricted_m: 1.2 });
    expect(result.reasons.find((r) => r.criterion === "approach-distance-dc")?.meaning).toContain(
      "a qualified person must set the distances",
    );
  });
});
