import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { applicationRevisions, applications, decisions, permits } from "@/db/schema";
import { sealDecision } from "@/lib/records/seal";
import { writeAudit, type Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { conflict, forbidden, notFound } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import { STEP_ROLE_LABELS } from "@/lib/rules/chain";
import { revisionHash } from "@/lib/signing/canonical";
import { separationOfDuties } from "@/lib/signing/duties";
import { DECISION_MEANINGS } from "@/lib/signing/meanings";
import { verifySignerPassword, type SigningContext } from "@/lib/signing/password";
import type { RevokeBody } from "@/lib/permits/schemas";
import { activeEmails } from "@/lib/users/queries";
import { effectivePermitState } from "./dates";
import { institutionToday } from "./queries";

// Revocation is a signed decision on the revision the permit was issued for: the password is
// re-asked, then the permit's state, the decision row, the audit row and the outbox mail change in
// one transaction guarded by the permit's version.

/**
 * Revokes an active permit: a signed decision on the revision the permit was issued for. Only a
 * safety officer who is neither its holder nor named on its application may revoke it.
 */
export async function revokePermit(actor: CurrentUser, permitId: string, body: RevokeBody, ctx: SigningContext = {}) {
  const prepared = await prepareRevocation(actor, permitId, body, ctx);
  return db.transaction((tx) => applyRevocation(tx, actor, prepared, body));
}

export type PreparedRevocation = Awaited<ReturnType<typeof prepareRevocation>>;

/**
 * Every check of a revocation before anything is written: the permission, separation of duties, an
 * active permit at the version the signer saw, the revision's hash, then the signer's password.
 * Other domains that revoke as part of their own step (an incident report) call this, then
 * applyRevocation inside their own transaction, so the rules stay these.
 */
export async function prepareRevocation(
  actor: CurrentUser,
  permitId: string,
  body: RevokeBody,
  ctx: SigningContext = {},
) {
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
  return { row, contentHash, today, now };
}

/** Writes a prepared revocation in the caller's transaction: state, signed decision, audit, mail. */
export async function applyRevocation(
  tx: Tx,
  actor: CurrentUser,
  prepared: PreparedRevocation,
  body: Pick<RevokeBody, "expectedVersion" | "reason">,
) {
  const { row, contentHash, today, now } = prepared;
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
    .values(
      sealDecision({
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
      }),
    )
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
  const recipients = await activeEmails(tx, [row.permit.holderId, ...row.application.namedUserIds]);
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
}
