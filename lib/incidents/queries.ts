import "server-only";
import { aliasedTable, and, getTableColumns, sql, asc, count, desc, eq, inArray, or, type SQL } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, applications, auditEvents, incidentPhotos, incidents, permits, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { can, type CurrentUser } from "@/lib/auth/guards";
import { INCIDENT_READ_BY_LINKED_PERMIT_HOLDER } from "@/lib/auth/permissions";
import { notFound } from "@/lib/errors";
import { effectivePermitState } from "@/lib/permits/dates";
import { institutionToday, permitScope } from "@/lib/permits/queries";
import { listApparatusChoices } from "@/lib/apparatus/queries";
import { INCIDENT_MOVES, type IncidentListQuery } from "./schemas";

// Reads of incident reports. Who reads one (lib/auth/permissions.ts): its reporter, incident.read.any
// (officers, admins) and, through the link, the holder of the permit it names — without the
// reporter's name. The rule is applied in the query, so a report one may not read answers 404.

export const INCIDENT_PAGE_SIZE = 25;

/** The reports `user` may read, as a WHERE condition (undefined: all of them). */
function readableBy(user: CurrentUser): SQL | undefined {
  if (can(user, "incident.read.any")) return undefined;
  const own = eq(incidents.reporterId, user.id);
  if (!INCIDENT_READ_BY_LINKED_PERMIT_HOLDER) return own;
  const held = db.select({ id: permits.id }).from(permits).where(eq(permits.holderId, user.id));
  return or(own, inArray(incidents.permitId, held));
}

/** Whether the reporter's name is shown to `user` for a report by `reporterId`. */
export function showsReporter(user: CurrentUser, reporterId: string): boolean {
  return reporterId === user.id || can(user, "incident.read.any");
}

const reporter = aliasedTable(users, "reporter");

export async function listIncidents(user: CurrentUser, query: Partial<IncidentListQuery> = {}) {
  const where = and(
    readableBy(user),
    query.state ? eq(incidents.state, query.state) : undefined,
    query.permitId ? eq(incidents.permitId, query.permitId) : undefined,
    query.apparatusId ? eq(incidents.apparatusId, query.apparatusId) : undefined,
  );
  const page = query.page ?? 1;
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: incidents.id,
        seq: incidents.seq,
        kind: incidents.kind,
        summary: incidents.summary,
        occurredAt: incidents.occurredAt,
        location: incidents.location,
        injuries: incidents.injuries,
        state: incidents.state,
        permitId: incidents.permitId,
        permitNumber: permits.number,
        apparatusId: incidents.apparatusId,
        apparatusName: apparatus.name,
        reporterId: incidents.reporterId,
        reporterName: reporter.name,
      })
      .from(incidents)
      .innerJoin(reporter, eq(reporter.id, incidents.reporterId))
      .leftJoin(permits, eq(permits.id, incidents.permitId))
      .leftJoin(apparatus, eq(apparatus.id, incidents.apparatusId))
      .where(where)
      .orderBy(desc(incidents.occurredAt), desc(incidents.id))
      .limit(INCIDENT_PAGE_SIZE)
      .offset((page - 1) * INCIDENT_PAGE_SIZE),
    db.select({ total: count() }).from(incidents).where(where),
  ]);
  return {
    rows: rows.map(({ reporterName, ...row }) => ({
      ...row,
      reporterName: showsReporter(user, row.reporterId) ? reporterName : null,
    })),
    total: Number(total),
    page,
    pageSize: INCIDENT_PAGE_SIZE,
  };
}

export type IncidentListRow = Awaited<ReturnType<typeof listIncidents>>["rows"][number];

/** The report's row for record checks (no scope): null when it does not exist. */
export async function incidentForCheck(tx: DbOrTx, id: string) {
  const [row] = await tx
    .select({
      id: incidents.id,
      reporterId: incidents.reporterId,
      state: incidents.state,
      permitId: incidents.permitId,
      permitHolderId: permits.holderId,
    })
    .from(incidents)
    .leftJoin(permits, eq(permits.id, incidents.permitId))
    .where(eq(incidents.id, id))
    .limit(1);
  return row ?? null;
}

export function canReadIncident(
  user: CurrentUser,
  row: { reporterId: string; permitHolderId: string | null },
): boolean {
  if (can(user, "incident.read.any") || row.reporterId === user.id) return true;
  return INCIDENT_READ_BY_LINKED_PERMIT_HOLDER && row.permitHolderId === user.id;
}

