// The supply ladder: one table of current rungs for DC and one for AC (touch current, let-go,
// fibrillation, arc flash), walked the same way for every supply.

import type { Finding } from "./findings";
import { atLeast, atMost, type Item } from "./prepare";
import type { Threshold, Tier, TierRules } from "./types";
import { formatQuantity as q } from "./units";

/** One rung of a supply's current ladder. */
type Rung = {
  criterion: string;
  tier: Tier;
  /** The threshold compared with; `on` picks the figure it is compared with. */
  threshold: (rules: TierRules) => Threshold;
  on: "current" | "limit" | "voltage";
  /** A voltage the supply must also reach for the rung to apply. */
  minVoltage?: (rules: TierRules) => Threshold;
  /** Listed even when not reached (as tier 0), like the touch current. */
  always?: boolean;
  says: string;
};

type Ladder = {
  system: "dc" | "ac";
  touchVoltage: (rules: TierRules) => Threshold;
  touchCriterion: string;
  unit: string;
  rungs: Rung[];
};

const LADDERS: Record<"dc" | "ac", Ladder> = {
  dc: {
    system: "dc",
    touchVoltage: (r) => r.touchSafe.dcVoltage,
    touchCriterion: "touch-safe-voltage-dc",
    unit: "DC",
    rungs: [
      {
        criterion: "touch-current-dc",
        tier: 1,
        threshold: (r) => r.touchSafe.dcCurrent,
        on: "current",
        always: true,
        says: "a felt, stinging shock",
      },
      {
        criterion: "let-go-current-dc",
        tier: 2,
        threshold: (r) => r.reflex.dcCurrent,
        on: "current",
        says: "muscles can lock onto the contact and the reflex can injure",
      },
      {
        criterion: "fibrillation-current-dc",
        tier: 3,
        threshold: (r) => r.lethal.dcCurrent,
        minVoltage: (r) => r.lethal.dcMinVoltage,
        on: "current",
        says: "enough to stop the heart",
      },
      {
        criterion: "arc-current-dc",
        tier: 4,
        threshold: (r) => r.arc.dcCurrentLimit,
        minVoltage: (r) => r.arc.dcMinVoltage,
        on: "limit",
        says: "a fault can draw an arc flash",
      },
    ],
  },
  ac: {
    system: "ac",
    touchVoltage: (r) => r.touchSafe.acVoltageRms,
    touchCriterion: "touch-safe-voltage-ac",
    unit: "rms",
    rungs: [
      {
        criterion: "touch-current-ac",
        tier: 1,
        threshold: (r) => r.touchSafe.acCurrentRms,
        on: "current",
        always: true,
        says: "a felt, stinging shock",
      },
      {
        criterion: "let-go-current-ac",
        tier: 2,
        threshold: (r) => r.reflex.acCurrentRms,
        on: "current",
        says: "muscles can lock onto the contact and the reflex can injure",
      },
      {
        criterion: "fibrillation-current-ac",
        tier: 3,
        threshold: (r) => r.lethal.acCurrentRms,
        minVoltage: (r) => r.lethal.acMinVoltageRms,
        on: "current",
        says: "enough to stop the heart",
      },
      {
        criterion: "arc-voltage-ac",
        tier: 4,
        threshold: (r) => r.arc.acMinVoltageRms,
        on: "voltage",
        says: "AC power at this voltage can sustain an arc flash and blast",
      },
    ],
  },
};

export function supplyFindings(item: Item, rules: TierRules, out: Finding[]): void {
  const ladder = LADDERS[item.system];
  const V = item.voltageRms_V;
  const I = item.continuousCurrent_A;
  const limit = item.currentLimit_A as number;
  const who = `Supply ${item.id}`;
  const unit = ladder.unit;
  const touch = ladder.touchVoltage(rules);
  if (atMost(V, touch.value)) {
    out.push({
      criterion: ladder.touchCriterion,
      value: V,
      unit: "V",
      threshold: touch.value,
      tier: 0,
      source: touch.source,
      ref: touch.ref,
      meaning: () =>
        `${who} at ${q(V, "V")} ${unit} is at or below ${q(touch.value, "V")}: touch-safe whatever its current.`,
    });
    return;
  }
  // The body-current thresholds are for 15–100 Hz; at higher frequencies the shock thresholds rise, so
  // keeping them is the cautious reading (RF burns are a separate matter the reviewer must judge).
  const frequencyNote =
    item.system === "ac" && (item.frequency_Hz as number) > 3000
      ? ` The thresholds are for mains frequencies; at ${q(item.frequency_Hz as number, "Hz")} they are applied as a cautious bound.`
      : "";
  const through = () =>
    `${q(I, "A")}${item.system === "ac" ? " rms" : ""} through the body (${q(V, "V")} ${unit}, limit ${q(limit, "A")})`;
  for (const rung of ladder.rungs) {
    const threshold = rung.threshold(rules);
    const value = rung.on === "current" ? I : rung.on === "limit" ? limit : V;
    const floor = rung.minVoltage?.(rules);
    const reached = atLeast(value, threshold.value) && (!floor || atLeast(V, floor.value));
    // The touch current is "≤ belongs to the lower tier": exactly at it stays tier 0.
    const touchRung = rung.always === true;
    const holds = touchRung ? !atMost(value, threshold.value) : reached;
    if (!holds && !touchRung) continue;
    const valueUnit = rung.on === "voltage" ? "V" : "A";
    const shown = `${q(threshold.value, valueUnit)}${item.system === "ac" && rung.on !== "limit" ? " rms" : ""}`;
    out.push({
      criterion: rung.criterion,
      value,
      unit: valueUnit,
      threshold: threshold.value,
      tier: holds ? rung.tier : 0,
      source: threshold.source,
      ref: threshold.ref,
      meaning: () => {
        if (!holds) return `${who} drives at most ${through()}, within the touch current of ${shown}: barely felt.`;
        if (touchRung)
          return `${who} drives ${through()}, above the touch current of ${shown}: ${rung.says}.` + frequencyNote;
        if (rung.on === "voltage") return `${who} at ${q(V, "V")} rms is at or above ${shown}: ${rung.says}.`;
        if (rung.on === "limit")
          return (
            `${who} can deliver ${q(limit, "A")} at ${q(V, "V")} ${unit}: at or above ${shown}` +
            `${floor ? ` at ${q(floor.value, "V")} or more` : ""}, ${rung.says}.`
          );
        return (
          `${who} drives ${through()}: at or above ${shown}` +
          `${floor ? ` at ${q(floor.value, "V")} ${unit} or more` : ""}, ${rung.says}.` +
          frequencyNote
        );
      },
    });
  }
}
