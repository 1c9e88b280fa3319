// Preparation: each source turned into the figures the criteria read (voltage after the ceilings of
// the gaps wired across it, capacitance, currents, discharge), in SI base units.

import { sphereCapacitance_F } from "./capacitance";
import type { GapBreakdown } from "./gaps";
import type { EnergySource, SetupInput, SourceKind, TierRules } from "./types";

// A bound written "≤" belongs to the lower tier and "≥" to the higher. Values typed exactly at a bound
// (10 J from 2 mF at 100 V) come out of floating-point arithmetic a few units in the last place off, so
// comparisons allow a relative margin of 1e-9 in the direction the table assigns the bound.
export const ROUNDING = 1e-9;
export const atLeast = (value: number, threshold: number) => value >= threshold * (1 - ROUNDING);
export const atMost = (value: number, threshold: number) => value <= threshold * (1 + ROUNDING);

/** Crest factor of a sine wave: a gap or a body sees √2 times the rms voltage at the peak. */
export const CREST = Math.SQRT2;

/** One way a source can be discharged: its own bleeder, or a bleeder wired across it and others. */
export type DischargePath = {
  /** "sources[0].bleeder_ohm" or "bleeders[1]". */
  field: string;
  /** Shown name: "its own bleeder" or "bleeder B1". */
  name: string;
  resistance_ohm: number;
  /** Capacitance the bleeder sees (every source it is across), F. */
  capacitance_F: number;
  /** Highest voltage among the sources it is across, V. */
  voltage_V: number;
  /** Ids of the sources it is across. */
  across: string[];
};

export type Item = {
  index: number;
  id: string;
  kind: SourceKind;
  system: "dc" | "ac";
  /** Before any gap ceiling (AC as crest value), V. */
  requested_V: number;
  /** A sphere terminal given no voltage: it charges until a gap across it sparks over. */
  voltageFromGap: boolean;
  /** The lowest ceiling (upper bound of a breakdown) of the gaps across this source, V; null: none. */
  ceiling_V: number | null;
  /** Index of the gap that sets the ceiling. */
  ceilingGap: number | null;
  /** After the gap ceiling (AC as crest value), V. */
  voltage_V: number;
  /** AC: rms after the ceiling; DC: equal to voltage_V. */
  voltageRms_V: number;
  /** Stored-energy capacitance; 0 for a supply without output capacitance. */
  capacitance_F: number;
  /** Capacitance of one unit and the voltage across it (capacitor banks), for plausibility. */
  unitCapacitance_F: number | null;
  unitVoltage_V: number | null;
  ratedVoltage_V: number | null;
  /** Body plus series resistance, Ω. */
  resistance_ohm: number;
  currentLimit_A: number | null;
  frequency_Hz: number | null;
  charge_C: number;
  energy_J: number;
  peakCurrent_A: number;
  timeConstant_s: number;
  specificEnergy_A2s: number;
  continuousCurrent_A: number;
  /** Every bleeder that discharges this source. */
  discharge: DischargePath[];
  /** The fastest single path's time to the safe voltage; 0 at or below it; null with no path. */
  timeToSafe_s: number | null;
  /** The path that gives timeToSafe_s. */
  fastest: DischargePath | null;
};

/** Discharge time through one path: V(t) = V·e^(−t / (R·C)), so t = R·C·ln(V / V_safe). */
export function pathTime_s(path: DischargePath, safe_V: number): number {
  if (atMost(path.voltage_V, safe_V)) return 0;
  return path.resistance_ohm * path.capacitance_F * Math.log(path.voltage_V / safe_V);
}

type Base = Omit<Item, "discharge" | "timeToSafe_s" | "fastest">;

