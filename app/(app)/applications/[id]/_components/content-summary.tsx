import { Card } from "@/app/_components/card";
import { Stat, StatList } from "@/app/_components/stat";
import { readableAssessment, type Assessment } from "@/lib/hazard";
import {
  audienceLabel,
  eventKindLabel,
  fieldLabel,
  figureRows,
  formatFieldValue,
  formatPerson,
  sourceKindLabel,
} from "@/lib/review/present";
import { formatBytes } from "@/lib/applications/limits";
import type { ApplicationContent } from "@/lib/applications/schemas";

// The frozen content of one revision, read-only: event, apparatus and energy sources, the figures and
// their reasons with sources, the controls and the attachments.

type Props = { applicationId: string; content: Partial<ApplicationContent>; assessment: Assessment; revision: number };

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid gap-0.5 sm:grid-cols-[11rem_minmax(0,1fr)] sm:gap-3">
      <dt className="text-sm text-stone-600">{label}</dt>
      <dd className="text-sm text-stone-900">{children}</dd>
    </div>
  );
}

export function ContentSummary({ applicationId, content, assessment, revision }: Props) {
  const event = content.event;
  const apparatus = content.apparatus;
  const sources = apparatus?.setup?.sources ?? [];
  const gaps = apparatus?.setup?.gaps ?? [];
  return (
    <>
      <Card title="Event" description={`As submitted in revision ${revision}.`}>
        <dl className="flex flex-col gap-2">
          <Row label="Title">{event?.title ?? "—"}</Row>
          <Row label="Kind">{eventKindLabel(event?.kind)}</Row>
          <Row label="Room or place">{event?.room || "—"}</Row>
          <Row label="Audience">
            {audienceLabel(event?.audience)}
            {event && event.audience !== "none" && (
              <span className="text-stone-600"> · about {event.audienceSize} people</span>
            )}
          </Row>
          <Row label="Days">
            {event?.firstDay ?? "—"}
            {event?.lastDay && event.lastDay !== event.firstDay ? ` to ${event.lastDay}` : ""}
          </Row>
          <Row label="Responsible person">{formatPerson(event?.responsible)}</Row>
          <Row label="Operators">
            {event?.operators?.length ? event.operators.map((o) => formatPerson(o)).join(", ") : "—"}
          </Row>
        </dl>
      </Card>

      <Card title="Apparatus and energy sources" description={apparatus?.name}>
        <dl className="mb-3 flex flex-col gap-2">
          <Row label="Room">{apparatus?.room || "—"}</Row>
          {apparatus?.notes && <Row label="Notes">{apparatus.notes}</Row>}
        </dl>
        <ol className="flex flex-col gap-3">
          {sources.map((source, i) => (
            <li key={i} className="rounded-md border border-stone-200 px-3 py-2">
              <p className="text-sm font-medium text-stone-900">
                Source {i + 1}
                {source.id ? ` · ${source.id}` : ""}{" "}
                <span className="font-normal text-stone-600">({sourceKindLabel(source.kind)})</span>
              </p>
              <dl className="mt-1 grid grid-cols-1 gap-x-6 gap-y-1 sm:grid-cols-2">
                {Object.entries(source)
                  .filter(([k]) => k !== "id" && k !== "kind")
                  .map(([k, v]) => (
                    <div key={k} className="flex justify-between gap-3 text-sm">
                      <dt className="text-stone-600">{fieldLabel(k)}</dt>
                      <dd className="figure text-stone-900">{formatFieldValue(k, v)}</dd>
                    </div>
                  ))}
              </dl>
            </li>
          ))}
          {gaps.map((gap, i) => (
            <li key={`gap-${i}`} className="rounded-md border border-stone-200 px-3 py-2">
              <p className="text-sm font-medium text-stone-900">Spark gap {i + 1}</p>
              <dl className="mt-1 grid grid-cols-1 gap-x-6 gap-y-1 sm:grid-cols-2">
                {Object.entries(gap).map(([k, v]) => (
                  <div key={k} className="flex justify-between gap-3 text-sm">
                    <dt className="text-stone-600">{fieldLabel(k)}</dt>
                    <dd className="figure text-stone-900">{formatFieldValue(k, v)}</dd>
                  </div>
                ))}
              </dl>
            </li>
          ))}
        </ol>
      </Card>

      <Card
        title="Figures and tier"
        description={`Engine ${assessment.engineVersion}, tier rules ${assessment.rulesVersion}.`}
      >
        <StatList>
          {figureRows(assessment)
            .filter((f) => f.key !== "tier")
            .map((f) => (
              <Stat key={f.key} label={f.label} value={f.value} size="sm" />
            ))}
        </StatList>
        <h3 className="mt-4 text-sm font-semibold text-stone-900">Why this tier</h3>
        <ul className="mt-1 flex flex-col gap-2">
          {/* A revision assessed by engine 1 named an internal working file in its sources: dropped here. */}
          {readableAssessment(assessment).reasons.map((r, i) => (
            <li key={`${r.criterion}-${i}`} className="text-sm">
              <p className="text-stone-900">{r.meaning}</p>
              <p className="text-xs text-stone-600">Source: {r.source}</p>
            </li>
          ))}
        </ul>
        {assessment.flags.length > 0 && (
          <>
            <h3 className="mt-4 text-sm font-semibold text-stone-900">Also note</h3>
            <ul className="mt-1 flex flex-col gap-2">
              {readableAssessment(assessment).flags.map((f) => (
                <li key={f.code} className="text-sm">
                  <p className="text-stone-900">{f.message}</p>
                  <p className="text-xs text-stone-600">Source: {f.source}</p>
                </li>
              ))}
            </ul>
          </>
        )}
      </Card>

      <Card title="Controls">
        <ul className="flex flex-col gap-1.5">
          {(content.controls?.required ?? []).map((c) => (
            <li key={c.code} className="flex gap-2 text-sm">
              <span aria-hidden="true" className={c.confirmed ? "text-emerald-700" : "text-orange-700"}>
                {c.confirmed ? "✓" : "!"}
              </span>
              <span>
                <span className="text-stone-900">{c.text || c.code}</span>
                <span className="text-stone-600"> — {c.confirmed ? "confirmed" : "not confirmed"}</span>
                {c.note && <span className="block text-stone-700">{c.note}</span>}
              </span>
            </li>
          ))}
        </ul>
        {content.controls?.additional && (
          <p className="mt-3 text-sm whitespace-pre-line text-stone-800">
            <span className="font-medium">Additional controls: </span>
            {content.controls.additional}
          </p>
        )}
      </Card>

      <Card title="Attachments">
        {content.attachments?.length ? (
          <ul className="flex flex-col gap-1">
            {content.attachments.map((a) => (
              <li key={a.id} className="text-sm">
                <a
                  href={`/api/applications/${applicationId}/attachments/${a.id}`}
                  className="text-ink-800 underline decoration-ink-300 hover:decoration-ink-700"
                >
                  {a.filename}
                </a>
                <span className="text-stone-600">
                  {" "}
                  · {a.contentType} · {formatBytes(a.size_B)}
                </span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-stone-600">No attachments.</p>
        )}
      </Card>
    </>
  );
}
