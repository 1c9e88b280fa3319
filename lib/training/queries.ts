import "server-only";
import { and, asc, desc, eq, inArray, isNull, lte, or, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  applicationRevisions,
  applications,
  courseTypes,
  departments,
  permits,
  trainingRecords,
  users,
  type CourseType,
} from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { can, type CurrentUser } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { permitScope } from "@/lib/permits/queries";
import { trainingStatus, type CourseCheck, type OperatorTraining, type TrainingStatus } from "./status";

// Reads of training records. Everyone reads their own record; holders of training.record read
// anyone's. A course's lapse day is computed by PostgreSQL's calendar arithmetic (completed_on +
// validity_months months, clamped to the month's end: 2024-01-31 + 1 month = 2024-02-29), in one
// place: lapsesOnSql below.

/** The day a completion lapses: the completion day plus the course's validity in calendar months. */
const lapsesOnSql = sql<string>`(max(${trainingRecords.completedOn}) + make_interval(months => max(${courseTypes.validityMonths})::int))::date::text`;

export async function listCourseTypes(options: { includeRetired?: boolean } = {}, tx: DbOrTx = db) {
  return tx
    .select({
      id: courseTypes.id,
      name: courseTypes.name,
      covers: courseTypes.covers,
      validityMonths: courseTypes.validityMonths,
      minTier: courseTypes.minTier,
      departmentId: courseTypes.departmentId,
      departmentName: departments.name,
      retiredAt: courseTypes.retiredAt,
    })
    .from(courseTypes)
    .leftJoin(departments, eq(departments.id, courseTypes.departmentId))
    .where(options.includeRetired ? undefined : isNull(courseTypes.retiredAt))
    .orderBy(asc(courseTypes.minTier), asc(courseTypes.name));
}

export type CourseTypeRow = Awaited<ReturnType<typeof listCourseTypes>>[number];

/** The course types required of an operator at `tier` in `departmentId` (not retired). */
export async function requiredCourses(
  tier: number,
  departmentId: string,
  tx: DbOrTx = db,
): Promise<Pick<CourseType, "id" | "name" | "validityMonths" | "minTier">[]> {
  return tx
    .select({
      id: courseTypes.id,
      name: courseTypes.name,
      validityMonths: courseTypes.validityMonths,
      minTier: courseTypes.minTier,
    })
    .from(courseTypes)
    .where(
      and(
        isNull(courseTypes.retiredAt),
        lte(courseTypes.minTier, tier),
        or(isNull(courseTypes.departmentId), eq(courseTypes.departmentId, departmentId)),
      ),
    )
    .orderBy(asc(courseTypes.minTier), asc(courseTypes.name));
}

/** The latest lapse day per (person, course), from records that are not withdrawn. */
export async function latestLapses(
  userIds: readonly string[],
  courseTypeIds: readonly string[],
  tx: DbOrTx = db,
): Promise<Map<string, { lapsesOn: string; completedOn: string }>> {
  const out = new Map<string, { lapsesOn: string; completedOn: string }>();
  if (userIds.length === 0 || courseTypeIds.length === 0) return out;
  const rows = await tx
    .select({
      userId: trainingRecords.userId,
      courseTypeId: trainingRecords.courseTypeId,
      completedOn: sql<string>`max(${trainingRecords.completedOn})::text`,
      lapsesOn: lapsesOnSql,
    })
    .from(trainingRecords)
    .innerJoin(courseTypes, eq(courseTypes.id, trainingRecords.courseTypeId))
    .where(
      and(
        inArray(trainingRecords.userId, [...userIds]),
        inArray(trainingRecords.courseTypeId, [...courseTypeIds]),
        isNull(trainingRecords.removedAt),
      ),
    )
    .groupBy(trainingRecords.userId, trainingRecords.courseTypeId);
  for (const r of rows) out.set(`${r.userId}:${r.courseTypeId}`, { lapsesOn: r.lapsesOn, completedOn: r.completedOn });
  return out;
}

