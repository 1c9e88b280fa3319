// Flags beside the tier: thermal, x-ray, ozone, ignition, overvoltage, no bleeder, the 5 s discharge
// time, and input a part of its kind cannot plausibly have.

import { idList, sum } from "./findings";
import { atLeast, atMost, pathTime_s, ROUNDING, type Item } from "./prepare";
import { citation } from "./references";
import type { Flag, SetupInput, TierRules } from "./types";
import { formatQuantity as q } from "./units";

export function flagsFor(
  input: SetupInput,
  items: readonly Item[],
  totals: { energy_J: number; maxVoltage_V: number },
  rules: TierRules,
): Flag[] {
  const f = rules.flags;
  const flags: Flag[] = [];
  const stored = items.filter((item) => item.capacitance_F > 0);

  const lowVoltage = stored.filter((item) => !atLeast(item.voltage_V, f.thermalMaxVoltage.value));
  const lowVoltageEnergy = sum(lowVoltage, (item) => item.energy_J);
  if (lowVoltageEnergy > f.thermalEnergy.value * (1 + ROUNDING)) {
    flags.push({
      code: "thermal",
      message:
        `${q(lowVoltageEnergy, "J")} is stored below ${q(f.thermalMaxVoltage.value, "V")} (${idList(lowVoltage)}): ` +
        `more than ${q(f.thermalEnergy.value, "J")}, so a short circuit can burn and melt metal even where the shock risk is low.`,
      source: f.thermalEnergy.source,
      ref: f.thermalEnergy.ref,
    });
  }

  const hotSupplies = items.filter(
    (item) =>
      item.kind === "dc-supply" &&
      !atLeast(item.voltage_V, f.dcThermalMaxVoltage.value) &&
      item.voltage_V * (item.currentLimit_A as number) > f.dcThermalPower.value * (1 + ROUNDING),
  );
  if (hotSupplies.length > 0) {
    flags.push({
      code: "thermal",
      message:
        hotSupplies
          .map(
            (item) =>
              `${item.id} can deliver ${q(item.voltage_V * (item.currentLimit_A as number), "W")} at ${q(item.voltage_V, "V")} DC`,
          )
          .join("; ") +
        `: below ${q(f.dcThermalMaxVoltage.value, "V")} and above ${q(f.dcThermalPower.value, "W")}, a short circuit can burn and melt metal even where the shock risk is low.`,
      source: f.dcThermalPower.source,
      ref: f.dcThermalPower.ref,
    });
  }

  if (input.vacuumDevice === true && atLeast(totals.maxVoltage_V, f.xrayVoltage.value)) {
    flags.push({
      code: "x-ray",
      message:
        `A vacuum device is driven at up to ${q(totals.maxVoltage_V, "V")} (${q(f.xrayVoltage.value, "V")} or more): ` +
        "electrons pulled from the electrodes make x-rays even in apparatus not meant to; survey with a dose-rate meter and shield.",
      source: f.xrayVoltage.source,
      ref: f.xrayVoltage.ref,
    });
  }

  const gapCount = input.gaps?.length ?? 0;
  const highVoltage = atLeast(totals.maxVoltage_V, f.ozoneVoltage.value);
  if (gapCount > 0 || highVoltage) {
    const why = [
      gapCount > 0 ? `${gapCount} open spark gap${gapCount === 1 ? "" : "s"}` : "",
      highVoltage ? `corona at ${q(totals.maxVoltage_V, "V")}` : "",
    ]
      .filter(Boolean)
      .join(" and ");
    flags.push({
      code: "ozone",
      message: `${why[0].toUpperCase()}${why.slice(1)} ${gapCount === 1 && !highVoltage ? "makes" : gapCount === 0 ? "makes" : "make"} ozone: ventilate the room, especially for long runs.`,
      source: f.ozoneVoltage.source,
      ref: f.ozoneVoltage.ref,
    });
  }

  if (atLeast(totals.energy_J, f.ignitionEnergy.value)) {
    flags.push({
      code: "ignition",
      message:
        `Stored energy ${q(totals.energy_J, "J")} is at or above ${q(f.ignitionEnergy.value, "J")}: a spark can ignite ` +
        "common flammable vapours (hydrogen with far less); keep solvents and fuel gases away.",
      source: f.ignitionEnergy.source,
      ref: f.ignitionEnergy.ref,
    });
  }

  const over = items.filter(
    (item) =>
      item.ratedVoltage_V !== null && item.unitVoltage_V !== null && !atMost(item.unitVoltage_V, item.ratedVoltage_V),
  );
  if (over.length > 0) {
    flags.push({
      code: "overvoltage",
      message:
        over
          .map(
            (item) =>
              `${item.id}: ${q(item.unitVoltage_V as number, "V")} per capacitor against a rating of ${q(item.ratedVoltage_V as number, "V")}`,
          )
          .join("; ") + ". A capacitor above its rating can fail short or burst.",
      source: citation("bench-practice"),
      ref: "bench-practice",
    });
  }

  const unbled = stored.filter((item) => item.discharge.length === 0);
  const unbledEnergy = sum(unbled, (item) => item.energy_J);
  if (unbledEnergy > f.noBleederEnergy.value * (1 + ROUNDING)) {
    flags.push({
      code: "no-bleeder",
      message:
        `${q(unbledEnergy, "J")} is stored in sources with no bleeder (${idList(unbled)}), more than ` +
        `${q(f.noBleederEnergy.value, "J")}: provide a means of discharge (bleeder or shorting switch) and ground before touching.`,
      source: f.noBleederEnergy.source,
      ref: f.noBleederEnergy.ref,
    });
  }
  dischargeFlags(items, rules, flags);
  implausibleFlags(items, rules, flags);
  return flags;
}

