// A set-up as people type it and as the engine takes it. Pure (no server or browser imports): the form
// converts on every keystroke to recompute the live figures, and the server converts the same text
// again on submission, so both ends agree on what was typed. Field paths in the issues are those of
// SetupInput ("sources[0].capacitance_F"), which are also the text form's field names.

import {
  BASE_UNIT,
  parseQuantity,
  siParts,
  type Dimension,
  type EnergySource,
  type Bleeder,
  type SetupInput,
  type SparkGap,
} from "@/lib/hazard";
import {
  type BleederText,
  GAP_QUANTITY_FIELDS,
  SOURCE_QUANTITY_FIELDS,
  type GapQuantityField,
  type GapText,
  type SetupText,
  type SourceKindName,
  type SourceQuantityField,
  type SourceText,
} from "@/lib/apparatus/schemas";
import { setupInputSchema } from "@/lib/apparatus/setup-schema";

export type Path = (string | number)[];
export type PathIssue = { path: Path; message: string };

export type QuantityFieldSpec<F extends string> = {
  name: F;
  label: string;
  dimension: Dimension;
  required: boolean;
  /** An example in the field's usual notation, shown as the placeholder. */
  example: string;
  hint?: string;
};

const q = <F extends string>(
  name: F,
  label: string,
  dimension: Dimension,
  required: boolean,
  example: string,
  hint?: string,
): QuantityFieldSpec<F> => ({ name, label, dimension, required, example, hint });

/** The quantity fields of each source kind, in the order the form shows them. */
export const SOURCE_FIELDS: Record<SourceKindName, QuantityFieldSpec<SourceQuantityField>[]> = {
  capacitor: [
    q("capacitance_F", "Capacitance of one unit", "capacitance", true, "4.7 nF"),
    q("voltage_V", "Charging voltage of the bank", "voltage", true, "30 kV"),
    q("ratedVoltage_V", "Rated voltage of one unit", "voltage", false, "40 kV"),
    q("bleeder_ohm", "Bleeder resistor across the bank", "resistance", false, "100 MΩ"),
    q("seriesResistance_ohm", "Resistance in series with the terminals", "resistance", false, "0 Ω"),
  ],
  "custom-capacitance": [
    q("capacitance_F", "Capacitance", "capacitance", true, "150 pF", "A Leyden jar, a cable or a structure."),
    q("voltage_V", "Voltage", "voltage", true, "25 kV"),
    q("bleeder_ohm", "Bleeder resistor", "resistance", false, "1 GΩ"),
  ],
  "sphere-terminal": [
    q("radius_m", "Sphere radius", "length", true, "150 mm", "C = 4·π·ε₀·r"),
    q("voltage_V", "Terminal voltage", "voltage", false, "200 kV", "Leave empty when a spark gap limits the voltage."),
  ],
  "dc-supply": [
    q("voltage_V", "Output voltage", "voltage", true, "5 kV"),
    q("currentLimit_A", "Current limit", "current", true, "2 mA"),
    q("seriesResistance_ohm", "Series resistance", "resistance", false, "10 MΩ"),
    q("outputCapacitance_F", "Output capacitance", "capacitance", false, "10 nF"),
  ],
  "ac-supply": [
    q("voltageRms_V", "Output voltage (rms)", "voltage", true, "10 kV"),
    q("frequency_Hz", "Frequency", "frequency", true, "50 Hz"),
    q("currentLimit_A", "Current limit (rms)", "current", true, "20 mA"),
  ],
};

export const GAP_FIELDS: QuantityFieldSpec<GapQuantityField>[] = [
  q("sphereDiameter_m", "Sphere diameter", "length", true, "50 mm"),
  q("spacing_m", "Gap spacing", "length", true, "5 mm"),
  q("pressure_Pa", "Air pressure", "pressure", false, "101.3 kPa", "Default one standard atmosphere."),
  q("temperature_C", "Air temperature", "temperature", false, "20 °C", "Default 20 °C."),
];

