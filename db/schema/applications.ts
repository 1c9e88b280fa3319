import { sql } from "drizzle-orm";
import {
  bigint,
  check,
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
import type { Assessment } from "@/lib/hazard";
import { apparatus, apparatusRevisions } from "./apparatus";
import { departments, users } from "./users";

// Applications, their frozen revisions and attachments. The state changes only through
// lib/applications/state.ts, guarded by `WHERE state = expected AND version = n`.

export const APPLICATION_STATES = [
  "draft",
  "submitted",
  "in_review",
  "returned",
  "approved",
  "rejected",
  "withdrawn",
] as const;
export type ApplicationState = (typeof APPLICATION_STATES)[number];
export const applicationStateEnum = pgEnum("application_state", APPLICATION_STATES);

export const applications = pgTable(
  "application",
  {
    id: uuid().primaryKey().defaultRandom(),
    // Human reference: shown as A-<seq>.
    seq: bigint({ mode: "number" }).notNull().generatedAlwaysAsIdentity(),
    title: text().notNull().default(""),
    applicantId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    departmentId: uuid()
      .notNull()
      .references(() => departments.id, { onDelete: "restrict" }),
    state: applicationStateEnum().notNull().default("draft"),
    // Bumped by every state transition and every draft save: optimistic concurrency.
    version: integer().notNull().default(1),
    // The working copy the form edits (ApplicationDraft, lib/applications/schemas.ts).
    draft: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    draftStep: smallint().notNull().default(1),
    // Users named on the application (responsible person, operators): they may not decide on it.
    namedUserIds: uuid()
      .array()
      .notNull()
      .default(sql`'{}'::uuid[]`),
    apparatusId: uuid().references(() => apparatus.id, { onDelete: "restrict" }),
    apparatusRevisionId: uuid().references(() => apparatusRevisions.id, { onDelete: "restrict" }),
    // Live tier of the draft, then of the submitted revision (for the queue's filter and sort).
    tier: smallint(),
    currentRevisionId: uuid(),
    // The chain rules version the application was submitted under (lib/review/rules).
    chainRulesVersion: integer(),
    // Review chain position: how many signed steps the current revision has.
    chainStep: smallint().notNull().default(0),
    submittedAt: timestamp({ withTimezone: true }),
    // When it entered its current waiting state: the queue sorts by this.
    waitingSince: timestamp({ withTimezone: true }),
    decidedAt: timestamp({ withTimezone: true }),
    duplicatedFromId: uuid(),
    renewalOfPermitId: uuid(),
    // The permit this application amends after its apparatus changed (lib/rereview/amend.ts).
    amendmentOfPermitId: uuid(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("application_seq_key").on(t.seq),
    index("application_applicant_idx").on(t.applicantId, t.updatedAt),
    index("application_queue_idx").on(t.state, t.waitingSince),
    index("application_department_idx").on(t.departmentId, t.state),
    // The review queue's order over waiting applications only (lib/review/queries.ts listQueue): an
    // index on (state, waiting_since) gives two ranges for the two waiting states, which PostgreSQL
    // sorts together; this one is read in order and stops after a page.
    index("application_waiting_idx")
      .on(t.waitingSince.asc().nullsLast(), t.seq)
      .where(sql`${t.state} IN ('submitted', 'in_review')`),
    // Waiting applications by the step they wait at and their tier: the queue's role tests and capped
    // counts read their candidates here (migration 0020).
    index("application_waiting_step_idx")
      .on(t.chainStep, t.tier)
      .where(sql`${t.state} IN ('submitted', 'in_review')`),
    index("application_amendment_idx")
      .on(t.amendmentOfPermitId)
      .where(sql`${t.amendmentOfPermitId} IS NOT NULL`),
    index("application_apparatus_idx")
      .on(t.apparatusId)
      .where(sql`${t.apparatusId} IS NOT NULL`),
    check("application_tier_range", sql`${t.tier} IS NULL OR ${t.tier} BETWEEN 0 AND 4`),
    // Search by title (lib/search; migration 0013_search_trgm).
    index("application_title_trgm_idx").using("gin", t.title.op("gin_trgm_ops")),
  ],
);

export const applicationRevisions = pgTable(
  "application_revision",
  {
    id: uuid().primaryKey().defaultRandom(),
    applicationId: uuid()
      .notNull()
      .references(() => applications.id, { onDelete: "restrict" }),
    revision: integer().notNull(),
    // The canonical content that signatures cover (ApplicationContent): event, apparatus, controls,
    // attachments, attestation. Never changed after insert.
    content: jsonb().$type<Record<string, unknown>>().notNull(),
    assessment: jsonb().$type<Assessment>().notNull(),
    tier: smallint().notNull(),
    // SHA-256 (hex) of the canonical JSON of `content` and `assessment`.
    contentHash: text().notNull(),
    submittedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    submittedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("application_revision_number_key").on(t.applicationId, t.revision),
    // Search by the event's room (lib/search; migration 0013_search_trgm).
    index("application_revision_room_trgm_idx").using("gin", sql`((${t.content} -> 'event') ->> 'room') gin_trgm_ops`),
  ],
);

export const attachments = pgTable(
  "attachment",
  {
    id: uuid().primaryKey().defaultRandom(),
    applicationId: uuid()
      .notNull()
      .references(() => applications.id, { onDelete: "restrict" }),
    storageKey: text().notNull().unique(),
    filename: text().notNull(),
    contentType: text().notNull(),
    size_B: integer().notNull(),
    sha256: text().notNull(),
    uploadedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    // Removed from the draft; kept when a submitted revision lists it (nothing signed is deleted).
    removedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("attachment_application_idx").on(t.applicationId)],
);

export type Application = typeof applications.$inferSelect;
export type ApplicationRevision = typeof applicationRevisions.$inferSelect;
export type Attachment = typeof attachments.$inferSelect;
