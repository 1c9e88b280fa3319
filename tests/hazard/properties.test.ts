import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { assessSetup, gapBreakdown, INPUT_LIMITS, TIER_LABELS, type EnergySource, type SetupInput } from "@/lib/hazard";
import { decades, setupArb } from "./arbitraries";
import { expectWithin, numbersIn } from "./support";

// Properties that must hold for every valid set-up, checked on generated set-ups spread over many
// decades of capacitance, voltage, current and resistance.

const RUNS = { numRuns: 200 };

/** A source with one of its size fields multiplied by k (k ≥ 1 makes it larger). */
function scaled(source: EnergySource, field: "energy" | "voltage" | "current", k: number): EnergySource {
  const s = { ...source } as Record<string, unknown> & EnergySource;
  const times = (key: string) => {
    if (typeof s[key] === "number") s[key] = Math.min((s[key] as number) * k, limitFor(key));
  };
  if (field === "energy") {
    times("capacitance_F");
    times("outputCapacitance_F");
    times("radius_m");
  } else if (field === "voltage") {
    times("voltage_V");
    times("voltageRms_V");
  } else {
    times("currentLimit_A");
  }
  return s;
}

function limitFor(key: string): number {
  if (key === "capacitance_F" || key === "outputCapacitance_F") return INPUT_LIMITS.capacitance_F;
  if (key === "radius_m") return INPUT_LIMITS.radius_m;
  if (key === "currentLimit_A") return INPUT_LIMITS.current_A;
  return INPUT_LIMITS.voltage_V;
}

const withSource = (input: SetupInput, index: number, source: EnergySource): SetupInput => ({
  ...input,
  sources: input.sources.map((s, i) => (i === index ? source : s)),
});

describe("every valid set-up", () => {
  it("gives finite numbers everywhere: never NaN or Infinity", () => {
    fc.assert(
      fc.property(setupArb, (input) => {
        const result = assessSetup(input);
        for (const [path, value] of numbersIn(result)) {
          if (!Number.isFinite(value)) expect.fail(`${path} is ${value}`);
        }
      }),
      { numRuns: 400 },
    );
  });

  it("stays finite at the corners of the accepted ranges", () => {
    const L = INPUT_LIMITS;
    const corners: SetupInput[] = [
      {
        sources: [
          {
            kind: "capacitor",
            capacitance_F: L.capacitance_F,
            voltage_V: L.voltage_V,
            count: L.count,
            bleeder_ohm: L.resistance_ohm,
          },
          {
            kind: "dc-supply",
            voltage_V: L.voltage_V,
            currentLimit_A: L.current_A,
            outputCapacitance_F: L.capacitance_F,
          },
          { kind: "ac-supply", voltageRms_V: L.voltage_V, frequency_Hz: L.frequency_Hz, currentLimit_A: L.current_A },
          { kind: "sphere-terminal", radius_m: L.radius_m, voltage_V: L.voltage_V },
        ],
        bodyResistance_ohm: L.bodyResistanceMin_ohm,
      },
      {
        sources: [
          { kind: "capacitor", capacitance_F: 1e-300, voltage_V: 1e-300, count: L.count, arrangement: "series" },
          { kind: "custom-capacitance", capacitance_F: 5e-324, voltage_V: 61, bleeder_ohm: 5e-324 },
        ],
        bodyResistance_ohm: L.bodyResistanceMax_ohm,
      },
    ];
    for (const input of corners) {
      for (const [path, value] of numbersIn(assessSetup(input))) {
        if (!Number.isFinite(value)) expect.fail(`${path} is ${value}`);
      }
    }
  });

  it("is deterministic, and every reason that raises the tier has reached its threshold", () => {
    fc.assert(
      fc.property(setupArb, (input) => {
        const result = assessSetup(input);
        expect(assessSetup(input)).toEqual(result);
        expect(result.tierLabel).toBe(TIER_LABELS[result.tier]);
        // A criterion above tier 0 holds only at or beyond its threshold ("≥" belongs to the higher
        // tier, hazard-model.md); the gap and approach reasons describe figures, not tier criteria.
        for (const reason of result.reasons) {
          if (reason.tier === 0 || reason.criterion === "gap-ceiling" || reason.criterion.startsWith("approach"))
            continue;
          expect(reason.value, reason.criterion).toBeGreaterThanOrEqual(reason.threshold * (1 - 1e-9));
        }
        for (const source of result.perSource) expect(source.tier).toBeLessThanOrEqual(result.tier);
        // v2: a gap caps only the sources it is across, at the upper bound of its breakdown
        for (const gap of input.gaps ?? []) {
          const bound = gapBreakdown(gap).bound_V;
          for (const id of gap.across ?? []) {
            const source = result.perSource.find((s) => s.id === id);
            expect(source?.voltage_V).toBeLessThanOrEqual(bound);
          }
        }
      }),
      RUNS,
    );
  });
});

