import "server-only";
import { sql } from "drizzle-orm";
import { permitCounters, permits, type Permit } from "@/db/schema";
import { writeAudit, type Tx } from "@/lib/audit";
import { formatPermitNumber, newVerificationCode } from "./numbers";
import { permitPrefix } from "@/lib/settings/queries";

// Writes for permits: issuing one inside the approving transaction. (Revoking is a signed decision:
// ./revoke.ts; a renewal starts a new application: lib/applications/renew.ts.)

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