export type NamedOperator = { userId: string | null; name: string };

/** The named operators of an application's content (event.operators), as stored. */
export function operatorsOf(content: unknown): NamedOperator[] {
  const list = (content as { event?: { operators?: unknown } } | null)?.event?.operators;
  if (!Array.isArray(list)) return [];
  return list
    .filter((o): o is { userId?: unknown; name?: unknown } => typeof o === "object" && o !== null)
    .map((o) => ({
      userId: typeof o.userId === "string" && o.userId ? o.userId : null,
      name: typeof o.name === "string" ? o.name : "",
    }));
}

/**
 * Each named operator's training against the courses the tier requires in the department, through
 * `throughDay` (the permit's last day): current, lapses on or before that day, or missing. Operators
 * named without an account have no record in Benchclear: every required course is missing.
 */
export async function operatorTraining(
  input: { tier: number; departmentId: string; operators: readonly NamedOperator[]; throughDay: string },
  tx: DbOrTx = db,
): Promise<OperatorTraining[]> {
  if (input.operators.length === 0) return [];
  const courses = await requiredCourses(input.tier, input.departmentId, tx);
  const ids = [...new Set(input.operators.map((o) => o.userId).filter((id): id is string => Boolean(id)))];
  const lapses = await latestLapses(
    ids,
    courses.map((c) => c.id),
    tx,
  );
  return input.operators.map((operator) => ({
    operator: operator.name,
    userId: operator.userId,
    courses: courses.map((course): CourseCheck => {
      const found = operator.userId ? lapses.get(`${operator.userId}:${course.id}`) : undefined;
      return {
        courseTypeId: course.id,
        course: course.name,
        minTier: course.minTier,
        lapsesOn: found?.lapsesOn ?? null,
        status: trainingStatus(found?.lapsesOn ?? null, input.throughDay),
      };
    }),
  }));
}

/** One person's records with each course's status today (their account page, the officers' page). */
export async function recordsOf(viewer: CurrentUser, userId: string, today: string, tx: DbOrTx = db) {
  if (viewer.id !== userId && !can(viewer, "training.record")) throw notFound("That person");
  const rows = await tx
    .select({
      id: trainingRecords.id,
      courseTypeId: trainingRecords.courseTypeId,
      course: courseTypes.name,
      validityMonths: courseTypes.validityMonths,
      completedOn: trainingRecords.completedOn,
      lapsesOn: sql<string>`(${trainingRecords.completedOn} + make_interval(months => ${courseTypes.validityMonths}::int))::date::text`,
      trainer: trainingRecords.trainer,
      certificateFilename: trainingRecords.certificateFilename,
      recordedByName: users.name,
      createdAt: trainingRecords.createdAt,
    })
    .from(trainingRecords)
    .innerJoin(courseTypes, eq(courseTypes.id, trainingRecords.courseTypeId))
    .innerJoin(users, eq(users.id, trainingRecords.recordedById))
    .where(and(eq(trainingRecords.userId, userId), isNull(trainingRecords.removedAt)))
    .orderBy(asc(courseTypes.name), desc(trainingRecords.completedOn));
  // A newer completion of the same course replaces an older one.
  const seen = new Set<string>();
  return rows.map((r) => {
    const superseded = seen.has(r.courseTypeId);
    seen.add(r.courseTypeId);
    const status: TrainingStatus | "superseded" = superseded ? "superseded" : trainingStatus(r.lapsesOn, today);
    return { ...r, status };
  });
}

export type TrainingRecordRow = Awaited<ReturnType<typeof recordsOf>>[number];

/** People an officer can record training for (active accounts), for the record form's list. */
export async function trainablePeople(tx: DbOrTx = db) {
  return tx
    .select({ id: users.id, name: users.name, email: users.email })
    .from(users)
    .where(isNull(users.disabledAt))
    .orderBy(asc(users.name))
    .limit(1000);
}

