import "server-only";
import crypto from "node:crypto";
import { and, count, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { apparatus, applications, incidentPhotos, incidents, permits, type Incident } from "@/db/schema";
import { writeAudit, type Tx } from "@/lib/audit";
import { canReadApparatus } from "@/lib/apparatus/access";
import { cleanFilename, detectAllowedType, type UploadedFile } from "@/lib/applications/attachments";
import { ATTACHMENT_MAX_COUNT } from "@/lib/applications/limits";
import { assertCan, can, type CurrentUser } from "@/lib/auth/guards";
import { usersWithPermission } from "@/lib/auth/holders";
import { AppError, conflict, forbidden, invalidField, notFound, type FieldIssue } from "@/lib/errors";
import { queueMail, type IncidentStep } from "@/lib/outbox";
import { permitScope } from "@/lib/permits/queries";
import { applyRevocation, prepareRevocation } from "@/lib/permits/revoke";
import { institutionTimeZone } from "@/lib/settings/queries";
import type { SigningContext } from "@/lib/signing/password";
import { getStorage, newKey } from "@/lib/storage";
import { activeEmails } from "@/lib/users/queries";
import { canReadIncident, getIncidentPhoto, incidentForCheck } from "./queries";
import {
  INCIDENT_MOVES,
  incidentRef,
  type IncidentReportInput,
  type IncidentRevokeInput,
  type IncidentTriageInput,
} from "./schemas";
import { wallTimeToInstant } from "./time";

// Writes to incident reports. Each step — reported, investigating, closed, reopened, the linked
// permit revoked — changes the row, writes its audit event (entity "incident") and queues one
// e-mail to the reporter and each safety officer, all in one transaction. The mail's key
// incident:<id>:<step>:v<version> makes each step's mail once-only per recipient.

/** A report may name a permit and an apparatus the reporter can see (422 naming the field otherwise). */
async function checkLinks(user: CurrentUser, input: IncidentReportInput) {
  const issues: FieldIssue[] = [];
  let apparatusId = input.apparatusId;
  if (input.permitId) {
    const [permit] = await db
      .select({ id: permits.id, apparatusId: applications.apparatusId })
      .from(permits)
      .innerJoin(applications, eq(applications.id, permits.applicationId))
      .where(and(eq(permits.id, input.permitId), permitScope(user)))
      .limit(1);
    if (!permit) issues.push({ path: "permitId", message: "That permit is not one you can see; leave it empty." });
    // The permit's registry apparatus, when the reporter named none: the report shows on both pages.
    else if (!apparatusId && permit.apparatusId) apparatusId = permit.apparatusId;
  }
  if (input.apparatusId) {
    const [row] = await db
      .select({ ownerId: apparatus.ownerId, departmentId: apparatus.departmentId })
      .from(apparatus)
      .where(eq(apparatus.id, input.apparatusId))
      .limit(1);
    if (!row || !canReadApparatus(user, row)) {
      issues.push({ path: "apparatusId", message: "That apparatus is not one you can see; leave it empty." });
    }
  }
  if (issues.length > 0) throw new AppError("invalid", `${issues[0].path}: ${issues[0].message}`, { issues });
  return { permitId: input.permitId, apparatusId };
}

/** Queues the step's mail to the reporter and every safety officer (each address once). */
async function mailStep(tx: Tx, row: Incident, step: IncidentStep, actorName: string, permitNumber: string | null) {
  const base = {
    incidentId: row.id,
    ref: incidentRef(row.seq),
    summary: row.summary,
    incidentKind: row.kind,
    step,
    state: row.state,
    actorName,
    occurredAt: row.occurredAt.toISOString(),
    location: row.location,
    injuries: row.injuries,
    findings: row.findings || undefined,
    actions: row.actions || undefined,
    permitNumber,
  };
  const key = `incident:${row.id}:${step}:v${row.version}`;
  const reporter = await activeEmails(tx, [row.reporterId]);
  let queued = await queueMail(
    tx,
    reporter,
    { kind: "incident_update", data: { ...base, recipient: "reporter" } },
    { dedupeKey: key },
  );
  const officers = await usersWithPermission(tx, "incident.triage", "institution");
  const others = officers.filter((o) => o.id !== row.reporterId).map((o) => o.email);
  queued += await queueMail(
    tx,
    others,
    { kind: "incident_update", data: { ...base, recipient: "officer" } },
    { dedupeKey: key },
  );
  return queued;
}

async function permitNumberOf(tx: Tx, permitId: string | null): Promise<string | null> {
  if (!permitId) return null;
  const [row] = await tx.select({ number: permits.number }).from(permits).where(eq(permits.id, permitId));
  return row?.number ?? null;
}

export async function reportIncident(user: CurrentUser, input: IncidentReportInput, now = new Date()) {
  assertCan(user, "incident.report");
  const occurredAt = wallTimeToInstant(input.occurredAt, await institutionTimeZone());
  if (Number.isNaN(occurredAt.getTime())) throw invalidField("occurredAt", "That date and time does not exist.");
  // A minute of slack (60 000 ms) for clocks that disagree a little.
  if (occurredAt.getTime() > now.getTime() + 60_000) {
    throw invalidField("occurredAt", "The time it happened cannot be in the future.");
  }
  const links = await checkLinks(user, input);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(incidents)
      .values({
        kind: input.kind,
        summary: input.summary,
        description: input.description,
        occurredAt,
        location: input.location,
        injuries: input.injuries,
        injuryNote: input.injuries ? input.injuryNote : "",
        permitId: links.permitId,
        apparatusId: links.apparatusId,
        reporterId: user.id,
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await writeAudit(tx, {
      actor: user,
      action: "incident.reported",
      entityType: "incident",
      entityId: row.id,
      data: {
        ref: incidentRef(row.seq),
        kind: row.kind,
        injuries: row.injuries,
        permitId: row.permitId,
        apparatusId: row.apparatusId,
      },
    });
    await mailStep(tx, row, "reported", user.name, await permitNumberOf(tx, row.permitId));
    return row;
  });
}

async function lockForTriage(tx: Tx, user: CurrentUser, id: string, expectedVersion?: number) {
  const [row] = await tx.select().from(incidents).where(eq(incidents.id, id)).for("update");
  if (!row) throw notFound("That report");
  if (expectedVersion !== undefined && row.version !== expectedVersion) {
    throw conflict("This report changed while you were working on it. Reload it and try again.");
  }
  void user;
  return row;
}

/** An officer's step: a new state (a move INCIDENT_MOVES allows) and the findings and actions so far. */
export async function triageIncident(user: CurrentUser, id: string, input: IncidentTriageInput, now = new Date()) {
  assertCan(user, "incident.triage");
  return db.transaction(async (tx) => {
    const current = await lockForTriage(tx, user, id, input.expectedVersion);
    const moving = input.state !== current.state;
    if (moving && !INCIDENT_MOVES[current.state].includes(input.state)) {
      throw invalidField("state", `A report that is ${current.state} cannot move to ${input.state}.`);
    }
    if (!moving && input.findings === current.findings && input.actions === current.actions) {
      throw conflict("Nothing changed: move the report on or change the findings or actions.");
    }
    const [row] = await tx
      .update(incidents)
      .set({
        state: input.state,
        findings: input.findings,
        actions: input.actions,
        triagedById: user.id,
        closedAt: input.state === "closed" ? (moving ? now : current.closedAt) : null,
        version: sql`${incidents.version} + 1`,
        updatedAt: now,
      })
      .where(and(eq(incidents.id, id), eq(incidents.version, current.version)))
      .returning();
    const step: IncidentStep | null = !moving
      ? null
      : input.state === "closed"
        ? "closed"
        : current.state === "closed"
          ? "reopened"
          : "investigating";
    await writeAudit(tx, {
      actor: user,
      action: step ? `incident.${step}` : "incident.notes_updated",
      entityType: "incident",
      entityId: id,
      data: {
        ref: incidentRef(row.seq),
        from: current.state,
        to: row.state,
        findings: row.findings,
        actions: row.actions,
      },
    });
    const mailed = step ? await mailStep(tx, row, step, user.name, await permitNumberOf(tx, row.permitId)) : 0;
    return { incident: row, step, mailed };
  });
}

/**
 * Revokes the permit a report names, from the report: the permit's own revoke path (its permission,
 * separation of duties, active state, version and the signer's password), then in one transaction
 * the permit's revocation (decision, audit, mail to the holder) and the report's step (audit, mail).
 */
export async function revokePermitFromIncident(
  user: CurrentUser,
  id: string,
  body: IncidentRevokeInput,
  ctx: SigningContext = {},
) {
  assertCan(user, "incident.triage");
  const check = await incidentForCheck(db, id);
  if (!check) throw notFound("That report");
  if (!check.permitId) throw conflict("This report names no permit.");
  const prepared = await prepareRevocation(user, check.permitId, body, ctx);
  const now = prepared.now;
  return db.transaction(async (tx) => {
    const current = await lockForTriage(tx, user, id);
    if (current.permitId !== check.permitId) throw conflict("This report changed; reload it and try again.");
    const revoked = await applyRevocation(tx, user, prepared, body);
    const [row] = await tx
      .update(incidents)
      .set({ permitRevokedAt: now, triagedById: user.id, version: sql`${incidents.version} + 1`, updatedAt: now })
      .where(eq(incidents.id, id))
      .returning();
    await writeAudit(tx, {
      actor: user,
      action: "incident.permit_revoked",
      entityType: "incident",
      entityId: id,
      data: {
        ref: incidentRef(row.seq),
        permitId: revoked.permit.id,
        permitNumber: revoked.permit.number,
        decisionId: revoked.decision.id,
        reason: body.reason,
      },
    });
    await mailStep(tx, row, "permit_revoked", user.name, revoked.permit.number);
    return { incident: row, ...revoked };
  });
}

/** The reporter (while the report is not closed) and officers add photos; the attachment rules apply. */
async function assertCanAddPhoto(user: CurrentUser, id: string) {
  const check = await incidentForCheck(db, id);
  if (!check || !canReadIncident(user, check)) throw notFound("That report");
  const triager = can(user, "incident.triage");
  if (!triager && check.reporterId !== user.id) throw forbidden("Only the reporter and safety officers add photos.");
  if (check.state === "closed") throw conflict("This report is closed; photos can no longer be added.");
}

export { assertCanAddPhoto };

export async function addIncidentPhoto(user: CurrentUser, id: string, file: UploadedFile) {
  await assertCanAddPhoto(user, id);
  const type = await detectAllowedType(file.bytes);
  const filename = cleanFilename(file.name, type.ext);
  const sha256 = crypto.createHash("sha256").update(file.bytes).digest("hex");
  const storageKey = newKey("incidents", type.ext);
  const storage = await getStorage();
  try {
    await storage.put(storageKey, file.bytes, type.mime);
  } catch (error) {
    console.error(`[incidents] storage refused ${storageKey}:`, error instanceof Error ? error.message : error);
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
      const current = await lockForTriage(tx, user, id);
      if (current.state === "closed") throw conflict("This report is closed; photos can no longer be added.");
      const [{ n }] = await tx.select({ n: count() }).from(incidentPhotos).where(eq(incidentPhotos.incidentId, id));
      if (Number(n) >= ATTACHMENT_MAX_COUNT) {
        throw invalidField("file", `A report can have at most ${ATTACHMENT_MAX_COUNT} photos.`);
      }
      const [photo] = await tx
        .insert(incidentPhotos)
        .values({
          incidentId: id,
          storageKey,
          filename,
          contentType: type.mime,
          size_B: file.bytes.length,
          sha256,
          uploadedById: user.id,
        })
        .returning({
          id: incidentPhotos.id,
          filename: incidentPhotos.filename,
          contentType: incidentPhotos.contentType,
          size_B: incidentPhotos.size_B,
          sha256: incidentPhotos.sha256,
          createdAt: incidentPhotos.createdAt,
        });
      await writeAudit(tx, {
        actor: user,
        action: "incident.photo_added",
        entityType: "incident",
        entityId: id,
        data: { photoId: photo.id, filename, contentType: type.mime, size_B: file.bytes.length, sha256 },
      });
      return photo;
    });
  } catch (error) {
    await storage.delete(storageKey).catch(() => undefined);
    throw error;
  }
}

/** A photo's bytes and facts, for a user who may read its report. */
export async function readIncidentPhoto(user: CurrentUser, incidentId: string, photoId: string) {
  const photo = await getIncidentPhoto(user, incidentId, photoId);
  const bytes = await (await getStorage()).get(photo.storageKey);
  if (!bytes) throw notFound("That photo");
  return { filename: photo.filename, contentType: photo.contentType, bytes };
}
