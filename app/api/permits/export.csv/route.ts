// GET /api/permits/export.csv — every permit with its effective state, for safety officers, as CSV
// (cells that would start a spreadsheet formula are neutralised).
import { route } from "@/lib/http/route";
import { permitsForExport } from "@/lib/permits/queries";
import { csvResponse, toCsv } from "@/lib/review/csv";

export const GET = route({ access: "permit.read.any" }, async ({ user }) => {
  const rows = await permitsForExport(user);
  const body = toCsv(
    [
      "number",
      "state",
      "tier",
      "valid_from",
      "valid_to",
      "title",
      "room",
      "holder",
      "holder_email",
      "department",
      "conditions",
      "issued_at",
      "revoked_at",
      "revoked_reason",
    ],
    rows.map((r) => [
      r.number,
      r.state,
      r.tier,
      r.validFrom,
      r.validTo,
      r.title,
      r.room,
      r.holderName,
      r.holderEmail,
      r.departmentName,
      r.conditions.join(" | "),
      r.issuedAt,
      r.revokedAt,
      r.revokedReason,
    ]),
  );
  return csvResponse(`benchclear-permits-${new Date().toISOString().slice(0, 10)}.csv`, body);
});