/** One report with its photos, its steps (from the audit trail) and what this user may do with it. */
export async function getIncident(user: CurrentUser, id: string, now = new Date()) {
  const [row] = await db
    .select({
      incident: getTableColumns(incidents),
      reporterName: reporter.name,
      triagedByName: sql<string | null>`(SELECT u.name FROM app_user u WHERE u.id = ${incidents.triagedById})`,
      permitId: permits.id,
      permitNumber: permits.number,
      permitState: permits.state,
      permitValidTo: permits.validTo,
      permitVersion: permits.version,
      permitHolderId: permits.holderId,
      permitTitle: applications.title,
      permitApplicantId: applications.applicantId,
      permitNamedUserIds: applications.namedUserIds,
      apparatusName: apparatus.name,
    })
    .from(incidents)
    .innerJoin(reporter, eq(reporter.id, incidents.reporterId))
    .leftJoin(permits, eq(permits.id, incidents.permitId))
    .leftJoin(applications, eq(applications.id, permits.applicationId))
    .leftJoin(apparatus, eq(apparatus.id, incidents.apparatusId))
    .where(eq(incidents.id, id))
    .limit(1);
  if (!row) throw notFound("That report");
  const permitHolderId = row.permitId ? row.permitHolderId : null;
  if (!canReadIncident(user, { reporterId: row.incident.reporterId, permitHolderId })) throw notFound("That report");

  const [photos, steps, today] = await Promise.all([
    db
      .select({
        id: incidentPhotos.id,
        filename: incidentPhotos.filename,
        contentType: incidentPhotos.contentType,
        size_B: incidentPhotos.size_B,
        createdAt: incidentPhotos.createdAt,
      })
      .from(incidentPhotos)
      .where(eq(incidentPhotos.incidentId, id))
      .orderBy(asc(incidentPhotos.createdAt), asc(incidentPhotos.id)),
    db
      .select({
        id: auditEvents.id,
        occurredAt: auditEvents.occurredAt,
        actorId: auditEvents.actorId,
        actorName: auditEvents.actorName,
        action: auditEvents.action,
        data: auditEvents.data,
      })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "incident"), eq(auditEvents.entityId, id)))
      .orderBy(asc(auditEvents.occurredAt), asc(auditEvents.id)),
    institutionToday(now),
  ]);

  const seesReporter = showsReporter(user, row.incident.reporterId);
  const permit = row.permitId
    ? {
        id: row.permitId,
        number: row.permitNumber!,
        title: row.permitTitle!,
        version: row.permitVersion!,
        state: effectivePermitState({ state: row.permitState!, validTo: row.permitValidTo! }, today),
      }
    : null;
  const involved =
    row.permitHolderId === user.id ||
    row.permitApplicantId === user.id ||
    (row.permitNamedUserIds ?? []).includes(user.id);
  const mayTriage = can(user, "incident.triage");
  return {
    incident: { ...row.incident, reporterId: seesReporter ? row.incident.reporterId : null },
    reporterName: seesReporter ? row.reporterName : null,
    triagedByName: row.triagedByName,
    permit,
    apparatusName: row.apparatusName,
    photos,
    // The reporter's name is in the steps' actor; the holder sees "the reporter" instead.
    steps: steps.map((s) =>
      !seesReporter && s.actorId === row.incident.reporterId ? { ...s, actorId: null, actorName: "The reporter" } : s,
    ),
    mayTriage,
    moves: mayTriage ? INCIDENT_MOVES[row.incident.state] : [],
    // The revoke path's own rules (separation of duties, an active permit) are checked again on use.
    mayRevokePermit: Boolean(
      permit && permit.state === "active" && can(user, "permit.revoke") && mayTriage && !involved,
    ),
    mayAddPhoto: row.incident.state !== "closed" && (mayTriage || row.incident.reporterId === user.id),
  };
}

export type IncidentDetail = Awaited<ReturnType<typeof getIncident>>;

/** A stored photo's row, for a user who may read its report. */
export async function getIncidentPhoto(user: CurrentUser, incidentId: string, photoId: string) {
  const check = await incidentForCheck(db, incidentId);
  if (!check || !canReadIncident(user, check)) throw notFound("That photo");
  const [photo] = await db
    .select()
    .from(incidentPhotos)
    .where(and(eq(incidentPhotos.id, photoId), eq(incidentPhotos.incidentId, incidentId)))
    .limit(1);
  if (!photo) throw notFound("That photo");
  return photo;
}

/**
 * What the report form offers to link: the permits this user can see (newest 100) and the apparatus
 * they can read (the registry's own choices). A report can still name nothing.
 */
export async function reportLinkChoices(user: CurrentUser) {
  const [permitRows, apparatusRows] = await Promise.all([
    db
      .select({ id: permits.id, number: permits.number, title: applications.title })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .where(permitScope(user))
      .orderBy(desc(permits.issuedAt), desc(permits.id))
      .limit(100),
    can(user, "apparatus.read") ? listApparatusChoices(user) : Promise.resolve([]),
  ]);
  return {
    permits: permitRows.map((p) => ({ id: p.id, label: `${p.number} · ${p.title}` })),
    apparatus: apparatusRows.map((a) => ({ id: a.id, label: `${a.name} · ${a.room}` })),
  };
}
