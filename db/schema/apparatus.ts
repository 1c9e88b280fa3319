import { sql } from "drizzle-orm";
import {
  check,
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
