// assessSetup: from a described set-up to its figures, tier, reasons and flags (hazard-model.md).
// Pure and deterministic: the same input and rules give the same assessment, in the browser and on
// the server, so a stored snapshot can always be recomputed and compared.

import { approachDistances, type ApproachLookup } from "./approach";
import { sphereCapacitance_F } from "./capacitance";
import type { GapBreakdown } from "./gaps";
import { DEFAULT_RULES, TIER_LABELS, validateRules } from "./rules";
import type {
  Assessment,
  EnergySource,
  Flag,
  Reason,
  SetupInput,
  SourceKind,
  SourceResult,
  Tier,
  TierRules,
} from "./types";
import { formatQuantity as q } from "./units";
import { checkSetupInput } from "./validate";

/** Version of the calculation itself; stored with every assessment beside the rules' version. */
export const ENGINE_VERSION = "1.0.0";

// A bound written "≤" belongs to the lower tier and "≥" to the higher. Values typed exactly at a bound
// (10 J from 2 mF at 100 V) come out of floating-point arithmetic a few units in the last place off, so
// comparisons allow a relative margin of 1e-9 in the direction the table assigns the bound.
const ROUNDING = 1e-9;
const atLeast = (value: number, threshold: number) => value >= threshold * (1 - ROUNDING);
const atMost = (value: number, threshold: number) => value <= threshold * (1 + ROUNDING);

/** Crest factor of a sine wave: a gap or a body sees √2 times the rms voltage at the peak. */
const CREST = Math.SQRT2;

type Item = {
  id: string;
  kind: SourceKind;
  system: "dc" | "ac";
  /** Before the gap ceiling (AC as crest value), V. */
  requested_V: number;
  /** A sphere terminal given no voltage: it charges until the lowest gap sparks over. */
  voltageFromGap: boolean;
  /** After the gap ceiling (AC as crest value), V. */
  voltage_V: number;
  /** AC: rms after the ceiling; DC: equal to voltage_V. */
  voltageRms_V: number;
  /** Stored-energy capacitance; 0 for a supply without output capacitance. */
  capacitance_F: number;
  /** Body plus series resistance, Ω. */
  resistance_ohm: number;
  bleeder_ohm: number | null;
  currentLimit_A: number | null;
  frequency_Hz: number | null;
  /** Capacitor banks: voltage across one unit and that unit's rating. */
  unitVoltage_V: number | null;
  ratedVoltage_V: number | null;
  charge_C: number;
  energy_J: number;
  peakCurrent_A: number;
  timeConstant_s: number;
  specificEnergy_A2s: number;
  continuousCurrent_A: number;
  timeToSafe_s: number | null;
};

function prepare(
  source: EnergySource,
  index: number,
  ceiling_V: number | null,
  body_ohm: number,
  rules: TierRules,
): Item {
  // Locals first and one object literal at the end: every item gets the same shape, which keeps the
  // engine fast enough to rerun on every keystroke of the form.
  let system: "dc" | "ac" = "dc";
  let requested_V: number;
  let capacitance_F = 0;
  let resistance_ohm = body_ohm;
  let bleeder_ohm: number | null = null;
  let currentLimit_A: number | null = null;
  let frequency_Hz: number | null = null;
  let ratedVoltage_V: number | null = null;
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
      resistance_ohm = body_ohm + (source.seriesResistance_ohm ?? 0);
      bleeder_ohm = source.bleeder_ohm ?? null;
      ratedVoltage_V = source.ratedVoltage_V ?? null;
      if (series) seriesUnits = count;
      break;
    }
    case "custom-capacitance":
      requested_V = source.voltage_V;
      capacitance_F = source.capacitance_F;
      bleeder_ohm = source.bleeder_ohm ?? null;
      break;
    case "sphere-terminal":
      // Validation guarantees a gap whenever the voltage is missing, so the ceiling is then a number.
      voltageFromGap = source.voltage_V === undefined;
      requested_V = source.voltage_V ?? (ceiling_V as number);
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
  const V = ceiling_V === null ? requested_V : Math.min(requested_V, ceiling_V);
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

  const safe_V = rules.safeVoltage.value;
  let timeToSafe_s: number | null;
  // An AC supply holds no charge once switched off; anything at or below the safe voltage is safe now.
  if (kind === "ac-supply" || atMost(V, safe_V)) timeToSafe_s = 0;
  // Exponential decay through the bleeder: V(t) = V·e^(−t / (R_b·C)), so t = R_b·C·ln(V / V_safe).
  else if (bleeder_ohm !== null && C > 0) timeToSafe_s = bleeder_ohm * C * Math.log(V / safe_V);
  // A sphere terminal or a supply has no stated bleeder: its discharge time is unknown.
  else timeToSafe_s = null;

  return {
    id: source.id ?? `source-${index + 1}`,
    kind,
    system,
    requested_V,
    voltageFromGap,
    voltage_V: V,
    voltageRms_V,
    capacitance_F: C,
    resistance_ohm: R,
    bleeder_ohm,
    currentLimit_A,
    frequency_Hz,
    unitVoltage_V: kind === "capacitor" ? V / seriesUnits : null,
    ratedVoltage_V,
    charge_C: C * V,
    energy_J: 0.5 * C * V * V,
    peakCurrent_A,
    timeConstant_s: R * C,
    specificEnergy_A2s: (V * V * C) / (2 * R),
    continuousCurrent_A,
    timeToSafe_s,
  };
}

