import "server-only";
import crypto from "node:crypto";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { preUseCheckPhotos, preUseChecks, type PreUseCheckItem } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { type CurrentUser } from "@/lib/auth/guards";
import { usersWithPermission } from "@/lib/auth/holders";
import { detectAllowedType } from "@/lib/applications/attachments";
import { AppError, conflict, forbidden, invalidField, notFound } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import { getStorage, newKey } from "@/lib/storage";
import { activeEmails } from "@/lib/users/queries";
import { checkPhotoFor, checkTarget, mayRecordCheck, photosOfPermit, type CheckTarget } from "./queries";
import type { RecordCheckBody } from "./schemas";

// Recording a pre-use check. The check row, its audit event and — when any item is answered "no" —
// the mail to the holder and the safety officers share one transaction. The phone sends the same
// idempotency key on every retry of one check: the unique (recorder, key) finds the first row, so a
// submit whose answer was lost on a weak signal is never recorded twice, and the mail's once-only key
// is the check's id, so it is never queued twice either.

function refuseUnlessAllowed(user: CurrentUser, target: CheckTarget | null): CheckTarget {
  if (!target) throw notFound("That permit");
  if (!mayRecordCheck(user, target)) {
    throw forbidden("Only the permit's holder, the people named on it and safety officers record its checks.");
  }
  if (target.effectiveState !== "active") {
    throw conflict(`A check is recorded only on an active permit; this one is ${target.effectiveState}.`);
  }
  if (!target.inUse) throw conflict(`This permit is valid from ${target.permit.validFrom}; record the check then.`);
  return target;
}

/** The permit's checklist answered in full: every item once, nothing else, photos of this permit. */
async function answersFor(target: CheckTarget, body: RecordCheckBody): Promise<PreUseCheckItem[]> {
  const byId = new Map(target.checklist.map((item) => [item.id, item]));
  const seen = new Set<string>();
  body.items.forEach((answer, index) => {
    if (!byId.has(answer.id)) {
      throw invalidField(`items[${index}].id`, "This item is not on this permit's checklist; reload the page.");
    }
    if (seen.has(answer.id)) throw invalidField(`items[${index}].id`, "This item is answered twice.");
    seen.add(answer.id);
  });
  const missing = target.checklist.find((item) => !seen.has(item.id));
  if (missing) throw invalidField("items", `Answer every item; "${missing.text}" has no answer.`);
  const photoIds = body.items.map((a) => a.photoId).filter((id): id is string => id !== null);
  const known = await photosOfPermit(db, target.permit.id, photoIds);
  body.items.forEach((answer, index) => {
    if (answer.photoId && !known.has(answer.photoId)) {
      throw invalidField(`items[${index}].photoId`, "This photo was not uploaded for this permit; add it again.");
    }
  });
  return body.items.map((answer) => ({
    id: answer.id,
    text: byId.get(answer.id)!.text,
    answer: answer.answer,
    note: answer.note,
    photoId: answer.photoId,
  }));
}

export type RecordedCheck = { id: string; checkedAt: Date; anyNo: boolean; replayed: boolean };

export async function recordCheck(
  user: CurrentUser,
  permitId: string,
  body: RecordCheckBody,
  now = new Date(),
): Promise<RecordedCheck> {
  // A retry of a check already recorded answers with that check, whatever the permit's state now.
  const existing = await findByKey(user.id, body.idempotencyKey);
  if (existing) {
    if (existing.permitId !== permitId)
      throw conflict("This check's key was used for another permit; reload the page.");
    return { id: existing.id, checkedAt: existing.checkedAt, anyNo: existing.anyNo, replayed: true };
  }
  const target = refuseUnlessAllowed(user, await checkTarget(user, permitId, now));
  const items = await answersFor(target, body);
  const anyNo = items.some((item) => item.answer === "no");

  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(preUseChecks)
      .values({
        permitId,
        recordedById: user.id,
        recordedByName: user.name,
        idempotencyKey: body.idempotencyKey,
        items,
        anyNo,
        note: body.note,
        checkedAt: now,
      })
      .onConflictDoNothing({ target: [preUseChecks.recordedById, preUseChecks.idempotencyKey] })
      .returning({ id: preUseChecks.id, checkedAt: preUseChecks.checkedAt });
    if (!row) {
      // The same check sent twice at once: the other request recorded it.
      const first = await findByKey(user.id, body.idempotencyKey, tx);
      if (!first) throw conflict("This check is being recorded; try again in a moment.");
      return { id: first.id, checkedAt: first.checkedAt, anyNo: first.anyNo, replayed: true };
    }
    const failed = items.filter((item) => item.answer === "no");
    await writeAudit(tx, {
      actor: user,
      action: "permit.pre_use_check_recorded",
      entityType: "permit",
      entityId: permitId,
      data: {
        checkId: row.id,
        number: target.permit.number,
        anyNo,
        failed: failed.map((item) => item.id),
        answers: items.length,
      },
    });
    if (anyNo) {
      const message = {
        kind: "pre_use_check_failed" as const,
        data: {
          permitId,
          permitNumber: target.permit.number,
          title: target.permit.title,
          checkId: row.id,
          recordedByName: user.name,
          checkedAt: row.checkedAt.toISOString(),
          failed: failed.map((item) => ({ text: item.text, note: item.note })),
          note: body.note,
        },
      };
      // Once per check and mailbox: a holder who is also a safety officer gets one message.
      const dedupeKey = `pre-use-check-no:${row.id}`;
      const holder = await activeEmails(tx, [target.permit.holderId]);
      await queueMail(tx, holder, { ...message, data: { ...message.data, recipient: "holder" } }, { dedupeKey });
      const officers = await usersWithPermission(tx, "permit.revoke", "institution");
      await queueMail(
        tx,
        officers.map((o) => o.email),
        { ...message, data: { ...message.data, recipient: "officer" } },
        { dedupeKey },
      );
    }
    return { id: row.id, checkedAt: row.checkedAt, anyNo, replayed: false };
  });
}