/** The bleeder resistance that takes a path's capacitance from its voltage to the safe voltage in t. */
export function bleederFor_ohm(capacitance_F: number, voltage_V: number, safe_V: number, time_s: number): number {
  return time_s / (capacitance_F * Math.log(voltage_V / safe_V));
}

/** IEC 60204-1 6.2.4: above 60 V, discharged to 60 V within 5 s unless the charge is at most 60 µC. */
function dischargeFlags(items: readonly Item[], rules: TierRules, flags: Flag[]): void {
  const { time, exemptCharge } = rules.discharge;
  const safe_V = rules.safeVoltage.value;
  const slow = items.filter(
    (item) =>
      item.capacitance_F > 0 &&
      !atMost(item.voltage_V, safe_V) &&
      !atMost(item.charge_C, exemptCharge.value) &&
      (item.timeToSafe_s === null || item.timeToSafe_s > time.value * (1 + ROUNDING)),
  );
  if (slow.length === 0) return;
  const parts = slow.map((item) => {
    const path = item.fastest;
    const C = path?.capacitance_F ?? item.capacitance_F;
    const V = path?.voltage_V ?? item.voltage_V;
    const needed = bleederFor_ohm(C, V, safe_V, time.value);
    const now =
      item.timeToSafe_s === null
        ? "has no bleeder"
        : `takes ${q(item.timeToSafe_s, "s")} through ${path?.name ?? "its bleeder"} (${q(path?.resistance_ohm ?? 0, "Ω")})`;
    return (
      `${item.id} (${q(item.charge_C, "C")} at ${q(item.voltage_V, "V")}) ${now} to reach ${q(safe_V, "V")}; ` +
      `a bleeder of at most ${q(needed, "Ω")} across ${path ? path.across.join(", ") : item.id} would take ${q(time.value, "s")}`
    );
  });
  flags.push({
    code: "discharge-time",
    message:
      `${parts.join(". ")}. Parts above ${q(safe_V, "V")} should reach it within ${q(time.value, "s")} unless they store at most ` +
      `${q(exemptCharge.value, "C")}; otherwise post a sign stating the waiting time.`,
    source: time.source,
    ref: time.ref,
  });
}

