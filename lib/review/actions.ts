import "server-only";
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  applicationRevisions,
  applications,
  decisions,
  permits,
  users,
  type Application,
  type Decision,
  type Permit,
} from "@/db/schema";
import { writeAudit, type DbOrTx, type Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { verifyPassword } from "@/lib/auth/password";
import { checkThrottle, recordAttempt } from "@/lib/auth/throttle";
import { AppError, conflict, forbidden, notFound } from "@/lib/http/errors";
import { queueMail } from "@/lib/mail/outbox";
import { addDays, effectivePermitState, inclusiveDays, isIsoDay } from "@/lib/permits/dates";
import { issuePermit } from "@/lib/permits/actions";
import { institutionToday } from "@/lib/permits/queries";
import { STEP_ROLE_LABELS, tierChain, type ChainRules } from "@/lib/rules/chain";
import { chainRulesFor, currentChainRules } from "@/lib/rules/queries";
import { revisionHash } from "./canonical";
import { checkDecision, DECISION_MEANINGS, separationOfDuties, type ChainDecisionKind } from "./policy";
import type { DecisionBody, RevokeBody } from "./schemas";
import { transition } from "./state";
import { canReadApplication } from "@/lib/applications/access";

// Signed decisions. Each one is a single transaction: the guarded state transition (409 on a lost
// race), the decision row (unique per revision and step: a second signature of one step cannot
// exist), the permit on final approval, the audit row and the outbox mail. Approve, reject and revoke
// re-ask the signer's password first, outside the transaction so no lock waits on argon2.

/** Where a signature was given from, for throttling password guesses per address. */
export type SigningContext = { ip?: string; now?: Date };

const WRONG_PASSWORD = "The password is not correct.";

/**
 * Re-asks the signer's password (security.md: approve, reject and revoke). Failures count toward
 * the same throttle as sign-in, so a left-open session cannot be used to guess the password.
 */
export async function verifySignerPassword(
  actor: CurrentUser,
  password: string,
  ctx: SigningContext = {},
): Promise<void> {
  const ip = ctx.ip ?? "unknown";
  const email = actor.email.toLowerCase();
  const throttle = await checkThrottle(email, ip);
  if (throttle.limited) {
    throw new AppError("rate_limited", "Too many wrong passwords. Wait a little and try again.", {
      retryAfterSeconds: throttle.retryAfterSeconds,
    });
  }
  const [row] = await db
    .select({ passwordHash: users.passwordHash })
    .from(users)
    .where(and(eq(users.id, actor.id), isNull(users.disabledAt)));
  const ok = await verifyPassword(row?.passwordHash, password);
  if (!ok) {
    await recordAttempt(email, ip, false);
    throw new AppError("invalid", `password: ${WRONG_PASSWORD}`, {
      issues: [{ path: "password", message: WRONG_PASSWORD }],
    });
  }
}

function invalid(path: string, message: string): AppError {
  return new AppError("invalid", `${path}: ${message}`, { issues: [{ path, message }] });
}

function refuse(refusal: { status: 403 | 409; message: string }): AppError {
  return refusal.status === 409 ? conflict(refusal.message) : forbidden(refusal.message);
}

function isUniqueViolation(error: unknown): boolean {
  const e = error as { code?: string; cause?: { code?: string } };
  return e?.code === "23505" || e?.cause?.code === "23505";
}

type Loaded = {
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

async function loadForDecision(actor: CurrentUser, applicationId: string, tx: DbOrTx = db): Promise<Loaded> {
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

async function signerIdsOf(tx: DbOrTx, revisionId: string): Promise<string[]> {
  const rows = await tx
    .select({ signerId: decisions.signerId })
    .from(decisions)
    .where(eq(decisions.revisionId, revisionId));
  return rows.map((r) => r.signerId);
}

async function emailsOf(tx: Tx, ids: readonly string[]): Promise<string[]> {
  if (ids.length === 0) return [];
  const rows = await tx
    .select({ email: users.email })
    .from(users)
    .where(and(inArray(users.id, [...ids]), isNull(users.disabledAt)));
  return rows.map((r) => r.email);
}

async function safetyOfficerEmails(tx: Tx, except: readonly string[]): Promise<string[]> {
  const rows = await tx
    .select({ id: users.id, email: users.email })
    .from(users)
    .where(and(sql`'safety_officer' = ANY(${users.roles})`, isNull(users.disabledAt)));
  return rows.filter((r) => !except.includes(r.id)).map((r) => r.email);
}

export type ValidityWindow = { validFrom: string; validTo: string };

/**
 * The permit's window: by default from today for the tier's longest validity; an approver may start
 * it later (up to a year ahead) or end it sooner, never make it longer. Days are inclusive.
 */
export function validityWindow(
  input: { validFrom?: string; validTo?: string },
  validityDays: number,
  today: string,
): ValidityWindow {
  const validFrom = input.validFrom ?? today;
  if (!isIsoDay(validFrom)) throw invalid("validFrom", "Enter a real date (YYYY-MM-DD).");
  if (validFrom < today) throw invalid("validFrom", "A permit cannot start before today.");
  if (validFrom > addDays(today, 365)) throw invalid("validFrom", "A permit must start within a year.");
  const validTo = input.validTo ?? addDays(validFrom, validityDays - 1);
  if (!isIsoDay(validTo)) throw invalid("validTo", "Enter a real date (YYYY-MM-DD).");
  if (validTo < validFrom) throw invalid("validTo", "The last day is before the first day.");
  const days = inclusiveDays(validFrom, validTo);
  if (days > validityDays) {
    throw invalid("validTo", `This tier allows at most ${validityDays} days; this window is ${days} days.`);
  }
  return { validFrom, validTo };
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
    const missing = chain.requirements.filter((r) => !confirmed.has(r.id));
    if (missing.length > 0) {
      throw invalid(
        "confirmedRequirements",
        `Confirm every requirement of this tier: ${missing.map((r) => r.text).join(" ")}`,
      );
    }
    today = await institutionToday(now);
    window = validityWindow(body, chain.validityDays, today);
    conditions = [...chain.requirements.map((r) => r.text), ...body.extraConditions];
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
        .values({
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
          signedAt: now,
        })
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
  const applicant = await emailsOf(tx, [application.applicantId]);
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
      const officers = await safetyOfficerEmails(tx, [application.applicantId, ...application.namedUserIds, actor.id]);
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

/**
 * Revokes an active permit: a signed decision on the revision the permit was issued for. Only a
 * safety officer who is neither its holder nor named on its application may revoke it.
 */
export async function revokePermit(actor: CurrentUser, permitId: string, body: RevokeBody, ctx: SigningContext = {}) {
  assertCan(actor, "permit.revoke");
  const now = ctx.now ?? new Date();
  const [row] = await db
    .select({
      permit: {
        id: permits.id,
        number: permits.number,
        state: permits.state,
        validTo: permits.validTo,
        version: permits.version,
        holderId: permits.holderId,
        revisionId: permits.revisionId,
      },
      application: {
        id: applications.id,
        title: applications.title,
        applicantId: applications.applicantId,
        namedUserIds: applications.namedUserIds,
      },
      revision: {
        content: applicationRevisions.content,
        assessment: applicationRevisions.assessment,
        contentHash: applicationRevisions.contentHash,
      },
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(eq(permits.id, permitId));
  if (!row) throw notFound("That permit");
  const sod = separationOfDuties({
    actor,
    application: row.application,
    submittedById: row.permit.holderId,
    signerIds: [],
  });
  if (sod) throw forbidden(sod.message.replace("decide on it", "revoke its permit"));
  const today = await institutionToday(now);
  const state = effectivePermitState(row.permit, today);
  if (state !== "active") throw conflict(`Only an active permit can be revoked; this one is ${state}.`);
  if (body.expectedVersion !== row.permit.version) {
    throw conflict("This permit changed while you were working on it. Reload it and try again.");
  }
  const contentHash = revisionHash(row.revision.content, row.revision.assessment);
  if (contentHash !== row.revision.contentHash)
    throw conflict("The permit's revision does not match its recorded hash.");
  await verifySignerPassword(actor, body.password, ctx);

  return db.transaction(async (tx) => {
    const [updated] = await tx
      .update(permits)
      .set({
        state: "revoked",
        revokedAt: now,
        revokedById: actor.id,
        revokedReason: body.reason,
        version: sql`${permits.version} + 1`,
        updatedAt: now,
      })
      .where(
        and(
          eq(permits.id, row.permit.id),
          eq(permits.state, "active"),
          eq(permits.version, body.expectedVersion),
          sql`${permits.validTo} >= ${today}::date`,
        ),
      )
      .returning();
    if (!updated) throw conflict("This permit changed while you were working on it. Reload it and try again.");
    const [decision] = await tx
      .insert(decisions)
      .values({
        applicationId: row.application.id,
        revisionId: row.permit.revisionId,
        kind: "revoke",
        step: null,
        signerId: actor.id,
        signerName: actor.name,
        signerRole: STEP_ROLE_LABELS.safety_officer,
        meaning: DECISION_MEANINGS.revoke,
        contentHash,
        comment: body.reason,
        signedAt: now,
      })
      .returning();
    await writeAudit(tx, {
      actor,
      action: "permit.revoked",
      entityType: "permit",
      entityId: updated.id,
      data: {
        number: updated.number,
        decisionId: decision.id,
        reason: body.reason,
        applicationId: row.application.id,
        contentHash,
      },
    });
    const recipients = await emailsOf(tx, [row.permit.holderId, ...row.application.namedUserIds]);
    await queueMail(tx, recipients, {
      kind: "permit_revoked",
      data: {
        permitId: updated.id,
        permitNumber: updated.number,
        title: row.application.title,
        reason: body.reason,
        signerName: actor.name,
      },
    });
    return { permit: updated, decision };
  });
}

/**
 * Call inside the submitting transaction, right after the draft/returned → submitted transition.
 * Binds the application to the chain rules in force when it has none yet, and when its tier's chain
 * has no signers (tier 0 by default) records it as self-certified: approved at once, with a permit
 * for the tier's longest validity. Returns the application as it now stands and the permit, if any.
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
  return selfCertify(tx, current, chain.validityDays, actor, now);
}

async function selfCertify(
  tx: Tx,
  application: Application,
  validityDays: number,
  actor: { id: string; name: string },
  now: Date,
): Promise<{ application: Application; permit: Permit }> {
  const [revision] = await tx
    .select({
      id: applicationRevisions.id,
      tier: applicationRevisions.tier,
      contentHash: applicationRevisions.contentHash,
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
  const validFrom = today;
  const validTo = addDays(today, validityDays - 1);
  const permit = await issuePermit(tx, {
    applicationId: application.id,
    revisionId: revision.id,
    holderId: application.applicantId,
    tier: revision.tier,
    validFrom,
    validTo,
    conditions: [],
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
  const applicant = await emailsOf(tx, [application.applicantId]);
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
