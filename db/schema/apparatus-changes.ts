import { sql } from "drizzle-orm";
import { check, index, integer, pgTable, smallint, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { apparatus, apparatusRevisions } from "./apparatus";
import { permits } from "./permits";
import { users } from "./users";

// Re-review when an apparatus changes: a row for each active permit covering the apparatus and each
// revision saved after the approval, written in the revision's transaction. The permit itself never
// changes (its approval is signed); the permit page and the holder's dashboard read these rows.
export const permitApparatusChanges = pgTable(
  "permit_apparatus_change",
  {
    id: uuid().primaryKey().defaultRandom(),
    permitId: uuid()
      .notNull()
      .references(() => permits.id, { onDelete: "restrict" }),
    apparatusId: uuid()
      .notNull()
      .references(() => apparatus.id, { onDelete: "restrict" }),
    apparatusRevisionId: uuid()
      .notNull()
      .references(() => apparatusRevisions.id, { onDelete: "restrict" }),
    // The apparatus's revision number the change saved.
    revision: integer().notNull(),
    // The tier the permit was approved at, and the new revision's under the engine and rules in force.
    permitTier: smallint().notNull(),
    tier: smallint().notNull(),
    changedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("permit_apparatus_change_key").on(t.permitId, t.apparatusRevisionId),
    index("permit_apparatus_change_permit_idx").on(t.permitId, t.createdAt),
    check("permit_apparatus_change_tier_range", sql`${t.tier} BETWEEN 0 AND 4`),
  ],
);

export type PermitApparatusChange = typeof permitApparatusChanges.$inferSelect;
