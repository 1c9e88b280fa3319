import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  smallint,
  text,
  timestamp,
  unique,
  uuid,
} from "drizzle-orm/pg-core";
import type { Assessment, SetupInput } from "@/lib/hazard";
import { departments, users } from "./users";

// The apparatus registry: a reusable set-up record. Every edit writes a new revision; the apparatus
// row points at the newest. Applications record the exact revision they used.

export const apparatus = pgTable(
  "apparatus",
  {
    id: uuid().primaryKey().defaultRandom(),
    name: text().notNull(),
    room: text().notNull(),
    departmentId: uuid()
      .notNull()
      .references(() => departments.id, { onDelete: "restrict" }),
    ownerId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    notes: text().notNull().default(""),
    currentRevision: integer().notNull().default(1),
    // Tier of the current revision, kept for sorting and filtering the registry list.
    tier: smallint().notNull(),
    energy_J: doublePrecision().notNull(),
    archivedAt: timestamp({ withTimezone: true }),
    // Upkeep (migration 0016_apparatus_upkeep): days between inspections (null: none set), and
    // retirement — kept for the record, no longer offered for new applications.
    inspectionInterval_days: integer("inspection_interval_days"),
    retiredAt: timestamp({ withTimezone: true }),
    retiredById: uuid().references((): AnyPgColumn => users.id, { onDelete: "restrict" }),
    retiredReason: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("apparatus_department_idx").on(t.departmentId),
    index("apparatus_name_idx").on(sql`lower(${t.name})`),
    // Search by name and room (lib/search; migration 0013_search_trgm).
    index("apparatus_name_trgm_idx").using("gin", t.name.op("gin_trgm_ops")),
    index("apparatus_room_trgm_idx").using("gin", t.room.op("gin_trgm_ops")),
    check("apparatus_tier_range", sql`${t.tier} BETWEEN 0 AND 4`),
    check(
      "apparatus_inspection_interval_range",
      sql`${t.inspectionInterval_days} IS NULL OR ${t.inspectionInterval_days} BETWEEN 1 AND 3660`,
    ),
    index("apparatus_inspection_due_idx")
      .on(t.id)
      .where(sql`${t.inspectionInterval_days} IS NOT NULL AND ${t.retiredAt} IS NULL`),
  ],
);

export const apparatusRevisions = pgTable(
  "apparatus_revision",
  {
    id: uuid().primaryKey().defaultRandom(),
    apparatusId: uuid()
      .notNull()
      .references(() => apparatus.id, { onDelete: "restrict" }),
    revision: integer().notNull(),
    name: text().notNull(),
    room: text().notNull(),
    notes: text().notNull().default(""),
    // The engine's input in SI base units; source ids double as the labels users gave them.
    setup: jsonb().$type<SetupInput>().notNull(),
    // The engine's answer for this revision, frozen (engine and rules versions inside).
    assessment: jsonb().$type<Assessment>().notNull(),
    tier: smallint().notNull(),
    createdById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique("apparatus_revision_number_key").on(t.apparatusId, t.revision)],
);

export type Apparatus = typeof apparatus.$inferSelect;
export type ApparatusRevision = typeof apparatusRevisions.$inferSelect;

export const INSPECTION_KINDS = ["bleeder", "jars_insulation", "grounding_hook", "maintenance"] as const;
export type InspectionKind = (typeof INSPECTION_KINDS)[number];
export const INSPECTION_RESULTS = ["pass", "fail", "repaired"] as const;
export type InspectionResult = (typeof INSPECTION_RESULTS)[number];

// Inspection and maintenance records of an apparatus: what was checked, on which day, by whom, the
// result, a note and an optional photo (stored through lib/storage by the attachment rules).
export const apparatusInspections = pgTable(
  "apparatus_inspection",
  {
    id: uuid().primaryKey().defaultRandom(),
    apparatusId: uuid()
      .notNull()
      .references(() => apparatus.id, { onDelete: "restrict" }),
    kind: text({ enum: INSPECTION_KINDS }).notNull(),
    // The institution's calendar day it was done.
    inspectedOn: date({ mode: "string" }).notNull(),
    // The person who did it, as named by the one who recorded it.
    inspectedBy: text().notNull(),
    result: text({ enum: INSPECTION_RESULTS }).notNull(),
    note: text().notNull().default(""),
    photoKey: text().unique(),
    photoFilename: text(),
    photoContentType: text(),
    photoSize_B: integer("photo_size_b"),
    photoSha256: text(),
    recordedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("apparatus_inspection_apparatus_idx").on(t.apparatusId, t.inspectedOn),
    check(
      "apparatus_inspection_kind_check",
      sql`${t.kind} IN ('bleeder', 'jars_insulation', 'grounding_hook', 'maintenance')`,
    ),
    check("apparatus_inspection_result_check", sql`${t.result} IN ('pass', 'fail', 'repaired')`),
  ],
);

export type ApparatusInspection = typeof apparatusInspections.$inferSelect;
