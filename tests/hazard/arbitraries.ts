// fast-check generators of valid set-ups, spread over many decades of every quantity, for the
// property tests (kept apart so the other test files do not load fast-check).

import fc from "fast-check";
import type { EnergySource, SetupInput, SparkGap } from "@/lib/hazard";

/** A positive number spread evenly over decades: 10^min … 10^max. */
export const decades = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true }).map((exponent) => 10 ** exponent);

const id = fc.option(fc.string({ minLength: 1, maxLength: 8 }), { nil: undefined });

export const capacitorArb: fc.Arbitrary<EnergySource> = fc.record(
  {
    id,
    kind: fc.constant("capacitor" as const),
    capacitance_F: decades(-13, 1),
    voltage_V: decades(0, 6),
    count: fc.integer({ min: 2, max: 50 }),
    arrangement: fc.constantFrom("parallel" as const, "series" as const),
    ratedVoltage_V: decades(1, 6),
    bleeder_ohm: decades(2, 12),
    seriesResistance_ohm: fc.oneof(fc.constant(0), decades(-1, 6)),
  },
  { requiredKeys: ["kind", "capacitance_F", "voltage_V", "count", "arrangement"] },
);

export const customArb: fc.Arbitrary<EnergySource> = fc.record(
  {
    id,
    kind: fc.constant("custom-capacitance" as const),
    capacitance_F: decades(-13, 1),
    voltage_V: decades(0, 6),
    bleeder_ohm: decades(2, 12),
  },
  { requiredKeys: ["kind", "capacitance_F", "voltage_V"] },
);

export const sphereArb: fc.Arbitrary<EnergySource> = fc.record({
  id,
  kind: fc.constant("sphere-terminal" as const),
  radius_m: decades(-3, 1),
  voltage_V: decades(1, 6),
});

export const dcSupplyArb: fc.Arbitrary<EnergySource> = fc.record(
  {
    id,
    kind: fc.constant("dc-supply" as const),
    voltage_V: decades(0, 6),
    currentLimit_A: decades(-6, 3.5),
    seriesResistance_ohm: fc.oneof(fc.constant(0), decades(0, 7)),
    outputCapacitance_F: decades(-12, -2),
  },
  { requiredKeys: ["kind", "voltage_V", "currentLimit_A"] },
);

export const acSupplyArb: fc.Arbitrary<EnergySource> = fc.record({
  id,
  kind: fc.constant("ac-supply" as const),
  voltageRms_V: decades(0, 5),
  frequency_Hz: decades(0, 6),
  currentLimit_A: decades(-6, 2),
});

export const sourceArb = fc.oneof(capacitorArb, customArb, sphereArb, dcSupplyArb, acSupplyArb);

export const gapArb: fc.Arbitrary<SparkGap> = fc.record(
  {
    sphereDiameter_m: decades(-2.5, 0),
    // 1 mm to 1 m; with pressure ≥ 50 kPa and ≤ 100 °C, δ·d stays above the 0.01 cm floor.
    spacing_m: decades(-3, 0),
    pressure_Pa: fc.double({ min: 50_000, max: 200_000, noNaN: true }),
    temperature_C: fc.double({ min: -40, max: 100, noNaN: true }),
  },
  { requiredKeys: ["sphereDiameter_m", "spacing_m"] },
);

/** Which of up to five sources a gap or bleeder is wired across, as flags by source position. */
const wiring = fc.array(fc.boolean(), { minLength: 5, maxLength: 5 });

/** The engine's id of each source: its own (made unique by position) or "source-N". */
export const engineIds = (sources: readonly EnergySource[]) =>
  sources.map((source, index) => source.id ?? `source-${index + 1}`);

export const setupArb: fc.Arbitrary<SetupInput> = fc
  .record(
    {
      sources: fc.array(sourceArb, { minLength: 1, maxLength: 5 }),
      gaps: fc.array(fc.tuple(gapArb, wiring), { maxLength: 2 }),
      bleeders: fc.array(fc.tuple(decades(2, 12), wiring), { maxLength: 2 }),
      bodyResistance_ohm: decades(0, 5),
      vacuumDevice: fc.boolean(),
    },
    { requiredKeys: ["sources", "gaps", "bleeders"] },
  )
  .map(({ sources: raw, gaps, bleeders, ...rest }) => {
    // Ids must be unique for wiring to name them: an id gets its position appended.
    const sources = raw.map((source, index) =>
      source.id === undefined ? source : { ...source, id: `${source.id}#${index}` },
    );
    const ids = engineIds(sources);
    const pick = (flags: boolean[], allow: (source: EnergySource) => boolean) =>
      ids.filter((_, i) => flags[i] && allow(sources[i]));
    const setup: SetupInput = { sources, ...rest };
    if (gaps.length > 0) setup.gaps = gaps.map(([gap, flags]) => ({ ...gap, across: pick(flags, () => true) }));
    const wired = bleeders
      .map(([resistance_ohm, flags]) => ({ resistance_ohm, across: pick(flags, (s) => s.kind !== "ac-supply") }))
      .filter((bleeder) => bleeder.across.length > 0);
    if (wired.length > 0) setup.bleeders = wired;
    return setup;
  });