export const BODY_RESISTANCE_FIELD = q(
  "bodyResistance_ohm",
  "Body resistance",
  "resistance",
  false,
  "500 Ω",
  "Leave empty for the default body model (500 Ω hand to hand).",
);

const DEFAULT_LABEL_PREFIX: Record<SourceKindName, string> = {
  capacitor: "C",
  "custom-capacitance": "Cx",
  "sphere-terminal": "Terminal ",
  "dc-supply": "DC supply ",
  "ac-supply": "AC supply ",
};

export function defaultSourceLabel(kind: SourceKindName, index: number): string {
  return `${DEFAULT_LABEL_PREFIX[kind]}${index + 1}`;
}

function blankQuantities<F extends string>(fields: readonly F[]): Record<F, string> {
  return Object.fromEntries(fields.map((f) => [f, ""])) as Record<F, string>;
}

export function emptySourceText(kind: SourceKindName = "capacitor", label = ""): SourceText {
  return { label, kind, arrangement: "", count: "", ...blankQuantities(SOURCE_QUANTITY_FIELDS) };
}

/** A new gap, connected across the given sources (the editor preselects a set-up's only source). */
export function emptyGapText(across: string[] = []): GapText {
  return { ...blankQuantities(GAP_QUANTITY_FIELDS), across };
}

export function emptyBleederText(across: string[] = []): BleederText {
  return { label: "", resistance_ohm: "", across };
}

export function emptySetupText(): SetupText {
  return { sources: [], gaps: [], bleeders: [], bodyResistance_ohm: "", vacuumDevice: false };
}

/** The id the engine gives a typed source: its label, or "source-N" when the label is empty. */
export function sourceTextId(source: Pick<SourceText, "label">, index: number): string {
  const label = source.label.trim();
  return label !== "" ? label : `source-${index + 1}`;
}

/**
 * A set-up typed before gaps were wired (no gap says what it is across) gets its gaps connected across
 * the sphere terminals with no voltage of their own, and nothing else; `rewired` asks the form to show
 * the notice that the user should confirm the wiring.
 */
export function upgradeSetupText(text: SetupText): { text: SetupText; rewired: boolean } {
  const gaps = text.gaps ?? [];
  if (gaps.length === 0 || gaps.some((gap) => gap.across !== undefined)) return { text, rewired: false };
  const terminals = text.sources.flatMap((source, index) =>
    source.kind === "sphere-terminal" && source.voltage_V.trim() === "" ? [sourceTextId(source, index)] : [],
  );
  return { text: { ...text, gaps: gaps.map((gap) => ({ ...gap, across: [...terminals] })) }, rewired: true };
}

/** One typed quantity: "" for an empty field, a number, or the parser's message. */
export function readQuantity(
  text: string,
  dimension: Dimension,
): { empty: true } | { empty: false; ok: true; value: number } | { empty: false; ok: false; message: string } {
  if (text.trim() === "") return { empty: true };
  const result = parseQuantity(text, dimension);
  return result.ok
    ? { empty: false, ok: true, value: result.value }
    : { empty: false, ok: false, message: result.error.message };
}

function requiredMessage(spec: QuantityFieldSpec<string>): string {
  return `Enter the ${spec.label.toLowerCase()} (e.g. ${spec.example}).`;
}

function readFields<F extends string>(
  specs: readonly QuantityFieldSpec<F>[],
  values: Record<F, string>,
  at: Path,
  issues: PathIssue[],
): Partial<Record<F, number>> {
  const out: Partial<Record<F, number>> = {};
  for (const spec of specs) {
    const read = readQuantity(values[spec.name] ?? "", spec.dimension);
    if (read.empty) {
      if (spec.required) issues.push({ path: [...at, spec.name], message: requiredMessage(spec) });
    } else if (!read.ok) {
      issues.push({ path: [...at, spec.name], message: read.message });
    } else {
      out[spec.name] = read.value;
    }
  }
  return out;
}

