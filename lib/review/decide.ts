import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { isUniqueViolation } from "@/db/errors";
import {
  applicationRevisions,
  applications,
  decisions,
  type Application,
  type Decision,
  type Permit,
} from "@/db/schema";
import { canReadApplication } from "@/lib/applications/access";
import { transition } from "@/lib/applications/state";
import { sealDecision } from "@/lib/records/seal";
import { writeAudit, type DbOrTx, type Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { usersWithPermission } from "@/lib/auth/holders";
import { AppError, conflict, forbidden, invalidField, notFound } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import {
  addDays,
  defaultValidity,
  eventDaysOf,
  inclusiveDays,
  isIsoDay,
  widensEvent,
  type EventDays,
} from "@/lib/permits/dates";
import { issuePermit } from "@/lib/permits/actions";
import { institutionToday } from "@/lib/permits/queries";
import { approvalRequirements, audienceFactsOf, STEP_ROLE_LABELS, tierChain, type ChainRules } from "@/lib/rules/chain";
import { chainRulesFor } from "@/lib/rules/queries";
import { revisionHash } from "@/lib/signing/canonical";
import { DECISION_MEANINGS } from "@/lib/signing/meanings";
import { verifySignerPassword, type SigningContext } from "@/lib/signing/password";
import { activeEmails } from "@/lib/users/queries";
import { checkDecision, type ChainDecisionKind } from "./policy";
import { separationOfDuties } from "@/lib/signing/duties";
import type { DecisionBody } from "./schemas";
import { assertOperatorsTrained } from "./training";

// Signed decisions of the review chain. Each one is a single transaction: the guarded state
// transition (409 on a lost race), the decision row (unique per revision and step: a second
// signature of one step cannot exist), the permit on final approval, the audit row and the outbox
// mail. Approve and reject re-ask the signer's password first (lib/signing/password.ts).

function refuse(refusal: { status: 403 | 409; message: string }): AppError {
  return refusal.status === 409 ? conflict(refusal.message) : forbidden(refusal.message);
}

export type Loaded = {
  application: Application;
  revision: {
    id: string;
    revision: number;
    content: Record<string, unknown>;
    assessment: unknown;
    contentHash: string;
    submittedById: string;
    tier: number;
  };
  rules: ChainRules;
};

export async function loadForDecision(actor: CurrentUser, applicationId: string, tx: DbOrTx = db): Promise<Loaded> {
  const [application] = await tx.select().from(applications).where(eq(applications.id, applicationId));
  if (!application || !canReadApplication(actor, application)) throw notFound("That application");
  if (!application.currentRevisionId) throw conflict("This application has not been submitted.");
  const [revision] = await tx
    .select({
      id: applicationRevisions.id,
      revision: applicationRevisions.revision,
      content: applicationRevisions.content,
      assessment: applicationRevisions.assessment,
      contentHash: applicationRevisions.contentHash,
      submittedById: applicationRevisions.submittedById,
      tier: applicationRevisions.tier,
    })
    .from(applicationRevisions)
    .where(
      and(
        eq(applicationRevisions.id, application.currentRevisionId),
        eq(applicationRevisions.applicationId, application.id),
      ),
    );
  if (!revision) throw conflict("This application's submitted revision is missing.");
  const rules = await chainRulesFor(application.chainRulesVersion, tx);
  return { application, revision, rules };
}

export async function signerIdsOf(tx: DbOrTx, revisionId: string): Promise<string[]> {
  const rows = await tx
    .select({ signerId: decisions.signerId })
    .from(decisions)
    .where(eq(decisions.revisionId, revisionId));
  return rows.map((r) => r.signerId);
}

/** Those who give the final approval (the permission table's approvers), less `except`. */
async function approverEmails(tx: Tx, except: readonly string[]): Promise<string[]> {
  const rows = await usersWithPermission(tx, "permit.approve", "institution");
  return rows.filter((r) => !except.includes(r.id)).map((r) => r.email);
}

export type ValidityWindow = { validFrom: string; validTo: string; reason: string | null };

/**
 * The permit's window. By default the application's event days (from today at the earliest, cut to
 * the tier's longest validity: lib/permits/dates defaultValidity). The approver may narrow it freely;
 * a window reaching beyond the event days needs a reason, which is stored on the permit, printed, and
 * signed with the approval. Never longer than the tier's longest validity, never starting in the past.
 * Days are inclusive.
 */
export function validityWindow(
  input: { validFrom?: string; validTo?: string; validityReason?: string },
  validityDays: number,
  today: string,
  event: EventDays | null = null,
): ValidityWindow {
  const fallback = defaultValidity(event, validityDays, today);
  const validFrom = input.validFrom ?? fallback.validFrom;
  if (!isIsoDay(validFrom)) throw invalidField("validFrom", "Enter a real date (YYYY-MM-DD).");
  if (validFrom < today) throw invalidField("validFrom", "A permit cannot start before today.");
  if (validFrom > addDays(today, 365)) throw invalidField("validFrom", "A permit must start within a year.");
  const validTo =
    input.validTo ??
    (input.validFrom === undefined ? fallback.validTo : defaultValidity(event, validityDays, validFrom).validTo);
  if (!isIsoDay(validTo)) throw invalidField("validTo", "Enter a real date (YYYY-MM-DD).");
  if (validTo < validFrom) throw invalidField("validTo", "The last day is before the first day.");
  const days = inclusiveDays(validFrom, validTo);
  if (days > validityDays) {
    throw invalidField("validTo", `This tier allows at most ${validityDays} days; this window is ${days} days.`);
  }
  const reason = input.validityReason?.trim() ?? "";
  if (event && widensEvent({ validFrom, validTo }, event)) {
    if (!reason) {
      throw invalidField(
        "validityReason",
        `The event runs ${event.firstDay} to ${event.lastDay}. Give the reason for a window beyond those days.`,
      );
    }
    return { validFrom, validTo, reason };
  }
  return { validFrom, validTo, reason: null };
}

export type DecisionResult = { application: Application; decision: Decision; permit: Permit | null };

/** Records a decision of the review chain on the application's current revision. */
export async function decide(
  actor: CurrentUser,
  applicationId: string,
  body: DecisionBody,
  ctx: SigningContext = {},
): Promise<DecisionResult> {
  assertCan(actor, "application.review");
  const now = ctx.now ?? new Date();
  const loaded = await loadForDecision(actor, applicationId);
  const { application, revision, rules } = loaded;
  const policyInput = {
    actor,
    application,
    rules,
    submittedById: revision.submittedById,
    signerIds: await signerIdsOf(db, revision.id),
  };
  const options = checkDecision(policyInput, body.kind);
  if (!options.ok) throw refuse(options.refusal);
  if (body.expectedVersion !== application.version) {
    throw conflict("This application changed while you were working on it. Reload it and try again.");
  }
  // The hash signed is recomputed from the stored content, so a revision altered after submission
  // is refused rather than signed.
  const contentHash = revisionHash(revision.content, revision.assessment);
  if (contentHash !== revision.contentHash) {
    console.error(`[review] revision ${revision.id} does not match its stored content hash`);
    throw conflict("This revision's content does not match its recorded hash; it cannot be signed.");
  }

  const chain = tierChain(rules, revision.tier);
  let window: ValidityWindow | null = null;
  let conditions: string[] = [];
  let today = "";
  if (body.kind === "approve") {
    const confirmed = new Set(body.confirmedRequirements);
    // The tier's requirements and those the event's audience adds (rules.audience).
    const requirements = approvalRequirements(rules, revision.tier, audienceFactsOf(revision.content));
    const missing = requirements.filter((r) => !confirmed.has(r.id));
    if (missing.length > 0) {
      throw invalidField(
        "confirmedRequirements",
        `Confirm every requirement of this tier: ${missing.map((r) => r.text).join(" ")}`,
      );
    }
    today = await institutionToday(now);
    window = validityWindow(body, chain.validityDays, today, eventDaysOf(revision.content));
    conditions = [...requirements.map((r) => r.text), ...body.extraConditions];
    // Named operators' training, through the permit's last day (lib/review/training.ts).
    await assertOperatorsTrained(application, revision, window.validTo);
  }
  if (body.kind === "approve" || body.kind === "reject") await verifySignerPassword(actor, body.password, ctx);

  const step = options.step;
  const role = options.role;
  try {
    return await db.transaction(async (tx) => {
      const toState = { recommend: "in_review", return: "returned", approve: "approved", reject: "rejected" } as const;
      const updated = await transition(tx, {
        applicationId: application.id,
        from: ["submitted", "in_review"],
        to: toState[body.kind],
        expectedVersion: body.expectedVersion,
        set:
          body.kind === "recommend"
            ? { chainStep: step, waitingSince: now }
            : body.kind === "return"
              ? { chainStep: 0, waitingSince: now }
              : { chainStep: step, waitingSince: null, decidedAt: now },
      });
      // Holding the application's row lock now: no other decision on it can be in flight, so this
      // re-check of who signed sees every committed signature.
      const sod = separationOfDuties({ ...policyInput, signerIds: await signerIdsOf(tx, revision.id) });
      if (sod) throw refuse(sod);

      const [decision] = await tx
        .insert(decisions)
        .values(
          sealDecision({
            applicationId: application.id,
            revisionId: revision.id,
            kind: body.kind,
            step,
            signerId: actor.id,
            signerName: actor.name,
            signerRole: STEP_ROLE_LABELS[role],
            meaning: DECISION_MEANINGS[body.kind],
            contentHash,
            comment: body.comment || null,
            pinnedTo: body.kind === "return" ? body.pinnedTo || null : null,
            conditions: body.kind === "approve" ? conditions : null,
            validFrom: window?.validFrom ?? null,
            validTo: window?.validTo ?? null,
            validityReason: window?.reason ?? null,
            signedAt: now,
          }),
        )
        .returning();

      let permit: Permit | null = null;
      if (body.kind === "approve" && window) {
        permit = await issuePermit(tx, {
          applicationId: application.id,
          revisionId: revision.id,
          holderId: application.applicantId,
          tier: revision.tier,
          validFrom: window.validFrom,
          validTo: window.validTo,
          validityReason: window.reason,
          conditions,
          today,
          actor,
          now,
        });
      }

      await writeAudit(tx, {
        actor,
        action: `application.${PAST[body.kind]}`,
        entityType: "application",
        entityId: application.id,
        data: {
          decisionId: decision.id,
          revisionId: revision.id,
          revision: revision.revision,
          step,
          signerRole: decision.signerRole,
          contentHash,
          from: application.state,
          to: updated.state,
          ...(decision.pinnedTo ? { pinnedTo: decision.pinnedTo } : {}),
          ...(permit ? { permitId: permit.id, permitNumber: permit.number } : {}),
          ...(window ? { validFrom: window.validFrom, validTo: window.validTo, validityReason: window.reason } : {}),
        },
      });

      await notify(tx, body.kind, {
        application: updated,
        actor,
        comment: body.comment ?? "",
        permit,
        tier: revision.tier,
      });
      return { application: updated, decision, permit };
    });
  } catch (error) {
    // A concurrent signature of the same step lost on the unique key rather than the version guard.
    if (isUniqueViolation(error)) throw conflict("Someone else signed this step a moment ago. Reload to see it.");
    throw error;
  }
}

const PAST: Record<ChainDecisionKind, string> = {
  recommend: "recommended",
  return: "returned",
  approve: "approved",
  reject: "rejected",
};

async function notify(
  tx: Tx,
  kind: ChainDecisionKind,
  input: { application: Application; actor: CurrentUser; comment: string; permit: Permit | null; tier: number },
): Promise<void> {
  const { application, actor } = input;
  const applicant = await activeEmails(tx, [application.applicantId]);
  switch (kind) {
    case "return":
      await queueMail(tx, applicant, {
        kind: "application_returned",
        data: {
          applicationId: application.id,
          title: application.title,
          reviewerName: actor.name,
          comment: input.comment,
        },
      });
      return;
    case "recommend": {
      const officers = await approverEmails(tx, [application.applicantId, ...application.namedUserIds, actor.id]);
      await queueMail(tx, officers, {
        kind: "application_recommended",
        data: { applicationId: application.id, title: application.title, reviewerName: actor.name, tier: input.tier },
      });
      return;
    }
    case "approve":
      if (!input.permit) return;
      await queueMail(tx, applicant, {
        kind: "application_approved",
        data: {
          applicationId: application.id,
          permitId: input.permit.id,
          permitNumber: input.permit.number,
          title: application.title,
          validFrom: input.permit.validFrom,
          validTo: input.permit.validTo,
        },
      });
      return;
    case "reject":
      await queueMail(tx, applicant, {
        kind: "application_rejected",
        data: {
          applicationId: application.id,
          title: application.title,
          signerName: actor.name,
          comment: input.comment,
        },
      });
      return;
  }
}
