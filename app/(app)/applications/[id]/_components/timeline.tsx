import { formatDateTime, isoDate } from "@/app/_components/format";

export type TimelineEvent = {
  id: number;
  occurredAt: Date;
  actorName: string;
  action: string;
  entityType: string;
  data: Record<string, unknown>;
};

const str = (v: unknown) => (typeof v === "string" || typeof v === "number" ? String(v) : "");

function describe(e: TimelineEvent): string {
  const d = e.data;
  switch (e.action) {
    case "application.created":
      if (d.amendmentOfPermitId)
        return `Started as an amendment of permit ${str(d.permitNumber)}, with apparatus revision ${str(d.apparatusRevision)}`;
      return d.renewalOfPermitId ? `Started as a renewal of permit ${str(d.permitNumber)}` : "Draft started";
    case "application.duplicated":
      return "Started as a copy of an earlier application";
    case "application.submitted":
      return `Submitted revision ${str(d.revision)}`;
    case "application.recommended":
      return `Recommended revision ${str(d.revision)} (step ${str(d.step)})`;
    case "application.returned":
      return `Returned revision ${str(d.revision)} for changes`;
    case "application.approved":
      return `Approved revision ${str(d.revision)}`;
    case "application.rejected":
      return `Rejected revision ${str(d.revision)}`;
    case "application.self_certified":
      return "Recorded as self-certified: no review at this tier";
    case "application.withdrawn":
      return "Withdrawn";
    case "application.comment_replied":
      return `Replied to a return comment: “${str(d.reply)}”`;
    case "permit.issued":
      return `Permit ${str(d.number)} issued, valid ${str(d.validFrom)} to ${str(d.validTo)}`;
    case "permit.revoked":
      return `Permit ${str(d.number)} revoked`;
    case "permit.renewal_started":
      return "Renewal started";
    default:
      return e.action.replace(/[._]/g, " ");
  }
}

/** The audit trail of one application and its permit, oldest first. */
export function Timeline({ events, timeZone }: { events: readonly TimelineEvent[]; timeZone: string }) {
  if (events.length === 0) return <p className="text-sm text-stone-600">No events recorded.</p>;
  return (
    <ol className="relative flex flex-col gap-3 border-l border-stone-200 pl-4">
      {events.map((e) => (
        <li key={e.id} className="text-sm">
          <span aria-hidden="true" className="absolute -left-[4.5px] mt-1.5 size-2 rounded-full bg-stone-400" />
          <p className="text-stone-900">{describe(e)}</p>
          <p className="text-xs text-stone-600">
            {e.actorName} · <time dateTime={isoDate(e.occurredAt)}>{formatDateTime(e.occurredAt, timeZone)}</time>
          </p>
        </li>
      ))}
    </ol>
  );
}
