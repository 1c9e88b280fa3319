import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Alert } from "@/app/_components/alert";
import { Card } from "@/app/_components/card";
import { formatDateTime, isoDate } from "@/app/_components/format";
import { IncidentStateBadge } from "@/app/_components/incident-list";
import { PageHeader } from "@/app/_components/page-header";
import { RevokeForm } from "@/app/_components/permits/revoke-form";
import { StateBadge } from "@/app/_components/state-badge";
import { requirePageUser } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { isRecordId } from "@/lib/http/ids";
import { getIncident } from "@/lib/incidents/queries";
import { INCIDENT_KIND_LABELS, incidentRef } from "@/lib/incidents/schemas";
import { institutionTimeZone } from "@/lib/settings/queries";
import { signingFor } from "@/lib/signing/password";
import { PhotoUpload, TriageForm } from "../_components/incident-actions";

export const metadata: Metadata = { title: "Incident report" };

type PageProps = {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

const STEP_WORDS: Record<string, string> = {
  "incident.reported": "Reported",
  "incident.investigating": "Investigation started",
  "incident.closed": "Closed",
  "incident.reopened": "Reopened",
  "incident.notes_updated": "Findings or actions updated",
  "incident.permit_revoked": "Permit revoked from this report",
  "incident.photo_added": "Photo added",
};

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid gap-0.5 sm:grid-cols-[10rem_minmax(0,1fr)] sm:gap-3">
      <dt className="text-sm text-stone-600">{label}</dt>
      <dd className="text-sm whitespace-pre-line text-stone-900">{children}</dd>
    </div>
  );
}

async function load(id: string) {
  const user = await requirePageUser("incident.report", `/incidents/${id}`);
  if (!isRecordId(id)) notFound();
  try {
    return { user, found: await getIncident(user, id) };
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

export default async function IncidentPage({ params, searchParams }: PageProps) {
  const { id } = await params;
  const { user, found } = await load(id);
  const [timeZone, query] = await Promise.all([institutionTimeZone(), searchParams]);
  const { incident, permit } = found;
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/incidents">Incidents</Link>}
        title={
          <>
            <span className="figure">{incidentRef(incident.seq)}</span> {incident.summary}
          </>
        }
        description={`${INCIDENT_KIND_LABELS[incident.kind]} · ${incident.location}`}
        actions={<IncidentStateBadge state={incident.state} />}
      />
      {query.photos === "refused" && (
        <Alert tone="warn" className="mb-6">
          The report is stored, but one or more photos were refused. Add them again below.
        </Alert>
      )}
      {incident.injuries && (
        <Alert tone="error" title="Someone was hurt" className="mb-6">
          {incident.injuryNote || "No detail given."}
        </Alert>
      )}
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Report">
            <dl className="flex flex-col gap-2">
              <Row label="When">
                <time dateTime={isoDate(incident.occurredAt)}>{formatDateTime(incident.occurredAt, timeZone)}</time>
              </Row>
              <Row label="Where">{incident.location}</Row>
              <Row label="Injuries">{incident.injuries ? "Yes" : "No"}</Row>
              <Row label="Reported by">{found.reporterName ?? "Not shown to you"}</Row>
              <Row label="Permit">
                {permit ? (
                  <span className="inline-flex flex-wrap items-center gap-2">
                    <Link href={`/permits/${permit.id}`} className="text-ink-800 underline decoration-ink-300">
                      {permit.number}
                    </Link>
                    <StateBadge kind="permit" state={permit.state} />
                  </span>
                ) : (
                  "—"
                )}
              </Row>
              <Row label="Apparatus">
                {incident.apparatusId ? (
                  <Link
                    href={`/apparatus/${incident.apparatusId}`}
                    className="text-ink-800 underline decoration-ink-300"
                  >
                    {found.apparatusName}
                  </Link>
                ) : (
                  "—"
                )}
              </Row>
              <Row label="What happened">{incident.description}</Row>
            </dl>
          </Card>
          <Card title="Findings and actions">
            <dl className="flex flex-col gap-2">
              <Row label="Findings">{incident.findings || "None recorded yet."}</Row>
              <Row label="Actions">{incident.actions || "None recorded yet."}</Row>
            </dl>
          </Card>
          <Card title="Photos">
            {found.photos.length === 0 ? (
              <p className="text-sm text-stone-600">No photos.</p>
            ) : (
              <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3" aria-label="Photos">
                {found.photos.map((p) => (
                  <li key={p.id} className="text-xs text-stone-700">
                    <a href={`/api/incidents/${incident.id}/photos/${p.id}`} className="underline decoration-ink-300">
                      {p.contentType.startsWith("image/") ? (
                        // eslint-disable-next-line @next/next/no-img-element -- served by our own authorized route
                        <img
                          src={`/api/incidents/${incident.id}/photos/${p.id}`}
                          alt={p.filename}
                          className="mb-1 aspect-square w-full rounded border border-stone-200 object-cover"
                        />
                      ) : null}
                      {p.filename}
                    </a>
                  </li>
                ))}
              </ul>
            )}
            {found.mayAddPhoto && <PhotoUpload incidentId={incident.id} />}
          </Card>
        </div>
        <div className="flex min-w-0 flex-col gap-6">
          {found.mayTriage && (
            <Card title="Triage" description="The reporter and the safety officers are told of each step by e-mail.">
              <TriageForm
                incidentId={incident.id}
                version={incident.version}
                state={incident.state}
                moves={[...found.moves]}
                findings={incident.findings}
                actions={incident.actions}
              />
            </Card>
          )}
          {found.mayRevokePermit && permit && (
            <Card
              title={`Revoke permit ${permit.number}`}
              description="Signed like any revocation (your password, or a fresh sign-in through your institution); the holder is told by e-mail."
            >
              <RevokeForm
                action={`/api/incidents/${incident.id}/revoke-permit`}
                version={permit.version}
                signing={await signingFor(user.id, `/incidents/${incident.id}`)}
              />
            </Card>
          )}
          <Card title="Steps">
            <ol className="flex flex-col gap-2 text-sm">
              {found.steps.map((s) => (
                <li key={s.id}>
                  <span className="font-medium text-stone-900">{STEP_WORDS[s.action] ?? s.action}</span>
                  <span className="block text-xs text-stone-600">
                    {s.actorName} ·{" "}
                    <time dateTime={isoDate(s.occurredAt)}>{formatDateTime(s.occurredAt, timeZone)}</time>
                  </span>
                </li>
              ))}
            </ol>
          </Card>
        </div>
      </div>
    </>
  );
}