function base(
  source: EnergySource,
  index: number,
  id: string,
  ceiling: { V: number; gap: number } | null,
  body_ohm: number,
): Base {
  let system: "dc" | "ac" = "dc";
  let requested_V: number;
  let capacitance_F = 0;
  let resistance_ohm = body_ohm;
  let currentLimit_A: number | null = null;
  let frequency_Hz: number | null = null;
  let ratedVoltage_V: number | null = null;
  let unitCapacitance_F: number | null = null;
  let voltageFromGap = false;
  /** Units in series share the bank voltage; 1 for everything else. */
  let seriesUnits = 1;
  switch (source.kind) {
    case "capacitor": {
      const count = source.count ?? 1;
      const series = source.arrangement === "series";
      requested_V = source.voltage_V;
      // Parallel units add; in series the bank is C1/n with the bank voltage shared equally.
      capacitance_F = series ? source.capacitance_F / count : source.capacitance_F * count;
      unitCapacitance_F = source.capacitance_F;
      resistance_ohm = body_ohm + (source.seriesResistance_ohm ?? 0);
      ratedVoltage_V = source.ratedVoltage_V ?? null;
      if (series) seriesUnits = count;
      break;
    }
    case "custom-capacitance":
      requested_V = source.voltage_V;
      capacitance_F = source.capacitance_F;
      unitCapacitance_F = source.capacitance_F;
      break;
    case "sphere-terminal":
      // Validation guarantees a gap across a terminal whenever its voltage is missing.
      voltageFromGap = source.voltage_V === undefined;
      requested_V = source.voltage_V ?? (ceiling as { V: number }).V;
      capacitance_F = sphereCapacitance_F(source.radius_m);
      break;
    case "dc-supply":
      requested_V = source.voltage_V;
      capacitance_F = source.outputCapacitance_F ?? 0;
      resistance_ohm = body_ohm + (source.seriesResistance_ohm ?? 0);
      currentLimit_A = source.currentLimit_A;
      break;
    case "ac-supply":
      system = "ac";
      requested_V = source.voltageRms_V * CREST;
      currentLimit_A = source.currentLimit_A;
      frequency_Hz = source.frequency_Hz;
      break;
  }
  const V = ceiling === null ? requested_V : Math.min(requested_V, ceiling.V);
  const C = capacitance_F;
  const R = resistance_ohm;
  const voltageRms_V = system === "ac" ? V / CREST : V;
  const kind = source.kind;
  // Supplies drive min(limit, V/R) through the body for as long as they are touched; AC in rms.
  const continuousCurrent_A = currentLimit_A === null ? 0 : Math.min(currentLimit_A, voltageRms_V / R);
  let peakCurrent_A: number;
  if (kind === "ac-supply") peakCurrent_A = continuousCurrent_A * CREST;
  // A supply's output capacitance discharges through the body without the supply's current limit.
  else if (kind === "dc-supply") peakCurrent_A = C > 0 ? V / R : continuousCurrent_A;
  else peakCurrent_A = V / R;
  return {
    index,
    id,
    kind,
    system,
    requested_V,
    voltageFromGap,
    ceiling_V: ceiling?.V ?? null,
    ceilingGap: ceiling?.gap ?? null,
    voltage_V: V,
    voltageRms_V,
    capacitance_F: C,
    unitCapacitance_F,
    unitVoltage_V: kind === "capacitor" ? V / seriesUnits : null,
    ratedVoltage_V,
    resistance_ohm: R,
    currentLimit_A,
    frequency_Hz,
    charge_C: C * V,
    energy_J: 0.5 * C * V * V,
    peakCurrent_A,
    // A supply without output capacitance has no stored-energy discharge: τ and ∫i²dt are 0.
    timeConstant_s: R * C,
    specificEnergy_A2s: (V * V * C) / (2 * R),
    continuousCurrent_A,
  };
}

/**
 * Every source prepared: the gaps across it cap its voltage at their conservative bound, and every
 * bleeder across it (its own, or one of `bleeders`) is a discharge path.
 */
export function prepareAll(
  input: SetupInput,
  ids: readonly string[],
  gaps: readonly GapBreakdown[],
  gapAcross: readonly number[][],
  bleederAcross: readonly number[][],
  body_ohm: number,
  rules: TierRules,
): Item[] {
  const ceilings = input.sources.map(() => null as { V: number; gap: number } | null);
  gapAcross.forEach((across, gapIndex) => {
    for (const sourceIndex of across) {
      const held = ceilings[sourceIndex];
      if (!held || gaps[gapIndex].bound_V < held.V)
        ceilings[sourceIndex] = { V: gaps[gapIndex].bound_V, gap: gapIndex };
    }
  });
  const bases = input.sources.map((source, index) => base(source, index, ids[index], ceilings[index], body_ohm));
  const safe_V = rules.safeVoltage.value;
  const shared: DischargePath[][] = bases.map(() => []);
  (input.bleeders ?? []).forEach((bleeder, bleederIndex) => {
    const across = bleederAcross[bleederIndex];
    const path: DischargePath = {
      field: `bleeders[${bleederIndex}]`,
      name: `bleeder ${bleeder.id ?? bleederIndex + 1}`,
      resistance_ohm: bleeder.resistance_ohm,
      capacitance_F: across.reduce((total, i) => total + bases[i].capacitance_F, 0),
      voltage_V: across.reduce((top, i) => Math.max(top, bases[i].voltage_V), 0),
      across: across.map((i) => bases[i].id),
    };
    for (const i of across) shared[i].push(path);
  });
  return bases.map((item, index) => {
    const source = input.sources[index];
    const own =
      (source.kind === "capacitor" || source.kind === "custom-capacitance") && source.bleeder_ohm !== undefined
        ? [
            {
              field: `sources[${index}].bleeder_ohm`,
              name: "its own bleeder",
              resistance_ohm: source.bleeder_ohm,
              capacitance_F: item.capacitance_F,
              voltage_V: item.voltage_V,
              across: [item.id],
            },
          ]
        : [];
    const discharge = [...own, ...shared[index]].filter((path) => path.capacitance_F > 0);
    let timeToSafe_s: number | null;
    let fastest: DischargePath | null = null;
    // An AC supply holds no charge once switched off; anything at or below the safe voltage is safe now.
    if (item.kind === "ac-supply" || atMost(item.voltage_V, safe_V)) timeToSafe_s = 0;
    // A sphere terminal or a supply with no bleeder across it: its discharge time is unknown.
    else if (discharge.length === 0) timeToSafe_s = null;
    else {
      // Parallel paths discharge faster than any one of them; the fastest single path errs slow, the
      // cautious side for a waiting time.
      timeToSafe_s = Infinity;
      for (const path of discharge) {
        const t = pathTime_s(path, safe_V);
        if (t < timeToSafe_s) {
          timeToSafe_s = t;
          fastest = path;
        }
      }
    }
    return { ...item, discharge, timeToSafe_s, fastest };
  });
}
