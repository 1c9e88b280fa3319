// GET /api/apparatus/export.csv — the apparatus inventory as CSV: every registry record the user may
// read (their own, their department's; every record for safety officers), with its current revision's
// set-up and figures in SI base units (the unit in the column name). Cells that would start a
// spreadsheet formula are neutralised, as in the other exports.
import { apparatusForExport } from "@/lib/apparatus/queries";
import { TIER_LABELS, type Assessment, type SetupInput, type Tier } from "@/lib/hazard";
import { route } from "@/lib/http/route";
import { sourceLines, gapLines } from "@/lib/pdf/content";
import { csvResponse, toCsv } from "@/lib/review/csv";

export const GET = route({ access: "apparatus.read" }, async ({ user }) => {
  const rows = await apparatusForExport(user);
  const body = toCsv(
    [
      "name",
      "room",
      "department",
      "owner",
      "owner_email",
      "revision",
      "tier",
      "tier_label",
      "stored_energy_J",
      "highest_voltage_V",
      "capacitance_F",
      "charge_C",
      "peak_body_current_A",
      "continuous_body_current_A",
      "time_to_safe_voltage_s",
      "limited_approach_m",
      "restricted_approach_m",
      "energy_sources",
      "spark_gaps",
      "engine_version",
      "rules_version",
      "archived_at",
      "updated_at",
    ],
    rows.map((r) => {
      const a = r.assessment as Assessment;
      const setup = r.setup as SetupInput;
      return [
        r.name,
        r.room,
        r.departmentName,
        r.ownerName,
        r.ownerEmail,
        r.revision,
        r.tier,
        TIER_LABELS[r.tier as Tier] ?? "",
        a.energy_J,
        a.maxVoltage_V,
        a.capacitance_F,
        a.charge_C,
        a.peakCurrent_A,
        a.continuousCurrent_A,
        // null: a source above the safe voltage has no bleeder.
        a.timeToSafe_s ?? "no bleeder",
        a.approach?.limited_m,
        a.approach?.restricted_m,
        sourceLines(setup, a)
          .map((l) => `${l.label} (${l.kind}): ${l.detail}`)
          .join(" | "),
        gapLines(setup.gaps).join(" | "),
        a.engineVersion,
        a.rulesVersion,
        r.archivedAt,
        r.updatedAt,
      ];
    }),
  );
  return csvResponse(`benchclear-apparatus-${new Date().toISOString().slice(0, 10)}.csv`, body);
});
