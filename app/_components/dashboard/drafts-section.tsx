import Link from "next/link";
import { Card } from "../card";
import { DataTable, type Column } from "../data-table";
import { formatDate, isoDate } from "../format";
import { TierBadge } from "../tier-badge";
import type { DraftSummary } from "./types";

const columns: Column<DraftSummary>[] = [
  {
    key: "title",
    header: "Application",
    rowHeader: true,
    cell: (d) => (
      <>
        <Link
          href={`/applications/${d.id}/edit`}
          className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
        >
          {d.title}
        </Link>
        {d.apparatusName && <span className="block text-xs font-normal text-stone-600">{d.apparatusName}</span>}
      </>
    ),
  },
  {
    key: "tier",
    header: "Tier",
    hideBelow: "sm",
    cell: (d) =>
      d.tier == null ? <span className="text-stone-500">Not assessed</span> : <TierBadge tier={d.tier} size="sm" />,
  },
  {
    key: "updated",
    header: "Last edited",
    align: "right",
    cell: (d) => (
      <time dateTime={isoDate(d.updatedAt)} className="whitespace-nowrap text-stone-600">
        {formatDate(d.updatedAt)}
      </time>
    ),
  },
];

export function DraftsSection({ drafts }: { drafts: readonly DraftSummary[] }) {
  return (
    <Card title="Your drafts" description="Applications you have started and not yet submitted." flush>
      <DataTable
        caption="Your drafts"
        columns={columns}
        rows={drafts}
        rowKey={(d) => d.id}
        empty="No drafts. Start a new application when you plan a set-up."
      />
    </Card>
  );
}
