import "server-only";
import crypto from "node:crypto";
import { and, eq, isNotNull, isNull } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, apparatusInspections, users } from "@/db/schema";
import { writeAudit, type Tx } from "@/lib/audit";
import { canReadApparatus } from "@/lib/apparatus/access";
import { cleanFilename, detectAllowedType, type UploadedFile } from "@/lib/applications/attachments";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { AppError, conflict, forbidden, invalidField, notFound } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import { todayIn } from "@/lib/permits/dates";
import { institutionTimeZone } from "@/lib/settings/queries";
import { getStorage, newKey } from "@/lib/storage";
import { canKeepUp } from "./access";
import { inspectionReminderKey, inspectionStatus } from "./due";
import { getInspectionPhoto, lastPassedOn, upkeepRow } from "./queries";
import type { InspectionInput, RetireInput, UpkeepSettingsInput } from "./schemas";

// Writes of apparatus upkeep: inspection and maintenance records, the inspection interval, retiring.
// Each writes its audit event (entity "apparatus") in the same transaction. The registry's own rows
// change only in the upkeep columns; revisions (and what lib/rereview does with them) are untouched.

async function lockForUpkeep(tx: Tx, user: CurrentUser, apparatusId: string) {
  const [row] = await tx
    .select({
      id: apparatus.id,
      ownerId: apparatus.ownerId,
      departmentId: apparatus.departmentId,
      retiredAt: apparatus.retiredAt,
      inspectionInterval_days: apparatus.inspectionInterval_days,
    })
    .from(apparatus)
    .where(eq(apparatus.id, apparatusId))
    .for("update");
  if (!row || !canReadApparatus(user, row)) throw notFound("That apparatus");
  if (!canKeepUp(user, row)) {
    throw forbidden("Only its owner, people of its department and safety officers keep this apparatus's records.");
  }
  return row;
}

/** 404 for an apparatus the user cannot read, 403 when they may not keep it up: before any upload is read. */
export async function assertCanKeepUp(user: CurrentUser, apparatusId: string) {
  const row = await upkeepRow(db, apparatusId);
  if (!row || !canReadApparatus(user, row)) throw notFound("That apparatus");
  if (!canKeepUp(user, row)) {
    throw forbidden("Only its owner, people of its department and safety officers keep this apparatus's records.");
  }
}

export async function recordInspection(
  user: CurrentUser,
  apparatusId: string,
  input: InspectionInput,
  now = new Date(),
) {
  assertCan(user, "apparatus.read");
  const today = todayIn(await institutionTimeZone(), now);
  if (input.inspectedOn > today) throw invalidField("inspectedOn", "The day it was done cannot be in the future.");
  return db.transaction(async (tx) => {
    await lockForUpkeep(tx, user, apparatusId);
    const [row] = await tx
      .insert(apparatusInspections)
      .values({
        apparatusId,
        kind: input.kind,
        inspectedOn: input.inspectedOn,
        inspectedBy: input.inspectedBy,
        result: input.result,
        note: input.note,
        recordedById: user.id,
        createdAt: now,
      })
      .returning();
    await writeAudit(tx, {
      actor: user,
      action: "apparatus.inspection_recorded",
      entityType: "apparatus",
      entityId: apparatusId,
      data: {
        inspectionId: row.id,
        kind: row.kind,
        inspectedOn: row.inspectedOn,
        inspectedBy: row.inspectedBy,
        result: row.result,
      },
    });
    return row;
  });
}

/** One photo per record, by the attachment rules (type from the content, 10 MB). */
export async function addInspectionPhoto(
  user: CurrentUser,
  apparatusId: string,
  inspectionId: string,
  file: UploadedFile,
) {
  await assertCanKeepUp(user, apparatusId);
  const type = await detectAllowedType(file.bytes);
  const filename = cleanFilename(file.name, type.ext);
  const sha256 = crypto.createHash("sha256").update(file.bytes).digest("hex");
  const storageKey = newKey("inspections", type.ext);
  const storage = await getStorage();
  try {
    await storage.put(storageKey, file.bytes, type.mime);
  } catch (error) {
    console.error(`[upkeep] storage refused ${storageKey}:`, error instanceof Error ? error.message : error);
    await storage.delete(storageKey).catch(() => undefined);
    throw new AppError(
      "unavailable",
      "The file store could not save this photo, so nothing was added. Try again later.",
      {
        retryAfterSeconds: 30,
      },
    );
  }
  try {
    return await db.transaction(async (tx) => {
      await lockForUpkeep(tx, user, apparatusId);
      const [row] = await tx
        .update(apparatusInspections)
        .set({
          photoKey: storageKey,
          photoFilename: filename,
          photoContentType: type.mime,
          photoSize_B: file.bytes.length,
          photoSha256: sha256,
        })
        .where(
          and(
            eq(apparatusInspections.id, inspectionId),
            eq(apparatusInspections.apparatusId, apparatusId),
            isNull(apparatusInspections.photoKey),
          ),
        )
        .returning({ id: apparatusInspections.id });
      if (!row) {
        const [exists] = await tx
          .select({ id: apparatusInspections.id })
          .from(apparatusInspections)
          .where(and(eq(apparatusInspections.id, inspectionId), eq(apparatusInspections.apparatusId, apparatusId)));
        if (!exists) throw notFound("That record");
        throw conflict("This record already has its photo.");
      }
      await writeAudit(tx, {
        actor: user,
        action: "apparatus.inspection_photo_added",
        entityType: "apparatus",
        entityId: apparatusId,
        data: { inspectionId, filename, contentType: type.mime, size_B: file.bytes.length, sha256 },
      });
      return { id: inspectionId, filename, contentType: type.mime, size_B: file.bytes.length };
    });
  } catch (error) {
    await storage.delete(storageKey).catch(() => undefined);
    throw error;
  }
}