async function findByKey(userId: string, key: string, tx: Pick<typeof db, "select"> = db) {
  const [row] = await tx
    .select({
      id: preUseChecks.id,
      permitId: preUseChecks.permitId,
      checkedAt: preUseChecks.checkedAt,
      anyNo: preUseChecks.anyNo,
    })
    .from(preUseChecks)
    .where(and(eq(preUseChecks.recordedById, userId), eq(preUseChecks.idempotencyKey, key)))
    .limit(1);
  return row ?? null;
}

/** Refuses before an upload is read: 404 for a permit the user cannot see, 403/409 as for a check. */
export async function assertCanAddCheckPhoto(user: CurrentUser, permitId: string): Promise<void> {
  refuseUnlessAllowed(user, await checkTarget(user, permitId));
}

/**
 * Stores one photo for a check about to be sent, with the uploads' type checks and limits
 * (lib/applications/attachments detectAllowedType: decided from the bytes, ≤ 10 MB); PDFs are not
 * photos and are refused here.
 */
export async function addCheckPhoto(user: CurrentUser, permitId: string, bytes: Buffer) {
  await assertCanAddCheckPhoto(user, permitId);
  const type = await detectAllowedType(bytes);
  if (!type.mime.startsWith("image/")) {
    throw new AppError("invalid", "file: Only JPEG, PNG and WebP photos can be added to a check.", {
      issues: [{ path: "file", message: "Only JPEG, PNG and WebP photos can be added to a check." }],
    });
  }
  const sha256 = crypto.createHash("sha256").update(bytes).digest("hex");
  const storageKey = newKey("checks", type.ext);
  const storage = await getStorage();
  try {
    await storage.put(storageKey, bytes, type.mime);
  } catch (error) {
    console.error(`[checks] storage refused ${storageKey}:`, error instanceof Error ? error.message : error);
    await storage.delete(storageKey).catch(() => undefined);
    throw new AppError("unavailable", "The file store could not save this photo. Try again later.", {
      retryAfterSeconds: 30,
    });
  }
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(preUseCheckPhotos)
        .values({ permitId, uploadedById: user.id, storageKey, contentType: type.mime, size_B: bytes.length, sha256 })
        .returning({
          id: preUseCheckPhotos.id,
          contentType: preUseCheckPhotos.contentType,
          size_B: preUseCheckPhotos.size_B,
        });
      await writeAudit(tx, {
        actor: user,
        action: "permit.pre_use_check_photo_added",
        entityType: "permit",
        entityId: permitId,
        data: { photoId: row.id, contentType: type.mime, size_B: bytes.length, sha256 },
      });
      return row;
    });
  } catch (error) {
    await storage.delete(storageKey).catch(() => undefined);
    throw error;
  }
}

/** The bytes of a check photo this user may see. */
export async function readCheckPhoto(user: CurrentUser, permitId: string, photoId: string) {
  const row = await checkPhotoFor(user, permitId, photoId);
  if (!row) throw notFound("That photo");
  const bytes = await (await getStorage()).get(row.storageKey);
  if (!bytes) throw notFound("That photo");
  return { ...row, bytes };
}
