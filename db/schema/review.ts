import {
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

// Signed decisions and the versioned rules they follow.

export const DECISION_KINDS = ["recommend", "return", "approve", "reject", "revoke"] as const;
export type DecisionKind = (typeof DECISION_KINDS)[number];
export const decisionKindEnum = pgEnum("decision_kind", DECISION_KINDS);

export const decisions = pgTable(
  "decision",
  {
    id: uuid().primaryKey().defaultRandom(),
    applicationId: uuid()
      .notNull()
      .references(() => applications.id, { onDelete: "restrict" }),
    revisionId: uuid()
      .notNull()
      .references(() => applicationRevisions.id, { onDelete: "restrict" }),
    kind: decisionKindEnum().notNull(),
    // Position in the review chain (1 = reviewer, 2 = safety officer); revoke has none.
    step: smallint(),
    signerId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    // Printed name and role at the time of signing, and what the signature means.
    signerName: text().notNull(),
    signerRole: text().notNull(),
    meaning: text().notNull(),
    // SHA-256 of the canonical content of the revision signed.
    contentHash: text().notNull(),
    comment: text(),
    // Optional pin of a return comment to a form step or field path ("event.firstDay").
    pinnedTo: text(),
    conditions: jsonb().$type<string[]>(),
    // The validity window an approval signs (inclusive institution days), and the approver's reason
    // when it reaches beyond the application's event days. Null on every other kind of decision.
    validFrom: date({ mode: "string" }),
    validTo: date({ mode: "string" }),
    validityReason: text(),
    signedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    // HMAC over the decision (lib/records/seal.ts). Added nullable by 0008_roles_and_seals; scripts/lib/migrate.ts
    // seals older rows with the key and then sets NOT NULL.
    hmac: text().notNull(),
  },
  (t) => [
    index("decision_application_idx").on(t.applicationId, t.signedAt),
    // Separation of duties in the queue: "not a revision this person signed" (migration 0020).
    index("decision_signer_idx").on(t.signerId, t.revisionId),
    // One signature per chain step of a revision: a second approval of the same step cannot exist.
    unique("decision_revision_step_key").on(t.revisionId, t.step),
  ],
);

// Chain rules (tier → review steps, longest validity, extra requirements) and tier rules (the
// engine's thresholds), both versioned: an application keeps the version it was submitted under.
export const ruleSets = pgTable(
  "rule_set",
  {
    id: uuid().primaryKey().defaultRandom(),
    kind: text({ enum: ["chain", "tier", "reminders"] }).notNull(),
    version: integer().notNull(),
    rules: jsonb().$type<Record<string, unknown>>().notNull(),
    note: text().notNull().default(""),
    createdById: uuid().references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique("rule_set_kind_version_key").on(t.kind, t.version)],
);

export type Decision = typeof decisions.$inferSelect;
export type RuleSet = typeof ruleSets.$inferSelect;

// The applicant's answer to a return comment: kept beside the signed decision (which never changes),
// shown to reviewers on the application page and recorded in the audit trail.
export const commentReplies = pgTable(
  "comment_reply",
  {
    id: uuid().primaryKey().defaultRandom(),
    applicationId: uuid()
      .notNull()
      .references(() => applications.id, { onDelete: "restrict" }),
    decisionId: uuid()
      .notNull()
      .references(() => decisions.id, { onDelete: "restrict" }),
    authorId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    authorName: text().notNull(),
    body: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("comment_reply_application_idx").on(t.applicationId, t.createdAt)],
);

export type CommentReply = typeof commentReplies.$inferSelect;
