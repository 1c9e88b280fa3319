import { sql } from "drizzle-orm";
import { boolean, check, index, integer, jsonb, pgTable, text, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { permits } from "./permits";
import { users } from "./users";

// Pre-use checks recorded at the bench on a phone (lib/checks): one row per check, its answers as
// the checklist read at the time (the item's words are kept, so a later rule change cannot rewrite
// what was confirmed). The app's role may only insert and read these rows (migration 0010): a check
// is a record, corrected by recording another one.

/** Yes, no, or not applicable (the list the forms use is lib/checks/schemas.ts PRE_USE_ANSWERS). */
export type PreUseAnswer = "yes" | "no" | "na";

export type PreUseCheckItem = {
  /** Stable within a permit: `general:…`, `control:<code>` or `condition:<n>` (lib/checks/checklist.ts). */
  id: string;
  text: string;
  answer: PreUseAnswer;
  note: string;
  photoId: string | null;
};

export const preUseChecks = pgTable(
  "pre_use_check",
  {
    id: uuid().primaryKey().defaultRandom(),
    permitId: uuid()
      .notNull()
      .references(() => permits.id, { onDelete: "restrict" }),
    recordedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    // The name as it was when the check was recorded.
    recordedByName: text().notNull(),
    // Chosen by the phone for one check and sent again on every retry: a repeated submit finds the
    // first row instead of recording the check twice.
    idempotencyKey: uuid().notNull(),
    items: jsonb().$type<PreUseCheckItem[]>().notNull(),
    anyNo: boolean().notNull(),
    note: text().notNull().default(""),
    checkedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("pre_use_check_idempotency_key").on(t.recordedById, t.idempotencyKey),
    index("pre_use_check_permit_idx").on(t.permitId, t.checkedAt.desc()),
    check("pre_use_check_items_array", sql`jsonb_typeof(${t.items}) = 'array'`),
  ],
);

// Photos taken during a check, uploaded one by one before the check is sent (a weak signal loses one
// photo, not the whole check). Served only through the authorized route.
export const preUseCheckPhotos = pgTable(
  "pre_use_check_photo",
  {
    id: uuid().primaryKey().defaultRandom(),
    permitId: uuid()
      .notNull()
      .references(() => permits.id, { onDelete: "restrict" }),
    uploadedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    storageKey: text().notNull().unique(),
    contentType: text().notNull(),
    size_B: integer().notNull(),
    sha256: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("pre_use_check_photo_permit_idx").on(t.permitId)],
);

export type PreUseCheck = typeof preUseChecks.$inferSelect;
export type PreUseCheckPhoto = typeof preUseCheckPhotos.$inferSelect;
