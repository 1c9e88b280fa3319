// Plain-text presentation of an application revision's content and figures, shared by the read page,
// the field-level diff and the CSV export. Field names end in their SI unit (lib/hazard/types.ts);
// every number is shown with that unit and three significant digits.

import { formatQuantity, TIER_LABELS, type Assessment, type Tier } from "@/lib/hazard";
import { AUDIENCE_LABELS, EVENT_KIND_LABELS, SOURCE_KIND_LABELS } from "@/lib/applications/schemas";

const UNIT_SUFFIXES: ReadonlyArray<readonly [string, string]> = [
  ["_ohm", "Ω"],
  ["_Hz", "Hz"],
  ["_Pa", "Pa"],
  ["_A2s", "A²s"],
  ["_F", "F"],
  ["_V", "V"],
  ["_A", "A"],
  ["_m", "m"],
  ["_J", "J"],
  ["_s", "s"],
];

/** The unit a field's name declares ("capacitance_F" → "F"), or null. temperature_C is in °C, not coulombs. */
export function unitOfField(field: string): string | null {
  if (field === "temperature_C") return "°C";
  if (field.endsWith("_C")) return "C";
  for (const [suffix, unit] of UNIT_SUFFIXES) if (field.endsWith(suffix)) return unit;
  return null;
}

const FIELD_LABELS: Record<string, string> = {
  kind: "Kind",
  id: "Label",
  capacitance_F: "Capacitance",
  voltage_V: "Voltage",
  voltageRms_V: "Voltage (rms)",
  count: "Units",
  arrangement: "Arrangement",
  ratedVoltage_V: "Rated voltage per unit",
  bleeder_ohm: "Bleeder",
  seriesResistance_ohm: "Series resistance",
  radius_m: "Radius",
  currentLimit_A: "Current limit",
  outputCapacitance_F: "Output capacitance",
  frequency_Hz: "Frequency",
  sphereDiameter_m: "Sphere diameter",
  spacing_m: "Spacing",
  pressure_Pa: "Air pressure",
  temperature_C: "Air temperature",
  bodyResistance_ohm: "Body model resistance",
  vacuumDevice: "Vacuum device driven",
  across: "Connected across",
  resistance_ohm: "Resistance",
};

/** Stored codes shown as the words the form uses (a reviewer read "sphere-terminal → custom-capacitance"). */
const VALUE_LABELS: Record<string, Record<string, string>> = {
  kind: SOURCE_KIND_LABELS,
  arrangement: { parallel: "Parallel", series: "Series" },
};

/** A source kind as the form names it ("sphere-terminal" → "Sphere terminal"). */
export function sourceKindLabel(kind: unknown): string {
  return SOURCE_KIND_LABELS[kind as keyof typeof SOURCE_KIND_LABELS] ?? String(kind ?? "—");
}

export function fieldLabel(field: string): string {
  return (
    FIELD_LABELS[field] ??
    field
      .replace(/_.*$/, "")
      .replace(/([a-z])([A-Z])/g, "$1 $2")
      .toLowerCase()
  );
}

/** One value of a set-up field as text, with its unit. */
export function formatFieldValue(field: string, value: unknown): string {
  if (value === null || value === undefined || value === "") return "—";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") {
    const unit = unitOfField(field);
    return unit ? formatQuantity(value, unit) : String(value);
  }
  if (typeof value === "string") return VALUE_LABELS[field]?.[value] ?? value;
  if (Array.isArray(value)) return value.length ? value.map(String).join(", ") : "nothing";
  return JSON.stringify(value);
}

type Person = { userId?: string | null; name?: string; trained?: boolean };

export function formatPerson(person: Person | undefined | null): string {
  if (!person?.name) return "—";
  return person.trained ? `${person.name} (trained)` : person.name;
}

export function eventKindLabel(kind: unknown): string {
  return EVENT_KIND_LABELS[kind as keyof typeof EVENT_KIND_LABELS] ?? String(kind ?? "—");
}

export function audienceLabel(audience: unknown): string {
  return AUDIENCE_LABELS[audience as keyof typeof AUDIENCE_LABELS] ?? String(audience ?? "—");
}

export function tierText(tier: number): string {
  return `Tier ${tier} · ${TIER_LABELS[tier as Tier] ?? "?"}`;
}

/** The figures that decide a tier, labelled, in display order. */
export function figureRows(a: Assessment): { key: string; label: string; value: string }[] {
  const q = (v: number | null | undefined, unit: string) =>
    v === null || v === undefined ? "—" : formatQuantity(v, unit);
  return [
    { key: "tier", label: "Tier", value: tierText(a.tier) },
    { key: "energy_J", label: "Stored energy", value: q(a.energy_J, "J") },
    { key: "maxVoltage_V", label: "Highest voltage", value: q(a.maxVoltage_V, "V") },
    { key: "capacitance_F", label: "Capacitance", value: q(a.capacitance_F, "F") },
    { key: "charge_C", label: "Charge", value: q(a.charge_C, "C") },
    { key: "peakCurrent_A", label: "Peak body current", value: q(a.peakCurrent_A, "A") },
    { key: "continuousCurrent_A", label: "Continuous body current", value: q(a.continuousCurrent_A, "A") },
    { key: "gapCeiling_V", label: "Gap ceiling", value: q(a.gapCeiling_V, "V") },
    {
      key: "timeToSafe_s",
      label: "Time to 60 V",
      value: a.timeToSafe_s === null ? "no bleeder" : q(a.timeToSafe_s, "s"),
    },
    { key: "approach.limited_m", label: "Limited approach", value: q(a.approach?.limited_m, "m") },
    { key: "approach.restricted_m", label: "Restricted approach", value: q(a.approach?.restricted_m, "m") },
  ];
}
