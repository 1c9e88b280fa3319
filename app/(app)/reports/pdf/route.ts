// GET /reports/pdf?from&to&department — the whole committee report as a PDF for the meeting (every
// chart's table, with a bar for each row), for safety officers and admins. A browser link: a visitor
// without a session is sent to sign in, an account without the permission to the 403 page; a bad
// filter is a 422 naming the field.
import { can } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { forbiddenRedirect, signInRedirect } from "@/lib/pdf/http";
import { renderReportPdf } from "@/lib/pdf/report";
import { committeeReport, reportFilters } from "@/lib/reports/queries";
import { reportFilterSchema } from "@/lib/reports/schemas";

export const GET = route({ access: "public", query: reportFilterSchema }, async ({ request, user, query }) => {
  if (!user) return signInRedirect(request);
  if (!can(user, "report.read")) return forbiddenRedirect();
  const filters = await reportFilters(query);
  const report = await committeeReport(user, filters);
  const pdf = await renderReportPdf(report);
  return new Response(new Uint8Array(pdf), {
    status: 200,
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(pdf.length),
      "Content-Disposition": `attachment; filename="benchclear-committee-report-${filters.from}-${filters.to}.pdf"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
});
