import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { ButtonLink } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { AboutFigures } from "@/app/_components/about-figures";
import { formatDateTime, isoDate } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { StateBadge } from "@/app/_components/state-badge";
import { isTier } from "@/app/_components/tier";
import { TierBadge } from "@/app/_components/tier-badge";
import { pinLabel, pinOptions } from "@/lib/applications/pins";
import { requirePageUser } from "@/lib/auth/guards";
import { defaultValidity, eventDaysOf, todayIn } from "@/lib/permits/dates";
import { institutionTimeZone } from "@/lib/settings/queries";
import { getApplicationRecord } from "@/lib/review/queries";
import { repliesFor } from "@/lib/review/replies";
import { approvalRequirements, audienceFactsOf, describeChain, STEP_ROLE_LABELS, tierChain } from "@/lib/rules/chain";
import type { ApplicationContent } from "@/lib/applications/schemas";
import { SignatureList } from "@/app/_components/signature-list";
import { ContentSummary } from "./_components/content-summary";
import { signingFor } from "@/lib/signing/password";
import { DecisionPanel } from "./_components/decision-panel";
import { OperatorTraining } from "./_components/operator-training";
import { trainingCheck } from "@/lib/review/training";
import { RevisionDiff } from "./_components/revision-diff";
import { Timeline } from "./_components/timeline";

export const metadata: Metadata = { title: "Application" };

const SIGNED_TEXT = {
  recommend: "Your recommendation is signed and recorded.",
  return: "Returned to the applicant with your comment. It is signed and recorded.",
  approve: "Your approval is signed and recorded.",
  reject: "Your rejection is signed and recorded.",
} as const;