/** The stored certificate of a record, for its person or a holder of training.record. */
export async function certificateFor(viewer: CurrentUser, recordId: string, tx: DbOrTx = db) {
  const [row] = await tx
    .select({
      userId: trainingRecords.userId,
      key: trainingRecords.certificateKey,
      filename: trainingRecords.certificateFilename,
      contentType: trainingRecords.certificateContentType,
    })
    .from(trainingRecords)
    .where(and(eq(trainingRecords.id, recordId), isNull(trainingRecords.removedAt)));
  if (!row || (row.userId !== viewer.id && !can(viewer, "training.record"))) throw notFound("That training record");
  if (!row.key || !row.filename || !row.contentType) throw notFound("That certificate");
  return { key: row.key, filename: row.filename, contentType: row.contentType };
}

export type PermitTrainingLapse = {
  permitId: string;
  number: string;
  title: string;
  validTo: string;
  operator: string;
  course: string;
  /** The day the training lapses (null: no record at all). */
  lapsesOn: string | null;
};

/**
 * Active permits (of the viewer's scope, or one permit) whose named operator's required training
 * lapses on or before the permit's last day, or has no record. Operators named without an account
 * have no record to lapse and are not listed here (the approval asked about them). One SQL query:
 * the operators are read from the signed revision's content.
 */
export async function permitTrainingLapses(
  viewer: CurrentUser,
  today: string,
  options: { permitId?: string; limit?: number } = {},
  tx: DbOrTx = db,
): Promise<PermitTrainingLapse[]> {
  const rows = await tx.execute<{
    permit_id: string;
    number: string;
    title: string;
    valid_to: string;
    operator: string;
    course: string;
    lapses_on: string | null;
  }>(sql`
    SELECT permit_id, number, title, last_day::text AS valid_to, operator, course, lapses::text AS lapses_on FROM (
      SELECT ${permits.id} AS permit_id, ${permits.number} AS number, ${applications.title} AS title,
        ${permits.validTo} AS last_day, coalesce(op ->> 'name', '') AS operator, ct.name AS course,
        (
          SELECT (max(tr.completed_on) + make_interval(months => ct.validity_months::int))::date
          FROM ${trainingRecords} tr
          WHERE tr.user_id = (op ->> 'userId')::uuid AND tr.course_type_id = ct.id AND tr.removed_at IS NULL
        ) AS lapses
      FROM ${permits}
      JOIN ${applications} ON ${applications.id} = ${permits.applicationId}
      JOIN ${applicationRevisions} ON ${applicationRevisions.id} = ${permits.revisionId}
      CROSS JOIN LATERAL jsonb_array_elements(
        coalesce(${applicationRevisions.content} -> 'event' -> 'operators', '[]'::jsonb)
      ) AS op
      JOIN ${courseTypes} ct ON ct.retired_at IS NULL AND ct.min_tier <= ${permits.tier}
        AND (ct.department_id IS NULL OR ct.department_id = ${applications.departmentId})
      WHERE ${permitScope(viewer)}
        AND ${permits.state} = 'active'
        AND ${permits.validTo} >= ${today}::date
        AND ${options.permitId ? sql`${permits.id} = ${options.permitId}::uuid` : sql`true`}
        AND (op ->> 'userId') ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$'
    ) AS checked
    WHERE lapses IS NULL OR lapses <= last_day
    -- By the date itself (not its text), so PostgreSQL walks the active permits in order through
    -- permit_valid_to_idx and stops at the limit instead of sorting every active permit (18,014 at
    -- 100k permits; docs/performance.md).
    ORDER BY last_day, number, operator, course
    LIMIT ${options.limit ?? 50}
  `);
  return rows.rows.map((r) => ({
    permitId: r.permit_id,
    number: r.number,
    title: r.title,
    validTo: r.valid_to,
    operator: r.operator,
    course: r.course,
    lapsesOn: r.lapses_on,
  }));
}