/** One tier criterion that holds. The meaning is written only for the set-up's own reasons. */
type Finding = {
  criterion: string;
  value: number;
  unit: string;
  threshold: number;
  tier: Tier;
  source: string;
  meaning: () => string;
};

const CRITERION_ORDER = [
  "stored-energy-arc",
  "arc-current-dc",
  "stored-energy-lethal",
  "fibrillation-current-dc",
  "fibrillation-current-ac",
  "stored-energy-heavy-shock",
  "let-go-current-dc",
  "let-go-current-ac",
  "capacitance-level",
  "touch-current-dc",
  "touch-current-ac",
  "touch-safe-voltage-dc",
  "touch-safe-voltage-ac",
];

const sum = (items: readonly Item[], pick: (item: Item) => number) =>
  items.reduce((total, item) => total + pick(item), 0);
const maxOf = (items: readonly Item[], pick: (item: Item) => number) =>
  items.reduce((best, item) => Math.max(best, pick(item)), 0);
const idList = (items: readonly Item[]) => items.map((item) => item.id).join(", ");

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
      meaning: () =>
        `Stored energy ${q(arcEnergy, "J")} at ${q(arc.energyMinVoltage.value, "V")} or more is at or above ` +
        `${q(arc.energy.value, "J")}: a fault can release it as an arc flash and blast (burns, flying metal, hearing damage).`,
    });
  }
}

function dcSupplyFindings(item: Item, rules: TierRules, out: Finding[]): void {
  const V = item.voltage_V;
  const I = item.continuousCurrent_A;
  const limit = item.currentLimit_A as number;
  const touch = rules.touchSafe.dcVoltage;
  const who = `Supply ${item.id}`;
  if (atMost(V, touch.value)) {
    out.push({
      criterion: "touch-safe-voltage-dc",
      value: V,
      unit: "V",
      threshold: touch.value,
      tier: 0,
      source: touch.source,
      meaning: () =>
        `${who} at ${q(V, "V")} DC is at or below ${q(touch.value, "V")}: touch-safe whatever its current.`,
    });
    return;
  }
  const through = () => `${q(I, "A")} through the body (${q(V, "V")} DC, limit ${q(limit, "A")})`;
  const touchCurrent = rules.touchSafe.dcCurrent;
  const withinTouch = atMost(I, touchCurrent.value);
  out.push({
    criterion: "touch-current-dc",
    value: I,
    unit: "A",
    threshold: touchCurrent.value,
    tier: withinTouch ? 0 : 1,
    source: touchCurrent.source,
    meaning: () =>
      withinTouch
        ? `${who} drives at most ${through()}, within the touch current of ${q(touchCurrent.value, "A")}: barely felt.`
        : `${who} drives ${through()}, above the touch current of ${q(touchCurrent.value, "A")}: a felt, stinging shock.`,
  });
  const letGo = rules.reflex.dcCurrent;
  if (atLeast(I, letGo.value)) {
    out.push({
      criterion: "let-go-current-dc",
      value: I,
      unit: "A",
      threshold: letGo.value,
      tier: 2,
      source: letGo.source,
      meaning: () =>
        `${who} drives ${through()}, at or above ${q(letGo.value, "A")}: muscles can lock onto the contact and the reflex can injure.`,
    });
  }
  const lethal = rules.lethal;
  if (atLeast(V, lethal.dcMinVoltage.value) && atLeast(I, lethal.dcCurrent.value)) {
    out.push({
      criterion: "fibrillation-current-dc",
      value: I,
      unit: "A",
      threshold: lethal.dcCurrent.value,
      tier: 3,
      source: lethal.dcCurrent.source,
      meaning: () =>
        `${who} drives ${through()}: at or above ${q(lethal.dcCurrent.value, "A")} at ${q(lethal.dcMinVoltage.value, "V")} ` +
        "DC or more, enough to stop the heart.",
    });
  }
  const arc = rules.arc;
  if (atLeast(V, arc.dcMinVoltage.value) && atLeast(limit, arc.dcCurrentLimit.value)) {
    out.push({
      criterion: "arc-current-dc",
      value: limit,
      unit: "A",
      threshold: arc.dcCurrentLimit.value,
      tier: 4,
      source: arc.dcCurrentLimit.source,
      meaning: () =>
        `${who} can deliver ${q(limit, "A")} at ${q(V, "V")} DC: at or above ${q(arc.dcCurrentLimit.value, "A")} at ` +
        `${q(arc.dcMinVoltage.value, "V")} or more, a fault can draw an arc flash.`,
    });
  }
}

