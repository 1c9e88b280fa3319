import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { db } from "@/db";
import { Alert } from "@/app/_components/alert";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { AboutFigures } from "@/app/_components/about-figures";
import { formatDate, formatDateTime, isoDate } from "@/app/_components/format";
import { RevokeForm } from "@/app/_components/permits/revoke-form";
import { PageHeader } from "@/app/_components/page-header";
import { Stat, StatList } from "@/app/_components/stat";
import { StateBadge } from "@/app/_components/state-badge";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { can, requirePageUser } from "@/lib/auth/guards";
import { daysFromTo, inclusiveDays } from "@/lib/permits/dates";
import { getPermit } from "@/lib/permits/queries";
import { institutionTimeZone } from "@/lib/settings/queries";
import { permitSeals } from "@/lib/records/verify";
import { figureRows, formatPerson } from "@/lib/review/present";
import { printAudience, printDays } from "@/lib/pdf/content";
import { AUDIENCE_LABELS, EVENT_KIND_LABELS, type ApplicationContent } from "@/lib/applications/schemas";
import { SignatureList } from "@/app/_components/signature-list";
import { ApparatusChangedBanner } from "@/app/_components/rereview/apparatus-changed-banner";
import { TrainingLapseFlag } from "@/app/_components/training/training-lapse-flag";
import { RenewButton } from "./_components/permit-actions";
import { signingFor } from "@/lib/signing/password";
import { PreUseCheckLog } from "./_components/pre-use-check-log";
import { PermitIncidents } from "./_components/permit-incidents";

export const metadata: Metadata = { title: "Permit" };

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid gap-0.5 sm:grid-cols-[10rem_minmax(0,1fr)] sm:gap-3">
      <dt className="text-sm text-stone-600">{label}</dt>
      <dd className="text-sm text-stone-900">{children}</dd>
    </div>
  );
}

