import Link from "next/link";
import type { ReactNode } from "react";
import { INCIDENT_KIND_LABELS, INCIDENT_STATE_LABELS, incidentRef } from "@/lib/incidents/schemas";
import type { IncidentListRow } from "@/lib/incidents/queries";
import { cx } from "./cx";
import { formatDateTime, isoDate } from "./format";

// Incident and near-miss reports in words: the state badge (outlined, like application states) and
// the compact list the permit and apparatus pages show beside their other panels.

const LOOK = {
  open: "border-orange-300 text-orange-900",
  investigating: "border-ink-300 text-ink-800",
  closed: "border-stone-300 text-stone-600",
} as const;
const DOT = { open: "bg-orange-600", investigating: "bg-ink-600", closed: "bg-stone-400" } as const;

export function IncidentStateBadge({ state, className }: { state: keyof typeof LOOK; className?: string }) {
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1.5 rounded-full border bg-white px-2 py-px text-xs leading-5 font-medium whitespace-nowrap",
        LOOK[state],
        className,
      )}
    >
      <span aria-hidden="true" className={cx("size-1.5 rounded-full", DOT[state])} />
      {INCIDENT_STATE_LABELS[state]}
    </span>
  );
}

/** The reports of one permit or apparatus, newest first, as a short list of links. */
export function IncidentLinks({
  rows,
  timeZone,
  empty,
  footer,
}: {
  rows: readonly IncidentListRow[];
  timeZone: string;
  empty: ReactNode;
  footer?: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-3 text-sm">
      {rows.length === 0 ? (
        <p className="text-stone-600">{empty}</p>
      ) : (
        <ul className="flex flex-col gap-2" aria-label="Incident and near-miss reports">
          {rows.map((r) => (
            <li key={r.id} className="flex flex-wrap items-baseline gap-x-2 gap-y-0.5">
              <Link href={`/incidents/${r.id}`} className="font-medium text-ink-800 underline decoration-ink-300">
                {incidentRef(r.seq)}
              </Link>
              <span className="text-stone-900">{r.summary}</span>
              <span className="basis-full text-xs text-stone-600">
                {INCIDENT_KIND_LABELS[r.kind]} ·{" "}
                <time dateTime={isoDate(r.occurredAt)}>{formatDateTime(r.occurredAt, timeZone)}</time>
                {r.injuries ? " · injuries" : ""}
              </span>
              <IncidentStateBadge state={r.state} />
            </li>
          ))}
        </ul>
      )}
      {footer}
    </div>
  );
}