function acSupplyFindings(item: Item, rules: TierRules, out: Finding[]): void {
  const V = item.voltageRms_V;
  const I = item.continuousCurrent_A;
  const limit = item.currentLimit_A as number;
  const touch = rules.touchSafe.acVoltageRms;
  const who = `Supply ${item.id}`;
  if (atMost(V, touch.value)) {
    out.push({
      criterion: "touch-safe-voltage-ac",
      value: V,
      unit: "V",
      threshold: touch.value,
      tier: 0,
      source: touch.source,
      meaning: () =>
        `${who} at ${q(V, "V")} rms is at or below ${q(touch.value, "V")} rms: touch-safe whatever its current.`,
    });
    return;
  }
  // The body-current thresholds are for 15–100 Hz; at higher frequencies the shock thresholds rise, so
  // keeping them is the cautious reading (RF burns are a separate matter the reviewer must judge).
  const frequencyNote = () =>
    (item.frequency_Hz as number) > 3000
      ? ` The thresholds are for mains frequencies; at ${q(item.frequency_Hz as number, "Hz")} they are applied as a cautious bound.`
      : "";
  const through = () => `${q(I, "A")} rms through the body (${q(V, "V")} rms, limit ${q(limit, "A")})`;
  const touchCurrent = rules.touchSafe.acCurrentRms;
  const withinTouch = atMost(I, touchCurrent.value);
  out.push({
    criterion: "touch-current-ac",
    value: I,
    unit: "A",
    threshold: touchCurrent.value,
    tier: withinTouch ? 0 : 1,
    source: touchCurrent.source,
    meaning: () =>
      (withinTouch
        ? `${who} drives at most ${through()}, within the touch current of ${q(touchCurrent.value, "A")} rms: barely felt.`
        : `${who} drives ${through()}, above the touch current of ${q(touchCurrent.value, "A")} rms: a felt, stinging shock.`) +
      frequencyNote(),
  });
  const letGo = rules.reflex.acCurrentRms;
  if (atLeast(I, letGo.value)) {
    out.push({
      criterion: "let-go-current-ac",
      value: I,
      unit: "A",
      threshold: letGo.value,
      tier: 2,
      source: letGo.source,
      meaning: () =>
        `${who} drives ${through()}, at or above ${q(letGo.value, "A")} rms: muscles can lock onto the contact and the reflex can injure.` +
        frequencyNote(),
    });
  }
  const lethal = rules.lethal;
  if (atLeast(V, lethal.acMinVoltageRms.value) && atLeast(I, lethal.acCurrentRms.value)) {
    out.push({
      criterion: "fibrillation-current-ac",
      value: I,
      unit: "A",
      threshold: lethal.acCurrentRms.value,
      tier: 3,
      source: lethal.acCurrentRms.source,
      meaning: () =>
        `${who} drives ${through()}: at or above ${q(lethal.acCurrentRms.value, "A")} rms at ` +
        `${q(lethal.acMinVoltageRms.value, "V")} rms or more, enough to stop the heart.` +
        frequencyNote(),
    });
  }
}

