import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { applicationRevisions, applications, type Application, type Permit } from "@/db/schema";
import { writeAudit, type Tx } from "@/lib/audit";
import { conflict } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import { defaultValidity, eventDaysOf, widensEvent } from "@/lib/permits/dates";
import { issuePermit } from "@/lib/permits/actions";
import { institutionToday } from "@/lib/permits/queries";
import { approvalRequirements, audienceFactsOf, tierChain, type ChainRules } from "@/lib/rules/chain";
import { chainRulesFor, currentChainRules } from "@/lib/rules/queries";
import { activeEmails } from "@/lib/users/queries";
import { transition } from "./state";

// Where the review chain starts: on submission the application is bound to the chain rules in
// force, and a tier whose chain has no signers is self-certified at once. The signed decisions that
// follow are lib/review/decide.ts.

/**
 * Call inside the submitting transaction, right after the draft/returned → submitted transition.
 * Binds the application to the chain rules in force when it has none yet, and when its tier's chain
 * has no signers (tier 0 by default) records it as self-certified: approved at once, with a permit
 * for the event days. Returns the application as it now stands and the permit, if any.
 */
export async function afterSubmit(
  tx: Tx,
  application: Application,
  actor: { id: string; name: string },
  now: Date = new Date(),
): Promise<{ application: Application; permit: Permit | null }> {
  let current = application;
  if (current.chainRulesVersion === null) {
    const { version } = await currentChainRules(tx);
    const [row] = await tx
      .update(applications)
      .set({ chainRulesVersion: version })
      .where(and(eq(applications.id, current.id), isNull(applications.chainRulesVersion)))
      .returning();
    current = row ?? current;
  }
  if (current.state !== "submitted" || current.tier === null || !current.currentRevisionId) {
    return { application: current, permit: null };
  }
  const rules = await chainRulesFor(current.chainRulesVersion, tx);
  const chain = tierChain(rules, current.tier);
  if (chain.steps.length > 0) return { application: current, permit: null };
  return selfCertify(tx, current, rules, chain.validityDays, actor, now);
}

async function selfCertify(
  tx: Tx,
  application: Application,
  rules: ChainRules,
  validityDays: number,
  actor: { id: string; name: string },
  now: Date,
): Promise<{ application: Application; permit: Permit }> {
  const [revision] = await tx
    .select({
      id: applicationRevisions.id,
      tier: applicationRevisions.tier,
      contentHash: applicationRevisions.contentHash,
      content: applicationRevisions.content,
    })
    .from(applicationRevisions)
    .where(eq(applicationRevisions.id, application.currentRevisionId!));
  if (!revision) throw conflict("This application's submitted revision is missing.");
  const updated = await transition(tx, {
    applicationId: application.id,
    from: ["submitted"],
    to: "approved",
    expectedVersion: application.version,
    set: { waitingSince: null, decidedAt: now },
  });
  const today = await institutionToday(now, tx);
  // The event days, as for an approval; nobody signs here, so nothing may widen them.
  const event = eventDaysOf(revision.content);
  const { validFrom, validTo } = defaultValidity(event, validityDays, today);
  const validityReason = widensEvent({ validFrom, validTo }, event)
    ? "Recorded after the event's last day had passed in the institution's time zone."
    : null;
  const permit = await issuePermit(tx, {
    applicationId: application.id,
    revisionId: revision.id,
    holderId: application.applicantId,
    tier: revision.tier,
    validFrom,
    validTo,
    validityReason,
    // Nobody signs a signerless tier, so what the rules ask (the tier's and the audience's) is printed
    // as the permit's conditions for the holder to meet.
    conditions: approvalRequirements(rules, revision.tier, audienceFactsOf(revision.content)).map((r) => r.text),
    today,
    actor,
    now,
  });
  await writeAudit(tx, {
    actor,
    action: "application.self_certified",
    entityType: "application",
    entityId: application.id,
    data: {
      revisionId: revision.id,
      contentHash: revision.contentHash,
      tier: revision.tier,
      chainRulesVersion: application.chainRulesVersion,
      permitId: permit.id,
      permitNumber: permit.number,
    },
  });
  const applicant = await activeEmails(tx, [application.applicantId]);
  await queueMail(tx, applicant, {
    kind: "application_approved",
    data: {
      applicationId: application.id,
      permitId: permit.id,
      permitNumber: permit.number,
      title: application.title,
      validFrom,
      validTo,
    },
  });
  return { application: updated, permit };
}
