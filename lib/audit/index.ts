import "server-only";
import type { ExtractTablesWithRelations } from "drizzle-orm";
import type { NodePgQueryResultHKT } from "drizzle-orm/node-postgres";
import type { PgTransaction } from "drizzle-orm/pg-core";
import type { Database } from "@/db";
import { auditEvents } from "@/db/schema";
import type * as schema from "@/db/schema";

// Audit rows are written with the same transaction handle as the change they record (style habit
// 11): if the change rolls back, so does its audit row, and the other way round.

export type Tx = PgTransaction<NodePgQueryResultHKT, typeof schema, ExtractTablesWithRelations<typeof schema>>;
export type DbOrTx = Database | Tx;

export type AuditInput = {
  actor: { id: string; name: string } | null;
  action: string;
  entityType: string;
  entityId: string;
  data?: Record<string, unknown>;
};

export async function writeAudit(tx: DbOrTx, event: AuditInput): Promise<void> {
  await tx.insert(auditEvents).values({
    actorId: event.actor?.id ?? null,
    actorName: event.actor?.name ?? "system",
    action: event.action,
    entityType: event.entityType,
    entityId: event.entityId,
    data: event.data ?? {},
  });
}