function sourceFromText(text: SourceText, index: number, issues: PathIssue[]): EnergySource {
  const at: Path = ["sources", index];
  const values = readFields(SOURCE_FIELDS[text.kind], text, at, issues);
  const label = text.label.trim();
  const base: Record<string, unknown> = { ...(label ? { id: label } : {}), kind: text.kind, ...values };
  if (text.kind === "capacitor") {
    const count = text.count.trim();
    if (count !== "") {
      if (!/^\d+$/.test(count) || Number(count) < 1)
        issues.push({ path: [...at, "count"], message: "Enter the number of capacitors (a whole number, 1 or more)." });
      else base.count = Number(count);
    }
    if (text.arrangement) base.arrangement = text.arrangement;
  }
  return base as EnergySource;
}

function gapFromText(text: GapText, index: number, issues: PathIssue[]): SparkGap {
  const gap = readFields(GAP_FIELDS, text, ["gaps", index], issues) as SparkGap;
  if (text.across !== undefined) gap.across = [...text.across];
  return gap;
}

function bleederFromText(text: BleederText, index: number, issues: PathIssue[]): Bleeder {
  const read = readQuantity(text.resistance_ohm, "resistance");
  const bleeder: Record<string, unknown> = { ...(text.label.trim() ? { id: text.label.trim() } : {}) };
  if (read.empty)
    issues.push({
      path: ["bleeders", index, "resistance_ohm"],
      message: "Enter the bleeder's resistance (e.g. 100 MΩ).",
    });
  else if (!read.ok) issues.push({ path: ["bleeders", index, "resistance_ohm"], message: read.message });
  else bleeder.resistance_ohm = read.value;
  if (text.across.length === 0) {
    issues.push({
      path: ["bleeders", index, "across"],
      message: "Choose the sources this bleeder is connected across.",
    });
  }
  bleeder.across = [...text.across];
  return bleeder as Bleeder;
}

/**
 * Converts the typed set-up to the engine's input. On any problem the setup is null and every issue
 * names its field: unreadable text first; once all text reads, the engine's own input rules.
 */
export function setupFromText(text: SetupText): { setup: SetupInput | null; issues: PathIssue[] } {
  const issues: PathIssue[] = [];
  // Text typed before gaps were wired reads as engine 2 wiring (see upgradeSetupText).
  const upgraded = upgradeSetupText(text).text;
  const sources = upgraded.sources.map((s, i) => sourceFromText(s, i, issues));
  const gaps = upgraded.gaps.map((g, i) => gapFromText(g, i, issues));
  const bleeders = (upgraded.bleeders ?? []).map((b, i) => bleederFromText(b, i, issues));
  const setup: SetupInput = { sources };
  if (gaps.length > 0) setup.gaps = gaps;
  if (bleeders.length > 0) setup.bleeders = bleeders;
  const body = readQuantity(text.bodyResistance_ohm, "resistance");
  if (!body.empty) {
    if (body.ok) setup.bodyResistance_ohm = body.value;
    else issues.push({ path: ["bodyResistance_ohm"], message: body.message });
  }
  if (text.vacuumDevice) setup.vacuumDevice = true;
  if (sources.length === 0) issues.push({ path: ["sources"], message: "Add at least one energy source." });
  const parsed = setupInputSchema.safeParse(setup);
  if (issues.length > 0) {
    // The engine's rules still speak about the values that did read ("0 V"), so each field gets its
    // message as soon as it is left, not only once every other field is complete.
    for (const issue of parsed.success ? [] : parsed.error.issues) {
      const path = issue.path.map((p) => (p === "id" ? "label" : p)) as Path;
      if (valueAt(setup, issue.path) !== undefined && !issues.some((i) => pathText(i.path) === pathText(path)))
        issues.push({ path, message: issue.message });
    }
    return { setup: null, issues };
  }

  if (!parsed.success) {
    return {
      setup: null,
      issues: parsed.error.issues.map((issue) => ({
        path: issue.path.map((p) => (p === "id" ? "label" : p)) as Path,
        message: issue.message,
      })),
    };
  }
  return { setup: parsed.data, issues: [] };
}