export default async function PermitPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser(undefined, `/permits/${id}`);
  if (!z.uuid().safeParse(id).success) notFound();
  const [found, timeZone] = await Promise.all([getPermit(user, id), institutionTimeZone()]);
  if (!found) notFound();
  const { permit, application, revision, effectiveState, today } = found;
  const content = revision.content as Partial<ApplicationContent>;
  const tier = revision.assessment.tier;
  const isHolder = permit.holderId === user.id;
  const involved = isHolder || application.applicantId === user.id || application.namedUserIds.includes(user.id);
  const mayRevoke = effectiveState === "active" && can(user, "permit.revoke") && !involved;
  const renewalOpen = found.renewal && found.renewal.state !== "withdrawn";
  const mayRenew = isHolder && effectiveState !== "revoked" && !renewalOpen && can(user, "application.create");
  const left = daysFromTo(today, permit.validTo);
  // Re-checked on every view: the seals, the signed content and the permit's terms (lib/records).
  const seals = await permitSeals(db, permit.id);

  return (
    <>
      <PageHeader
        eyebrow={<Link href="/permits">Permits</Link>}
        title={<span className="figure">{permit.number}</span>}
        description={
          <>
            {application.title} · {found.departmentName}
          </>
        }
        actions={
          <>
            <StateBadge kind="permit" state={effectiveState} />
            {isTier(tier) && <TierBadge tier={tier} />}
            <ButtonLink href={`/permits/${permit.id}/pdf`} variant="secondary" size="sm" prefetch={false}>
              Printable PDF
            </ButtonLink>
            <ButtonLink href={`/permits/${permit.id}/bench-card`} variant="secondary" size="sm" prefetch={false}>
              Bench card
            </ButtonLink>
          </>
        }
      />
      <AboutFigures className="mb-6" />

      {effectiveState === "revoked" && (
        <Alert tone="error" title="Revoked" className="mb-6">
          This permit no longer allows the set-up to be operated.
          {permit.revokedReason && <span className="block">Reason: {permit.revokedReason}</span>}
        </Alert>
      )}
      {effectiveState === "expired" && (
        <Alert tone="warn" title="Expired" className="mb-6">
          The last valid day was {formatDate(permit.validTo)}. Renew it to operate the set-up again.
        </Alert>
      )}
      <ApparatusChangedBanner user={user} permitId={permit.id} />
      <TrainingLapseFlag user={user} permitId={permit.id} />
      {renewalOpen && (
        <Alert tone="info" title="Renewal under way" className="mb-6">
          <Link href={`/applications/${found.renewal!.id}`} className="underline">
            The renewal application
          </Link>{" "}
          replaces this permit once approved; its reminders have stopped.
        </Alert>
      )}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Permit">
            <dl className="flex flex-col gap-2">
              <Row label="Holder">{found.holderName}</Row>
              <Row label="Room or place">{content.event?.room || content.apparatus?.room || "—"}</Row>
              <Row label="Apparatus">{content.apparatus?.name || "—"}</Row>
              <Row label="Event days">
                {content.event?.firstDay ? printDays(content.event.firstDay, content.event.lastDay ?? "") : "—"}
                {content.event?.kind ? (
                  <span className="text-stone-600"> ({EVENT_KIND_LABELS[content.event.kind]})</span>
                ) : null}
              </Row>
              <Row label="Audience">
                {content.event?.audience
                  ? printAudience(AUDIENCE_LABELS[content.event.audience], content.event.audienceSize ?? 0)
                  : "—"}
              </Row>
              <Row label="Valid">
                <time dateTime={permit.validFrom}>{formatDate(permit.validFrom)}</time> to{" "}
                <time dateTime={permit.validTo}>{formatDate(permit.validTo)}</time>
                <span className="text-stone-600">
                  {" "}
                  ({inclusiveDays(permit.validFrom, permit.validTo)} days
                  {effectiveState === "active" ? `; ${left === 0 ? "last day today" : `${left + 1} days left`}` : ""})
                </span>
                {permit.validityReason && (
                  <span className="mt-0.5 block text-stone-700" data-testid="validity-reason">
                    Beyond the event days because: {permit.validityReason}
                  </span>
                )}
              </Row>
              <Row label="Responsible person">{formatPerson(content.event?.responsible)}</Row>
              <Row label="Operators">
                {content.event?.operators?.length
                  ? content.event.operators.map((o) => formatPerson(o)).join(", ")
                  : "—"}
              </Row>
              <Row label="Issued">
                <time dateTime={isoDate(permit.issuedAt)}>{formatDateTime(permit.issuedAt, timeZone)}</time>
              </Row>
              <Row label="Application">
                <Link href={`/applications/${application.id}`} className="text-ink-800 underline decoration-ink-300">
                  A-{application.seq}, revision {revision.revision}
                </Link>
              </Row>
              <Row label="Verification">
                <Link
                  href={`/verify/${permit.verificationCode}`}
                  className="text-ink-800 underline decoration-ink-300"
                  prefetch={false}
                >
                  Public status page
                </Link>
              </Row>
            </dl>
          </Card>

          <Card title="Conditions">
            {permit.conditions.length ? (
              <ul className="list-disc pl-5 text-sm text-stone-900" data-testid="permit-conditions">
                {permit.conditions.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            ) : (
              <p className="text-sm text-stone-600">No conditions beyond the controls of the application.</p>
            )}
          </Card>

          <Card title="Figures" description={`Tier rules ${revision.assessment.rulesVersion}.`}>
            <StatList>
              {figureRows(revision.assessment)
                .filter((f) => f.key !== "tier")
                .slice(0, 6)
                .map((f) => (
                  <Stat key={f.key} label={f.label} value={f.value} size="sm" />
                ))}
            </StatList>
          </Card>
        </div>

        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Signatures">
            <SignatureList
              timeZone={timeZone}
              items={found.signatures}
              empty="Self-certified: no signatures at this tier."
            />
            {seals.ok ? (
              <p className="mt-3 text-sm text-emerald-800">
                <span className="font-semibold">Signatures check out:</span> each seal, the signed content and this
                permit&rsquo;s dates and conditions agree.
              </p>
            ) : (
              <p
                role="alert"
                className="mt-3 rounded-md border-2 border-red-700 bg-red-50 px-3 py-2 text-sm text-stone-900"
              >
                <span className="font-semibold">The signatures do not check out.</span> {seals.reason} Do not rely on
                this permit; tell the safety office.
              </p>
            )}
          </Card>
          <PreUseCheckLog user={user} permitId={permit.id} />
          <Card title="Print" description="Post the permit at the bench and fix the bench card beside the apparatus.">
            <ul className="flex flex-col gap-2 text-sm" aria-label="Printable files">
              {(
                [
                  ["pdf", "Permit"],
                  ["bench-card", "Bench card"],
                  ["assessment", "Full assessment"],
                ] as const
              ).map(([path, name]) => (
                <li key={path} className="flex flex-wrap items-center gap-x-3 gap-y-1">
                  <span className="w-24 font-medium text-stone-900">{name}</span>
                  <a href={`/permits/${permit.id}/${path}`} className="text-ink-800 underline decoration-ink-300">
                    {name} (A4)
                  </a>
                  <a
                    href={`/permits/${permit.id}/${path}?size=letter`}
                    className="text-ink-800 underline decoration-ink-300"
                  >
                    {name} (US Letter)
                  </a>
                </li>
              ))}
            </ul>
          </Card>
          {mayRenew && (
            <Card title="Renew" description="Starts a new application from this permit; you give the new dates.">
              <RenewButton permitId={permit.id} />
            </Card>
          )}
          <PermitIncidents user={user} permitId={permit.id} />
          {mayRevoke && (
            <Card title="Revoke" description="The holder and the people named on the permit are told by e-mail.">
              <RevokeForm
                action={`/api/permits/${permit.id}/revoke`}
                version={permit.version}
                signing={await signingFor(user.id, `/permits/${permit.id}`)}
              />
            </Card>
          )}
        </div>
      </div>
    </>
  );
}
