import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { applicationRevisions, applications, permitCounters, permits, type Permit } from "@/db/schema";
import { writeAudit, type Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { conflict, notFound } from "@/lib/http/errors";
import { effectivePermitState } from "./dates";
import { formatPermitNumber, newVerificationCode } from "./numbers";
import { permitPrefix } from "@/lib/settings/queries";
import { institutionToday } from "./queries";
import { renewalDraft } from "./renewal";

// Writes for permits: issuing one inside the approving transaction, and starting a renewal.
// (Revoking is a signed decision: ./revoke.ts.)

/**
 * The next number of `year`, taken inside the caller's transaction. The upsert locks the year's
 * counter row until the transaction ends, so concurrent approvals take numbers one after another;
 * a transaction that rolls back gives its number back. No gaps, no duplicates. The prefix is read
 * after the lock is held, so a permit takes the prefix in force when its number is drawn; the
 * sequence is per year whatever the prefix (HV-2026-0041 then LAB-2026-0042 after a change).
 */
export async function nextPermitNumber(tx: Tx, year: number): Promise<{ year: number; seq: number; number: string }> {
  const [row] = await tx
    .insert(permitCounters)
    .values({ year, last: 1 })
    .onConflictDoUpdate({ target: permitCounters.year, set: { last: sql`${permitCounters.last} + 1` } })
    .returning({ last: permitCounters.last });
  const prefix = await permitPrefix(tx);
  return { year, seq: row.last, number: formatPermitNumber(prefix, year, row.last) };
}

export type IssueInput = {
  applicationId: string;
  revisionId: string;
  holderId: string;
  tier: number;
  validFrom: string;
  validTo: string;
  /** Why the window reaches beyond the event days (null: it does not). */
  validityReason?: string | null;
  conditions: string[];
  /** The institution's calendar day of issue: its year numbers the permit. */
  today: string;
  actor: { id: string; name: string } | null;
  now: Date;
};

/** Creates the permit of an approved application (caller's transaction, which also audits the decision). */
export async function issuePermit(tx: Tx, input: IssueInput): Promise<Permit> {
  const { year, seq, number } = await nextPermitNumber(tx, Number(input.today.slice(0, 4)));
  const [permit] = await tx
    .insert(permits)
    .values({
      number,
      year,
      seq,
      applicationId: input.applicationId,
      revisionId: input.revisionId,
      holderId: input.holderId,
      tier: input.tier,
      validFrom: input.validFrom,
      validTo: input.validTo,
      validityReason: input.validityReason ?? null,
      conditions: input.conditions,
      verificationCode: newVerificationCode(),
      issuedAt: input.now,
    })
    .returning();
  await writeAudit(tx, {
    actor: input.actor,
    action: "permit.issued",
    entityType: "permit",
    entityId: permit.id,
    data: {
      number,
      applicationId: input.applicationId,
      revisionId: input.revisionId,
      tier: input.tier,
      validFrom: input.validFrom,
      validTo: input.validTo,
      validityReason: input.validityReason ?? null,
      conditions: input.conditions,
    },
  });
  return permit;
}

/**
 * Starts the renewal of a permit: a new draft application prefilled from the permit's revision
 * (lib/permits/renewal.ts: dates, confirmations, attestation and attachments to give again). The permit
 * then points at the draft, which stops its reminders. A renewal whose draft was withdrawn may be
 * started again.
 */
export async function renewPermit(actor: CurrentUser, permitId: string, now = new Date()) {
  assertCan(actor, "application.create");
  const today = await institutionToday(now);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({
        permit: {
          id: permits.id,
          number: permits.number,
          state: permits.state,
          validTo: permits.validTo,
          holderId: permits.holderId,
          version: permits.version,
          renewedByApplicationId: permits.renewedByApplicationId,
        },
        application: {
          id: applications.id,
          title: applications.title,
          departmentId: applications.departmentId,
          namedUserIds: applications.namedUserIds,
          apparatusId: applications.apparatusId,
          apparatusRevisionId: applications.apparatusRevisionId,
        },
        content: applicationRevisions.content,
        tier: applicationRevisions.tier,
      })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
      .where(eq(permits.id, permitId))
      .for("update", { of: permits });
    // Only the holder renews; anyone else learns nothing about the permit here.
    if (!row || row.permit.holderId !== actor.id) throw notFound("That permit");
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