function findings(items: readonly Item[], rules: TierRules): Finding[] {
  const out: Finding[] = [];
  storedFindings(items, rules, out);
  for (const item of items) {
    if (item.kind === "dc-supply") dcSupplyFindings(item, rules, out);
    else if (item.kind === "ac-supply") acSupplyFindings(item, rules, out);
  }
  return out;
}

const highestTier = (list: readonly Finding[]): Tier =>
  list.reduce<Tier>((best, finding) => (finding.tier > best ? finding.tier : best), 0);

/** Keeps, per criterion, the instance that weighs most (higher tier, then further past its threshold). */
function strongestPerCriterion(list: readonly Finding[]): Finding[] {
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

function flagsFor(
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
    });
  }

  if (input.vacuumDevice === true && atLeast(totals.maxVoltage_V, f.xrayVoltage.value)) {
    flags.push({
      code: "x-ray",
      message:
        `A vacuum device is driven at up to ${q(totals.maxVoltage_V, "V")} (${q(f.xrayVoltage.value, "V")} or more): ` +
        "electrons pulled from the electrodes make x-rays even in apparatus not meant to; survey with a dose-rate meter and shield.",
      source: f.xrayVoltage.source,
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
      message: `${why[0].toUpperCase()}${why.slice(1)} make ozone: ventilate the room, especially for long runs.`,
      source: f.ozoneVoltage.source,
    });
  }

  if (atLeast(totals.energy_J, f.ignitionEnergy.value)) {
    flags.push({
      code: "ignition",
      message:
        `Stored energy ${q(totals.energy_J, "J")} is at or above ${q(f.ignitionEnergy.value, "J")}: a spark can ignite ` +
        "common flammable vapours; keep solvents and fuel gases away.",
      source: f.ignitionEnergy.source,
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
      source: "capacitor voltage rating, common practice",
    });
  }

  const unbled = stored.filter((item) => item.bleeder_ohm === null);
  const unbledEnergy = sum(unbled, (item) => item.energy_J);
  if (unbledEnergy > f.noBleederEnergy.value * (1 + ROUNDING)) {
    flags.push({
      code: "no-bleeder",
      message:
        `${q(unbledEnergy, "J")} is stored in sources with no bleeder (${idList(unbled)}), more than ` +
        `${q(f.noBleederEnergy.value, "J")}: provide a means of discharge (bleeder or shorting switch) and ground before touching.`,
      source: f.noBleederEnergy.source,
    });
  }
  return flags;
}

function approachReason(lookup: ApproachLookup, system: "dc" | "ac", voltage_V: number, tier: Tier): Reason | null {
  if (lookup.rowUpTo_V === null) return null;
  return {
    criterion: `approach-distance-${system}`,
    value: voltage_V,
    unit: "V",
    threshold: lookup.rowUpTo_V,
    tier,
    meaning: lookup.note,
    source: lookup.source,
  };
}

const maxOrNull = (a: number | null, b: number | null) => (a === null ? b : b === null ? a : Math.max(a, b));

/**
 * Assesses a set-up against the tier rules (the defaults of hazard-model.md unless an institution's
 * stricter set is given). Throws HazardInputError, naming the field, for input it cannot assess.
 */
