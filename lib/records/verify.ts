import crypto from "node:crypto";
import { and, asc, eq, gt, sql } from "drizzle-orm";
import type { Database } from "@/db";
import { applicationRevisions, auditChainHead, auditEvents, decisions, permits } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { revisionHash } from "@/lib/signing/canonical";
import { sealKey, sealMatches } from "./seal";

// Walks the tamper evidence: the audit hash chain (migration 0008_roles_and_seals) and the seal on
// every decision (lib/records/seal.ts), and reports the first broken link of each. Used by
// `npm run verify:records`, the admin page /admin/records, and — for one permit — the permit page
// and the public status page, which say "signatures check out" only when permitSeals() says so.

export const GENESIS_HASH = "0".repeat(64);

export type Break = { where: string; reason: string };

export type ChainReport = {
  rows: number;
  head: { seq: number; hash: string } | null;
  firstRowAt: string | null;
  firstBreak: Break | null;
};

export type DecisionReport = { checked: number; firstBreak: Break | null };

export type RecordsReport = { ok: boolean; chain: ChainReport; decisions: DecisionReport; checkedAt: string };

function field(value: string | null): string {
  return value === null ? "-;" : `${Buffer.byteLength(value, "utf8")}:${value};`;
}

/** The hash of one audit row, computed here independently of the SQL function the trigger uses. */
export function auditRowHash(
  prev: string,
  row: {
    chainSeq: string;
    id: string;
    at: string;
    actorId: string | null;
    actorName: string;
    action: string;
    entityType: string;
    entityId: string;
    data: string;
  },
): string {
  const text =
    prev +
    "\n" +
    [row.chainSeq, row.id, row.at, row.actorId, row.actorName, row.action, row.entityType, row.entityId, row.data]
      .map(field)
      .join("");
  return crypto.createHash("sha256").update(text, "utf8").digest("hex");
}

type RawAuditRow = {
  chain_seq: string;
  id: string;
  at: string;
  actor_id: string | null;
  actor_name: string;
  action: string;
  entity_type: string;
  entity_id: string;
  data: string;
  prev_hash: string;
  hash: string;
};

const BATCH = 2_000;

export async function verifyAuditChain(db: DbOrTx): Promise<ChainReport> {
  const [head] = await db.select().from(auditChainHead).where(eq(auditChainHead.id, 1));
  let expectedSeq = 1;
  let prev = GENESIS_HASH;
  let rows = 0;
  let firstRowAt: string | null = null;
  let firstBreak: Break | null = null;
  let after = 0;
  for (;;) {
    // Every value as PostgreSQL's text, so nothing is lost to JavaScript's numbers or dates. Ordered by
    // the table's column (e.chain_seq), not the text output column of the same name.
    const batch = await db.execute<RawAuditRow>(sql`
      SELECT chain_seq::text, id::text,
             to_char(occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') AS at,
             actor_id::text, actor_name, action, entity_type, entity_id, data::text, prev_hash, hash
        FROM audit_event e WHERE e.chain_seq > ${after} ORDER BY e.chain_seq LIMIT ${BATCH}`);
    for (const r of batch.rows) {
      rows++;
      firstRowAt ??= r.at;
      const seq = Number(r.chain_seq);
      const where = `audit event #${r.id} (link ${r.chain_seq}, ${r.at})`;
      if (!firstBreak) {
        if (seq !== expectedSeq) {
          firstBreak = { where, reason: `link ${expectedSeq} is missing: the chain jumps to ${seq}.` };
        } else if (r.prev_hash !== prev) {
          firstBreak = { where, reason: "it does not point at the hash of the event before it." };
        } else {
          const want = auditRowHash(prev, {
            chainSeq: r.chain_seq,
            id: r.id,
            at: r.at,
            actorId: r.actor_id,
            actorName: r.actor_name,
            action: r.action,
            entityType: r.entity_type,
            entityId: r.entity_id,
            data: r.data,
          });
          if (want !== r.hash) firstBreak = { where, reason: "its content no longer matches its hash." };
        }
      }
      expectedSeq = seq + 1;
      prev = r.hash;
    }
    if (batch.rows.length < BATCH) break;
    after = Number(batch.rows[batch.rows.length - 1].chain_seq);
  }
  if (!firstBreak) {
    if (!head) firstBreak = { where: "chain head", reason: "the chain head row is missing." };
    else if (head.seq !== expectedSeq - 1 || head.hash !== prev) {
      firstBreak = {
        where: "chain head",
        reason: `the head says link ${head.seq} but the table ends at link ${expectedSeq - 1}: events at the end were removed.`,
      };
    }
  }
  return { rows, head: head ? { seq: head.seq, hash: head.hash } : null, firstRowAt, firstBreak };
}

type DecisionRow = typeof decisions.$inferSelect;

