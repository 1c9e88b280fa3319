import type { Metadata } from "next";
import { Alert } from "@/app/_components/alert";
import { buttonClasses } from "@/app/_components/button-classes";
import { controlClasses } from "@/app/_components/field";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { formatPath } from "@/lib/errors";
import { committeeReport, EXPIRY_WINDOW_DAYS, reportFilters, type Report } from "@/lib/reports/queries";
import { reportFilterSchema, type ReportChart } from "@/lib/reports/schemas";
import { displayCell, reportTable, tierName, weekLabel } from "@/lib/reports/tables";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { listDepartments } from "@/lib/users/queries";
import { ReportBarChart } from "./_components/bar-chart";
import { ReportSection } from "./_components/report-section";

export const metadata: Metadata = { title: "Committee report" };

// The safety committee's report: the questions a committee asks each term, for a range of days and a
// department, each as a chart (Recharts, loaded by this route only), the same figures as a table, and
// a CSV; the whole report as a PDF for the meeting.

const TIERS = [0, 1, 2, 3, 4] as const;
const tierSeries = TIERS.map((t) => ({ key: `t${t}`, label: tierName(t), colour: TIER_COLOURS[t].swatch }));
const byTier = (tiers: Record<number, number>) => Object.fromEntries(TIERS.map((t) => [`t${t}`, tiers[t]]));

