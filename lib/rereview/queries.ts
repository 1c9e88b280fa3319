import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  apparatusRevisions,
  applicationRevisions,
  applications,
  permitApparatusChanges,
  permits,
  users,
} from "@/db/schema";
import { can, type CurrentUser } from "@/lib/auth/guards";
import type { Assessment } from "@/lib/hazard";
import { effectivePermitState } from "@/lib/permits/dates";
import { institutionToday, permitScope } from "@/lib/permits/queries";
import type { DiffEntry } from "@/lib/review/diff";
import { apparatusChangeDiff } from "./diff";

// Reads for the "apparatus changed since approval" banner (permit page) and the holder's dashboard.
// Visibility is the permit's (permitScope): whoever may see the permit sees its changes.

export type ApparatusChangeView = {
  permitId: string;
  permitNumber: string;
  permitState: "active" | "expired" | "revoked";
  permitTier: number;
  holderId: string;
  apparatusName: string;
  /** The registry revision the permit's application used (null when it was not read back). */
  approvedRevision: number | null;
  /** Every revision saved under the permit, oldest first. */
  revisions: { revision: number; tier: number; changedAt: Date; changedByName: string }[];
  /** The newest revision's tier under the engine and rules in force when it was saved. */
  tier: number;
  rulesVersion: string;
  engineVersion: string;
  changes: DiffEntry[];
  amendment: { id: string; seq: number; state: string } | null;
  /** The holder may start an amendment now (active, none open). */
  mayAmend: boolean;
};

/** The apparatus changes under one permit, or null when there are none or the permit is not visible. */
export async function apparatusChangeForPermit(
  user: CurrentUser,
  permitId: string,
  now = new Date(),
): Promise<ApparatusChangeView | null> {
  const rows = await db
    .select({
      revision: permitApparatusChanges.revision,
      tier: permitApparatusChanges.tier,
      changedAt: permitApparatusChanges.createdAt,
      changedByName: users.name,
      apparatusRevisionId: permitApparatusChanges.apparatusRevisionId,
    })
    .from(permitApparatusChanges)
    .innerJoin(users, eq(users.id, permitApparatusChanges.changedById))
    .where(eq(permitApparatusChanges.permitId, permitId))
    .orderBy(asc(permitApparatusChanges.revision));
  if (rows.length === 0) return null;

  const [permit] = await db
    .select({
      id: permits.id,
      number: permits.number,
      state: permits.state,
      validTo: permits.validTo,
      tier: permits.tier,
      holderId: permits.holderId,
      content: applicationRevisions.content,
      assessment: applicationRevisions.assessment,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(and(eq(permits.id, permitId), permitScope(user)))
    .limit(1);
  if (!permit) return null;

  const newest = rows[rows.length - 1];
  const [revision] = await db
    .select({
      name: apparatusRevisions.name,
      room: apparatusRevisions.room,
      notes: apparatusRevisions.notes,
      setup: apparatusRevisions.setup,
      assessment: apparatusRevisions.assessment,
    })
    .from(apparatusRevisions)
    .where(eq(apparatusRevisions.id, newest.apparatusRevisionId));
  const approvedRevisionId = (permit.content.apparatus as { apparatusRevisionId?: string | null } | undefined)
    ?.apparatusRevisionId;
  const [approved] = approvedRevisionId
    ? await db
        .select({ revision: apparatusRevisions.revision })
        .from(apparatusRevisions)
        .where(eq(apparatusRevisions.id, approvedRevisionId))
    : [];
  const [amendment] = await db
    .select({ id: applications.id, seq: applications.seq, state: applications.state })
    .from(applications)
    .where(eq(applications.amendmentOfPermitId, permitId))
    .orderBy(desc(applications.createdAt))
    .limit(1);

  const today = await institutionToday(now);
  const permitState = effectivePermitState(permit, today);
  const amendmentOpen = amendment && amendment.state !== "withdrawn" && amendment.state !== "rejected";
  const assessment = revision.assessment as Assessment;
  return {
    permitId: permit.id,
    permitNumber: permit.number,
    permitState,
    permitTier: permit.tier,
    holderId: permit.holderId,
    apparatusName: revision.name,
    approvedRevision: approved?.revision ?? null,
    revisions: rows.map((r) => ({
      revision: r.revision,
      tier: r.tier,
      changedAt: r.changedAt,
      changedByName: r.changedByName,
    })),
    tier: newest.tier,
    rulesVersion: assessment.rulesVersion,
    engineVersion: assessment.engineVersion,
    changes: apparatusChangeDiff(
      { content: permit.content, assessment: permit.assessment as Assessment },
      revision,
      assessment,
    ),
    amendment: amendment ?? null,
    mayAmend:
      permitState === "active" && permit.holderId === user.id && !amendmentOpen && can(user, "application.create"),
  };
}

export type HolderApparatusChange = {
  permitId: string;
  permitNumber: string;
  title: string;
  apparatusName: string;
  permitTier: number;
  tier: number;
  revision: number;
  changedAt: Date;
  amendmentId: string | null;
};

/** The signed-in holder's active permits whose apparatus changed since approval (the dashboard list). */
export async function apparatusChangesForHolder(user: CurrentUser, now = new Date()): Promise<HolderApparatusChange[]> {
  const today = await institutionToday(now);
  // The newest change per permit.
  const newest = db
    .selectDistinctOn([permitApparatusChanges.permitId], {
      permitId: permitApparatusChanges.permitId,
      tier: permitApparatusChanges.tier,
      revision: permitApparatusChanges.revision,
      changedAt: permitApparatusChanges.createdAt,
      apparatusRevisionId: permitApparatusChanges.apparatusRevisionId,
    })
    .from(permitApparatusChanges)
    .innerJoin(permits, eq(permits.id, permitApparatusChanges.permitId))
    .where(and(eq(permits.holderId, user.id), eq(permits.state, "active"), sql`${permits.validTo} >= ${today}::date`))
    .orderBy(permitApparatusChanges.permitId, desc(permitApparatusChanges.revision))
    .as("newest");
  const rows = await db
    .select({
      permitId: permits.id,
      permitNumber: permits.number,
      title: applications.title,
      apparatusName: apparatusRevisions.name,
      permitTier: permits.tier,
      tier: newest.tier,
      revision: newest.revision,
      changedAt: newest.changedAt,
    })
    .from(newest)
    .innerJoin(permits, eq(permits.id, newest.permitId))
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(apparatusRevisions, eq(apparatusRevisions.id, newest.apparatusRevisionId))
    .orderBy(desc(newest.changedAt))
    .limit(20);
  if (rows.length === 0) return [];
  const amendments = await db
    .select({ id: applications.id, permitId: applications.amendmentOfPermitId, state: applications.state })
    .from(applications)
    .where(
      inArray(
        applications.amendmentOfPermitId,
        rows.map((r) => r.permitId),
      ),
    )
    .orderBy(desc(applications.createdAt));
  const open = new Map<string, string>();
  for (const a of amendments) {
    if (a.permitId && !open.has(a.permitId) && a.state !== "withdrawn" && a.state !== "rejected") {
      open.set(a.permitId, a.id);
    }
  }
  return rows.map((r) => ({ ...r, amendmentId: open.get(r.permitId) ?? null }));
}