/**
 * A number as an editable quantity that reads back to exactly the same number: the shortest SI
 * notation that round-trips ("4.7 nF", "30 kV"), else plain exponent notation in the base unit.
 */
export function editableQuantity(value: number, dimension: Dimension): string {
  const unit = BASE_UNIT[dimension];
  const exact = (text: string) => {
    const read = parseQuantity(text, dimension);
    return read.ok && read.value === value;
  };
  if (dimension !== "temperature" && value !== 0 && Number.isFinite(value)) {
    for (let digits = 1; digits <= 17; digits++) {
      const parts = siParts(value, digits);
      const mantissa = parts.mantissa.includes(".") ? parts.mantissa.replace(/\.?0+$/, "") : parts.mantissa;
      const text = `${mantissa} ${parts.prefix}${unit}`;
      if (exact(text)) return text;
    }
  }
  return `${String(value)} ${unit}`;
}

const quantityOrEmpty = (value: number | undefined, dimension: Dimension) =>
  value === undefined ? "" : editableQuantity(value, dimension);

/** The text form of a stored set-up (from the registry), so it can be edited in the same fields. */
export function setupToText(setup: SetupInput): SetupText {
  const sources = setup.sources.map((source): SourceText => {
    const text = emptySourceText(source.kind, source.id ?? "");
    const record = source as unknown as Record<string, number | undefined>;
    for (const spec of SOURCE_FIELDS[source.kind]) text[spec.name] = quantityOrEmpty(record[spec.name], spec.dimension);
    if (source.kind === "capacitor") {
      text.count = source.count === undefined ? "" : String(source.count);
      text.arrangement = source.arrangement ?? "";
    }
    return text;
  });
  const gaps = (setup.gaps ?? []).map((gap): GapText => {
    const text: GapText = emptyGapText();
    for (const spec of GAP_FIELDS) text[spec.name] = quantityOrEmpty(gap[spec.name], spec.dimension);
    // A stored set-up from before gaps were wired keeps "across" absent, so upgradeSetupText can tell.
    if (gap.across === undefined) delete text.across;
    else text.across = [...gap.across];
    return text;
  });
  const bleeders = (setup.bleeders ?? []).map((bleeder): BleederText => ({
    label: bleeder.id ?? "",
    resistance_ohm: quantityOrEmpty(bleeder.resistance_ohm, "resistance"),
    across: [...bleeder.across],
  }));
  return {
    sources,
    gaps,
    bleeders,
    bodyResistance_ohm: quantityOrEmpty(setup.bodyResistance_ohm, "resistance"),
    vacuumDevice: setup.vacuumDevice === true,
  };
}

/** The same set-up in one normal form, to compare two set-ups that may differ only in spelling. */
export function normalizeSetup(setup: SetupInput): SetupInput | null {
  return setupFromText(setupToText(setup)).setup;
}

function valueAt(value: unknown, path: readonly PropertyKey[]): unknown {
  let at = value;
  for (const key of path) {
    if (at === null || typeof at !== "object") return undefined;
    at = (at as Record<PropertyKey, unknown>)[key];
  }
  // Only a single typed value counts: a message about a whole source or list is the text's to give.
  return typeof at === "number" || typeof at === "string" ? at : undefined;
}

/** "sources[0].capacitance_F" for showing and for 422 answers. */
export function pathText(path: readonly (string | number)[]): string {
  let out = "";
  for (const part of path) out += typeof part === "number" ? `[${part}]` : out ? `.${part}` : part;
  return out;
}
