import { bigint, index, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./users";

// The audit trail: one row per change, written in the same transaction as the change. A trigger
// (migration 0001_audit_append_only) refuses UPDATE and DELETE, so the table is append-only.
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
  },
  (t) => [
    index("audit_event_entity_idx").on(t.entityType, t.entityId, t.occurredAt),
    index("audit_event_actor_idx").on(t.actorId, t.occurredAt),
  ],
);

export type AuditEvent = typeof auditEvents.$inferSelect;
