// GET /api/reports/export.csv?chart=issued|decision-times|returns|active|expiries|incidents&from&to&department —
// one chart of the committee report as CSV (the figures of its table), for safety officers and
// admins; cells that would start a spreadsheet formula are neutralised. 422 naming a bad field.
import { route } from "@/lib/http/route";
import { committeeReport, reportFilters } from "@/lib/reports/queries";
import { reportCsvQuerySchema } from "@/lib/reports/schemas";
import { reportTable } from "@/lib/reports/tables";
import { csvResponse, toCsv } from "@/lib/review/csv";

export const GET = route({ access: "report.read", query: reportCsvQuerySchema }, async ({ user, query }) => {
  const filters = await reportFilters(query);
  const report = await committeeReport(user, filters);
  const table = reportTable(report, query.chart);
  return csvResponse(
    `benchclear-${query.chart}-${filters.from}-${filters.to}.csv`,
    toCsv(
      table.columns.map((c) => c.csv),
      table.rows,
    ),
  );
});
