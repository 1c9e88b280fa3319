import "server-only";
import { and, asc, eq, gte, inArray, lte, ne, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "@/db";
import {
  applicationRevisions,
  applications,
  auditEvents,
  decisions,
  departments,
  permits,
  users,
  type ApplicationState,
} from "@/db/schema";
import { can, type CurrentUser } from "@/lib/auth/guards";
import type { Assessment } from "@/lib/hazard";
import { effectivePermitState } from "@/lib/permits/dates";
import { institutionToday } from "@/lib/permits/queries";
import { BUILT_IN_CHAIN_VERSION, type ChainRules, type StepRole } from "@/lib/rules/chain";
import { allChainRules, chainRulesFor } from "@/lib/rules/queries";
import { revisionDiff, type DiffEntry } from "./diff";
import { decisionOptions, pendingStep, type DecisionOptions } from "./policy";
import { canReadApplication } from "@/lib/applications/access";
import { QUEUE_COUNT_CAP } from "./counts";

export { QUEUE_COUNT_CAP };

// Reads for the review queue, the application record page and the audit export.

export const QUEUE_STATES = ["submitted", "in_review"] as const satisfies readonly ApplicationState[];
export const QUEUE_PAGE_SIZE = 25;

// Waiting applications, written as literals rather than bound parameters so that PostgreSQL can prove
// the partial index application_waiting_idx (same predicate) applies to every plan it makes.
const WAITING = sql.raw(`"application"."state" IN (${QUEUE_STATES.map((s) => `'${s}'`).join(", ")})`);

export type QueueFilters = {
  tier?: number;
  departmentId?: string;
  state?: (typeof QUEUE_STATES)[number];
  /** Waiting at least this many days. */
  minAgeDays?: number;
  /** "mine": waiting for this user's signature (default); "all": every waiting application they may see. */
  scope?: "mine" | "all";
  page?: number;
};

/**
 * SQL for the role that signs the step an application waits at, from every chain rules version in
 * use: (version, tier, step) → role. The numbers come from validated rule sets, not from a request.
 */
function pendingRoleSql(all: Map<number, ChainRules>): SQL<StepRole | null> {
  const tuples: Record<StepRole, string[]> = { reviewer: [], safety_officer: [] };
  for (const [version, rules] of all) {
    rules.tiers.forEach((chain, tier) => {
      chain.steps.forEach((role, i) => tuples[role].push(`(${Number(version)},${Number(tier)},${i + 1})`));
    });
  }
  const key = sql`(coalesce(${applications.chainRulesVersion}, ${sql.raw(String(BUILT_IN_CHAIN_VERSION))}), ${applications.tier}::int, ${applications.chainStep} + 1)`;
  const branch = (role: StepRole) =>
    tuples[role].length ? sql`WHEN ${key} IN (${sql.raw(tuples[role].join(","))}) THEN ${role}` : sql``;
  return sql<StepRole | null>`(CASE ${branch("reviewer")} ${branch("safety_officer")} ELSE NULL END)`;
}

/**
 * Waiting at a step `role` signs, as plain comparisons of the application's own columns (chain rules
 * version, tier, step), one per (version, tier, step) of every rule set in use. Unlike a test of
 * pendingRoleSql's CASE, PostgreSQL estimates these from its statistics (and the extended statistics
 * of migration 0017_queue_statistics), so it walks application_waiting_idx in order for a page
 * instead of sorting every waiting application (docs/performance.md).
 */
function waitsForRole(all: Map<number, ChainRules>, role: StepRole): SQL {
  const terms: SQL[] = [];
  for (const [version, rules] of all) {
    const versionIs =
      Number(version) === BUILT_IN_CHAIN_VERSION
        ? sql.raw(
            `("application"."chain_rules_version" IS NULL OR "application"."chain_rules_version" = ${Number(version)})`,
          )
        : sql.raw(`"application"."chain_rules_version" = ${Number(version)}`);
    rules.tiers.forEach((chain, tier) => {
      chain.steps.forEach((stepRole, i) => {
        if (stepRole === role)
          terms.push(
            sql`(${versionIs} AND ${sql.raw(`"application"."tier" = ${Number(tier)} AND "application"."chain_step" = ${i}`)})`,
          );
      });
    });
  }
  return terms.length ? sql`(${sql.join(terms, sql` OR `)})` : sql`false`;
}

/** Applications this user may see in the queue at all. */
function queueScope(user: CurrentUser): SQL {
  if (can(user, "application.review.any")) return sql`true`;
  if (can(user, "application.review") && user.departmentId) return eq(applications.departmentId, user.departmentId);
  return sql`false`;
}

/**
 * Waiting for this user's signature, one condition per role they sign as (each an application's
 * role at its pending step, plus separation of duties); the branches never overlap (one pending
 * role each). Kept apart so each can be planned on its own (see waitsForRole).
 */
function actionableBranches(user: CurrentUser, all: Map<number, ChainRules>): SQL[] {
  const branches: SQL[] = [];
  if (can(user, "application.review") && user.departmentId) {
    branches.push(sql`(${waitsForRole(all, "reviewer")} AND ${applications.departmentId} = ${user.departmentId})`);
  }
  if (can(user, "permit.approve")) branches.push(waitsForRole(all, "safety_officer"));
  return branches.map((branch) => and(branch, separatedFrom(user))!);
}

/** Waiting for this user's signature: their role at the pending step, and separation of duties. */
function actionableBy(user: CurrentUser, role: SQL<StepRole | null>): SQL {
  const branches: SQL[] = [];
  if (can(user, "application.review") && user.departmentId) {
    branches.push(sql`(${role} = 'reviewer' AND ${applications.departmentId} = ${user.departmentId})`);
  }
  if (can(user, "permit.approve")) branches.push(sql`(${role} = 'safety_officer')`);
  if (branches.length === 0) return sql`false`;
  return and(or(...branches), separatedFrom(user))!;
}

/** Separation of duties: never one's own application, one naming oneself, or one already signed. */
function separatedFrom(user: CurrentUser): SQL {
  return and(
    sql`${applications.applicantId} <> ${user.id}`,
    sql`NOT (${user.id}::uuid = ANY(${applications.namedUserIds}))`,
    sql`NOT EXISTS (SELECT 1 FROM ${decisions} WHERE ${decisions.revisionId} = ${applications.currentRevisionId} AND ${decisions.signerId} = ${user.id})`,
    sql`NOT EXISTS (SELECT 1 FROM ${applicationRevisions} WHERE ${applicationRevisions.id} = ${applications.currentRevisionId} AND ${applicationRevisions.submittedById} = ${user.id})`,
  )!;
}

export type QueueRow = {
  id: string;
  seq: number;
  title: string;
  tier: number | null;
  state: ApplicationState;
  chainStep: number;
  waitingSince: Date | null;
  submittedAt: Date | null;
  applicantName: string;
  departmentName: string;
  pendingRole: StepRole | null;
  actionable: boolean;
};

/** The review queue: waiting applications, oldest wait first, one page at a time. */
export async function listQueue(
  user: CurrentUser,
  filters: QueueFilters = {},
  now = new Date(),
  { pageSize = QUEUE_PAGE_SIZE, count: withCount = true }: { pageSize?: number; count?: boolean } = {},
) {
  const rules = await allChainRules();
  const role = pendingRoleSql(rules);
  const actionable = actionableBy(user, role);
  const common = and(
    WAITING,
    queueScope(user),
    filters.tier !== undefined ? eq(applications.tier, filters.tier) : undefined,
    filters.departmentId ? eq(applications.departmentId, filters.departmentId) : undefined,
    filters.state ? eq(applications.state, filters.state) : undefined,
    filters.minAgeDays
      ? lte(applications.waitingSince, new Date(now.getTime() - filters.minAgeDays * 86_400_000))
      : undefined,
  );
  const page = Math.max(1, Math.floor(filters.page ?? 1));
  const mine = (filters.scope ?? "mine") === "mine";
  // "mine": the ids of each role's first pages, each walked in queue order on its own (one OR over
  // both roles is estimated far too selective, and PostgreSQL then sorts every waiting application:
  // 7 × the p95 at 100k permits, docs/performance.md); then the page is cut from their union.
  const branches = mine ? actionableBranches(user, rules) : [sql`true`];
  const reach = page * pageSize + 1;
  const branchIds = branches.map(
    (branch) =>
      sql`(SELECT ${applications.id} FROM ${applications} WHERE ${and(common, branch)} ORDER BY ${applications.waitingSince} ASC NULLS LAST, ${applications.seq} ASC LIMIT ${reach})`,
  );
  const where = mine
    ? branchIds.length
      ? sql`${applications.id} IN (${sql.join(branchIds, sql` UNION ALL `)})`
      : sql`false`
    : common;
  const capped = branches.map(
    (branch) => sql`(SELECT 1 FROM ${applications} WHERE ${and(common, branch)} LIMIT ${QUEUE_COUNT_CAP + 1})`,
  );
  const [fetched, [counted]] = await Promise.all([
    db
      .select({
        id: applications.id,
        seq: applications.seq,
        title: applications.title,
        tier: applications.tier,
        state: applications.state,
        chainStep: applications.chainStep,
        waitingSince: applications.waitingSince,
        submittedAt: applications.submittedAt,
        applicantName: users.name,
        departmentName: departments.name,
        pendingRole: role,
        actionable: sql<boolean>`coalesce((${actionable}), false)`,
      })
      .from(applications)
      .innerJoin(users, eq(users.id, applications.applicantId))
      .innerJoin(departments, eq(departments.id, applications.departmentId))
      .where(where)
      .orderBy(sql`${applications.waitingSince} ASC NULLS LAST`, asc(applications.seq))
      // One more than a page: whether there is a next page, without counting them all.
      .limit(pageSize + 1)
      .offset((page - 1) * pageSize),
    withCount && capped.length
      ? db
          .execute<{ n: string }>(sql`SELECT count(*) AS n FROM (${sql.join(capped, sql` UNION ALL `)}) AS capped`)
          .then((result) => result.rows)
      : Promise.resolve([{ n: 0 }]),
  ]);
  const n = Number(counted?.n ?? 0);
  return {
    rows: fetched.slice(0, pageSize) as QueueRow[],
    /** How many wait, up to QUEUE_COUNT_CAP; `more` says there are more than that. */
    total: Math.min(n, QUEUE_COUNT_CAP),
    more: n > QUEUE_COUNT_CAP,
    hasNext: fetched.length > pageSize,
    page,
    pageSize,
  };
}

/** Each tier's count, up to QUEUE_COUNT_CAP + 1 (read as "more than the cap"). */
export type CappedTierCounts = Record<0 | 1 | 2 | 3 | 4, number>;

/**
 * Applications waiting for this user's signature, by tier (the dashboard's queue card), each count
 * stopping at QUEUE_COUNT_CAP + 1 so that its cost does not grow with the backlog.
 */
export async function queueCountsByTier(user: CurrentUser): Promise<CappedTierCounts> {
  const counts: CappedTierCounts = { 0: 0, 1: 0, 2: 0, 3: 0, 4: 0 };
  if (!can(user, "application.review")) return counts;
  const branches = actionableBranches(user, await allChainRules());
  if (branches.length === 0) return counts;
  // Each role's count on its own, for the reason listQueue gives; they never overlap.
  const capped = branches.map(
    (branch) =>
      sql`(SELECT 1 FROM ${applications} WHERE ${and(WAITING, queueScope(user), branch)} AND ${applications.tier} = t.tier LIMIT ${QUEUE_COUNT_CAP + 1})`,
  );
  const result = await db.execute<{ tier: number; n: string }>(sql`
    SELECT t.tier, (
      SELECT count(*) FROM (${sql.join(capped, sql` UNION ALL `)}) AS capped
    ) AS n
    FROM (VALUES (0), (1), (2), (3), (4)) AS t(tier)`);
  // Each role stops at the cap + 1, so their sum may pass it: the card reads it as "more than the cap".
  for (const row of result.rows)
    counts[Number(row.tier) as 0 | 1 | 2 | 3 | 4] = Math.min(Number(row.n), QUEUE_COUNT_CAP + 1);
  return counts;
}

export type ApplicationRecord = NonNullable<Awaited<ReturnType<typeof getApplicationRecord>>>;

/** Everything the application page shows, or null when it is missing or this user may not see it. */
export async function getApplicationRecord(user: CurrentUser, id: string, now = new Date()) {
  const submitter = alias(users, "submitter");
  const [row] = await db
    .select({
      application: applications,
      applicantName: users.name,
      departmentName: departments.name,
    })
    .from(applications)
    .innerJoin(users, eq(users.id, applications.applicantId))
    .innerJoin(departments, eq(departments.id, applications.departmentId))
    .where(eq(applications.id, id));
  if (!row || !canReadApplication(user, row.application)) return null;
  const application = row.application;

  const [revisionRows, decisionRows, permitRows, rules] = await Promise.all([
    db
      .select({
        id: applicationRevisions.id,
        revision: applicationRevisions.revision,
        content: applicationRevisions.content,
        assessment: applicationRevisions.assessment,
        tier: applicationRevisions.tier,
        contentHash: applicationRevisions.contentHash,
        submittedAt: applicationRevisions.submittedAt,
        submittedById: applicationRevisions.submittedById,
        submittedByName: submitter.name,
      })
      .from(applicationRevisions)
      .innerJoin(submitter, eq(submitter.id, applicationRevisions.submittedById))
      .where(eq(applicationRevisions.applicationId, id))
      .orderBy(asc(applicationRevisions.revision)),
    db
      .select({
        id: decisions.id,
        revisionId: decisions.revisionId,
        kind: decisions.kind,
        step: decisions.step,
        signerId: decisions.signerId,
        signerName: decisions.signerName,
        signerRole: decisions.signerRole,
        meaning: decisions.meaning,
        contentHash: decisions.contentHash,
        comment: decisions.comment,
        pinnedTo: decisions.pinnedTo,
        conditions: decisions.conditions,
        signedAt: decisions.signedAt,
      })
      .from(decisions)
      .where(eq(decisions.applicationId, id))
      .orderBy(asc(decisions.signedAt)),
    db
      .select({
        id: permits.id,
        number: permits.number,
        state: permits.state,
        validFrom: permits.validFrom,
        validTo: permits.validTo,
      })
      .from(permits)
      .where(eq(permits.applicationId, id)),
    chainRulesFor(application.chainRulesVersion),
  ]);

  const entityFilter = permitRows.length
    ? or(
        and(eq(auditEvents.entityType, "application"), eq(auditEvents.entityId, id)),
        and(
          eq(auditEvents.entityType, "permit"),
          inArray(
            auditEvents.entityId,
            permitRows.map((p) => p.id),
          ),
        ),
      )
    : and(eq(auditEvents.entityType, "application"), eq(auditEvents.entityId, id));
  const audit = await db
    .select({
      id: auditEvents.id,
      occurredAt: auditEvents.occurredAt,
      actorName: auditEvents.actorName,
      action: auditEvents.action,
      entityType: auditEvents.entityType,
      data: auditEvents.data,
    })
    .from(auditEvents)
    // Autosaves of the draft stay in the trail (and its export) but would drown the timeline.
    .where(and(entityFilter, ne(auditEvents.action, "application.draft_saved")))
    .orderBy(asc(auditEvents.occurredAt), asc(auditEvents.id));

  const revisions = revisionRows.map((r) => ({ ...r, assessment: r.assessment as Assessment }));
  const current = revisions.find((r) => r.id === application.currentRevisionId) ?? revisions.at(-1) ?? null;
  const previous = current ? (revisions.filter((r) => r.revision < current.revision).at(-1) ?? null) : null;
  const diff: DiffEntry[] | null = current && previous ? revisionDiff(previous, current) : null;

  let options: DecisionOptions | null = null;
  if (current && can(user, "application.review")) {
    options = decisionOptions({
      actor: user,
      application,
      rules,
      submittedById: current.submittedById,
      signerIds: decisionRows.filter((d) => d.revisionId === current.id).map((d) => d.signerId),
    });
  }
  const today = permitRows.length ? await institutionToday(now) : null;
  const permit = permitRows[0]
    ? { ...permitRows[0], effectiveState: effectivePermitState(permitRows[0], today!) }
    : null;

  return {
    application,
    applicantName: row.applicantName,
    departmentName: row.departmentName,
    revisions,
    current,
    previous,
    diff,
    decisions: decisionRows,
    audit,
    permit,
    rules,
    pending: pendingStep(application, rules),
    options,
  };
}

/** The audit trail between two instants (inclusive), oldest first, for the CSV export. */
export async function auditForExport(range: { from?: Date; to?: Date }, limit = 100_000) {
  return db
    .select({
      id: auditEvents.id,
      occurredAt: auditEvents.occurredAt,
      actorId: auditEvents.actorId,
      actorName: auditEvents.actorName,
      action: auditEvents.action,
      entityType: auditEvents.entityType,
      entityId: auditEvents.entityId,
      data: auditEvents.data,
    })
    .from(auditEvents)
    .where(
      and(
        range.from ? gte(auditEvents.occurredAt, range.from) : undefined,
        range.to ? lte(auditEvents.occurredAt, range.to) : undefined,
      ),
    )
    .orderBy(asc(auditEvents.occurredAt), asc(auditEvents.id))
    .limit(limit);
}

/**
 * The comments of the decision that returned the application's current revision, for the edit page
 * to show beside the fields they are pinned to ("event.firstDay", "step:2"). Empty unless the
 * application is returned and this user may read it.
 */
export async function returnCommentsFor(user: CurrentUser, applicationId: string) {
  const [app] = await db
    .select({
      state: applications.state,
      applicantId: applications.applicantId,
      namedUserIds: applications.namedUserIds,
      departmentId: applications.departmentId,
      submittedAt: applications.submittedAt,
      currentRevisionId: applications.currentRevisionId,
    })
    .from(applications)
    .where(eq(applications.id, applicationId));
  if (!app || app.state !== "returned" || !app.currentRevisionId || !canReadApplication(user, app)) return [];
  return db
    .select({
      id: decisions.id,
      comment: decisions.comment,
      pinnedTo: decisions.pinnedTo,
      signerName: decisions.signerName,
      signerRole: decisions.signerRole,
      signedAt: decisions.signedAt,
    })
    .from(decisions)
    .where(and(eq(decisions.revisionId, app.currentRevisionId), eq(decisions.kind, "return")))
    .orderBy(asc(decisions.signedAt));
}