/** What is wrong with one decision, or null when its seal, its revision and its permit agree. */
function decisionProblem(
  d: DecisionRow,
  revision: { contentHash: string; content: unknown; assessment: unknown } | undefined,
  permit: { validFrom: string; validTo: string; validityReason: string | null; conditions: string[] } | undefined,
  key: string,
  /** Whether the revision's content is known to match its hash already (checked once per permit). */
  revisionIntact?: boolean,
): string | null {
  if (!sealMatches(d, key))
    return "its seal does not match what it says (kind, signer, time, conditions or validity changed, or it was not made by Benchclear).";
  if (!revision) return "the revision it signs is missing.";
  if (revision.contentHash !== d.contentHash) return "it signs a hash that is not its revision's.";
  if (!revisionIntact && revisionHash(revision.content, revision.assessment) !== revision.contentHash) {
    return "the content of the revision it signs has changed since it was signed.";
  }
  if (d.kind === "approve" && permit) {
    if (permit.validFrom !== d.validFrom || permit.validTo !== d.validTo) {
      return "the permit's validity differs from the validity this approval granted.";
    }
    if ((permit.validityReason ?? null) !== (d.validityReason ?? null)) {
      return "the permit's reason for its validity differs from the one this approval signed.";
    }
    if (JSON.stringify(permit.conditions) !== JSON.stringify(d.conditions ?? [])) {
      return "the permit's conditions differ from those this approval set.";
    }
  }
  return null;
}

export async function verifyDecisions(db: DbOrTx, key = sealKey()): Promise<DecisionReport> {
  let checked = 0;
  let firstBreak: Break | null = null;
  let after = "";
  for (;;) {
    const batch = await db
      .select({ d: decisions, revision: applicationRevisions, permit: permits })
      .from(decisions)
      .leftJoin(applicationRevisions, eq(applicationRevisions.id, decisions.revisionId))
      .leftJoin(permits, eq(permits.revisionId, decisions.revisionId))
      .where(after ? gt(decisions.id, after) : undefined)
      .orderBy(asc(decisions.id))
      .limit(500);
    for (const row of batch) {
      checked++;
      if (firstBreak) continue;
      const problem = decisionProblem(row.d, row.revision ?? undefined, row.permit ?? undefined, key);
      if (problem) {
        firstBreak = {
          where: `decision ${row.d.id} (${row.d.kind} by ${row.d.signerName}, ${row.d.signedAt.toISOString()})`,
          reason: problem,
        };
      }
    }
    if (batch.length < 500) break;
    after = batch[batch.length - 1].d.id;
  }
  return { checked, firstBreak };
}

export async function verifyRecords(db: Database): Promise<RecordsReport> {
  const [chain, decisionReport] = await Promise.all([verifyAuditChain(db), verifyDecisions(db)]);
  return {
    ok: !chain.firstBreak && !decisionReport.firstBreak,
    chain,
    decisions: decisionReport,
    checkedAt: new Date().toISOString(),
  };
}

export type PermitSeals = { ok: true; signatures: number } | { ok: false; signatures: number; reason: string };

/**
 * Re-checks one permit as it is shown: every decision on its revision carries a valid seal, the
 * revision's content still matches the hash they signed, and the permit's validity and conditions
 * are those the approval granted. A self-certified permit (tier 0) has no signatures; its content
 * hash is still checked.
 */
export async function permitSeals(db: DbOrTx, permitId: string, key = sealKey()): Promise<PermitSeals> {
  const [row] = await db
    .select({ permit: permits, revision: applicationRevisions })
    .from(permits)
    .leftJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(eq(permits.id, permitId));
  if (!row) return { ok: false, signatures: 0, reason: "The permit was not found." };
  const signed = await db
    .select()
    .from(decisions)
    .where(eq(decisions.revisionId, row.permit.revisionId))
    .orderBy(asc(decisions.signedAt));
  const revision = row.revision ?? undefined;
  if (!revision) return { ok: false, signatures: signed.length, reason: "The signed revision is missing." };
  if (revisionHash(revision.content, revision.assessment) !== revision.contentHash) {
    return { ok: false, signatures: signed.length, reason: "The permit's content has changed since it was signed." };
  }
  // The content hash was checked just above: each signature is not made to hash the content again.
  for (const d of signed) {
    const problem = decisionProblem(d, revision, row.permit, key, true);
    if (problem)
      return { ok: false, signatures: signed.length, reason: `A signature (${d.kind}, ${d.signerName}): ${problem}` };
  }
  if (!signed.some((d) => d.kind === "approve")) {
    // Only a tier whose chain has no signers is issued without an approval; its submission says so.
    const [selfCertified] = await db
      .select({ id: auditEvents.id })
      .from(auditEvents)
      .where(
        and(eq(auditEvents.entityId, row.permit.applicationId), eq(auditEvents.action, "application.self_certified")),
      )
      .limit(1);
    if (!selfCertified) {
      return { ok: false, signatures: signed.length, reason: "The approval that issued this permit is missing." };
    }
  }
  return { ok: true, signatures: signed.length };
}
