// Findings: every tier criterion that holds for the prepared sources — the stored-energy levels,
// the ∫i²dt of a capacitor discharge, and one table-driven current ladder for DC and AC supplies.

import { atLeast, atMost, type Item } from "./prepare";
import { supplyFindings } from "./supply";
import type { Tier, TierRules } from "./types";
import { formatQuantity as q } from "./units";

/** One tier criterion that holds. The meaning is written only for the set-up's own reasons. */
export type Finding = {
  criterion: string;
  value: number;
  unit: string;
  threshold: number;
  tier: Tier;
  source: string;
  ref?: string;
  meaning: () => string;
};

export const CRITERION_ORDER = [
  "stored-energy-arc",
  "arc-current-dc",
  "arc-voltage-ac",
  "stored-energy-lethal",
  "fibrillation-current-dc",
  "fibrillation-current-ac",
  "impulse-specific-energy",
  "stored-energy-heavy-shock",
  "let-go-current-dc",
  "let-go-current-ac",
  "capacitance-level",
  "touch-current-dc",
  "touch-current-ac",
  "touch-safe-voltage-dc",
  "touch-safe-voltage-ac",
];

export const sum = (items: readonly Item[], pick: (item: Item) => number) =>
  items.reduce((total, item) => total + pick(item), 0);
export const maxOf = (items: readonly Item[], pick: (item: Item) => number) =>
  items.reduce((best, item) => Math.max(best, pick(item)), 0);
export const idList = (items: readonly Item[]) => items.map((item) => item.id).join(", ");

type LevelShare = { kind: "capacitance" | "charge" | "energy"; quantity: number; level: number; share: number };

/** How much of the touch-safe capacitance level one charged source uses (1 = exactly at the level). */
function levelShare(item: Item, rules: TierRules): LevelShare {
  const ts = rules.touchSafe;
  const C = item.capacitance_F;
  if (atMost(item.voltage_V, ts.capacitanceBandTop.value)) {
    return { kind: "capacitance", quantity: C, level: ts.capacitance.value, share: C / ts.capacitance.value };
  }
  const byCharge: LevelShare = {
    kind: "charge",
    quantity: item.charge_C,
    level: ts.charge.value,
    share: item.charge_C / ts.charge.value,
  };
  if (atMost(item.voltage_V, ts.chargeBandTop.value)) return byCharge;
  const byEnergy: LevelShare = {
    kind: "energy",
    quantity: item.energy_J,
    level: ts.energy.value,
    share: item.energy_J / ts.energy.value,
  };
  // Just above 15 kV the energy level (350 mJ) is looser than the charge level below it (45 µC at
  // 15 kV is 338 mJ); the tighter of the two keeps the level falling steadily with voltage, so raising
  // a voltage never turns a combination touch-safe. For one source it never changes the tier: past
  // 45 µC at 15 kV the energy is above 0.25 J, which is tier 2 anyway.
  return byEnergy.share >= byCharge.share ? byEnergy : byCharge;
}

const LEVEL_UNIT = { capacitance: "F", charge: "C", energy: "J" } as const;

