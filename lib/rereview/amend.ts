import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, apparatusRevisions, applications, permitApparatusChanges } from "@/db/schema";
import { canReadApparatus } from "@/lib/apparatus/access";
import { setupToText } from "@/lib/apparatus/setup-text";
import { draftFromContent } from "@/lib/applications/renewal";
import { applicationContentSchema } from "@/lib/applications/schemas";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { conflict } from "@/lib/errors";
import { assessSetup } from "@/lib/hazard";
import { currentTierRules } from "@/lib/hazard-rules";
import { effectivePermitState } from "@/lib/permits/dates";
import { lockHeldPermit } from "@/lib/permits/held";
import { institutionToday } from "@/lib/permits/queries";

// An amendment: after the apparatus under an active permit changed, its holder starts a new
// application pre-filled from the permit — the same event, people and controls — with the
// apparatus's current revision in place of the approved one. It goes through the normal review chain
// (the new tier decides the chain) and is linked to the permit it amends; the permit itself stays as
// approved until it lapses or an officer revokes it.

/** States in which an amendment is still open or done: another one may not be started beside it. */
const AMENDMENT_HELD = ["draft", "submitted", "in_review", "returned", "approved"] as const;

export async function amendPermit(actor: CurrentUser, permitId: string, now = new Date()) {
  assertCan(actor, "application.create");
  const today = await institutionToday(now);
  const rules = await currentTierRules();
  return db.transaction(async (tx) => {
    // Two clicks of "Start an amendment" queue on the lock; the second then finds the first's draft.
    const row = await lockHeldPermit(tx, actor, permitId);
    if (effectivePermitState(row.permit, today) !== "active") {
      throw conflict("Only an active permit can be amended. Start a new application instead.");
    }
    const [change] = await tx
      .select({ id: permitApparatusChanges.id })
      .from(permitApparatusChanges)
      .where(eq(permitApparatusChanges.permitId, permitId))
      .limit(1);
    if (!change || !row.application.apparatusId) {
      throw conflict("The apparatus has not changed since this permit was approved: there is nothing to amend.");
    }
    const [held] = await tx
      .select({ id: applications.id, seq: applications.seq })
      .from(applications)
      .where(and(eq(applications.amendmentOfPermitId, permitId), inArray(applications.state, [...AMENDMENT_HELD])))
      .orderBy(desc(applications.createdAt))
      .limit(1);
    if (held) throw conflict(`This permit is already being amended: application A-${held.seq}.`);

    const [current] = await tx
      .select({
        ownerId: apparatus.ownerId,
        departmentId: apparatus.departmentId,
        revisionId: apparatusRevisions.id,
        revision: apparatusRevisions.revision,
        name: apparatusRevisions.name,
        room: apparatusRevisions.room,
        notes: apparatusRevisions.notes,
        setup: apparatusRevisions.setup,
      })
      .from(apparatus)
      .innerJoin(
        apparatusRevisions,
        and(
          eq(apparatusRevisions.apparatusId, apparatus.id),
          eq(apparatusRevisions.revision, apparatus.currentRevision),
        ),
      )
      .where(eq(apparatus.id, row.application.apparatusId));
    if (!current || !canReadApparatus(actor, current)) {
      throw conflict("The changed apparatus is not in your registry any more; start a new application instead.");
    }

    const parsed = applicationContentSchema.safeParse(row.content);
    if (!parsed.success) throw conflict("This permit's application cannot be read back into the form.");
    // Same event and people; every control to be confirmed again, since the tier may have moved.
    const draft = draftFromContent(parsed.data, { clearDates: false, clearConfirmations: true });
    draft.apparatus = {
      apparatusId: row.application.apparatusId,
      apparatusRevisionId: current.revisionId,
      name: current.name,
      room: current.room,
      notes: current.notes,
      setup: setupToText(current.setup),
    };
    const tier = assessSetup(current.setup, rules).tier;
    const [created] = await tx
      .insert(applications)
      .values({
        title: row.application.title,
        applicantId: actor.id,
        departmentId: row.application.departmentId,
        state: "draft",
        draft,
        draftStep: 1,
        namedUserIds: row.application.namedUserIds,
        apparatusId: row.application.apparatusId,
        apparatusRevisionId: current.revisionId,
        tier,
        amendmentOfPermitId: permitId,
        createdAt: now,
        updatedAt: now,
      })
      .returning({ id: applications.id, seq: applications.seq, title: applications.title });
    await writeAudit(tx, {
      actor,
      action: "application.created",
      entityType: "application",
      entityId: created.id,
      data: {
        amendmentOfPermitId: permitId,
        permitNumber: row.permit.number,
        apparatusRevision: current.revision,
        apparatusRevisionId: current.revisionId,
      },
    });
    await writeAudit(tx, {
      actor,
      action: "permit.amendment_started",
      entityType: "permit",
      entityId: permitId,
      data: { applicationId: created.id, apparatusRevision: current.revision },
    });
    return { application: { ...created, tier }, permitId };
  });
}
