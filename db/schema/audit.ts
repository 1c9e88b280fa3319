import { sql } from "drizzle-orm";
import { bigint, check, index, jsonb, pgTable, smallint, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./users";

// The audit trail: one row per change, written in the same transaction as the change. A trigger
// (migration 0001_audit_append_only) refuses UPDATE and DELETE, so the table is append-only, and the
// app's database role has only SELECT and INSERT on it (0008_roles_and_seals).
export const auditEvents = pgTable(
  "audit_event",
  {
    id: bigint({ mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    occurredAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    actorId: uuid().references(() => users.id, { onDelete: "restrict" }),
    // Printed name at the time, so the record stays readable after a rename.
    actorName: text().notNull(),
    action: text().notNull(),
    entityType: text().notNull(),
    entityId: text().notNull(),
    data: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    // The hash chain (migration 0008_roles_and_seals): filled by the insert trigger, whatever the
    // INSERT says. chainSeq is the place in the chain, prevHash the hash of the row before, hash
    // this row's (lib/records/verify.ts recomputes both).
    chainSeq: bigint({ mode: "number" }).notNull().default(0).unique("audit_event_chain_seq_key"),
    prevHash: text().notNull().default(""),
    hash: text().notNull().default(""),
  },
  (t) => [
    index("audit_event_entity_idx").on(t.entityType, t.entityId, t.occurredAt),
    index("audit_event_actor_idx").on(t.actorId, t.occurredAt),
  ],
);

// The last link of the chain, moved by the insert trigger (the app's role may only read it).
export const auditChainHead = pgTable(
  "audit_chain_head",
  {
    id: smallint().primaryKey().default(1),
    seq: bigint({ mode: "number" }).notNull(),
    hash: text().notNull(),
  },
  (t) => [check("audit_chain_head_id_check", sql`${t.id} = 1`)],
);

export type AuditEvent = typeof auditEvents.$inferSelect;