/** Electric strength of air, about 3 MV/m: an isolated sphere cannot hold more than about E·r. */
const AIR_STRENGTH_V_PER_M = 3e6;
/** No single capacitor on a bench stores more than 1 MJ; more is a mistyped prefix. */
const MAX_UNIT_ENERGY_J = 1e6;
/** No bench supply delivers more than 1 MW. */
const MAX_SUPPLY_POWER_W = 1e6;

/** Figures a part of the kind cannot have: most likely a mistyped prefix. The form asks to confirm. */
function implausibleFlags(items: readonly Item[], rules: TierRules, flags: Flag[]): void {
  const { bleederPower, minTimeToSafe } = rules.plausibility;
  const safe_V = rules.safeVoltage.value;
  const say = (field: string, message: string, threshold: { source: string; ref?: string }) =>
    flags.push({ code: "implausible", message, source: threshold.source, ref: threshold.ref, field });
  const seen = new Set<string>();
  for (const item of items) {
    for (const path of item.discharge) {
      if (seen.has(path.field)) continue;
      seen.add(path.field);
      const power = (path.voltage_V * path.voltage_V) / path.resistance_ohm;
      const t = pathTime_s(path, safe_V);
      if (power > bleederPower.value * (1 + ROUNDING)) {
        say(
          path.field,
          `${path.name} of ${path.across.join(", ")} (${q(path.resistance_ohm, "Ω")}) would dissipate ${q(power, "W")} at ` +
            `${q(path.voltage_V, "V")}, more than ${q(bleederPower.value, "W")}: is the resistance mistyped (MΩ for mΩ or Ω)?`,
          bleederPower,
        );
      } else if (t > 0 && t < minTimeToSafe.value) {
        say(
          path.field,
          `${path.name} of ${path.across.join(", ")} would discharge it to ${q(safe_V, "V")} in ${q(t, "s")}, under ` +
            `${q(minTimeToSafe.value, "s")}: is the resistance or the capacitance mistyped?`,
          minTimeToSafe,
        );
      }
    }
    const at = `sources[${item.index}]`;
    const unitEnergy =
      item.unitCapacitance_F !== null && item.unitVoltage_V !== null
        ? 0.5 * item.unitCapacitance_F * item.unitVoltage_V * item.unitVoltage_V
        : item.energy_J;
    if (
      (item.kind === "capacitor" || item.kind === "custom-capacitance" || item.kind === "dc-supply") &&
      unitEnergy > MAX_UNIT_ENERGY_J
    ) {
      say(
        item.kind === "dc-supply" ? `${at}.outputCapacitance_F` : `${at}.capacitance_F`,
        `${item.id} would store ${q(unitEnergy, "J")} in one capacitor (${q(item.unitCapacitance_F ?? item.capacitance_F, "F")} at ` +
          `${q(item.unitVoltage_V ?? item.voltage_V, "V")}), more than any one capacitor can: is the capacitance or the voltage mistyped?`,
        { source: citation("benchclear-plausibility"), ref: "benchclear-plausibility" },
      );
    }
    if (item.kind === "sphere-terminal" && !item.voltageFromGap) {
      const radius_m = item.capacitance_F / (4 * Math.PI * 8.8541878128e-12);
      const most = AIR_STRENGTH_V_PER_M * radius_m;
      if (item.requested_V > most * (1 + ROUNDING)) {
        say(
          `${at}.voltage_V`,
          `${item.id} is set to ${q(item.requested_V, "V")}, but a sphere of ${q(radius_m, "m")} radius in air sparks or ` +
            `coronas away above about ${q(most, "V")} (3 MV/m × radius): is the voltage or the radius mistyped?`,
          { source: citation("benchclear-plausibility"), ref: "benchclear-plausibility" },
        );
      }
    }
    if (item.currentLimit_A !== null && item.voltageRms_V * item.currentLimit_A > MAX_SUPPLY_POWER_W) {
      say(
        `${at}.currentLimit_A`,
        `${item.id} could deliver ${q(item.voltageRms_V * item.currentLimit_A, "W")}, more than a bench supply: is the ` +
          "current limit or the voltage mistyped?",
        { source: citation("benchclear-plausibility"), ref: "benchclear-plausibility" },
      );
    }
  }
}