/** Set-ups crowded around the tier bounds: 20 V to 50 kV, 0.1 nF to 10 µF, 0.3 mA to 300 mA. */
const nearBoundsArb: fc.Arbitrary<SetupInput> = fc.record({
  sources: fc.array(
    fc.oneof(
      fc.record({
        kind: fc.constant("capacitor" as const),
        capacitance_F: decades(-10, -5),
        voltage_V: decades(1.3, 4.7),
      }),
      fc.record({
        kind: fc.constant("dc-supply" as const),
        voltage_V: decades(1.5, 3),
        currentLimit_A: decades(-3.5, -0.5),
      }),
      fc.record({
        kind: fc.constant("ac-supply" as const),
        voltageRms_V: decades(1.3, 2.5),
        frequency_Hz: fc.constant(50),
        currentLimit_A: decades(-3.5, -0.5),
      }),
    ),
    { minLength: 1, maxLength: 4 },
  ),
});

describe("monotonic tiers", () => {
  const growth = fc.double({ min: 1, max: 1000, noNaN: true });
  const nudge = fc.double({ min: 1, max: 1.1, noNaN: true });
  const pick = fc.nat();

  for (const field of ["energy", "voltage", "current"] as const) {
    it(`more ${field} never lowers the tier`, () => {
      fc.assert(
        fc.property(setupArb, pick, growth, (input, n, k) => {
          const index = n % input.sources.length;
          const bigger = withSource(input, index, scaled(input.sources[index], field, k));
          expect(assessSetup(bigger).tier).toBeGreaterThanOrEqual(assessSetup(input).tier);
        }),
        { numRuns: 200 },
      );
      fc.assert(
        fc.property(nearBoundsArb, pick, nudge, (input, n, k) => {
          const index = n % input.sources.length;
          const bigger = withSource(input, index, scaled(input.sources[index], field, k));
          expect(assessSetup(bigger).tier).toBeGreaterThanOrEqual(assessSetup(input).tier);
        }),
        { numRuns: 400 },
      );
    });
  }

  it("adding a source never lowers the tier", () => {
    fc.assert(
      fc.property(setupArb, setupArb, (input, other) => {
        // The added source gets an id of its own: two sources may not share one (a gap names its sources by id).
        const more = { ...input, sources: [...input.sources, { ...other.sources[0], id: "added-source" }] };
        expect(assessSetup(more).tier).toBeGreaterThanOrEqual(assessSetup(input).tier);
      }),
      RUNS,
    );
  });
});

describe("capacitor banks", () => {
  it("a parallel bank of n stores n times the energy of one unit, a series bank 1/n, at the same bank voltage", () => {
    fc.assert(
      fc.property(decades(-12, 0), decades(0, 5), fc.integer({ min: 2, max: 1000 }), (C, V, n) => {
        const one = assessSetup({ sources: [{ kind: "capacitor", capacitance_F: C, voltage_V: V }] }).energy_J;
        const parallel = assessSetup({
          sources: [{ kind: "capacitor", capacitance_F: C, voltage_V: V, count: n, arrangement: "parallel" }],
        }).energy_J;
        const series = assessSetup({
          sources: [{ kind: "capacitor", capacitance_F: C, voltage_V: V, count: n, arrangement: "series" }],
        }).energy_J;
        // computed from E=½CV² with C = n·C1 or C1/n (hazard-model.md Formulas)
        expectWithin(parallel, n * one, 1e-12);
        expectWithin(series, one / n, 1e-12);
      }),
      RUNS,
    );
  });
});
