import "server-only";
import { and, asc, desc, eq, ilike, isNull, or, sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, apparatusRevisions, departments, users } from "@/db/schema";
import { assertCan, can, type CurrentUser } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import type { ApparatusListQuery } from "@/lib/apparatus/schemas";
import { canReadApparatus, canWriteApparatus } from "./access";

// Reads of the apparatus registry. Every read is limited to the records the user may see
// (lib/apparatus/access.ts) in the query itself, so a guessed id answers 404 like a missing one.

/** The SQL form of canReadApparatus, for lists and search. Requires the user first (never an undefined id). */
export function apparatusReadScope(user: CurrentUser): SQL | undefined {
  if (can(user, "application.read.any")) return undefined;
  const mine = eq(apparatus.ownerId, user.id);
  return user.departmentId ? or(mine, eq(apparatus.departmentId, user.departmentId)) : mine;
}

/** Escapes LIKE wildcards so a search for "50%" means the text "50%". */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

const SORT_COLUMNS = {
  name: sql`lower(${apparatus.name})`,
  room: sql`lower(${apparatus.room})`,
  tier: apparatus.tier,
  energy: apparatus.energy_J,
  updated: apparatus.updatedAt,
} as const;

export async function listApparatus(user: CurrentUser, query: ApparatusListQuery) {
  assertCan(user, "apparatus.read");
  const conditions: (SQL | undefined)[] = [isNull(apparatus.archivedAt), apparatusReadScope(user)];
  if (query.owner === "mine") conditions.push(eq(apparatus.ownerId, user.id));
  if (query.tier !== undefined) conditions.push(eq(apparatus.tier, query.tier));
  if (query.q) {
    const pattern = likePattern(query.q);
    conditions.push(
      or(ilike(apparatus.name, pattern), ilike(apparatus.room, pattern), ilike(apparatus.notes, pattern)),
    );
  }
  const where = and(...conditions);
  const order = query.dir === "asc" ? asc : desc;

  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: apparatus.id,
        name: apparatus.name,
        room: apparatus.room,
        tier: apparatus.tier,
        energy_J: apparatus.energy_J,
        currentRevision: apparatus.currentRevision,
        updatedAt: apparatus.updatedAt,
        retiredAt: apparatus.retiredAt,
        ownerId: apparatus.ownerId,
        ownerName: users.name,
        departmentName: departments.name,
      })
      .from(apparatus)
      .innerJoin(users, eq(users.id, apparatus.ownerId))
      .innerJoin(departments, eq(departments.id, apparatus.departmentId))
      .where(where)
      // The id breaks ties, so paging through equal sort keys never repeats or skips a row.
      .orderBy(order(SORT_COLUMNS[query.sort]), order(apparatus.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ total: sql<number>`count(*)::int` })
      .from(apparatus)
      .where(where),
  ]);
  return { rows, total, page: query.page, pageSize: query.pageSize };
}

export type ApparatusListRow = Awaited<ReturnType<typeof listApparatus>>["rows"][number];

/** One apparatus with its current revision (set-up and assessment) and the list of its revisions. */
export async function getApparatus(user: CurrentUser, id: string) {
  assertCan(user, "apparatus.read");
  const [row] = await db
    .select({
      id: apparatus.id,
      name: apparatus.name,
      room: apparatus.room,
      notes: apparatus.notes,
      departmentId: apparatus.departmentId,
      departmentName: departments.name,
      ownerId: apparatus.ownerId,
      ownerName: users.name,
      currentRevision: apparatus.currentRevision,
      tier: apparatus.tier,
      energy_J: apparatus.energy_J,
      archivedAt: apparatus.archivedAt,
      retiredAt: apparatus.retiredAt,
      retiredReason: apparatus.retiredReason,
      createdAt: apparatus.createdAt,
      updatedAt: apparatus.updatedAt,
    })
    .from(apparatus)
    .innerJoin(users, eq(users.id, apparatus.ownerId))
    .innerJoin(departments, eq(departments.id, apparatus.departmentId))
    .where(eq(apparatus.id, id))
    .limit(1);
  if (!row || !canReadApparatus(user, row)) throw notFound("That apparatus");

  const revisions = await db
    .select({
      id: apparatusRevisions.id,
      revision: apparatusRevisions.revision,
      name: apparatusRevisions.name,
      room: apparatusRevisions.room,
      notes: apparatusRevisions.notes,
      setup: apparatusRevisions.setup,
      assessment: apparatusRevisions.assessment,
      tier: apparatusRevisions.tier,
      createdAt: apparatusRevisions.createdAt,
      createdByName: users.name,
    })
    .from(apparatusRevisions)
    .innerJoin(users, eq(users.id, apparatusRevisions.createdById))
    .where(eq(apparatusRevisions.apparatusId, id))
    .orderBy(desc(apparatusRevisions.revision));
  const current = revisions.find((r) => r.revision === row.currentRevision) ?? revisions[0];
  return {
    ...row,
    canEdit: canWriteApparatus(user, row),
    current,
    revisions: revisions.map(({ id: revisionId, revision, name, room, tier, createdAt, createdByName }) => ({
      id: revisionId,
      revision,
      name,
      room,
      tier,
      createdAt,
      createdByName,
    })),
  };
}

