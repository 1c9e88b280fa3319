import Link from "next/link";
import { Card } from "../card";
import { DataTable, type Column } from "../data-table";
import { formatDate, isoDate } from "../format";
import { StateBadge } from "../state-badge";
import { TierBadge } from "../tier-badge";
import type { OpenApplicationSummary } from "./types";

const columns: Column<OpenApplicationSummary>[] = [
  {
    key: "title",
    header: "Application",
    rowHeader: true,
    cell: (a) => (
      <Link
        href={`/applications/${a.id}`}
        className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
      >
        {a.title}
      </Link>
    ),
  },
  {
    key: "state",
    header: "State",
    cell: (a) => <StateBadge kind="application" state={a.state} />,
  },
  {
    key: "tier",
    header: "Tier",
    hideBelow: "md",
    cell: (a) => (a.tier == null ? <span className="text-stone-500">—</span> : <TierBadge tier={a.tier} size="sm" />),
  },
  {
    key: "submitted",
    header: "Submitted",
    align: "right",
    hideBelow: "sm",
    cell: (a) =>
      a.submittedAt ? (
        <time dateTime={isoDate(a.submittedAt)} className="whitespace-nowrap text-stone-600">
          {formatDate(a.submittedAt)}
        </time>
      ) : (
        <span className="text-stone-500">—</span>
      ),
  },
];

export function OpenApplicationsSection({ applications }: { applications: readonly OpenApplicationSummary[] }) {
  return (
    <Card
      title="Open applications"
      description="Submitted, in review, or returned to you for changes."
      flush
      actions={
        <Link href="/applications" className="text-sm font-medium text-ink-700 hover:text-ink-900">
          All applications
        </Link>
      }
    >
      <DataTable
        caption="Open applications"
        columns={columns}
        rows={applications}
        rowKey={(a) => a.id}
        empty="No open applications."
      />
    </Card>
  );
}
