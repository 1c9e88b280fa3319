import "server-only";
import crypto from "node:crypto";
import { and, eq, isNull, sql } from "drizzle-orm";
import { fileTypeFromBuffer } from "file-type";
import { db } from "@/db";
import { applications, attachments, type ApplicationState } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { AppError, conflict, notFound } from "@/lib/errors";
import { getStorage, newKey } from "@/lib/storage";
import { EDITABLE_STATES } from "./access";
import { attachmentListedInRevision, getAttachmentForDownload } from "./queries";
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_MAX_COUNT, ATTACHMENT_TYPES, formatBytes } from "./limits";

// Photos and schematics attached to an application. The type is read from the bytes (file-type's
// magic numbers), never from the name or the browser's claim; only JPEG, PNG, WebP and PDF pass, so
// an HTML page renamed .png or an SVG (script inside) is refused. Files live under generated keys
// in lib/storage and are served only through the authorized download route.

export type UploadedFile = { name: string; bytes: Buffer };

/** A file name safe to show and to put in Content-Disposition: no path, no control characters. */
export function cleanFilename(name: string, extension: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base
    .replace(/[\u0000-\u001f\u007f"]/g, "")
    .trim()
    .slice(0, 200);
  return cleaned || `attachment.${extension}`;
}

function refuse(code: "invalid" | "payload_too_large", message: string): AppError {
  return new AppError(code, `file: ${message}`, { issues: [{ path: "file", message }] });
}

/** Reads the type from the content; refuses anything outside the allow-list with a clear message. */
export async function detectAllowedType(bytes: Buffer): Promise<{ mime: keyof typeof ATTACHMENT_TYPES; ext: string }> {
  if (bytes.length === 0) throw refuse("invalid", "The file is empty.");
  if (bytes.length > ATTACHMENT_MAX_BYTES) {
    throw refuse(
      "payload_too_large",
      `The file is ${formatBytes(bytes.length)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`,
    );
  }
  const detected = await fileTypeFromBuffer(bytes);
  if (!detected || !(detected.mime in ATTACHMENT_TYPES)) {
    const what = detected ? `its content is ${detected.mime}` : "its content is not a recognised image or PDF";
    throw refuse("invalid", `Only JPEG, PNG, WebP and PDF files can be attached; ${what}.`);
  }
  const mime = detected.mime as keyof typeof ATTACHMENT_TYPES;
  return { mime, ext: ATTACHMENT_TYPES[mime] };
}

async function lockEditable(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], user: CurrentUser, id: string) {
  const [app] = await tx
    .select({ applicantId: applications.applicantId, state: applications.state })
    .from(applications)
    .where(eq(applications.id, id))
    .for("update");
  if (!app || app.applicantId !== user.id) throw notFound("That application");
  if (!(EDITABLE_STATES as readonly ApplicationState[]).includes(app.state)) {
    throw conflict(`This application is ${app.state.replace("_", " ")}; files can be changed only on a draft.`);
  }
}

/**
 * Refuses before any upload is read: 404 unless the user is the applicant, 409 unless it is still a
 * draft, so a stranger learns nothing from the size and type checks and nothing is stored.
 */
export async function assertCanAttach(user: CurrentUser, applicationId: string): Promise<void> {
  assertCan(user, "application.create");
  const [app] = await db
    .select({ applicantId: applications.applicantId, state: applications.state })
    .from(applications)
    .where(eq(applications.id, applicationId))
    .limit(1);
  if (!app || app.applicantId !== user.id) throw notFound("That application");
  if (!(EDITABLE_STATES as readonly ApplicationState[]).includes(app.state)) {
    throw conflict(`This application is ${app.state.replace("_", " ")}; files can be changed only on a draft.`);
  }
}

export async function addAttachment(user: CurrentUser, applicationId: string, file: UploadedFile) {
  await assertCanAttach(user, applicationId);

  const type = await detectAllowedType(file.bytes);
  const filename = cleanFilename(file.name, type.ext);
  const sha256 = crypto.createHash("sha256").update(file.bytes).digest("hex");
  const storageKey = newKey("attachments", type.ext);
  const storage = await getStorage();
  try {
    await storage.put(storageKey, file.bytes, type.mime);
  } catch (error) {
    // The file store refused (full, read-only, out of reach): no row was written, and whatever part
    // of the file may have been stored is removed, so nothing is left half-saved.
    console.error(`[attachments] storage refused ${storageKey}:`, error instanceof Error ? error.message : error);
    await storage.delete(storageKey).catch(() => undefined);
    throw new AppError(
      "unavailable",
      "The file store could not save this file, so nothing was attached. Try again later.",
      {
        retryAfterSeconds: 30,
      },
    );
  }
  try {
    return await db.transaction(async (tx) => {
      await lockEditable(tx, user, applicationId);
      const [{ count }] = await tx
        .select({ count: sql<number>`count(*)::int` })
        .from(attachments)
        .where(and(eq(attachments.applicationId, applicationId), isNull(attachments.removedAt)));
      if (count >= ATTACHMENT_MAX_COUNT) {
        throw refuse("invalid", `An application can have at most ${ATTACHMENT_MAX_COUNT} files; remove one first.`);
      }
      const [row] = await tx
        .insert(attachments)
        .values({
          applicationId,
          storageKey,
          filename,
          contentType: type.mime,
          size_B: file.bytes.length,
          sha256,
          uploadedById: user.id,
        })
        .returning({
          id: attachments.id,
          filename: attachments.filename,
          contentType: attachments.contentType,
          size_B: attachments.size_B,
          sha256: attachments.sha256,
          createdAt: attachments.createdAt,
        });
      await writeAudit(tx, {
        actor: user,
        action: "application.attachment_added",
        entityType: "application",
        entityId: applicationId,
        data: { attachmentId: row.id, filename, contentType: type.mime, size_B: file.bytes.length, sha256 },
      });
      return row;
    });
  } catch (error) {
    // The row was never written: the stored bytes belong to nothing.
    await storage.delete(storageKey).catch(() => undefined);
    throw error;
  }
}

/** Takes a file off the draft. Bytes a submitted revision lists stay (nothing signed is deleted). */
export async function removeAttachment(user: CurrentUser, applicationId: string, attachmentId: string) {
  assertCan(user, "application.create");
  const removed = await db.transaction(async (tx) => {
    await lockEditable(tx, user, applicationId);
    const [row] = await tx
      .update(attachments)
      .set({ removedAt: new Date() })
      .where(
        and(
          eq(attachments.id, attachmentId),
          eq(attachments.applicationId, applicationId),
          isNull(attachments.removedAt),
        ),
      )
      .returning({ id: attachments.id, storageKey: attachments.storageKey, filename: attachments.filename });
    if (!row) throw notFound("That attachment");
    await writeAudit(tx, {
      actor: user,
      action: "application.attachment_removed",
      entityType: "application",
      entityId: applicationId,
      data: { attachmentId, filename: row.filename },
    });
    return row;
  });
  if (!(await attachmentListedInRevision(applicationId, attachmentId))) {
    await (await getStorage()).delete(removed.storageKey).catch(() => undefined);
  }
  return { id: removed.id };
}

/** The bytes and headers' facts of an attachment this user may read. */
export async function readAttachment(user: CurrentUser, applicationId: string, attachmentId: string) {
  const row = await getAttachmentForDownload(user, applicationId, attachmentId);
  const bytes = await (await getStorage()).get(row.storageKey);
  if (!bytes) throw notFound("That file");
  return { ...row, bytes };
}
