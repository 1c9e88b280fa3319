import { z } from "zod";
import { MAX_GAPS, MAX_SOURCES, setupInputSchema } from "./setup-schema";

// The apparatus registry's input, shared by its forms and its route handlers, and the text form of a
// set-up: what a person types into the source and gap fields ("4.7 nF", "30 kV"), kept exactly as
// typed so that a draft never loses input, even input that does not parse yet. The conversion from
// text to the engine's SI numbers is lib/apparatus/setup-text.ts.

export const SOURCE_KINDS = ["capacitor", "custom-capacitance", "sphere-terminal", "dc-supply", "ac-supply"] as const;
export type SourceKindName = (typeof SOURCE_KINDS)[number];

export const SOURCE_KIND_LABELS: Record<SourceKindName, string> = {
  capacitor: "Capacitor or bank",
  "custom-capacitance": "Other capacitance",
  "sphere-terminal": "Sphere terminal",
  "dc-supply": "DC supply",
  "ac-supply": "AC supply",
};

/** Every quantity field a source can have, named as the engine names it (unit in the name). */
export const SOURCE_QUANTITY_FIELDS = [
  "capacitance_F",
  "voltage_V",
  "ratedVoltage_V",
  "bleeder_ohm",
  "seriesResistance_ohm",
  "radius_m",
  "currentLimit_A",
  "outputCapacitance_F",
  "voltageRms_V",
  "frequency_Hz",
] as const;
export type SourceQuantityField = (typeof SOURCE_QUANTITY_FIELDS)[number];

export const GAP_QUANTITY_FIELDS = ["sphereDiameter_m", "spacing_m", "pressure_Pa", "temperature_C"] as const;
export type GapQuantityField = (typeof GAP_QUANTITY_FIELDS)[number];

// 60 characters holds any quantity a person types ("0.000000047 F", "101.325 kPa") with room to spare.
const quantityText = z.string().max(60, { error: "Use at most 60 characters." }).default("");

const sourceQuantities = Object.fromEntries(SOURCE_QUANTITY_FIELDS.map((f) => [f, quantityText])) as Record<
  SourceQuantityField,
  typeof quantityText
>;
const gapQuantities = Object.fromEntries(GAP_QUANTITY_FIELDS.map((f) => [f, quantityText])) as Record<
  GapQuantityField,
  typeof quantityText
>;

export const sourceTextSchema = z.object({
  /** Becomes the source's id in the engine: the name people know it by ("C1", "Belt terminal"). */
  label: z.string().max(80, { error: "Use at most 80 characters for the label." }).default(""),
  kind: z.enum(SOURCE_KINDS, { error: "Choose the kind of energy source." }),
  /** "" leaves the engine's default (parallel). */
  arrangement: z.enum(["", "parallel", "series"]).default(""),
  count: z.string().max(12, { error: "Use at most 12 characters." }).default(""),
  ...sourceQuantities,
});

/** Source labels (their ids in the engine) a gap or bleeder is connected across. */
const acrossText = z
  .array(z.string().max(80, { error: "Use at most 80 characters." }))
  .max(MAX_SOURCES, { error: `Name at most ${MAX_SOURCES} sources.` });

export const gapTextSchema = z.object({
  ...gapQuantities,
  /** Absent in set-ups typed before gaps were wired (engine 1): see upgradeSetupText. */
  across: acrossText.optional(),
});

export const bleederTextSchema = z.object({
  label: z.string().max(80, { error: "Use at most 80 characters for the label." }).default(""),
  resistance_ohm: quantityText,
  across: acrossText.default([]),
});

export const setupTextSchema = z.object({
  sources: z
    .array(sourceTextSchema)
    .max(MAX_SOURCES, { error: `Use at most ${MAX_SOURCES} energy sources.` })
    .default([]),
  gaps: z
    .array(gapTextSchema)
    .max(MAX_GAPS, { error: `Use at most ${MAX_GAPS} spark gaps.` })
    .default([]),
  bleeders: z
    .array(bleederTextSchema)
    .max(MAX_GAPS, { error: `Use at most ${MAX_GAPS} bleeders.` })
    .default([]),
  bodyResistance_ohm: quantityText,
  vacuumDevice: z.boolean().default(false),
});

export type SourceText = z.output<typeof sourceTextSchema>;
export type GapText = z.output<typeof gapTextSchema>;
export type BleederText = z.output<typeof bleederTextSchema>;
export type SetupText = z.output<typeof setupTextSchema>;

const name = z
  .string({ error: "Name the apparatus." })
  .trim()
  .min(1, { error: "Name the apparatus." })
  .max(160, { error: "Use at most 160 characters for the name." });
const room = z
  .string({ error: "Enter the room." })
  .trim()
  .min(1, { error: "Enter the room where it is kept or used." })
  .max(120, { error: "Use at most 120 characters for the room." });
const notes = z.string().trim().max(4000, { error: "Use at most 4000 characters for the notes." }).default("");

/** POST /api/apparatus: a new registry record; the set-up in SI base units. */
export const apparatusCreateSchema = z.strictObject({ name, room, notes, setup: setupInputSchema });

/** PATCH /api/apparatus/[id]: a new revision. `expectedRevision` is the revision the editor started from. */
export const apparatusUpdateSchema = z.strictObject({
  name,
  room,
  notes,
  setup: setupInputSchema,
  // Revisions are PostgreSQL integers: a larger number names no revision and must not reach SQL.
  expectedRevision: z
    .number({ error: "Send the revision you edited (expectedRevision)." })
    .int()
    .min(1)
    .max(2_147_483_647),
});

export type ApparatusCreateInput = z.output<typeof apparatusCreateSchema>;
export type ApparatusUpdateInput = z.output<typeof apparatusUpdateSchema>;

export const APPARATUS_SORTS = ["name", "room", "tier", "energy", "updated"] as const;
export type ApparatusSort = (typeof APPARATUS_SORTS)[number];

const oneValue = (value: unknown) => (Array.isArray(value) ? value[0] : value);

/**
 * The registry list's query string (GET /api/apparatus and the /apparatus page). Unknown values are
 * refused with 422 by the API; the page falls back to the defaults instead.
 */
export const apparatusListQuerySchema = z.object({
  page: z.preprocess(oneValue, z.coerce.number().int().min(1).max(100_000).default(1)),
  pageSize: z.preprocess(oneValue, z.coerce.number().int().min(5).max(100).default(20)),
  sort: z.preprocess(oneValue, z.enum(APPARATUS_SORTS).default("updated")),
  dir: z.preprocess(oneValue, z.enum(["asc", "desc"]).default("desc")),
  /** Matches name, room or notes (case-insensitive). */
  q: z.preprocess(oneValue, z.string().trim().max(100).default("")),
  tier: z.preprocess((v) => {
    const one = oneValue(v);
    return one === "" ? undefined : one;
  }, z.coerce.number().int().min(0).max(4).optional()),
  /** "mine": apparatus I own; "all": everything I may read. */
  owner: z.preprocess(oneValue, z.enum(["all", "mine"]).default("all")),
});

export type ApparatusListQuery = z.output<typeof apparatusListQuerySchema>;
