import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { applications, permits } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { conflict } from "@/lib/errors";
import { effectivePermitState } from "@/lib/permits/dates";
import { lockHeldPermit } from "@/lib/permits/held";
import { institutionToday } from "@/lib/permits/queries";
import { renewalDraft } from "./renewal";

// Renewing a permit is starting a new application from the permit's revision.

/**
 * Starts the renewal of a permit: a new draft application prefilled from the permit's revision
 * (./renewal.ts: dates, confirmations, attestation and attachments to give again). The permit
 * then points at the draft, which stops its reminders. A renewal whose draft was withdrawn may be
 * started again.
 */
export async function renewPermit(actor: CurrentUser, permitId: string, now = new Date()) {
  assertCan(actor, "application.create");
  const today = await institutionToday(now);
  return db.transaction(async (tx) => {
    const row = await lockHeldPermit(tx, actor, permitId);
    if (effectivePermitState(row.permit, today) === "revoked") {
      throw conflict("A revoked permit cannot be renewed. Start a new application instead.");
    }
    if (row.permit.renewedByApplicationId) {
      const [earlier] = await tx
        .select({ state: applications.state })
        .from(applications)
        .where(eq(applications.id, row.permit.renewedByApplicationId));
      if (earlier && earlier.state !== "withdrawn") {
        throw conflict("This permit is already being renewed.");
      }
    }
    const [created] = await tx
      .insert(applications)
      .values({
        title: row.application.title,
        applicantId: actor.id,
        departmentId: row.application.departmentId,
        state: "draft",
        draft: renewalDraft(row.content, row.application.title),
        draftStep: 1,
        namedUserIds: row.application.namedUserIds,
        apparatusId: row.application.apparatusId,
        apparatusRevisionId: row.application.apparatusRevisionId,
        tier: row.tier,
        renewalOfPermitId: row.permit.id,
        createdAt: now,
        updatedAt: now,
      })
      .returning({ id: applications.id, seq: applications.seq, title: applications.title });
    const [updated] = await tx
      .update(permits)
      .set({ renewedByApplicationId: created.id, version: sql`${permits.version} + 1`, updatedAt: now })
      .where(and(eq(permits.id, row.permit.id), eq(permits.version, row.permit.version)))
      .returning({ id: permits.id });
    if (!updated) throw conflict("This permit changed while you were working on it. Reload it and try again.");
    await writeAudit(tx, {
      actor,
      action: "application.created",
      entityType: "application",
      entityId: created.id,
      data: { renewalOfPermitId: row.permit.id, permitNumber: row.permit.number },
    });
    await writeAudit(tx, {
      actor,
      action: "permit.renewal_started",
      entityType: "permit",
      entityId: row.permit.id,
      data: { applicationId: created.id },
    });
    return { application: created, permitId: row.permit.id };
  });
}
