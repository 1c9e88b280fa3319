// Measures how fast the hazard engine assesses a large set-up (20 sources, 3 gaps), as the live form
// recomputes on every keystroke. Run: npx tsx scripts/bench/hazard.ts

import { assessSetup, type EnergySource, type SetupInput } from "../../lib/hazard";

function buildSetup(): SetupInput {
  const sources: EnergySource[] = [];
  for (let i = 0; i < 20; i++) {
    // Cycle through every kind, with values spread over the tiers (1 nF to 100 µF, 100 V to 30 kV).
    switch (i % 5) {
      case 0:
        sources.push({
          id: `bank-${i}`,
          kind: "capacitor",
          capacitance_F: 1e-9 * 10 ** (i % 4),
          voltage_V: 1000 * (1 + i),
          count: 2 + (i % 3),
          arrangement: i % 2 === 0 ? "parallel" : "series",
          ratedVoltage_V: 20_000,
          bleeder_ohm: 1e8,
          seriesResistance_ohm: 10,
        });
        break;
      case 1:
        sources.push({
          id: `jar-${i}`,
          kind: "custom-capacitance",
          capacitance_F: 1.06e-9,
          voltage_V: 25_000,
          bleeder_ohm: 1e9,
        });
        break;
      case 2:
        sources.push({ id: `dome-${i}`, kind: "sphere-terminal", radius_m: 0.05 + i / 100 });
        break;
      case 3:
        sources.push({
          id: `hv-${i}`,
          kind: "dc-supply",
          voltage_V: 30_000,
          currentLimit_A: 1e-3 * i,
          seriesResistance_ohm: 1e6,
          outputCapacitance_F: 2e-9,
        });
        break;
      default:
        sources.push({
          id: `mains-${i}`,
          kind: "ac-supply",
          voltageRms_V: 230,
          frequency_Hz: 50,
          currentLimit_A: 0.1 * i,
        });
    }
  }
  return {
    sources,
    gaps: [
      // Engine 2 caps only what a gap is across: the first gap is across every source, so the
      // voltage-less domes have a ceiling and every source's figures go through the ceiling path.
      { sphereDiameter_m: 0.05, spacing_m: 0.012, across: sources.map((source) => source.id as string) },
      { sphereDiameter_m: 0.07, spacing_m: 0.02, pressure_Pa: 96_000, temperature_C: 24 },
      { sphereDiameter_m: 0.5, spacing_m: 0.1 },
    ],
    vacuumDevice: true,
  };
}

const input = buildSetup();

// Warm-up: let the JIT compile the hot paths before anything is timed (about 0.5 s).
const warmUntil = performance.now() + 500;
let sink = 0;
while (performance.now() < warmUntil) sink += assessSetup(input).tier;

// Each assessment is timed on its own: at well over 10 µs apiece, the timer's resolution and its
// own cost (well under 1 µs) hardly matter.
const samples: number[] = [];
const runFor_ms = 2000;
const start = performance.now();
while (performance.now() - start < runFor_ms) {
  const t0 = performance.now();
  sink += assessSetup(input).tier;
  samples.push((performance.now() - t0) * 1000);
}
const elapsed_s = (performance.now() - start) / 1000;
const assessments = samples.length;

samples.sort((a, b) => a - b);
const quantile = (q: number) => samples[Math.min(samples.length - 1, Math.floor(q * samples.length))];
const mean_us = samples.reduce((total, x) => total + x, 0) / samples.length;

console.log(
  `hazard engine: ${input.sources.length} sources, ${input.gaps?.length ?? 0} gaps, ${elapsed_s.toFixed(2)} s`,
);
console.log(`assessments per second: ${Math.round(assessments / elapsed_s)}`);
console.log(`mean: ${mean_us.toFixed(1)} µs per assessment`);
console.log(`p50:  ${quantile(0.5).toFixed(1)} µs`);
console.log(`p99:  ${quantile(0.99).toFixed(1)} µs`);
// Printing the checksum keeps the optimiser from discarding the work being timed.
console.log(`checksum: ${sink}`);
