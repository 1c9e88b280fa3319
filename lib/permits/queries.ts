import "server-only";
import { and, asc, count, desc, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { joinPermitBase } from "./base-query";
import {
  applicationRevisions,
  applications,
  decisions,
  departments,
  permits,
  users,
  type PermitState,
} from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { can, type CurrentUser } from "@/lib/auth/guards";
import type { Assessment } from "@/lib/hazard";
import { institutionTimeZone } from "@/lib/settings/queries";
import { effectivePermitState, todayIn } from "./dates";

// Reads of permits. Who sees a permit: its holder and the people named on its application, reviewers
// of its department, and safety officers (permit.read.any). The effective state (active, expired,
// revoked) is computed against the institution's calendar day, in SQL for lists and filters.

export async function institutionToday(now: Date = new Date(), tx: DbOrTx = db): Promise<string> {
  return todayIn(await institutionTimeZone(tx), now);
}

/** The effective state as SQL, for filtering and sorting lists. */
export function effectiveStateSql(today: string): SQL<PermitState> {
  return sql<PermitState>`(CASE WHEN ${permits.state} = 'revoked' THEN 'revoked' WHEN ${permits.state} = 'expired' OR ${permits.validTo} < ${today}::date THEN 'expired' ELSE 'active' END)`;
}

/** The permits a user may see, as a WHERE condition (never undefined: a user is required first). */
export function permitScope(user: CurrentUser): SQL {
  if (can(user, "permit.read.any")) return sql`true`;
  const own = or(eq(permits.holderId, user.id), sql`${user.id}::uuid = ANY(${applications.namedUserIds})`)!;
  if (can(user, "application.review") && user.departmentId) {
    return or(own, eq(applications.departmentId, user.departmentId))!;
  }
  return own;
}

export const PERMIT_PAGE_SIZE = 25;

/**
 * The list's count stops here and reads "more than 10000 permits". Counting every permit in scope
 * for each page cost time in proportion to the register (19–63 ms a statement at 100k permits);
 * past this many the exact figure does not change what anyone does next, and the pages still walk
 * every permit.
 */
export const PERMIT_COUNT_CAP = 10_000;

export type PermitListFilters = {
  state?: PermitState;
  tier?: number;
  page?: number;
  /** Rows per page (tests use a small page to cross from active to the rest); PERMIT_PAGE_SIZE by default. */
  pageSize?: number;
  /** Where the count stops (tests use a small one); PERMIT_COUNT_CAP by default. */
  countCap?: number;
};

export type PermitListRow = {
  id: string;
  number: string;
  tier: number;
  state: PermitState;
  validFrom: string;
  validTo: string;
  applicationId: string;
  title: string;
  room: string | null;
  holderName: string;
  departmentName: string;
  renewedByApplicationId: string | null;
};

// The list's order: active permits first, the soonest to end first; then expired and revoked ones,
// in the same order. Sorting on the effective state (an expression of today's date) would read every
// permit in scope before the first row, so each half is read on its own through the
// (valid_to, issued_at, id, state, tier) index (permit_list_order_idx, from the index alone), and only
// the page's ids are joined to the application, revision, holder and department. A page costs what
// the permits before it cost in that index, never the whole register (docs/performance.md).
const LIST_ORDER = [asc(permits.validTo), desc(permits.issuedAt), asc(permits.id)] as const;

/** Whether a permit counts as active today, as SQL (revoked and expired ones do not). */
function activeSql(today: string): SQL<boolean> {
  return sql<boolean>`(${permits.state} <> 'revoked' AND ${permits.validTo} >= ${today}::date)`;
}

export async function listPermits(user: CurrentUser, filters: PermitListFilters = {}, now = new Date()) {
  const today = await institutionToday(now);
  const active = activeSql(today);
  const scope = permitScope(user);
  // Safety officers see every permit: no need to read the application to decide.
  const scopeNeedsApplication = !can(user, "permit.read.any");
  const stateFilter: Record<PermitState, SQL> = {
    active,
    revoked: sql`${permits.state} = 'revoked'`,
    expired: sql`(${permits.state} <> 'revoked' AND ${permits.validTo} < ${today}::date)`,
  };
  const where = and(
    scope,
    filters.state ? stateFilter[filters.state] : undefined,
    filters.tier !== undefined ? eq(permits.tier, filters.tier) : undefined,
  );
  const page = Math.max(1, filters.page ?? 1);
  const pageSize = Math.max(1, Math.min(PERMIT_PAGE_SIZE, filters.pageSize ?? PERMIT_PAGE_SIZE));
  const countCap = Math.max(1, filters.countCap ?? PERMIT_COUNT_CAP);
  const offset = (page - 1) * pageSize;
  // One more than a page: whether there is a next page, without counting them all.
  const reach = pageSize + 1;

  /** One half of the order (active or not active): the ids of up to `limit` permits after `skip`. */
  const idsOf = async (half: "active" | "rest", skip: number, limit: number) => {
    const base = db.select({ id: permits.id }).from(permits).$dynamic();
    const joined = scopeNeedsApplication
      ? base.innerJoin(applications, eq(applications.id, permits.applicationId))
      : base;
    const rows = await joined
      .where(and(where, half === "active" ? active : sql`NOT ${active}`))
      .orderBy(...LIST_ORDER)
      .limit(limit)
      .offset(skip);
    return rows.map((r) => r.id);
  };

  /** How many permits in scope match `condition`, stopping at `cap` + 1. */
  const cappedCount = async (condition: SQL | undefined, cap: number) => {
    const base = db
      .select({ one: sql<number>`1`.as("one") })
      .from(permits)
      .$dynamic();
    const joined = scopeNeedsApplication
      ? base.innerJoin(applications, eq(applications.id, permits.applicationId))
      : base;
    const matching = joined
      .where(condition)
      .limit(cap + 1)
      .as("matching");
    const [row] = await db.select({ n: count() }).from(matching);
    return Number(row?.n ?? 0);
  };

  const [counted, firstIds] = await Promise.all([
    cappedCount(where, countCap),
    filters.state === "expired" || filters.state === "revoked" ? Promise.resolve(null) : idsOf("active", offset, reach),
  ]);
  let ids = firstIds ?? [];
  // The active half ends on or before this page: the rest follows it. Where it starts from: the top
  // when no active permit matches or the active half ended on this page; otherwise past the active
  // permits before this page (fewer than `offset`, so counting them costs no more than skipping them).
  if (ids.length < reach && filters.state !== "active") {
    let restSkip = offset;
    if (firstIds !== null) {
      restSkip = ids.length > 0 || offset === 0 ? 0 : offset - (await cappedCount(and(where, active), offset));
    }
    ids = ids.concat(await idsOf("rest", Math.max(0, restSkip), reach - ids.length));
  }
  const hasNext = ids.length > pageSize;
  ids = ids.slice(0, pageSize);
  const total = Math.min(counted, countCap);
  /** `total` is a floor: more than countCap permits match. */
  const more = counted > countCap;
  if (ids.length === 0) return { rows: [] as PermitListRow[], total, more, hasNext, page, pageSize, today };

  const details = await joinPermitBase(
    db
      .select({
        id: permits.id,
        number: permits.number,
        tier: permits.tier,
        state: effectiveStateSql(today),
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        applicationId: permits.applicationId,
        title: applications.title,
        room: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'room'`,
        holderName: users.name,
        departmentName: departments.name,
        renewedByApplicationId: permits.renewedByApplicationId,
      })
      .from(permits)
      .$dynamic(),
  )
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(inArray(permits.id, ids));
  const byId = new Map(details.map((r) => [r.id, r as PermitListRow]));
  const rows = ids.map((id) => byId.get(id)).filter((r): r is PermitListRow => r !== undefined);
  return { rows, total, more, hasNext, page, pageSize, today };
}

/** Active permits of this user's scope whose last day is within `withinDays` (the dashboard list). */
export async function expiringPermits(user: CurrentUser, withinDays = 30, now = new Date()) {
  const today = await institutionToday(now);
  const rows = await db
    .select({
      id: permits.id,
      number: permits.number,
      tier: permits.tier,
      validTo: permits.validTo,
      title: applications.title,
      room: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'room'`,
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .where(
      and(
        permitScope(user),
        eq(permits.state, "active"),
        sql`${permits.validTo} >= ${today}::date`,
        sql`${permits.validTo} <= ${today}::date + ${withinDays}::int`,
      ),
    )
    .orderBy(asc(permits.validTo))
    .limit(20);
  return rows.map((r) => ({ ...r, validUntil: r.validTo }));
}

export type PermitDetail = NonNullable<Awaited<ReturnType<typeof getPermit>>>;

/** One permit with its application, revision and signatures, or null when missing or not visible. */
export async function getPermit(user: CurrentUser, id: string, now = new Date()) {
  const today = await institutionToday(now);
  const [row] = await joinPermitBase(
    db
      .select({
        permit: {
          id: permits.id,
          number: permits.number,
          year: permits.year,
          tier: permits.tier,
          state: permits.state,
          validFrom: permits.validFrom,
          validTo: permits.validTo,
          validityReason: permits.validityReason,
          conditions: permits.conditions,
          verificationCode: permits.verificationCode,
          issuedAt: permits.issuedAt,
          revokedAt: permits.revokedAt,
          revokedReason: permits.revokedReason,
          renewedByApplicationId: permits.renewedByApplicationId,
          version: permits.version,
          holderId: permits.holderId,
          revisionId: permits.revisionId,
          applicationId: permits.applicationId,
        },
        application: {
          id: applications.id,
          seq: applications.seq,
          title: applications.title,
          applicantId: applications.applicantId,
          namedUserIds: applications.namedUserIds,
          departmentId: applications.departmentId,
          chainRulesVersion: applications.chainRulesVersion,
        },
        revision: {
          id: applicationRevisions.id,
          revision: applicationRevisions.revision,
          content: applicationRevisions.content,
          assessment: applicationRevisions.assessment,
          contentHash: applicationRevisions.contentHash,
        },
        holderName: users.name,
        departmentName: departments.name,
      })
      .from(permits)
      .$dynamic(),
  )
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(and(eq(permits.id, id), permitScope(user)))
    .limit(1);
  if (!row) return null;
  const signatures = await db
    .select({
      id: decisions.id,
      kind: decisions.kind,
      step: decisions.step,
      signerName: decisions.signerName,
      signerRole: decisions.signerRole,
      meaning: decisions.meaning,
      contentHash: decisions.contentHash,
      comment: decisions.comment,
      signedAt: decisions.signedAt,
    })
    .from(decisions)
    .where(
      and(eq(decisions.revisionId, row.permit.revisionId), inArray(decisions.kind, ["recommend", "approve", "revoke"])),
    )
    .orderBy(asc(decisions.signedAt));
  let renewal: { id: string; state: string } | null = null;
  if (row.permit.renewedByApplicationId) {
    const [r] = await db
      .select({ id: applications.id, state: applications.state })
      .from(applications)
      .where(eq(applications.id, row.permit.renewedByApplicationId));
    renewal = r ?? null;
  }
  return {
    ...row,
    revision: { ...row.revision, assessment: row.revision.assessment as Assessment },
    effectiveState: effectivePermitState(row.permit, today),
    today,
    signatures,
    renewal,
  };
}

/** Every permit, for the officers' CSV export (newest first). */
export async function permitsForExport(user: CurrentUser, now = new Date()) {
  const today = await institutionToday(now);
  const state = effectiveStateSql(today);
  return joinPermitBase(
    db
      .select({
        number: permits.number,
        state,
        tier: permits.tier,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
        title: applications.title,
        room: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'room'`,
        // From the signed revision: the apparatus, its figures (SI base units) and the event.
        apparatusName: sql<string | null>`${applicationRevisions.content} -> 'apparatus' ->> 'name'`,
        energy_J: sql<number | null>`(${applicationRevisions.assessment} ->> 'energy_J')::float8`,
        maxVoltage_V: sql<number | null>`(${applicationRevisions.assessment} ->> 'maxVoltage_V')::float8`,
        firstDay: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'firstDay'`,
        lastDay: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'lastDay'`,
        audience: sql<string | null>`${applicationRevisions.content} -> 'event' ->> 'audience'`,
        audienceSize: sql<number | null>`(${applicationRevisions.content} -> 'event' ->> 'audienceSize')::int`,
        operators: sql<
          string[] | null
        >`(SELECT array_agg(o ->> 'name' ORDER BY n) FROM jsonb_array_elements(CASE WHEN jsonb_typeof(${applicationRevisions.content} -> 'event' -> 'operators') = 'array' THEN ${applicationRevisions.content} -> 'event' -> 'operators' ELSE '[]'::jsonb END) WITH ORDINALITY AS t(o, n))`,
        holderName: users.name,
        holderEmail: users.email,
        departmentName: departments.name,
        conditions: permits.conditions,
        issuedAt: permits.issuedAt,
        revokedAt: permits.revokedAt,
        revokedReason: permits.revokedReason,
      })
      .from(permits)
      .$dynamic(),
  )
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(permitScope(user))
    .orderBy(desc(permits.year), desc(permits.seq));
}
