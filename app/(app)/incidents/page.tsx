import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { formatDateTime, isoDate } from "@/app/_components/format";
import { IncidentStateBadge } from "@/app/_components/incident-list";
import { Pager } from "@/app/_components/list-controls";
import { PageHeader } from "@/app/_components/page-header";
import { can, requirePageUser } from "@/lib/auth/guards";
import { listIncidents, type IncidentListRow } from "@/lib/incidents/queries";
import {
  INCIDENT_KIND_LABELS,
  INCIDENT_STATE_LABELS,
  INCIDENT_STATE_VALUES,
  incidentListQuerySchema,
  incidentRef,
} from "@/lib/incidents/schemas";
import { institutionTimeZone } from "@/lib/settings/queries";

export const metadata: Metadata = { title: "Incidents" };

type PageProps = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function IncidentsPage({ searchParams }: PageProps) {
  const user = await requirePageUser("incident.report", "/incidents");
  const parsed = incidentListQuerySchema.safeParse(await searchParams);
  // A hand-edited query string falls back to the defaults rather than failing the page.
  const query = parsed.success ? parsed.data : incidentListQuerySchema.parse({});
  const [result, timeZone] = await Promise.all([listIncidents(user, query), institutionTimeZone()]);
  const params = { state: query.state, permitId: query.permitId, apparatusId: query.apparatusId };
  const columns: Column<IncidentListRow>[] = [
    {
      key: "ref",
      header: "Report",
      rowHeader: true,
      cell: (r) => (
        <>
          <Link href={`/incidents/${r.id}`} className="text-ink-800 underline decoration-ink-300">
            {incidentRef(r.seq)}
          </Link>
          <span className="block text-xs font-normal text-stone-600">{INCIDENT_KIND_LABELS[r.kind]}</span>
        </>
      ),
    },
    {
      key: "summary",
      header: "What happened",
      cell: (r) => (
        <>
          {r.summary}
          <span className="block text-xs text-stone-600">
            {r.location}
            {r.injuries ? " · injuries" : ""}
          </span>
        </>
      ),
    },
    {
      key: "when",
      header: "When",
      hideBelow: "md",
      cell: (r) => <time dateTime={isoDate(r.occurredAt)}>{formatDateTime(r.occurredAt, timeZone)}</time>,
    },
    {
      key: "links",
      header: "Permit / apparatus",
      hideBelow: "lg",
      cell: (r) => [r.permitNumber, r.apparatusName].filter(Boolean).join(" · ") || "—",
    },
    { key: "state", header: "State", cell: (r) => <IncidentStateBadge state={r.state} /> },
  ];
  return (
    <>
      <PageHeader
        title="Incidents and near misses"
        description={
          can(user, "incident.read.any")
            ? "Every report. Safety officers move each one from open to investigating to closed."
            : "Your reports, and reports that name a permit you hold."
        }
        actions={<ButtonLink href="/incidents/new">Report an incident or near miss</ButtonLink>}
      />
      <Card flush>
        <nav aria-label="Filter by state" className="flex flex-wrap gap-2 border-b border-stone-200 px-4 py-3 text-sm">
          {[undefined, ...INCIDENT_STATE_VALUES].map((state) => (
            <Link
              key={state ?? "all"}
              href={state ? `/incidents?state=${state}` : "/incidents"}
              aria-current={query.state === state ? "page" : undefined}
              className="rounded-md border border-stone-300 px-2.5 py-1 aria-[current=page]:border-ink-600 aria-[current=page]:font-semibold"
            >
              {state ? INCIDENT_STATE_LABELS[state] : "All"}
            </Link>
          ))}
        </nav>
        <DataTable
          caption="Incident and near-miss reports"
          columns={columns}
          rows={result.rows}
          rowKey={(r) => r.id}
          empty={<p className="px-4 py-6 text-sm text-stone-600">No reports here.</p>}
        />
        <Pager
          base="/incidents"
          params={params}
          page={result.page}
          pageSize={result.pageSize}
          total={result.total}
          noun="reports"
        />
      </Card>
    </>
  );
}