export function assessSetup(input: SetupInput, rules: TierRules = DEFAULT_RULES): Assessment {
  if (rules !== DEFAULT_RULES) validateRules(rules);
  const gapResults: GapBreakdown[] = checkSetupInput(input);

  let lowestGap: GapBreakdown | null = null;
  for (const gap of gapResults) if (!lowestGap || gap.breakdown_V < lowestGap.breakdown_V) lowestGap = gap;
  const ceiling_V = lowestGap ? lowestGap.breakdown_V : null;
  const body_ohm = input.bodyResistance_ohm ?? rules.bodyResistance.value;

  const items = input.sources.map((source, index) => prepare(source, index, ceiling_V, body_ohm, rules));
  const all = findings(items, rules);
  const tierReasons = strongestPerCriterion(all);
  const tier = highestTier(tierReasons);

  let worst = items[0];
  for (const item of items) if (item.peakCurrent_A > worst.peakCurrent_A) worst = item;

  const maxVoltage_V = maxOf(items, (item) => item.voltage_V);
  const energy_J = sum(items, (item) => item.energy_J);
  const timeToSafe_s = items.some((item) => item.timeToSafe_s === null)
    ? null
    : Math.max(0, ...items.map((item) => item.timeToSafe_s as number));

  const dcItems = items.filter((item) => item.system === "dc");
  const acItems = items.filter((item) => item.system === "ac");
  const dcVoltage = maxOf(dcItems, (item) => item.voltage_V);
  const acVoltage = maxOf(acItems, (item) => item.voltageRms_V);
  const dcLookup = dcItems.length > 0 ? approachDistances(dcVoltage, "dc") : null;
  const acLookup = acItems.length > 0 ? approachDistances(acVoltage, "ac") : null;

  const reasons: Reason[] = tierReasons.map((finding) => ({
    criterion: finding.criterion,
    value: finding.value,
    unit: finding.unit,
    threshold: finding.threshold,
    tier: finding.tier,
    meaning: finding.meaning(),
    source: finding.source,
  }));

  if (lowestGap && ceiling_V !== null) {
    const highestRequested = maxOf(items, (item) => item.requested_V);
    const capped = items.filter((item) => item.requested_V > ceiling_V);
    const chargedToIt = items.filter((item) => item.voltageFromGap);
    const others = gapResults.length - 1;
    const effects: string[] = [];
    if (chargedToIt.length > 0) {
      effects.push(
        `${idList(chargedToIt)}, given no voltage, ${chargedToIt.length === 1 ? "charges" : "charge"} up to it.`,
      );
    }
    if (capped.length > 0) {
      effects.push(
        `No source charges past it: ${idList(capped)} ${capped.length === 1 ? "is" : "are"} held to ${q(ceiling_V, "V")} peak.`,
      );
    }
    if (effects.length === 0) {
      effects.push(`No source is set above it (highest ${q(highestRequested, "V")} peak), so it caps nothing.`);
    }
    if (others > 0)
      effects.push(others === 1 ? "The other gap sparks over higher." : `The other ${others} gaps spark over higher.`);
    reasons.push({
      criterion: "gap-ceiling",
      value: highestRequested,
      unit: "V",
      threshold: ceiling_V,
      tier,
      meaning: `${lowestGap.detail}. ${effects.join(" ")}`,
      source: lowestGap.source,
    });
  }
  for (const [lookup, system, voltage] of [
    [dcLookup, "dc", dcVoltage],
    [acLookup, "ac", acVoltage],
  ] as const) {
    const reason = lookup && approachReason(lookup, system, voltage, tier);
    if (reason) reasons.push(reason);
  }

  const perSource: SourceResult[] = items.map((item) => ({
    id: item.id,
    kind: item.kind,
    voltage_V: item.voltage_V,
    capacitance_F: item.capacitance_F,
    charge_C: item.charge_C,
    energy_J: item.energy_J,
    peakCurrent_A: item.peakCurrent_A,
    timeConstant_s: item.timeConstant_s,
    continuousCurrent_A: item.continuousCurrent_A,
    tier: highestTier(findings([item], rules)),
  }));

  return {
    engineVersion: ENGINE_VERSION,
    rulesVersion: rules.rulesVersion,
    tier,
    tierLabel: TIER_LABELS[tier],
    maxVoltage_V,
    gapCeiling_V: ceiling_V,
    capacitance_F: sum(items, (item) => item.capacitance_F),
    charge_C: sum(items, (item) => item.charge_C),
    energy_J,
    peakCurrent_A: worst.peakCurrent_A,
    timeConstant_s: worst.timeConstant_s,
    specificEnergy_A2s: worst.specificEnergy_A2s,
    continuousCurrent_A: maxOf(items, (item) => item.continuousCurrent_A),
    timeToSafe_s,
    approach: {
      limited_m: maxOrNull(dcLookup?.limited_m ?? null, acLookup?.limited_m ?? null),
      restricted_m: maxOrNull(dcLookup?.restricted_m ?? null, acLookup?.restricted_m ?? null),
    },
    reasons,
    flags: flagsFor(input, items, { energy_J, maxVoltage_V }, rules),
    perSource,
  };
}
