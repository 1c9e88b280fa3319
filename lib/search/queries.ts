import "server-only";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  apparatus,
  applicationRevisions,
  applications,
  departments,
  permits,
  users,
  type ApplicationState,
  type PermitState,
  type Role,
} from "@/db/schema";
import { apparatusReadScope, likePattern } from "@/lib/apparatus/queries";
import { applicationReadScope, canReadApplication } from "@/lib/applications/access";
import { assertCan, can, type CurrentUser } from "@/lib/auth/guards";
import { effectiveStateSql, institutionToday, permitScope } from "@/lib/permits/queries";

// The header's search: permits (number, title, room, holder), applications (reference, title,
// applicant), apparatus (name, room) and people (name), each limited to what the signed-in person
// may see by the rule of its own domain — permitScope (lib/permits), the application read rule
// (lib/applications/access.ts: its SQL form narrows the rows, canReadApplication decides each one),
// the apparatus read scope (lib/apparatus) — and to the permission "search" (lib/auth/permissions.ts).
// Matching is a case-insensitive substring (ILIKE '%q%') that the trigram indexes of migration
// 0013_search_trgm serve; each kind reads its matches through one index per column (a UNION of ids),
// because one OR across joined tables would read every row. Ranked by trigram similarity, best first.

/** Rows shown per kind; one more is read to say that there are more. */
export const SEARCH_LIMIT = 10;

export type PermitHit = {
  id: string;
  number: string;
  title: string;
  room: string | null;
  holderName: string;
  tier: number;
  state: PermitState;
};
export type ApplicationHit = {
  id: string;
  reference: string;
  title: string;
  applicantName: string;
  state: ApplicationState;
  tier: number | null;
};
export type ApparatusHit = { id: string; name: string; room: string; tier: number; departmentName: string };
export type PersonHit = {
  id: string;
  name: string;
  departmentName: string | null;
  /** Only for those who manage accounts (admin.users); others see names and departments, as when naming operators. */
  email: string | null;
  roles: Role[] | null;
  disabled: boolean;
};

export type Group<T> = { rows: T[]; more: boolean };

export type SearchResults = {
  q: string;
  permits: Group<PermitHit>;
  applications: Group<ApplicationHit>;
  apparatus: Group<ApparatusHit>;
  people: Group<PersonHit>;
};

const group = <T>(rows: T[]): Group<T> => ({ rows: rows.slice(0, SEARCH_LIMIT), more: rows.length > SEARCH_LIMIT });
const none = <T>(): Group<T> => ({ rows: [], more: false });

const room = sql`(${applicationRevisions.content} -> 'event') ->> 'room'`;

/** "A-123", "a123", "A 123": an application's reference, as its number. */
function applicationSeq(q: string): number | null {
  const match = /^a[-\s]?(\d{1,15})$/i.exec(q);
  return match ? Number(match[1]) : null;
}

async function searchPermits(user: CurrentUser, q: string, pattern: string, today: string): Promise<PermitHit[]> {
  // Each branch reads one trigram index, then the permit by a unique or indexed key.
  const hits = sql`(
    SELECT p.id FROM permit p WHERE p.number ILIKE ${pattern}
    UNION SELECT p.id FROM application a JOIN permit p ON p.application_id = a.id WHERE a.title ILIKE ${pattern}
    UNION SELECT p.id FROM application_revision r JOIN permit p ON p.application_id = r.application_id AND p.revision_id = r.id
      WHERE (r.content -> 'event') ->> 'room' ILIKE ${pattern}
    UNION SELECT p.id FROM app_user u JOIN permit p ON p.holder_id = u.id WHERE u.name ILIKE ${pattern}
  )`;
  const rank = sql`greatest(similarity(${permits.number}, ${q}), similarity(${applications.title}, ${q}), similarity(coalesce(${room}, ''), ${q}), similarity(${users.name}, ${q}))`;
  return db
    .select({
      id: permits.id,
      number: permits.number,
      title: applications.title,
      room: sql<string | null>`${room}`,
      holderName: users.name,
      tier: permits.tier,
      state: effectiveStateSql(today),
    })
    .from(permits)
    .innerJoin(applications, eq(applications.id, permits.applicationId))
    .innerJoin(applicationRevisions, eq(applicationRevisions.id, permits.revisionId))
    .innerJoin(users, eq(users.id, permits.holderId))
    .where(and(sql`${permits.id} IN ${hits}`, permitScope(user)))
    .orderBy(desc(rank), desc(permits.issuedAt))
    .limit(SEARCH_LIMIT + 1);
}

