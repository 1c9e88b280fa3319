// GET /api/permits/export.csv — every permit with its effective state, for safety officers, as CSV
// (cells that would start a spreadsheet formula are neutralised). Figures are in SI base units, the
// unit in the column name; the apparatus, figures, event days, audience and operators are those of
// the signed revision the permit was issued on.
import { route } from "@/lib/http/route";
import { AUDIENCE_LABELS } from "@/lib/applications/schemas";
import { permitsForExport } from "@/lib/permits/queries";
import { csvResponse, toCsv } from "@/lib/review/csv";

const audienceText = (audience: string | null) =>
  audience ? (AUDIENCE_LABELS[audience as keyof typeof AUDIENCE_LABELS] ?? audience) : null;

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
      "apparatus",
      "stored_energy_J",
      "highest_voltage_V",
      "event_first_day",
      "event_last_day",
      "audience",
      "audience_size",
      "operators",
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
      r.apparatusName,
      r.energy_J,
      r.maxVoltage_V,
      r.firstDay,
      r.lastDay,
      audienceText(r.audience),
      r.audienceSize,
      (r.operators ?? []).join(" | "),
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