function capacitanceLevelFinding(charged: Item[], rules: TierRules): Finding {
  const ts = rules.touchSafe;
  const shares = charged.map((item) => levelShare(item, rules));
  const kind = shares[0].kind;
  const sameKind = shares.every((share) => share.kind === kind);
  const top = maxOf(charged, (item) => item.voltage_V);
  // Text is built only when the reason is shown, not for every per-source evaluation.
  const bandText = (band: LevelShare["kind"]) =>
    band === "capacitance"
      ? `from ${q(ts.dcVoltage.value, "V")} to ${q(ts.capacitanceBandTop.value, "V")}`
      : band === "charge"
        ? `from ${q(ts.capacitanceBandTop.value, "V")} to ${q(ts.chargeBandTop.value, "V")}` +
          (sameKind && top > ts.chargeBandTop.value
            ? `, kept a little above ${q(ts.chargeBandTop.value, "V")} where it is tighter than ${q(ts.energy.value, "J")}`
            : "")
        : `above ${q(ts.chargeBandTop.value, "V")}`;
  const quantityWord = { capacitance: "Capacitance", charge: "Stored charge", energy: "Stored energy" };
  if (sameKind) {
    const value = shares.reduce((total, share) => total + share.quantity, 0);
    const threshold = shares[0].level;
    const within = atMost(value, threshold);
    const unit = LEVEL_UNIT[kind];
    return {
      criterion: "capacitance-level",
      value,
      unit,
      threshold,
      tier: within ? 0 : 1,
      source: kind === "capacitance" ? ts.capacitance.source : kind === "charge" ? ts.charge.source : ts.energy.source,
      ref: ts.charge.ref,
      meaning: () =>
        `${quantityWord[kind]} ${q(value, unit)} at up to ${q(top, "V")}` +
        (charged.length === 1 ? "" : ` (${charged.length} sources together: ${idList(charged)})`) +
        " is " +
        (within
          ? `within the touch-safe level of ${q(threshold, unit)} ${bandText(kind)}: a discharge may be felt but is not hazardous.`
          : `above the touch-safe level of ${q(threshold, unit)} ${bandText(kind)}: a discharge gives a painful shock.`),
    };
  }
  const total = shares.reduce((acc, share) => acc + share.share, 0);
  const within = atMost(total, 1);
  return {
    criterion: "capacitance-level",
    value: total * 100,
    unit: "%",
    threshold: 100,
    tier: within ? 0 : 1,
    source: `${ts.charge.source}; shares summed across sources (Benchclear's combination rule)`,
    ref: ts.charge.ref,
    meaning: () =>
      `The ${charged.length} charged sources (${idList(charged)}) together use ${(total * 100).toFixed(1)} % of the ` +
      "touch-safe levels (each source's capacitance, charge or energy over the level for its voltage: " +
      `${q(ts.capacitance.value, "F")} ${bandText("capacitance")}, ${q(ts.charge.value, "C")} ${bandText("charge")}, ` +
      `${q(ts.energy.value, "J")} ${bandText("energy")}) — ` +
      (within
        ? "within the level: a discharge may be felt but is not hazardous."
        : "above it: a discharge gives a painful shock."),
  };
}

function storedFindings(items: readonly Item[], rules: TierRules, out: Finding[]): void {
  const stored = items.filter((item) => item.capacitance_F > 0);
  if (stored.length === 0) return;
  const touch = rules.touchSafe.dcVoltage;
  // Below the touch-safe voltage a set-up is tier 0 whatever it stores; a large energy there is a
  // burn hazard, which the thermal flag reports.
  const charged = stored.filter((item) => !atMost(item.voltage_V, touch.value));
  if (charged.length === 0) {
    const top = maxOf(stored, (item) => item.voltage_V);
    out.push({
      criterion: "touch-safe-voltage-dc",
      value: top,
      unit: "V",
      threshold: touch.value,
      tier: 0,
      source: touch.source,
      ref: touch.ref,
      meaning: () =>
        `Every stored-energy source is at or below ${q(touch.value, "V")} DC (highest ${q(top, "V")}): ` +
        "touch-safe whatever it stores, so the shock criteria for stored energy do not apply.",
    });
    return;
  }
  out.push(capacitanceLevelFinding(charged, rules));

  const reflex = rules.reflex.energy;
  const energy = sum(charged, (item) => item.energy_J);
  if (atLeast(energy, reflex.value)) {
    out.push({
      criterion: "stored-energy-heavy-shock",
      value: energy,
      unit: "J",
      threshold: reflex.value,
      tier: 2,
      source: reflex.source,
      ref: reflex.ref,
      meaning: () =>
        `Stored energy ${q(energy, "J")} above ${q(touch.value, "V")} is at or above ${q(reflex.value, "J")}: ` +
        "a discharge through the body gives a heavy shock, and the reflex it causes can injure.",
    });
  }

  const lethal = rules.lethal;
  const lethalSet = charged.filter((item) => atLeast(item.voltage_V, lethal.energyMinVoltage.value));
  const lethalEnergy = sum(lethalSet, (item) => item.energy_J);
  if (lethalSet.length > 0 && atLeast(lethalEnergy, lethal.energy.value)) {
    out.push({
      criterion: "stored-energy-lethal",
      value: lethalEnergy,
      unit: "J",
      threshold: lethal.energy.value,
      tier: 3,
      source: lethal.energy.source,
      ref: lethal.energy.ref,
      meaning: () =>
        `Stored energy ${q(lethalEnergy, "J")} at ${q(lethal.energyMinVoltage.value, "V")} or more is at or above ` +
        `${q(lethal.energy.value, "J")}: a discharge through the body can stop the heart.`,
    });
  }

  const arc = rules.arc;
  const arcSet = charged.filter((item) => atLeast(item.voltage_V, arc.energyMinVoltage.value));
  const arcEnergy = sum(arcSet, (item) => item.energy_J);
  if (arcSet.length > 0 && atLeast(arcEnergy, arc.energy.value)) {
    out.push({
      criterion: "stored-energy-arc",
      value: arcEnergy,
      unit: "J",
      threshold: arc.energy.value,
      tier: 4,
      source: arc.energy.source,
      ref: arc.energy.ref,
      meaning: () =>
        `Stored energy ${q(arcEnergy, "J")} at ${q(arc.energyMinVoltage.value, "V")} or more is at or above ` +
        `${q(arc.energy.value, "J")}: a fault can release it as an arc flash and blast (burns, flying metal, hearing damage).`,
    });
  }
}

