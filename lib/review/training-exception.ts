import "server-only";
import { db } from "@/db";
import { trainingExceptions } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { conflict, forbidden } from "@/lib/errors";
import { eventDaysOf } from "@/lib/permits/dates";
import { institutionToday } from "@/lib/permits/queries";
import { sealTrainingException } from "@/lib/records/training-seal";
import { STEP_ROLE_LABELS, tierChain } from "@/lib/rules/chain";
import { revisionHash } from "@/lib/signing/canonical";
import { separationOfDuties } from "@/lib/signing/duties";
import { verifySignerPassword, type SigningContext } from "@/lib/signing/password";
import type { TrainingExceptionBody } from "@/lib/training/schemas";
import { loadForDecision, signerIdsOf, validityWindow } from "./decide";
import { decisionOptions } from "./policy";
import { trainingCheck } from "./training";

// A training exception: the final approver records that named operators whose required course is
// lapsed or missing may operate under this revision's permit, and why. Signed like a decision: only
// the person who may give the final approval now (same policy: nobody on their own application or one
// they are named on), with their password re-asked, sealed with DECISION_HMAC_KEY
// (lib/records/training-seal.ts), with its audit row in the same transaction. It covers the gaps found
// at that moment (person and course); a gap that appears later needs a new one.

export const TRAINING_EXCEPTION_MEANING =
  "Training exception: the approver accepts that the named operators listed may operate under this permit without the current training listed, for the reason given.";

export async function recordTrainingException(
  actor: CurrentUser,
  applicationId: string,
  body: TrainingExceptionBody,
  ctx: SigningContext = {},
) {
  assertCan(actor, "permit.approve");
  const now = ctx.now ?? new Date();
  const { application, revision, rules } = await loadForDecision(actor, applicationId);
  const policyInput = {
    actor,
    application,
    rules,
    submittedById: revision.submittedById,
    signerIds: await signerIdsOf(db, revision.id),
  };
  const options = decisionOptions(policyInput);
  if (!options.ok)
    throw options.refusal.status === 409 ? conflict(options.refusal.message) : forbidden(options.refusal.message);
  if (!options.final) throw forbidden("A training exception is recorded by the final approver, at the last step.");
  if (body.expectedVersion !== application.version) {
    throw conflict("This application changed while you were working on it. Reload it and try again.");
  }
  const contentHash = revisionHash(revision.content, revision.assessment);
  if (contentHash !== revision.contentHash) {
    throw conflict("This revision's content does not match its recorded hash; it cannot be signed.");
  }
  const today = await institutionToday(now);
  const chain = tierChain(rules, revision.tier);
  // The permit's last day as the approver means to set it (the default window unless given). The
  // reason a window beyond the event days needs is asked with the approval itself, not here.
  const window = validityWindow(
    { validTo: body.validTo, validityReason: "exception" },
    chain.validityDays,
    today,
    eventDaysOf(revision.content),
  );
  const check = await trainingCheck(application, revision, window.validTo);
  if (check.open.length === 0) {
    throw conflict(
      check.gaps.length === 0
        ? `Every named operator's training is current through ${window.validTo}: there is nothing to except.`
        : "An exception already covers every lapsed or missing course on this revision.",
    );
  }
  await verifySignerPassword(actor, body.password, ctx);

  return db.transaction(async (tx) => {
    // Holding no application lock: re-check separation of duties against committed signatures.
    const sod = separationOfDuties({ ...policyInput, signerIds: await signerIdsOf(tx, revision.id) });
    if (sod) throw forbidden(sod.message);
    const [row] = await tx
      .insert(trainingExceptions)
      .values(
        sealTrainingException({
          applicationId: application.id,
          revisionId: revision.id,
          throughDay: window.validTo,
          gaps: check.open,
          reason: body.reason,
          signerId: actor.id,
          signerName: actor.name,
          signerRole: STEP_ROLE_LABELS[options.role],
          meaning: TRAINING_EXCEPTION_MEANING,
          contentHash,
          signedAt: now,
        }),
      )
      .returning();
    await writeAudit(tx, {
      actor,
      action: "application.training_exception",
      entityType: "application",
      entityId: application.id,
      data: {
        exceptionId: row.id,
        revisionId: revision.id,
        revision: revision.revision,
        throughDay: window.validTo,
        gaps: check.open,
        reason: body.reason,
        contentHash,
      },
    });
    return row;
  });
}
