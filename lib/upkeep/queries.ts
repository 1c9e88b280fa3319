import "server-only";
import { and, desc, eq, inArray, max } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, apparatusInspections, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { canReadApparatus } from "@/lib/apparatus/access";
import type { CurrentUser } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { todayIn } from "@/lib/permits/dates";
import { institutionTimeZone } from "@/lib/settings/queries";
import { canKeepUp } from "./access";
import { inspectionStatus } from "./due";

// Reads of apparatus upkeep. Records are read by whoever reads the apparatus (lib/apparatus/access).

/** The apparatus's upkeep facts, or null when it does not exist (no scope: callers check). */
export async function upkeepRow(tx: DbOrTx, apparatusId: string) {
  const [row] = await tx
    .select({
      id: apparatus.id,
      name: apparatus.name,
      room: apparatus.room,
      ownerId: apparatus.ownerId,
      departmentId: apparatus.departmentId,
      createdAt: apparatus.createdAt,
      inspectionInterval_days: apparatus.inspectionInterval_days,
      retiredAt: apparatus.retiredAt,
      retiredReason: apparatus.retiredReason,
      retiredById: apparatus.retiredById,
    })
    .from(apparatus)
    .where(eq(apparatus.id, apparatusId))
    .limit(1);
  return row ?? null;
}

/** The day of the last inspection that passed or ended in a repair, per apparatus. */
export async function lastPassedOn(tx: DbOrTx, apparatusIds: string[]): Promise<Map<string, string>> {
  if (apparatusIds.length === 0) return new Map();
  const rows = await tx
    .select({ apparatusId: apparatusInspections.apparatusId, last: max(apparatusInspections.inspectedOn) })
    .from(apparatusInspections)
    .where(
      and(
        inArray(apparatusInspections.apparatusId, apparatusIds),
        inArray(apparatusInspections.result, ["pass", "repaired"]),
      ),
    )
    .groupBy(apparatusInspections.apparatusId);
  return new Map(rows.filter((r) => r.last).map((r) => [r.apparatusId, r.last as string]));
}

/** An apparatus's records (newest first), its interval and due day, retirement, and what this user may do. */
export async function getUpkeep(user: CurrentUser, apparatusId: string, now = new Date()) {
  const row = await upkeepRow(db, apparatusId);
  if (!row || !canReadApparatus(user, row)) throw notFound("That apparatus");
  const timeZone = await institutionTimeZone();
  const today = todayIn(timeZone, now);
  const [records, last, retiredBy] = await Promise.all([
    db
      .select({
        id: apparatusInspections.id,
        kind: apparatusInspections.kind,
        inspectedOn: apparatusInspections.inspectedOn,
        inspectedBy: apparatusInspections.inspectedBy,
        result: apparatusInspections.result,
        note: apparatusInspections.note,
        photoFilename: apparatusInspections.photoFilename,
        photoContentType: apparatusInspections.photoContentType,
        recordedByName: users.name,
        createdAt: apparatusInspections.createdAt,
      })
      .from(apparatusInspections)
      .innerJoin(users, eq(users.id, apparatusInspections.recordedById))
      .where(eq(apparatusInspections.apparatusId, apparatusId))
      .orderBy(desc(apparatusInspections.inspectedOn), desc(apparatusInspections.createdAt))
      .limit(200),
    lastPassedOn(db, [apparatusId]),
    row.retiredById
      ? db.select({ name: users.name }).from(users).where(eq(users.id, row.retiredById))
      : Promise.resolve([]),
  ]);
  const mayKeepUp = canKeepUp(user, row);
  return {
    apparatusId,
    inspectionInterval_days: row.inspectionInterval_days,
    lastPassedOn: last.get(apparatusId) ?? null,
    status: row.retiredAt
      ? null
      : inspectionStatus({
          intervalDays: row.inspectionInterval_days,
          lastPassedOn: last.get(apparatusId) ?? null,
          registeredOn: todayIn(timeZone, row.createdAt),
          today,
        }),
    retired: row.retiredAt
      ? { at: row.retiredAt, reason: row.retiredReason ?? "", byName: retiredBy[0]?.name ?? null }
      : null,
    records: records.map(({ photoFilename, ...r }) => ({ ...r, photo: photoFilename })),
    today,
    mayRecord: mayKeepUp,
    maySetInterval: mayKeepUp && !row.retiredAt,
    mayRetire: mayKeepUp && !row.retiredAt,
  };
}

export type Upkeep = Awaited<ReturnType<typeof getUpkeep>>;

/** One record's stored photo, for a user who reads the apparatus. */
export async function getInspectionPhoto(user: CurrentUser, apparatusId: string, inspectionId: string) {
  const row = await upkeepRow(db, apparatusId);
  if (!row || !canReadApparatus(user, row)) throw notFound("That photo");
  const [record] = await db
    .select({
      key: apparatusInspections.photoKey,
      filename: apparatusInspections.photoFilename,
      contentType: apparatusInspections.photoContentType,
    })
    .from(apparatusInspections)
    .where(and(eq(apparatusInspections.id, inspectionId), eq(apparatusInspections.apparatusId, apparatusId)))
    .limit(1);
  if (!record?.key || !record.filename || !record.contentType) throw notFound("That photo");
  return { key: record.key, filename: record.filename, contentType: record.contentType };
}