/** ∫i²dt of the strongest capacitor discharge against IEC 60479-2's fibrillation data (tier 3). */
function impulseFinding(items: readonly Item[], rules: TierRules, out: Finding[]): void {
  // Like the other lethal criteria it applies from 100 V: below, skin keeps the body far above the
  // 500 Ω model and the LBNL table treats stored energy as a burn hazard only.
  const floor = rules.lethal.energyMinVoltage.value;
  const { specificEnergy, minDuration } = rules.impulse;
  let worst: Item | null = null;
  for (const item of items) {
    if (item.capacitance_F <= 0 || !atLeast(item.voltage_V, floor)) continue;
    // The data are for impulses of 0.1 ms or longer; a shorter discharge needs more ∫i²dt to
    // fibrillate, so there the energy criteria decide alone.
    if (!atLeast(item.timeConstant_s, minDuration.value)) continue;
    if (!worst || item.specificEnergy_A2s > worst.specificEnergy_A2s) worst = item;
  }
  if (!worst || !atLeast(worst.specificEnergy_A2s, specificEnergy.value)) return;
  const w = worst;
  out.push({
    criterion: "impulse-specific-energy",
    value: w.specificEnergy_A2s,
    unit: "A²s",
    threshold: specificEnergy.value,
    tier: 3,
    source: specificEnergy.source,
    ref: specificEnergy.ref,
    meaning: () =>
      `A discharge of ${w.id} through the body (${q(w.voltage_V, "V")}, ${q(w.capacitance_F, "F")} into ` +
      `${q(w.resistance_ohm, "Ω")}, time constant ${q(w.timeConstant_s, "s")}) gives ∫i²dt = V²·C / (2·R) = ` +
      `${w.specificEnergy_A2s.toPrecision(3)} A²s, at or above ${specificEnergy.value} A²s: enough to stop the heart.`,
  });
}

export function findings(items: readonly Item[], rules: TierRules): Finding[] {
  const out: Finding[] = [];
  storedFindings(items, rules, out);
  impulseFinding(items, rules, out);
  for (const item of items)
    if (item.kind === "dc-supply" || item.kind === "ac-supply") supplyFindings(item, rules, out);
  return out;
}

export const highestTier = (list: readonly Finding[]): Tier =>
  list.reduce<Tier>((best, finding) => (finding.tier > best ? finding.tier : best), 0);

/** Keeps, per criterion, the instance that weighs most (higher tier, then further past its threshold). */
export function strongestPerCriterion(list: readonly Finding[]): Finding[] {
  const best = new Map<string, Finding>();
  for (const finding of list) {
    const held = best.get(finding.criterion);
    if (
      !held ||
      finding.tier > held.tier ||
      (finding.tier === held.tier && finding.value / finding.threshold > held.value / held.threshold)
    ) {
      best.set(finding.criterion, finding);
    }
  }
  return [...best.values()].sort(
    (a, b) => b.tier - a.tier || CRITERION_ORDER.indexOf(a.criterion) - CRITERION_ORDER.indexOf(b.criterion),
  );
}
