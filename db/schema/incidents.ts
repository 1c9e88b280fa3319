import { sql } from "drizzle-orm";
import { bigint, boolean, check, index, integer, pgTable, text, timestamp, unique, uuid } from "drizzle-orm/pg-core";
import { apparatus } from "./apparatus";
import { permits } from "./permits";
import { users } from "./users";

// Incident and near-miss reports (migration 0015_incidents). Anyone signed in reports one; safety
// officers triage it (open → investigating → closed, with findings and actions) and may revoke the
// permit it names. Every step writes an audit row (entity "incident") and mail in one transaction.

export const INCIDENT_KINDS = ["incident", "near_miss"] as const;
export type IncidentKind = (typeof INCIDENT_KINDS)[number];
export const INCIDENT_STATES = ["open", "investigating", "closed"] as const;
export type IncidentState = (typeof INCIDENT_STATES)[number];

export const incidents = pgTable(
  "incident",
  {
    id: uuid().primaryKey().defaultRandom(),
    // Human reference: shown as IR-<seq>.
    seq: bigint({ mode: "number" }).notNull().generatedAlwaysAsIdentity(),
    kind: text({ enum: INCIDENT_KINDS }).notNull(),
    summary: text().notNull(),
    description: text().notNull(),
    occurredAt: timestamp({ withTimezone: true }).notNull(),
    location: text().notNull(),
    injuries: boolean().notNull(),
    injuryNote: text().notNull().default(""),
    permitId: uuid().references(() => permits.id, { onDelete: "restrict" }),
    apparatusId: uuid().references(() => apparatus.id, { onDelete: "restrict" }),
    reporterId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    state: text({ enum: INCIDENT_STATES }).notNull().default("open"),
    findings: text().notNull().default(""),
    actions: text().notNull().default(""),
    // The officer who last moved it.
    triagedById: uuid().references(() => users.id, { onDelete: "restrict" }),
    closedAt: timestamp({ withTimezone: true }),
    // Set when an officer revoked the linked permit from this report (the decision is on the permit).
    permitRevokedAt: timestamp({ withTimezone: true }),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("incident_seq_key").on(t.seq),
    index("incident_permit_idx").on(t.permitId, t.occurredAt),
    index("incident_apparatus_idx").on(t.apparatusId, t.occurredAt),
    index("incident_reporter_idx").on(t.reporterId, t.occurredAt),
    index("incident_occurred_idx").on(t.occurredAt, t.id),
    check("incident_kind_check", sql`${t.kind} IN ('incident', 'near_miss')`),
    check("incident_state_check", sql`${t.state} IN ('open', 'investigating', 'closed')`),
  ],
);

export const incidentPhotos = pgTable(
  "incident_photo",
  {
    id: uuid().primaryKey().defaultRandom(),
    incidentId: uuid()
      .notNull()
      .references(() => incidents.id, { onDelete: "restrict" }),
    storageKey: text().notNull().unique(),
    filename: text().notNull(),
    contentType: text().notNull(),
    size_B: integer().notNull(),
    sha256: text().notNull(),
    uploadedById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("incident_photo_incident_idx").on(t.incidentId, t.createdAt)],
);

export type Incident = typeof incidents.$inferSelect;
export type IncidentPhoto = typeof incidentPhotos.$inferSelect;
