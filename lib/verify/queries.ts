import "server-only";
import { eq, sql } from "drizzle-orm";
import { db, getDb, type Database } from "@/db";
import { applicationRevisions, decisions, permits, users, type DecisionKind, type PermitState } from "@/db/schema";
import { TIER_LABELS, type Tier } from "@/lib/hazard";
import { effectivePermitState, todayIn } from "@/lib/permits/dates";
import { printAudience } from "@/lib/pdf/content";
import { AUDIENCE_LABELS } from "@/lib/applications/schemas";
import { DEFAULT_TIME_ZONE, institutionTimeZoneSql } from "@/lib/settings/queries";
import { permitSeals } from "@/lib/records/verify";
import { isWellFormedCode } from "./code";

// What the public verification page may show about a permit, and nothing more (product.md, security.md:
// only what the printed permit shows): status, number, holder's name, room, apparatus, event days,
// audience, validity, tier, and the signers' names and meanings. Columns are listed one by one so nothing else is ever selected.

export type PublicSigner = { name: string; meaning: string; kind: DecisionKind };

export type PublicPermit = {
  number: string;
  status: PermitState;
  holderName: string;
  room: string;
  /** The apparatus the permit is for, as printed on it. */
  apparatusName: string;
  /** The event days the permit was asked for (ISO days; empty for a revision without them). */
  eventFirstDay: string;
  eventLastDay: string;
  /** "80 members of the public", as printed on the permit. */
  audience: string;
  validFrom: string;
  validTo: string;
  /** The institution's calendar day the status was computed for (YYYY-MM-DD). */
  today: string;
  tier: Tier;
  tierLabel: string;
  /** Calendar day of the revocation in the institution's time zone, when revoked. */
  revokedOn: string | null;
  signers: PublicSigner[];
  /** Whether the signatures' seals, the signed content and the permit's terms were re-checked and agree. */
  signaturesCheckOut: boolean;
};

/** The signatures a permit carries: the chain that approved its revision, and a revocation. */
const SIGNATURE_KINDS: DecisionKind[] = ["recommend", "approve", "revoke"];

// The seals' verdict per permit, kept a short while. Re-checking the seals costs two more round trips
// and hashing the signed content (the larger part of this page's own work, docs/performance.md), and
// what they cover changes only with a new signature, a new revision, a revocation or a change of the
// permit's terms, all of which are part of the key below, read live on every look-up; so a look-up
// re-checks them when any of those moved, and at least every SEAL_RECHECK_MS in any case, so that a
// change made behind the application's back (straight in the database) shows within that time. Only
// a verdict that checks out is kept: a broken one is re-checked on every look-up.
const SEAL_RECHECK_MS = 60_000; // ms
const SEAL_CACHE_MAX = 5_000; // permits
const sealVerdicts = new Map<string, { fingerprint: string; at: number }>();

async function sealsCheckOut(permitId: string, fingerprint: string, nowMs = Date.now()): Promise<boolean> {
  const kept = sealVerdicts.get(permitId);
  if (kept && kept.fingerprint === fingerprint && nowMs - kept.at < SEAL_RECHECK_MS) return true;
  const seals = await permitSeals(db, permitId);
  sealVerdicts.delete(permitId);
  if (!seals.ok) return false;
  if (sealVerdicts.size >= SEAL_CACHE_MAX) sealVerdicts.delete(sealVerdicts.keys().next().value!);
  sealVerdicts.set(permitId, { fingerprint, at: nowMs });
  return true;
}

