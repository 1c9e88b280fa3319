import "server-only";
import crypto from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/db";
import { isUniqueViolation } from "@/db/errors";
import { courseTypes, departments, trainingRecords, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { cleanFilename, detectAllowedType } from "@/lib/applications/attachments";
import { AppError, invalidField, notFound } from "@/lib/errors";
import { institutionToday } from "@/lib/permits/queries";
import { getStorage, newKey } from "@/lib/storage";
import type { CourseTypeBody, CourseTypeUpdate, TrainingRecordBody } from "./schemas";

// Writes of the training domain. Each change and its audit row share one transaction.

async function assertDepartment(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], id: string | null) {
  if (!id) return;
  const [row] = await tx.select({ id: departments.id }).from(departments).where(eq(departments.id, id));
  if (!row) throw invalidField("departmentId", "Choose a department from the list.");
}

const nameTaken = () => invalidField("name", "A course type with this name exists already.");

export async function createCourseType(actor: CurrentUser, body: CourseTypeBody) {
  assertCan(actor, "training.courses");
  try {
    return await db.transaction(async (tx) => {
      await assertDepartment(tx, body.departmentId);
      const [row] = await tx.insert(courseTypes).values(body).returning();
      await writeAudit(tx, {
        actor,
        action: "training.course_type_created",
        entityType: "course_type",
        entityId: row.id,
        data: { ...body },
      });
      return row;
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw nameTaken();
    throw error;
  }
}

export async function updateCourseType(actor: CurrentUser, id: string, body: CourseTypeUpdate) {
  assertCan(actor, "training.courses");
  const { retired, ...fields } = body;
  try {
    return await db.transaction(async (tx) => {
      const [before] = await tx.select().from(courseTypes).where(eq(courseTypes.id, id)).for("update");
      if (!before) throw notFound("That course type");
      if (fields.departmentId !== undefined) await assertDepartment(tx, fields.departmentId);
      const now = new Date();
      const [row] = await tx
        .update(courseTypes)
        .set({
          ...fields,
          ...(retired === undefined ? {} : { retiredAt: retired ? (before.retiredAt ?? now) : null }),
          updatedAt: now,
        })
        .where(eq(courseTypes.id, id))
        .returning();
      await writeAudit(tx, {
        actor,
        action: "training.course_type_changed",
        entityType: "course_type",
        entityId: id,
        data: {
          before: {
            name: before.name,
            validityMonths: before.validityMonths,
            minTier: before.minTier,
            departmentId: before.departmentId,
            retired: before.retiredAt !== null,
          },
          change: body,
        },
      });
      return row;
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw nameTaken();
    throw error;
  }
}

export async function recordTraining(actor: CurrentUser, body: TrainingRecordBody, now = new Date()) {
  assertCan(actor, "training.record");
  const today = await institutionToday(now);
  if (body.completedOn > today) throw invalidField("completedOn", "The course cannot be completed in the future.");
  return db.transaction(async (tx) => {
    const [person] = await tx
      .select({ id: users.id, name: users.name })
      .from(users)
      .where(and(eq(users.id, body.userId), isNull(users.disabledAt)));
    if (!person) throw invalidField("userId", "Choose the person from the list.");
    const [course] = await tx
      .select({ id: courseTypes.id, name: courseTypes.name })
      .from(courseTypes)
      .where(and(eq(courseTypes.id, body.courseTypeId), isNull(courseTypes.retiredAt)));
    if (!course) throw invalidField("courseTypeId", "Choose the course from the list.");
    const [row] = await tx
      .insert(trainingRecords)
      .values({ ...body, recordedById: actor.id })
      .returning();
    await writeAudit(tx, {
      actor,
      action: "training.recorded",
      entityType: "training_record",
      entityId: row.id,
      data: {
        userId: person.id,
        person: person.name,
        courseTypeId: course.id,
        course: course.name,
        completedOn: body.completedOn,
        trainer: body.trainer,
      },
    });
    return row;
  });
}

/** Refuses before an upload is read: 404 unless the record exists and the actor records training. */
export async function assertCanAttachCertificate(actor: CurrentUser, recordId: string): Promise<void> {
  assertCan(actor, "training.record");
  const [row] = await db
    .select({ id: trainingRecords.id })
    .from(trainingRecords)
    .where(and(eq(trainingRecords.id, recordId), isNull(trainingRecords.removedAt)));
  if (!row) throw notFound("That training record");
}

/**
 * Stores a record's certificate through lib/storage with the uploads' own checks (type read from the
 * bytes: JPEG, PNG, WebP or PDF; at most 10 MB), replacing an earlier one.
 */
export async function attachCertificate(actor: CurrentUser, recordId: string, file: { name: string; bytes: Buffer }) {
  await assertCanAttachCertificate(actor, recordId);
  const type = await detectAllowedType(file.bytes);
  const filename = cleanFilename(file.name, type.ext);
  const sha256 = crypto.createHash("sha256").update(file.bytes).digest("hex");
  const key = newKey("certificates", type.ext);
  const storage = await getStorage();
  try {
    await storage.put(key, file.bytes, type.mime);
  } catch (error) {
    console.error(`[training] storage refused ${key}:`, error instanceof Error ? error.message : error);
    await storage.delete(key).catch(() => undefined);
    throw new AppError("unavailable", "The file store could not save this certificate. Try again later.", {
      retryAfterSeconds: 30,
    });
  }
  let previousKey: string | null = null;
  try {
    const row = await db.transaction(async (tx) => {
      const [before] = await tx
        .select({ key: trainingRecords.certificateKey })
        .from(trainingRecords)
        .where(and(eq(trainingRecords.id, recordId), isNull(trainingRecords.removedAt)))
        .for("update");
      if (!before) throw notFound("That training record");
      previousKey = before.key;
      const [updated] = await tx
        .update(trainingRecords)
        .set({
          certificateKey: key,
          certificateFilename: filename,
          certificateContentType: type.mime,
          certificateSize_B: file.bytes.length,
          certificateSha256: sha256,
        })
        .where(eq(trainingRecords.id, recordId))
        .returning({
          id: trainingRecords.id,
          certificateFilename: trainingRecords.certificateFilename,
          certificateContentType: trainingRecords.certificateContentType,
          certificateSize_B: trainingRecords.certificateSize_B,
          certificateSha256: trainingRecords.certificateSha256,
        });
      await writeAudit(tx, {
        actor,
        action: "training.certificate_added",
        entityType: "training_record",
        entityId: recordId,
        data: { filename, contentType: type.mime, size_B: file.bytes.length, sha256 },
      });
      return updated;
    });
    if (previousKey) await storage.delete(previousKey).catch(() => undefined);
    return row;
  } catch (error) {
    await storage.delete(key).catch(() => undefined);
    throw error;
  }
}

/** Withdraws a record entered in error: kept for the record, no longer counted. */
export async function removeTrainingRecord(actor: CurrentUser, recordId: string) {
  assertCan(actor, "training.record");
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(trainingRecords)
      .set({ removedAt: new Date() })
      .where(and(eq(trainingRecords.id, recordId), isNull(trainingRecords.removedAt)))
      .returning({
        id: trainingRecords.id,
        userId: trainingRecords.userId,
        courseTypeId: trainingRecords.courseTypeId,
      });
    if (!row) throw notFound("That training record");
    await writeAudit(tx, {
      actor,
      action: "training.record_removed",
      entityType: "training_record",
      entityId: recordId,
      data: { userId: row.userId, courseTypeId: row.courseTypeId },
    });
    return { id: row.id };
  });
}