export type ApparatusDetail = Awaited<ReturnType<typeof getApparatus>>;

/**
 * One revision of an apparatus the user may read, or null. Applications use it to record (and check)
 * the exact revision they were written against.
 */
export async function findReadableRevision(user: CurrentUser, apparatusId: string, revisionId: string) {
  const [row] = await db
    .select({
      ownerId: apparatus.ownerId,
      departmentId: apparatus.departmentId,
      revisionId: apparatusRevisions.id,
      revision: apparatusRevisions.revision,
      name: apparatusRevisions.name,
      room: apparatusRevisions.room,
      notes: apparatusRevisions.notes,
      setup: apparatusRevisions.setup,
      tier: apparatusRevisions.tier,
    })
    .from(apparatusRevisions)
    .innerJoin(apparatus, eq(apparatus.id, apparatusRevisions.apparatusId))
    .where(and(eq(apparatusRevisions.id, revisionId), eq(apparatusRevisions.apparatusId, apparatusId)))
    .limit(1);
  if (!row || !can(user, "apparatus.read") || !canReadApparatus(user, row)) return null;
  return row;
}

/** The registry records the application form offers to pick from (current revisions, newest first). */
export async function listApparatusChoices(user: CurrentUser, limit = 200) {
  assertCan(user, "apparatus.read");
  return (
    db
      .select({
        id: apparatus.id,
        name: apparatus.name,
        room: apparatus.room,
        tier: apparatus.tier,
        currentRevision: apparatus.currentRevision,
      })
      .from(apparatus)
      // A retired apparatus is kept for the record but no longer offered (lib/upkeep).
      .where(and(isNull(apparatus.archivedAt), isNull(apparatus.retiredAt), apparatusReadScope(user)))
      .orderBy(desc(apparatus.updatedAt), asc(apparatus.id))
      .limit(limit)
  );
}

/**
 * The apparatus inventory for the CSV export: every record the user may read (retired or archived
 * ones too, marked), with its current revision's set-up and figures. Oldest department first, then name.
 */
export async function apparatusForExport(user: CurrentUser) {
  assertCan(user, "apparatus.read");
  return db
    .select({
      id: apparatus.id,
      name: apparatus.name,
      room: apparatus.room,
      departmentName: departments.name,
      ownerName: users.name,
      ownerEmail: users.email,
      revision: apparatus.currentRevision,
      tier: apparatus.tier,
      setup: apparatusRevisions.setup,
      assessment: apparatusRevisions.assessment,
      archivedAt: apparatus.archivedAt,
      updatedAt: apparatus.updatedAt,
    })
    .from(apparatus)
    .innerJoin(users, eq(users.id, apparatus.ownerId))
    .innerJoin(departments, eq(departments.id, apparatus.departmentId))
    .innerJoin(
      apparatusRevisions,
      and(eq(apparatusRevisions.apparatusId, apparatus.id), eq(apparatusRevisions.revision, apparatus.currentRevision)),
    )
    .where(apparatusReadScope(user))
    .orderBy(asc(departments.name), sql`lower(${apparatus.name})`, asc(apparatus.id));
}
