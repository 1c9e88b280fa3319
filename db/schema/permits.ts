import { sql } from "drizzle-orm";
import {
  check,
  date,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  smallint,
  text,
  timestamp,
  unique,
  uuid,
} from "drizzle-orm/pg-core";
import { applicationRevisions, applications } from "./applications";
import { users } from "./users";

// Permits: created by the final approval. `state` is stored as active or revoked; a permit whose
// validTo has passed reads as expired (lib/permits computes the effective state; the daily job also
// stores it, so reminders and lists agree).

export const PERMIT_STATES = ["active", "expired", "revoked"] as const;
export type PermitState = (typeof PERMIT_STATES)[number];
export const permitStateEnum = pgEnum("permit_state", PERMIT_STATES);

export const permits = pgTable(
  "permit",
  {
    id: uuid().primaryKey().defaultRandom(),
    // PREFIX-YYYY-NNNN (institution_settings.permit_prefix), sequential per year without gaps (permit_counter).
    number: text().notNull().unique(),
    year: smallint().notNull(),
    seq: integer().notNull(),
    applicationId: uuid()
      .notNull()
      .unique()
      .references(() => applications.id, { onDelete: "restrict" }),
    revisionId: uuid()
      .notNull()
      .references(() => applicationRevisions.id, { onDelete: "restrict" }),
    holderId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    state: permitStateEnum().notNull().default("active"),
    tier: smallint().notNull(),
    // Inclusive calendar days in the institution's time zone.
    validFrom: date({ mode: "string" }).notNull(),
    validTo: date({ mode: "string" }).notNull(),
    conditions: jsonb().$type<string[]>().notNull().default([]),
    // Why the window reaches beyond the event days the application asked for (null: it does not).
    validityReason: text(),
    // ≥ 128-bit random code behind the QR code (base64url); never sequential.
    verificationCode: text().notNull().unique(),
    issuedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    revokedAt: timestamp({ withTimezone: true }),
    revokedById: uuid().references(() => users.id, { onDelete: "restrict" }),
    revokedReason: text(),
    // The application that renews this permit; its reminders stop once that one is submitted.
    renewedByApplicationId: uuid(),
    // The stored PDF (storage key by content hash) and the state it was rendered for.
    pdfKey: text(),
    pdfRenderedState: permitStateEnum(),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("permit_year_seq_key").on(t.year, t.seq),
    index("permit_holder_idx").on(t.holderId),
    index("permit_valid_to_idx").on(t.state, t.validTo),
    // The permit list's order (lib/permits/queries.ts listPermits), with state and tier after it so
    // a page's ids and the capped count are read from the index alone (migration 0019).
    index("permit_list_order_idx").on(t.validTo, t.issuedAt.desc(), t.id, t.state, t.tier),
    // The list's count with a tier filter, read from the index alone.
    index("permit_tier_state_idx").on(t.tier, t.state, t.validTo),
    check("permit_window", sql`${t.validFrom} <= ${t.validTo}`),
    // Search by a piece of the number (lib/search; migration 0013_search_trgm).
    index("permit_number_trgm_idx").using("gin", t.number.op("gin_trgm_ops")),
  ],
);

// Last permit number issued per year. Incremented inside the approving transaction
// (INSERT … ON CONFLICT DO UPDATE … RETURNING): the row lock orders concurrent approvals and a
// rolled-back approval gives its number back, so numbers have no gaps and no duplicates.
export const permitCounters = pgTable("permit_counter", {
  year: smallint().primaryKey(),
  last: integer().notNull(),
});

export type Permit = typeof permits.$inferSelect;