function FigureTable({ report, chart, caption }: { report: Report; chart: ReportChart; caption: string }) {
  const table = reportTable(report, chart);
  if (table.rows.length === 0) return <p className="text-sm text-stone-600">Nothing in this range.</p>;
  return (
    <div role="group" aria-label={caption} tabIndex={0} className="overflow-x-auto">
      <table className="w-full border-collapse text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-stone-200 bg-stone-50">
            {table.columns.map((c) => (
              <th
                key={c.csv}
                scope="col"
                className={`px-3 py-1.5 text-xs font-medium whitespace-nowrap text-stone-700 ${c.numeric ? "text-right" : ""}`}
              >
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-stone-100">
          {table.rows.map((row, i) => (
            <tr key={i}>
              {row.map((value, j) => {
                const column = table.columns[j];
                const Cell = j === 0 ? "th" : "td";
                return (
                  <Cell
                    key={column.csv}
                    scope={j === 0 ? "row" : undefined}
                    className={`px-3 py-1.5 ${j === 0 ? "font-medium text-stone-900" : "text-stone-800"} ${column.numeric ? "figure text-right" : ""}`}
                  >
                    {displayCell(chart, column.csv, value)}
                  </Cell>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export default async function ReportsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePageUser("report.read", "/reports");
  const raw = Object.fromEntries(
    Object.entries(await searchParams)
      .filter(([k]) => ["from", "to", "department"].includes(k))
      .map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]),
  );
  const parsed = reportFilterSchema.safeParse(raw);
  const departments = await listDepartments();
  const filters = await reportFilters(parsed.success ? parsed.data : {});
  const report = parsed.success ? await committeeReport(user, filters) : null;
  const query = new URLSearchParams({
    from: filters.from,
    to: filters.to,
    ...(filters.departmentId ? { department: filters.departmentId } : {}),
  }).toString();
  const csv = (chart: ReportChart) => `/api/reports/export.csv?chart=${chart}&${query}`;
  const issues = parsed.success
    ? []
    : parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message }));
  const issueAt = (field: string) => issues.find((i) => i.path === field)?.message;

  return (
    <>
      <PageHeader
        title="Committee report"
        description={`Permits, decisions and returns from ${filters.from} to ${filters.to} (${filters.timeZone}), ${report?.departmentName ?? "all departments"}; active permits and expiries as of ${filters.today}.`}
        actions={
          report && (
            <a href={`/reports/pdf?${query}`} className={buttonClasses({ variant: "secondary" })} download>
              Report for the meeting (PDF)
            </a>
          )
        }
      />
      <form method="get" action="/reports" className="mb-6 flex flex-wrap items-end gap-3" noValidate>
        {(
          [
            ["from", "From", filters.from],
            ["to", "To", filters.to],
          ] as const
        ).map(([name, label, value]) => (
          <label key={name} className="flex flex-col text-sm font-medium text-stone-800">
            {label}
            <input
              type="date"
              name={name}
              defaultValue={typeof raw[name] === "string" ? raw[name] : value}
              aria-invalid={issueAt(name) ? true : undefined}
              aria-describedby={issueAt(name) ? `${name}-error` : undefined}
              className={`${controlClasses} mt-1`}
            />
            {issueAt(name) && (
              <span id={`${name}-error`} className="mt-1 text-sm font-normal text-red-800">
                {issueAt(name)}
              </span>
            )}
          </label>
        ))}
        <label className="flex flex-col text-sm font-medium text-stone-800">
          Department
          <select name="department" defaultValue={filters.departmentId ?? ""} className={`${controlClasses} mt-1`}>
            <option value="">All departments</option>
            {departments.map((d) => (
              <option key={d.id} value={d.id}>
                {d.name}
              </option>
            ))}
          </select>
          {issueAt("department") && (
            <span className="mt-1 text-sm font-normal text-red-800">{issueAt("department")}</span>
          )}
        </label>
        <button type="submit" className={buttonClasses()}>
          Show
        </button>
      </form>

      {!report ? (
        <Alert tone="error">The report was not drawn: {issues.map((i) => `${i.path}: ${i.message}`).join(" ")}</Alert>
      ) : (
        <div className="grid gap-6 xl:grid-cols-2">
          <ReportSection
            title="Permits issued per month"
            description="By the month the permit was issued, stacked by tier."
            csvHref={csv("issued")}
            chart={
              <ReportBarChart
                data={report.issued.map((m) => ({ month: m.month, ...byTier(m.tiers) }))}
                xKey="month"
                series={tierSeries}
                stacked
                yLabel="permits"
              />
            }
          >
            <FigureTable report={report} chart="issued" caption="Permits issued per month, by tier" />
          </ReportSection>

          <ReportSection
            title="Time to decision"
            description="From a submission to the decision that ended its wait (approve, reject or return), by tier. Tier 0 is self-certified and waits for no one."
            csvHref={csv("decision-times")}
            chart={
              <ReportBarChart
                data={report.decisionTimes.map((d) => ({
                  tier: `Tier ${d.tier}`,
                  median: d.medianHours === null ? null : Math.round(d.medianHours * 10) / 10,
                  p90: d.p90Hours === null ? null : Math.round(d.p90Hours * 10) / 10,
                }))}
                xKey="tier"
                series={[
                  { key: "median", label: "Median (h)", colour: "#223350" },
                  { key: "p90", label: "90th percentile (h)", colour: "#8a9bb8" },
                ]}
                yLabel="hours"
              />
            }
          >
            <FigureTable report={report} chart="decision-times" caption="Time from submission to decision, by tier" />
          </ReportSection>

          <ReportSection
            title="Returns per application"
            description="Applications first submitted in the range, by how often they came back to the applicant."
            csvHref={csv("returns")}
            chart={
              <ReportBarChart
                data={report.returns.map((r) => ({
                  tier: `Tier ${r.tier}`,
                  never: r.buckets[0],
                  once: r.buckets[1],
                  twice: r.buckets[2],
                  more: r.buckets[3],
                }))}
                xKey="tier"
                series={[
                  { key: "never", label: "Never returned", colour: "#a8a29e" },
                  { key: "once", label: "Once", colour: "#c47a02" },
                  { key: "twice", label: "Twice", colour: "#b8173a" },
                  { key: "more", label: "3 or more", colour: "#42198a" },
                ]}
                stacked
                yLabel="applications"
              />
            }
          >
            <FigureTable report={report} chart="returns" caption="Returns per application, by tier" />
          </ReportSection>

          <ReportSection
            title="Active permits"
            description={`Permits active on ${filters.today}, by department and tier.`}
            csvHref={csv("active")}
            chart={
              <ReportBarChart
                data={report.active.map((a) => ({ department: a.department, ...byTier(a.tiers) }))}
                xKey="department"
                series={tierSeries}
                stacked
                yLabel="permits"
              />
            }
          >
            <FigureTable report={report} chart="active" caption="Active permits by department and tier" />
          </ReportSection>

          <ReportSection
            title={`Expiries in the next ${EXPIRY_WINDOW_DAYS} days`}
            description="Active permits by the week their last valid day falls in, and each of them."
            csvHref={csv("expiries")}
            chart={
              <ReportBarChart
                data={report.expiriesByWeek.map((w) => ({ week: weekLabel(w.weekStart), ...byTier(w.tiers) }))}
                xKey="week"
                series={tierSeries}
                stacked
                yLabel="permits"
              />
            }
          >
            <FigureTable
              report={report}
              chart="expiries"
              caption={`Permits ending in the next ${EXPIRY_WINDOW_DAYS} days`}
            />
          </ReportSection>

          <ReportSection
            title="Incidents per month"
            description="Incident and near-miss reports by the month they happened, and how many hurt someone. A report counts for the department of the permit it names, else of its apparatus, else of its reporter."
            csvHref={csv("incidents")}
            chart={
              <ReportBarChart
                data={report.incidents.map((m) => ({
                  month: m.month,
                  incidents: m.incidents,
                  nearMisses: m.nearMisses,
                }))}
                xKey="month"
                series={[
                  { key: "incidents", label: "Incidents", colour: "#b8173a" },
                  { key: "nearMisses", label: "Near misses", colour: "#c47a02" },
                ]}
                stacked
                yLabel="reports"
              />
            }
          >
            <FigureTable report={report} chart="incidents" caption="Incident and near-miss reports per month" />
          </ReportSection>
        </div>
      )}
    </>
  );
}