async function searchApplications(user: CurrentUser, q: string, pattern: string): Promise<ApplicationHit[]> {
  const seq = applicationSeq(q);
  const hits = sql`(
    SELECT a.id FROM application a WHERE a.title ILIKE ${pattern}
    UNION SELECT a.id FROM app_user u JOIN application a ON a.applicant_id = u.id WHERE u.name ILIKE ${pattern}
    ${seq === null ? sql`` : sql`UNION SELECT a.id FROM application a WHERE a.seq = ${seq}`}
  )`;
  const rank = sql`greatest(similarity(${applications.title}, ${q}), similarity(${users.name}, ${q}))`;
  const rows = await db
    .select({
      id: applications.id,
      seq: applications.seq,
      title: applications.title,
      applicantName: users.name,
      state: applications.state,
      tier: applications.tier,
      // What canReadApplication needs.
      applicantId: applications.applicantId,
      departmentId: applications.departmentId,
      namedUserIds: applications.namedUserIds,
      submittedAt: applications.submittedAt,
    })
    .from(applications)
    .innerJoin(users, eq(users.id, applications.applicantId))
    .where(and(sql`${applications.id} IN ${hits}`, applicationReadScope(user)))
    .orderBy(
      ...(seq === null ? [] : [desc(sql`${applications.seq} = ${seq}`)]),
      desc(rank),
      desc(applications.updatedAt),
    )
    .limit(SEARCH_LIMIT + 1);
  // The SQL scope narrows the rows; the one rule decides each of them.
  return rows
    .filter((row) => canReadApplication(user, row))
    .map((row) => ({
      id: row.id,
      reference: `A-${row.seq}`,
      title: row.title,
      applicantName: row.applicantName,
      state: row.state,
      tier: row.tier,
    }));
}

async function searchApparatus(user: CurrentUser, q: string, pattern: string): Promise<ApparatusHit[]> {
  if (!can(user, "apparatus.read")) return [];
  const hits = sql`(
    SELECT x.id FROM apparatus x WHERE x.name ILIKE ${pattern}
    UNION SELECT x.id FROM apparatus x WHERE x.room ILIKE ${pattern}
  )`;
  const rank = sql`greatest(similarity(${apparatus.name}, ${q}), similarity(${apparatus.room}, ${q}))`;
  return db
    .select({
      id: apparatus.id,
      name: apparatus.name,
      room: apparatus.room,
      tier: apparatus.tier,
      departmentName: departments.name,
    })
    .from(apparatus)
    .innerJoin(departments, eq(departments.id, apparatus.departmentId))
    .where(and(sql`${apparatus.id} IN ${hits}`, isNull(apparatus.archivedAt), apparatusReadScope(user)))
    .orderBy(desc(rank), apparatus.name)
    .limit(SEARCH_LIMIT + 1);
}

async function searchPeople(user: CurrentUser, q: string, pattern: string): Promise<PersonHit[]> {
  const manages = can(user, "admin.users");
  // Naming a responsible person or an operator already shows any active person's name and department
  // to those who write applications (lib/applications/queries.ts searchPeople); search shows no more.
  if (!manages && !can(user, "application.create")) return [];
  const rows = await db
    .select({
      id: users.id,
      name: users.name,
      departmentName: departments.name,
      email: users.email,
      roles: users.roles,
      disabledAt: users.disabledAt,
    })
    .from(users)
    .leftJoin(departments, eq(departments.id, users.departmentId))
    .where(and(sql`${users.name} ILIKE ${pattern}`, manages ? undefined : isNull(users.disabledAt)))
    .orderBy(desc(sql`similarity(${users.name}, ${q})`), users.name, users.id)
    .limit(SEARCH_LIMIT + 1);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    departmentName: r.departmentName,
    email: manages ? r.email : null,
    roles: manages ? r.roles : null,
    disabled: r.disabledAt !== null,
  }));
}

/** Everything the user may see that matches `q` (already validated by searchQuerySchema), grouped by kind. */
export async function search(user: CurrentUser, q: string): Promise<SearchResults> {
  assertCan(user, "search");
  const pattern = likePattern(q);
  const today = await institutionToday();
  const [p, a, x, people] = await Promise.all([
    searchPermits(user, q, pattern, today),
    searchApplications(user, q, pattern),
    searchApparatus(user, q, pattern),
    searchPeople(user, q, pattern),
  ]);
  return { q, permits: group(p), applications: group(a), apparatus: group(x), people: group(people) };
}

/** No results (the page before a search, or after a query it refused). */
export function emptyResults(q: string): SearchResults {
  return { q, permits: none(), applications: none(), apparatus: none(), people: none() };
}