export async function readInspectionPhoto(user: CurrentUser, apparatusId: string, inspectionId: string) {
  const photo = await getInspectionPhoto(user, apparatusId, inspectionId);
  const bytes = await (await getStorage()).get(photo.key);
  if (!bytes) throw notFound("That photo");
  return { filename: photo.filename, contentType: photo.contentType, bytes };
}

export async function setInspectionInterval(user: CurrentUser, apparatusId: string, input: UpkeepSettingsInput) {
  assertCan(user, "apparatus.read");
  return db.transaction(async (tx) => {
    const row = await lockForUpkeep(tx, user, apparatusId);
    if (row.retiredAt) throw conflict("This apparatus is retired: it needs no more inspections.");
    await tx
      .update(apparatus)
      .set({ inspectionInterval_days: input.inspectionInterval_days })
      .where(eq(apparatus.id, apparatusId));
    await writeAudit(tx, {
      actor: user,
      action: "apparatus.inspection_interval_set",
      entityType: "apparatus",
      entityId: apparatusId,
      data: { from: row.inspectionInterval_days, to: input.inspectionInterval_days },
    });
    return { id: apparatusId, inspectionInterval_days: input.inspectionInterval_days };
  });
}

/** Retires an apparatus: kept with its revisions and records, no longer offered for new applications. */
export async function retireApparatus(user: CurrentUser, apparatusId: string, input: RetireInput, now = new Date()) {
  assertCan(user, "apparatus.read");
  return db.transaction(async (tx) => {
    const row = await lockForUpkeep(tx, user, apparatusId);
    if (row.retiredAt) throw conflict("This apparatus is already retired.");
    await tx
      .update(apparatus)
      .set({ retiredAt: now, retiredById: user.id, retiredReason: input.reason })
      .where(eq(apparatus.id, apparatusId));
    await writeAudit(tx, {
      actor: user,
      action: "apparatus.retired",
      entityType: "apparatus",
      entityId: apparatusId,
      data: { reason: input.reason },
    });
    return { id: apparatusId, retiredAt: now };
  });
}

export type InspectionReminderReport = { apparatusId: string; name: string; dueOn: string; to: string[] }[];

/**
 * The daily job's part for apparatus (lib/jobs/actions.ts runReminders): for each apparatus with an
 * interval that is not retired and whose next inspection is due on `today` or earlier, one e-mail to
 * its owner with the key inspection_due:<apparatus>:<due day>. A later run, or a second worker,
 * inserts nothing (mail_outbox.dedupe_key is UNIQUE); a new passing inspection moves the due day and
 * so makes the next reminder a new one.
 */
export async function queueInspectionReminders(today: string, timeZone: string): Promise<InspectionReminderReport> {
  const rows = await db
    .select({
      id: apparatus.id,
      name: apparatus.name,
      room: apparatus.room,
      createdAt: apparatus.createdAt,
      intervalDays: apparatus.inspectionInterval_days,
      ownerEmail: users.email,
      ownerDisabled: users.disabledAt,
    })
    .from(apparatus)
    .innerJoin(users, eq(users.id, apparatus.ownerId))
    .where(and(isNotNull(apparatus.inspectionInterval_days), isNull(apparatus.retiredAt)));
  const last = await lastPassedOn(
    db,
    rows.map((r) => r.id),
  );
  const report: InspectionReminderReport = [];
  for (const row of rows) {
    const status = inspectionStatus({
      intervalDays: row.intervalDays,
      lastPassedOn: last.get(row.id) ?? null,
      registeredOn: todayIn(timeZone, row.createdAt),
      today,
    });
    if (!status || status.state !== "due" || row.ownerDisabled) continue;
    const lastOn = last.get(row.id) ?? null;
    const to = await db.transaction(async (tx) => {
      const n = await queueMail(
        tx,
        row.ownerEmail,
        {
          kind: "inspection_due",
          data: {
            apparatusId: row.id,
            apparatusName: row.name,
            room: row.room,
            dueOn: status.dueOn,
            lastInspectedOn: lastOn,
            intervalDays: row.intervalDays ?? 0,
          },
        },
        { dedupeKey: inspectionReminderKey(row.id, status.dueOn) },
      );
      if (n === 0) return [];
      await writeAudit(tx, {
        actor: null,
        action: "apparatus.inspection_reminder_queued",
        entityType: "apparatus",
        entityId: row.id,
        data: { dueOn: status.dueOn, to: [row.ownerEmail] },
      });
      return [row.ownerEmail];
    });
    if (to.length > 0) report.push({ apparatusId: row.id, name: row.name, dueOn: status.dueOn, to });
  }
  return report;
}
