import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { applicationRevisions, applications, permitApparatusChanges, permits, users } from "@/db/schema";
import { updateApparatus, type SavedApparatusRevision } from "@/lib/apparatus/actions";
import type { ApparatusUpdateInput } from "@/lib/apparatus/schemas";
import { writeAudit, type Tx } from "@/lib/audit";
import type { CurrentUser } from "@/lib/auth/guards";
import { usersWithPermission } from "@/lib/auth/holders";
import type { Assessment } from "@/lib/hazard";
import { queueMail, type MailMessage } from "@/lib/outbox";
import { institutionToday } from "@/lib/permits/queries";
import { apparatusChangeDiff } from "./diff";

// Re-review when an apparatus changes (issue 17): saving a new revision of an apparatus that an
// active permit covers records the change against each such permit, writes its audit event and
// e-mails the holders and the safety officers — in the revision's own transaction. The permit stays
// as approved (its approval is signed); an officer may revoke it, the holder may start an amendment
// (./amend.ts).

/** Rows of the diff an e-mail carries per permit; the permit page shows them all. */
const MAIL_CHANGE_ROWS = 12;

export type FlaggedPermit = { permitId: string; permitNumber: string; permitTier: number; tier: number };

/** The apparatus registry's edit, with the permits it covers flagged in the same transaction. */
export async function reviseApparatus(user: CurrentUser, id: string, input: ApparatusUpdateInput, now = new Date()) {
  let flagged: FlaggedPermit[] = [];
  const saved = await updateApparatus(user, id, input, {
    inTransaction: async (tx, revision) => {
      flagged = await flagPermitsCovering(tx, user, revision, now);
    },
  });
  return { ...saved, permitsFlagged: flagged };
}

/**
 * Records the new revision against every active permit that covers the apparatus, with the tier the
 * engine and rules in force give it, and queues one e-mail per person: each holder hears of their
 * permits, each safety officer (who may revoke) of all of them. The once-only key is the revision, so
 * a retried transaction or a second call never mails anyone twice for the same change.
 */
export async function flagPermitsCovering(
  tx: Tx,
  actor: CurrentUser,
  saved: SavedApparatusRevision,
  now = new Date(),
): Promise<FlaggedPermit[]> {
  const today = await institutionToday(now, tx);
  const covering = await tx
    .select({
      permitId: permits.id,
      permitNumber: permits.number,
      permitTier: permits.tier,
      holderId: permits.holderId,
      holderEmail: users.email,
      holderDisabledAt: users.disabledAt,
      title: applications.title,
      content: applicationRevisions.content,
      assessment: applicationRevisions.assessment,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .innerJoin(users, eq(users.id, permits.holderId))
    .where(
      and(
        eq(applications.apparatusId, saved.id),
        eq(permits.state, "active"),
        sql`${permits.validTo} >= ${today}::date`,
      ),
    )
    .orderBy(permits.number);
  if (covering.length === 0) return [];

  const tier = saved.assessment.tier;
  const inserted = await tx
    .insert(permitApparatusChanges)
    .values(
      covering.map((p) => ({
        permitId: p.permitId,
        apparatusId: saved.id,
        apparatusRevisionId: saved.revisionId,
        revision: saved.revision,
        permitTier: p.permitTier,
        tier,
        changedById: actor.id,
        createdAt: now,
      })),
    )
    .onConflictDoNothing()
    .returning({ permitId: permitApparatusChanges.permitId });
  const fresh = new Set(inserted.map((r) => r.permitId));
  const affected = covering.filter((p) => fresh.has(p.permitId));
  if (affected.length === 0) return [];

  const mailed = affected.map((p) => {
    const changes = apparatusChangeDiff(
      { content: p.content, assessment: p.assessment as Assessment },
      saved,
      saved.assessment,
    );
    return { ...p, changes };
  });
  for (const p of mailed) {
    await writeAudit(tx, {
      actor,
      action: "permit.apparatus_changed",
      entityType: "permit",
      entityId: p.permitId,
      data: {
        number: p.permitNumber,
        apparatusId: saved.id,
        revision: saved.revision,
        revisionId: saved.revisionId,
        permitTier: p.permitTier,
        tier,
        fields: p.changes.map((c) => c.path),
      },
    });
  }

  // One message per person. A holder who is also an officer gets the officers' (fuller) message.
  type Item = MailMessage & { kind: "apparatus_changed" };
  const asItem = (p: (typeof mailed)[number]): Item["data"]["permits"][number] => ({
    permitId: p.permitId,
    permitNumber: p.permitNumber,
    title: p.title,
    permitTier: p.permitTier,
    tier,
    changes: p.changes.slice(0, MAIL_CHANGE_ROWS).map((c) => `${c.label}: ${c.before} → ${c.after}`),
  });
  const recipients = new Map<string, { address: string; recipient: "holder" | "officer"; permits: typeof mailed }>();
  for (const officer of await usersWithPermission(tx, "permit.revoke", "institution")) {
    recipients.set(officer.email.toLowerCase(), { address: officer.email, recipient: "officer", permits: mailed });
  }
  for (const p of mailed) {
    if (p.holderDisabledAt) continue;
    const key = p.holderEmail.toLowerCase();
    const known = recipients.get(key);
    if (known?.recipient === "officer") continue;
    if (known) known.permits.push(p);
    else recipients.set(key, { address: p.holderEmail, recipient: "holder", permits: [p] });
  }
  for (const { address, recipient, permits: theirs } of recipients.values()) {
    await queueMail(
      tx,
      address,
      {
        kind: "apparatus_changed",
        data: {
          apparatusId: saved.id,
          apparatusName: saved.name,
          revision: saved.revision,
          changedByName: actor.name,
          recipient,
          permits: theirs.map(asItem),
        },
      },
      { dedupeKey: `apparatus_changed:${saved.revisionId}` },
    );
  }
  return mailed.map((p) => ({ permitId: p.permitId, permitNumber: p.permitNumber, permitTier: p.permitTier, tier }));
}