// The look-up, built once per pool as a named prepared statement: the page is the one a busy open
// day loads most, and building the query (drizzle) and planning it (PostgreSQL) on every look-up was a
// fair part of what is left of its cost once its HTML is kept (lib/verify/rendered.ts).
function permitByCodeQuery(database: Database) {
  return database
    .select({
      id: permits.id,
      revisionId: permits.revisionId,
      conditions: permits.conditions,
      validityReason: permits.validityReason,
      number: permits.number,
      state: permits.state,
      tier: permits.tier,
      validFrom: permits.validFrom,
      validTo: permits.validTo,
      revokedAt: permits.revokedAt,
      holderName: users.name,
      eventRoom: sql<string | null>`${applicationRevisions.content}->'event'->>'room'`,
      apparatusRoom: sql<string | null>`${applicationRevisions.content}->'apparatus'->>'room'`,
      apparatusName: sql<string | null>`${applicationRevisions.content}->'apparatus'->>'name'`,
      firstDay: sql<string | null>`${applicationRevisions.content}->'event'->>'firstDay'`,
      lastDay: sql<string | null>`${applicationRevisions.content}->'event'->>'lastDay'`,
      audience: sql<string | null>`${applicationRevisions.content}->'event'->>'audience'`,
      audienceSize: sql<string | null>`${applicationRevisions.content}->'event'->>'audienceSize'`,
      timeZone: institutionTimeZoneSql,
      signers: sql<PublicSigner[]>`(
        SELECT coalesce(json_agg(json_build_object('name', d.signer_name, 'meaning', d.meaning, 'kind', d.kind)
                                 ORDER BY d.signed_at), '[]'::json)
        FROM ${decisions} d
        WHERE d.revision_id = ${permits.revisionId} AND d.kind IN (${sql.join(
          SIGNATURE_KINDS.map((k) => sql`${k}::decision_kind`),
          sql`, `,
        )}))`,
    })
    .from(permits)
    .innerJoin(users, eq(users.id, permits.holderId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(eq(permits.verificationCode, sql.placeholder("code")))
    .limit(1)
    .prepare("verify_public_permit");
}
let prepared: { database: Database; query: ReturnType<typeof permitByCodeQuery> } | null = null;
function permitByCode() {
  // A new pool (closeDb, tests) gets its own; each connection prepares the statement on first use.
  const database = getDb();
  if (prepared?.database !== database) prepared = { database, query: permitByCodeQuery(database) };
  return prepared.query;
}

/** The permit behind a verification code, or null for an unknown or malformed code (told apart nowhere). */
export async function findPublicPermit(code: string, now: Date = new Date()): Promise<PublicPermit | null> {
  if (!isWellFormedCode(code)) return null;
  // One round trip: the permit, the institution's time zone and the signatures together (this page
  // is the one a busy open day loads most; docs/performance.md).
  const [row] = await permitByCode().execute({ code });
  if (!row) return null;

  const timeZone = row.timeZone || DEFAULT_TIME_ZONE;
  const signers = row.signers;
  // The seals, the signed content and the permit's terms, re-checked (lib/records) whenever anything
  // they cover moved (sealsCheckOut above): the page says the signatures check out only when they do.
  const fingerprint = JSON.stringify([
    row.revisionId,
    row.state,
    row.validFrom,
    row.validTo,
    row.validityReason,
    row.conditions,
    row.revokedAt?.toISOString() ?? null,
    signers,
  ]);
  const signaturesCheckOut = await sealsCheckOut(row.id, fingerprint);
  const today = todayIn(timeZone, now);
  const tier = row.tier as Tier;
  return {
    number: row.number,
    status: effectivePermitState({ state: row.state, validTo: row.validTo }, today),
    holderName: row.holderName,
    room: row.eventRoom || row.apparatusRoom || "",
    apparatusName: row.apparatusName ?? "",
    eventFirstDay: row.firstDay ?? "",
    eventLastDay: row.lastDay ?? "",
    audience: printAudience(
      AUDIENCE_LABELS[row.audience as keyof typeof AUDIENCE_LABELS] ?? "",
      Number(row.audienceSize ?? 0) || 0,
    ),
    validFrom: row.validFrom,
    validTo: row.validTo,
    today,
    tier,
    tierLabel: TIER_LABELS[tier],
    revokedOn: row.revokedAt ? todayIn(timeZone, row.revokedAt) : null,
    signers,
    signaturesCheckOut,
  };
}
