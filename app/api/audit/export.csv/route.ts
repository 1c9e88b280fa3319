// GET /api/audit/export.csv?from&to — the audit trail between two dates (UTC days, both included),
// oldest first, for safety officers, as CSV (cells that would start a formula are neutralised).
import { route } from "@/lib/http/route";
import { csvResponse, toCsv } from "@/lib/review/csv";
import { auditForExport } from "@/lib/review/queries";
import { auditRangeSchema } from "@/lib/review/schemas";

export const GET = route({ access: "audit.export", query: auditRangeSchema }, async ({ query }) => {
  const rows = await auditForExport(query);
  const body = toCsv(
    ["id", "occurred_at_utc", "actor_id", "actor_name", "action", "entity_type", "entity_id", "data"],
    rows.map((r) => [r.id, r.occurredAt, r.actorId, r.actorName, r.action, r.entityType, r.entityId, r.data]),
  );
  const span = [query.from?.toISOString().slice(0, 10), query.to?.toISOString().slice(0, 10)]
    .filter(Boolean)
    .join("_to_");
  return csvResponse(`benchclear-audit${span ? `-${span}` : ""}.csv`, body);
});
