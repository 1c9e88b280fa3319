import { Document, Page, renderToBuffer, Text, View } from "@react-pdf/renderer";
import type { Report } from "@/lib/reports/queries";
import type { ReportChart } from "@/lib/reports/schemas";
import { displayCell, reportTable } from "@/lib/reports/tables";
import { registerFonts } from "./fonts";
import { s } from "./parts";
import { INK } from "./theme";

// The committee report for the meeting: every section's table (the same figures as the page and the
// CSVs, lib/reports/tables.ts) with a bar drawn for each row's main figure, so the paper shows the
// shape the page's charts show. A4 portrait; long tables run onto further pages with their header
// repeated. No database here: the route passes the report it read.

const SECTIONS: { chart: ReportChart; title: string; note: string; bar?: string }[] = [
  { chart: "issued", title: "Permits issued per month", note: "By the month the permit was issued.", bar: "total" },
  {
    chart: "decision-times",
    title: "Time to decision",
    note: "From a submission to the decision that ended its wait (approve, reject or return). Tier 0 is self-certified.",
    bar: "median_hours",
  },
  {
    chart: "returns",
    title: "Returns per application",
    note: "Applications first submitted in the range, by how often they came back.",
    bar: "returns_per_application",
  },
  { chart: "active", title: "Active permits", note: "Permits active today, by department and tier.", bar: "total" },
  { chart: "expiries", title: "Expiries in the next 90 days", note: "Active permits whose last valid day is near." },
  {
    chart: "incidents",
    title: "Incidents per month",
    note: "Incident and near-miss reports by the month they happened; someone hurt counts either kind.",
    bar: "total",
  },
];

function Section({
  report,
  chart,
  title,
  note,
  bar,
}: {
  report: Report;
  chart: ReportChart;
  title: string;
  note: string;
  bar?: string;
}) {
  const table = reportTable(report, chart);
  const barIndex = bar ? table.columns.findIndex((c) => c.csv === bar) : -1;
  const largest = barIndex >= 0 ? Math.max(0, ...table.rows.map((r) => Number(r[barIndex] ?? 0))) : 0;
  const width = `${Math.floor((barIndex >= 0 ? 75 : 100) / table.columns.length)}%`;
  return (
    <View style={{ marginTop: 14 }}>
      <View wrap={false}>
        <Text style={s.h2}>{title}</Text>
        <Text style={{ fontSize: 8, color: INK.muted, marginBottom: 4 }}>{note}</Text>
      </View>
      {table.rows.length === 0 ? (
        <Text style={{ fontSize: 9 }}>Nothing in this range.</Text>
      ) : (
        <View>
          <View fixed style={{ flexDirection: "row", backgroundColor: INK.panel, paddingVertical: 2 }}>
            {table.columns.map((c) => (
              <Text key={c.csv} style={{ width, fontSize: 7.5, fontWeight: 700, paddingHorizontal: 2 }}>
                {c.label}
              </Text>
            ))}
            {barIndex >= 0 && <Text style={{ width: "25%" }} />}
          </View>
          {table.rows.map((row, i) => (
            <View
              key={i}
              wrap={false}
              style={{ flexDirection: "row", borderTopWidth: 0.5, borderTopColor: INK.hairline, paddingVertical: 1.5 }}
            >
              {row.map((value, j) => (
                <Text
                  key={j}
                  style={{
                    width,
                    fontSize: 8,
                    paddingHorizontal: 2,
                    textAlign: table.columns[j].numeric ? "right" : "left",
                  }}
                >
                  {displayCell(chart, table.columns[j].csv, value)}
                </Text>
              ))}
              {barIndex >= 0 && (
                <View style={{ width: "25%", paddingLeft: 6, justifyContent: "center" }}>
                  <View
                    style={{
                      height: 6,
                      width: `${largest > 0 ? Math.max(0, (Number(row[barIndex] ?? 0) / largest) * 100) : 0}%`,
                      backgroundColor: INK.accent,
                    }}
                  />
                </View>
              )}
            </View>
          ))}
        </View>
      )}
    </View>
  );
}

function ReportDocument({ report, institution }: { report: Report; institution: string }) {
  const f = report.filters;
  return (
    <Document
      title={`Committee report ${f.from} to ${f.to}`}
      author={institution}
      creator="Benchclear"
      producer="Benchclear"
      language="en-GB"
    >
      <Page size="A4" style={[s.page, { padding: 36 }]}>
        <Text style={s.eyebrow}>{institution} · Safety committee</Text>
        <Text style={{ fontSize: 18, fontWeight: 700, color: INK.text, marginTop: 2 }}>
          High-voltage permits report
        </Text>
        <Text style={{ fontSize: 9, color: INK.muted, marginTop: 3 }}>
          {f.from} to {f.to} ({f.timeZone}) · {report.departmentName ?? "All departments"} · active permits and expiries
          as of {f.today}
        </Text>
        {SECTIONS.map((section) => (
          <Section key={section.chart} report={report} {...section} />
        ))}
        <Text
          fixed
          style={{ position: "absolute", bottom: 18, left: 36, right: 36, fontSize: 7, color: INK.faint }}
          render={({ pageNumber, totalPages }) => `Benchclear committee report · page ${pageNumber} of ${totalPages}`}
        />
      </Page>
    </Document>
  );
}

export async function renderReportPdf(report: Report): Promise<Buffer> {
  registerFonts();
  return renderToBuffer(
    <ReportDocument report={report} institution={report.filters.institutionName ?? "Benchclear"} />,
  );
}