export default async function ApplicationPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ signed?: string | string[] }>;
}) {
  const { id } = await params;
  const { signed } = await searchParams;
  const signedKind = typeof signed === "string" && signed in SIGNED_TEXT ? (signed as keyof typeof SIGNED_TEXT) : null;
  const user = await requirePageUser(undefined, `/applications/${id}`);
  if (!z.uuid().safeParse(id).success) notFound();
  const record = await getApplicationRecord(user, id);
  if (!record) notFound();
  // A draft is read and changed in the form; this page is for submitted applications.
  if (record.application.state === "draft" && record.application.applicantId === user.id) {
    redirect(`/applications/${id}/edit`);
  }
  const { application, current, previous, diff, options, pending, permit, rules } = record;
  const content = (current?.content ?? application.draft) as Partial<ApplicationContent>;
  const tier = current?.tier ?? application.tier;
  const chain = isTier(tier) ? tierChain(rules, tier) : null;
  // The tier's requirements and those the event's audience adds: the approver confirms them all.
  const requirements = isTier(tier) ? approvalRequirements(rules, tier, audienceFactsOf(content)) : [];
  const comments = record.decisions.filter((d) => d.comment && d.kind !== "revoke");
  const [replies, timeZone] = await Promise.all([
    comments.length > 0 ? repliesFor(user, application.id) : [],
    institutionTimeZone(),
  ]);
  const revisionNumber = new Map(record.revisions.map((r) => [r.id, r.revision]));
  // Named operators' training through the permit's last day: the issued permit's, else the proposed one.
  const training =
    current && chain
      ? await trainingCheck(
          application,
          current,
          permit?.validTo ??
            defaultValidity(eventDaysOf(current.content), chain.validityDays, todayIn(timeZone)).validTo,
        )
      : null;

  let panel: React.ReactNode = null;
  if (options?.ok && chain) {
    const today = todayIn(timeZone);
    const eventDays = eventDaysOf(current?.content);
    const window = defaultValidity(eventDays, chain.validityDays, today);
    panel = (
      <Card
        title="Sign a decision"
        description={`On revision ${current?.revision}. Your name, role and the time are recorded with it.`}
      >
        <DecisionPanel
          applicationId={application.id}
          version={application.version}
          allowed={options.allowed}
          stepLabel={`Step ${options.step} of ${chain.steps.length}: ${STEP_ROLE_LABELS[options.role]}${options.final ? " (final approval)" : ""}.`}
          requirements={options.final ? requirements : []}
          validityDays={chain.validityDays}
          defaultValidFrom={window.validFrom}
          defaultValidTo={window.validTo}
          eventDays={eventDays}
          pinOptions={pinOptions(content)}
          signing={await signingFor(user.id, `/applications/${application.id}`)}
          trainingHold={options.final && training && training.open.length > 0 ? training.open.length : 0}
        />
      </Card>
    );
  }

  return (
    <>
      <PageHeader
        eyebrow={
          <>
            <span className="figure">A-{application.seq}</span> · {record.departmentName}
          </>
        }
        title={application.title || content.event?.title || "Untitled application"}
        description={
          <>
            Applicant: {record.applicantName}
            {current && (
              <>
                {" "}
                · revision {current.revision}, submitted{" "}
                <time dateTime={isoDate(current.submittedAt)}>{formatDateTime(current.submittedAt, timeZone)}</time>
              </>
            )}
          </>
        }
        actions={
          <>
            <StateBadge kind="application" state={application.state} />
            {isTier(tier) && <TierBadge tier={tier} />}
            {permit && (
              <ButtonLink href={`/permits/${permit.id}`} variant="secondary" size="sm">
                Permit {permit.number}
              </ButtonLink>
            )}
          </>
        }
      />

      <AboutFigures className="mb-6" />

      {signedKind && (
        // Shown after the panel's redirect; the panel itself is gone once nothing waits for this signer.
        <Alert tone="success" title="Decision recorded" live className="mb-6">
          {SIGNED_TEXT[signedKind]}
          {signedKind === "approve" && permit && (
            <>
              {" "}
              <Link href={`/permits/${permit.id}`} className="font-medium underline">
                Permit {permit.number}
              </Link>{" "}
              is issued.
            </>
          )}
        </Alert>
      )}

      {application.state === "returned" && (
        <Alert tone="warn" title="Returned for changes" className="mb-6">
          The applicant edits it into a new revision and submits it again.{" "}
          {user.id === application.applicantId && (
            <Link href={`/applications/${application.id}/edit`} className="font-medium underline">
              Edit the application
            </Link>
          )}
        </Alert>
      )}
      {pending && !options?.ok && (
        <p className="mb-6 text-sm text-stone-700">
          Waiting for step {pending.step} of {pending.total}: {STEP_ROLE_LABELS[pending.role]}
          {pending.role === "reviewer" ? ` of ${record.departmentName}` : ""}.
          {options && !options.ok && options.refusal.status === 403 && (
            <span className="text-stone-600"> {options.refusal.message}</span>
          )}
        </p>
      )}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="flex min-w-0 flex-col gap-6">
          {panel}
          {training && (
            <OperatorTraining
              check={training}
              timeZone={timeZone}
              exception={
                options?.ok && options.final ? { applicationId: application.id, version: application.version } : null
              }
            />
          )}
          {diff && previous && current && (
            <RevisionDiff entries={diff} from={previous.revision} to={current.revision} />
          )}
          {current ? (
            <ContentSummary
              applicationId={application.id}
              content={content}
              assessment={current.assessment}
              revision={current.revision}
            />
          ) : (
            <Card title="Not submitted yet">
              <p className="text-sm text-stone-700">This application is a draft; it has no submitted revision.</p>
            </Card>
          )}
        </div>

        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Review chain" description={chain ? `Tier ${tier}: ${describeChain(chain)}.` : undefined}>
            {chain && (
              <dl className="flex flex-col gap-1 text-sm">
                <div className="flex justify-between gap-3">
                  <dt className="text-stone-600">Longest validity</dt>
                  <dd className="figure">{chain.validityDays} days</dd>
                </div>
                <div className="flex justify-between gap-3">
                  <dt className="text-stone-600">Chain rules</dt>
                  <dd>version {application.chainRulesVersion ?? 0}</dd>
                </div>
                {requirements.length > 0 && (
                  <div>
                    <dt className="text-stone-600">Conditions the approver confirms</dt>
                    <dd>
                      <ul className="mt-1 list-disc pl-5">
                        {requirements.map((r) => (
                          <li key={r.id}>{r.text}</li>
                        ))}
                      </ul>
                    </dd>
                  </div>
                )}
              </dl>
            )}
          </Card>

          <Card title="Signatures">
            <SignatureList
              timeZone={timeZone}
              items={record.decisions.map((d) => ({ ...d, revision: revisionNumber.get(d.revisionId) }))}
              empty={
                application.state === "approved" && !record.decisions.length
                  ? "Self-certified: no signatures at this tier."
                  : "No signatures yet."
              }
            />
          </Card>

          {comments.length > 0 && (
            <Card title="Comments">
              <ul className="flex flex-col gap-3">
                {comments.map((c) => (
                  <li key={c.id} className="text-sm">
                    <p className="whitespace-pre-line text-stone-900">{c.comment}</p>
                    <p className="text-xs text-stone-600">
                      {c.signerName} ({c.signerRole}) on revision {revisionNumber.get(c.revisionId)}
                      {c.pinnedTo && <> · about {pinLabel(c.pinnedTo, content)}</>}
                    </p>
                    {replies
                      .filter((r) => r.decisionId === c.id)
                      .map((r) => (
                        <div key={r.id} className="mt-1 border-l-2 border-stone-300 pl-3" data-testid="comment-reply">
                          <p className="whitespace-pre-line text-stone-900">{r.body}</p>
                          <p className="text-xs text-stone-600">
                            Reply by {r.authorName},{" "}
                            <time dateTime={isoDate(r.createdAt)}>{formatDateTime(r.createdAt, timeZone)}</time>
                          </p>
                        </div>
                      ))}
                  </li>
                ))}
              </ul>
            </Card>
          )}

          <Card title="Revisions">
            {record.revisions.length === 0 ? (
              <p className="text-sm text-stone-600">None yet.</p>
            ) : (
              <ol className="flex flex-col gap-2 text-sm">
                {record.revisions.map((r) => (
                  <li key={r.id}>
                    <p className="text-stone-900">
                      Revision {r.revision}
                      {r.id === application.currentRevisionId && <span className="text-stone-600"> (current)</span>}
                    </p>
                    <p className="text-xs text-stone-600">
                      {r.submittedByName} ·{" "}
                      <time dateTime={isoDate(r.submittedAt)}>{formatDateTime(r.submittedAt, timeZone)}</time>
                    </p>
                    <p className="figure text-xs break-all text-stone-600">SHA-256 {r.contentHash}</p>
                  </li>
                ))}
              </ol>
            )}
          </Card>

          <Card title="Timeline">
            <Timeline events={record.audit} timeZone={timeZone} />
          </Card>
        </div>
      </div>
    </>
  );
}
