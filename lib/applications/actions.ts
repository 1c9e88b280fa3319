import "server-only";
import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  apparatus,
  apparatusRevisions,
  applicationRevisions,
  applications,
  attachments,
  users,
  type ApplicationState,
} from "@/db/schema";
import { canReadApparatus } from "@/lib/apparatus/access";
import { normalizeSetup, setupToText } from "@/lib/apparatus/setup-text";
import { writeAudit, type Tx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { usersWithPermission } from "@/lib/auth/holders";
import { assessSetup, type TierRules } from "@/lib/hazard";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError, conflict, notFound, type FieldIssue } from "@/lib/errors";
import { queueMail } from "@/lib/outbox";
import { canonicalJson, revisionHash } from "@/lib/signing/canonical";
import { afterSubmit } from "@/lib/applications/chain-start";
import { transition } from "@/lib/applications/state";
import { currentChainRules } from "@/lib/rules/queries";
import { applicationDraftSchema, type ApplicationContent, type ApplicationDraft } from "@/lib/applications/schemas";
import { EDITABLE_STATES, WITHDRAWABLE_STATES } from "./access";
import { draftAssessment, draftToContent, duplicateDraft, emptyDraft, namedUserIds } from "./draft";
import { toAttachmentRef } from "./queries";

// Writes to applications by their applicant: create, autosave, duplicate, submit, withdraw. Each
// change and its audit row (and any outbox row) share one transaction; state changes go through
// transition() (./state.ts). Decisions after submission belong to lib/review.

function needDepartment(user: CurrentUser): string {
  if (!user.departmentId) {
    throw new AppError("forbidden", "Your account has no department yet. Ask an admin to set it, then try again.");
  }
  return user.departmentId;
}

function invalid(issues: FieldIssue[]): AppError {
  const first = issues[0];
  return new AppError("invalid", first ? `${first.path}: ${first.message}` : "The application is not complete.", {
    issues,
  });
}

/** The registry columns a draft may point at: only a revision this user may read. */
async function registryColumns(user: CurrentUser, draft: ApplicationDraft) {
  const { apparatusId, apparatusRevisionId } = draft.apparatus;
  if (!apparatusId) return { apparatusId: null, apparatusRevisionId: null };
  const [row] = await db
    .select({ ownerId: apparatus.ownerId, departmentId: apparatus.departmentId })
    .from(apparatus)
    .where(eq(apparatus.id, apparatusId))
    .limit(1);
  if (!row || !canReadApparatus(user, row)) return { apparatusId: null, apparatusRevisionId: null };
  if (!apparatusRevisionId) return { apparatusId, apparatusRevisionId: null };
  const [revision] = await db
    .select({ id: apparatusRevisions.id })
    .from(apparatusRevisions)
    .where(and(eq(apparatusRevisions.id, apparatusRevisionId), eq(apparatusRevisions.apparatusId, apparatusId)))
    .limit(1);
  return { apparatusId, apparatusRevisionId: revision ? revision.id : null };
}

/** The columns kept in step with the draft: list title, live tier, named users, registry record. */
async function draftColumns(user: CurrentUser, draft: ApplicationDraft, rules: TierRules) {
  const assessment = draftAssessment(draft, rules);
  return {
    title: draft.event.title.trim().slice(0, 160),
    tier: assessment ? assessment.tier : null,
    namedUserIds: namedUserIds(draft),
    ...(await registryColumns(user, draft)),
  };
}

/** A draft started from a registry record: its current revision's name, room, notes and set-up. */
async function draftFromApparatus(user: CurrentUser, apparatusId: string, draft: ApplicationDraft) {
  const [row] = await db
    .select({
      ownerId: apparatus.ownerId,
      departmentId: apparatus.departmentId,
      retiredAt: apparatus.retiredAt,
      revisionId: apparatusRevisions.id,
      name: apparatusRevisions.name,
      room: apparatusRevisions.room,
      notes: apparatusRevisions.notes,
      setup: apparatusRevisions.setup,
    })
    .from(apparatus)
    .innerJoin(
      apparatusRevisions,
      and(eq(apparatusRevisions.apparatusId, apparatus.id), eq(apparatusRevisions.revision, apparatus.currentRevision)),
    )
    .where(eq(apparatus.id, apparatusId))
    .limit(1);
  if (!row || !canReadApparatus(user, row)) {
    throw new AppError("invalid", "apparatusId: that apparatus is not in your registry.", {
      issues: [{ path: "apparatusId", message: "That apparatus is not in your registry." }],
    });
  }
  if (row.retiredAt) {
    throw new AppError("invalid", "apparatusId: that apparatus is retired.", {
      issues: [{ path: "apparatusId", message: "That apparatus is retired: it is kept for the record only." }],
    });
  }
  draft.apparatus = {
    apparatusId,
    apparatusRevisionId: row.revisionId,
    name: row.name,
    room: row.room,
    notes: row.notes,
    setup: setupToText(row.setup),
  };
  if (!draft.event.room) draft.event.room = row.room;
}

export async function createDraft(user: CurrentUser, input: { draft?: ApplicationDraft; apparatusId?: string } = {}) {
  assertCan(user, "application.create");
  const departmentId = needDepartment(user);
  const draft = input.draft ? applicationDraftSchema.parse(input.draft) : emptyDraft();
  if (!draft.event.responsible.name && !draft.event.responsible.userId) {
    draft.event.responsible = { userId: user.id, name: user.name, trained: false };
  }
  if (input.apparatusId) await draftFromApparatus(user, input.apparatusId, draft);
  const columns = await draftColumns(user, draft, await currentTierRules());
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(applications)
      .values({ applicantId: user.id, departmentId, draft, draftStep: 1, ...columns })
      .returning({ id: applications.id, version: applications.version, seq: applications.seq });
    await writeAudit(tx, {
      actor: user,
      action: "application.draft_created",
      entityType: "application",
      entityId: row.id,
      data: { apparatusId: columns.apparatusId },
    });
    return { id: row.id, seq: row.seq, version: row.version, tier: columns.tier };
  });
}

/** Explains why a guarded UPDATE matched no row: 404 (not yours), 409 (state or version moved on). */
async function whyNotUpdated(tx: Tx, user: CurrentUser, id: string, expectedVersion: number): Promise<never> {
  const [row] = await tx
    .select({ applicantId: applications.applicantId, state: applications.state, version: applications.version })
    .from(applications)
    .where(eq(applications.id, id))
    .limit(1);
  if (!row || row.applicantId !== user.id) throw notFound("That application");
  if (!(EDITABLE_STATES as readonly ApplicationState[]).includes(row.state)) {
    throw conflict(`This application is ${row.state.replace("_", " ")} and can no longer be edited.`);
  }
  throw new AppError(
    "conflict",
    `This draft was saved elsewhere (version ${row.version}; you edited version ${expectedVersion}). Reload it, or save yours over it.`,
    { issues: [{ path: "expectedVersion", message: `The current version is ${row.version}.` }] },
  );
}

/** Autosave: the whole draft and the step the user is on, guarded by the version they edited. */
export async function saveDraft(
  user: CurrentUser,
  id: string,
  input: { expectedVersion: number; step: number; draft: ApplicationDraft },
) {
  assertCan(user, "application.create");
  const columns = await draftColumns(user, input.draft, await currentTierRules());
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(applications)
      .set({
        draft: input.draft,
        draftStep: input.step,
        ...columns,
        version: sql`${applications.version} + 1`,
        updatedAt: new Date(),
      })
      .where(
        and(
          eq(applications.id, id),
          eq(applications.applicantId, user.id),
          inArray(applications.state, [...EDITABLE_STATES]),
          eq(applications.version, input.expectedVersion),
        ),
      )
      .returning({ version: applications.version, updatedAt: applications.updatedAt, tier: applications.tier });
    if (!row) return whyNotUpdated(tx, user, id, input.expectedVersion);
    await writeAudit(tx, {
      actor: user,
      action: "application.draft_saved",
      entityType: "application",
      entityId: id,
      data: { version: row.version, step: input.step, tier: row.tier },
    });
    return { id, version: row.version, savedAt: row.updatedAt, tier: row.tier };
  });
}

/** "Duplicate": a new draft with the same event and set-up, for the next run of the same demo. */
export async function duplicateApplication(user: CurrentUser, sourceId: string) {
  assertCan(user, "application.create");
  const departmentId = needDepartment(user);
  const [source] = await db
    .select({ applicantId: applications.applicantId, draft: applications.draft })
    .from(applications)
    .where(eq(applications.id, sourceId))
    .limit(1);
  if (!source || source.applicantId !== user.id) throw notFound("That application");
  const parsed = applicationDraftSchema.safeParse(source.draft);
  const draft = duplicateDraft(parsed.success ? parsed.data : emptyDraft());
  const columns = await draftColumns(user, draft, await currentTierRules());
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(applications)
      .values({ applicantId: user.id, departmentId, draft, draftStep: 1, duplicatedFromId: sourceId, ...columns })
      .returning({ id: applications.id, version: applications.version, seq: applications.seq });
    await writeAudit(tx, {
      actor: user,
      action: "application.duplicated",
      entityType: "application",
      entityId: row.id,
      data: { from: sourceId },
    });
    return { id: row.id, seq: row.seq, version: row.version };
  });
}

/** References a submission makes to other records: each must exist and be visible to the applicant. */
async function checkReferences(tx: Tx, user: CurrentUser, content: ApplicationContent): Promise<FieldIssue[]> {
  const issues: FieldIssue[] = [];
  const part = content.apparatus;
  if (part.apparatusId) {
    const [row] = await tx
      .select({ ownerId: apparatus.ownerId, departmentId: apparatus.departmentId, retiredAt: apparatus.retiredAt })
      .from(apparatus)
      .where(eq(apparatus.id, part.apparatusId))
      .limit(1);
    if (!row || !canReadApparatus(user, row)) {
      issues.push({ path: "apparatus.apparatusId", message: "That registry record is not available to you." });
    } else if (row.retiredAt) {
      issues.push({
        path: "apparatus.apparatusId",
        message: "That apparatus is retired: pick another one or describe the set-up without the registry.",
      });
    } else if (part.apparatusRevisionId) {
      const [revision] = await tx
        .select({ revision: apparatusRevisions.revision, setup: apparatusRevisions.setup })
        .from(apparatusRevisions)
        .where(
          and(
            eq(apparatusRevisions.id, part.apparatusRevisionId),
            eq(apparatusRevisions.apparatusId, part.apparatusId),
          ),
        )
        .limit(1);
      if (!revision) {
        issues.push({ path: "apparatus.apparatusRevisionId", message: "That registry revision does not exist." });
      } else if (canonicalJson(normalizeSetup(revision.setup)) !== canonicalJson(part.setup)) {
        issues.push({
          path: "apparatus.apparatusRevisionId",
          message: `The set-up differs from revision ${revision.revision} of the registry record: pick the record again, or describe it as a changed set-up.`,
        });
      }
    }
  } else if (part.apparatusRevisionId) {
    issues.push({ path: "apparatus.apparatusRevisionId", message: "A registry revision needs its apparatus." });
  }

  const people = [
    { path: "event.responsible", person: content.event.responsible },
    ...content.event.operators.map((person, i) => ({ path: `event.operators[${i}]`, person })),
  ].filter((p) => p.person.userId !== null);
  if (people.length > 0) {
    const ids = [...new Set(people.map((p) => p.person.userId as string))];
    const found = await tx
      .select({ id: users.id, name: users.name })
      .from(users)
      .where(and(inArray(users.id, ids), isNull(users.disabledAt)));
    const names = new Map(found.map((u) => [u.id, u.name]));
    for (const { path, person } of people) {
      const name = names.get(person.userId as string);
      if (name === undefined) {
        issues.push({
          path: `${path}.userId`,
          message: "This person has no active account: pick again or enter the name only.",
        });
      } else {
        // The name on record, not a typed one: a user id always shows that user's own name.
        person.name = name;
      }
    }
  }
  return issues;
}

/**
 * Submits a draft (or a returned application) as a new frozen revision. The content is rebuilt and
 * validated from the stored draft and the stored attachments, and the assessment recomputed here
 * under the tier rules in force: nothing the browser computed is trusted.
 */
export async function submitApplication(actor: CurrentUser, applicationId: string, expectedVersion: number) {
  assertCan(actor, "application.submit");
  const rules = await currentTierRules();
  return db.transaction(async (tx) => {
    const [app] = await tx
      .select({
        id: applications.id,
        applicantId: applications.applicantId,
        departmentId: applications.departmentId,
        state: applications.state,
        version: applications.version,
        draft: applications.draft,
      })
      .from(applications)
      .where(eq(applications.id, applicationId))
      .for("update");
    if (!app || app.applicantId !== actor.id) throw notFound("That application");
    if (!(EDITABLE_STATES as readonly ApplicationState[]).includes(app.state)) {
      throw conflict(
        `This application is ${app.state.replace("_", " ")}; only a draft or a returned application can be submitted.`,
      );
    }
    if (app.version !== expectedVersion) {
      throw conflict("This application changed while you were working on it. Reload it and try again.");
    }
    const parsedDraft = applicationDraftSchema.safeParse(app.draft);
    if (!parsedDraft.success)
      throw invalid([{ path: "draft", message: "The saved draft cannot be read; edit it again." }]);
    const draft = parsedDraft.data;

    const files = await tx
      .select({
        id: attachments.id,
        filename: attachments.filename,
        contentType: attachments.contentType,
        size_B: attachments.size_B,
        sha256: attachments.sha256,
      })
      .from(attachments)
      .where(and(eq(attachments.applicationId, app.id), isNull(attachments.removedAt)))
      .orderBy(asc(attachments.createdAt), asc(attachments.id));
    const conversion = draftToContent(draft, { rules, attachments: files.map(toAttachmentRef) });
    if (!conversion.ok) throw invalid(conversion.issues);
    const content = conversion.content;
    const referenceIssues = await checkReferences(tx, actor, content);
    if (referenceIssues.length > 0) throw invalid(referenceIssues);

    const assessment = assessSetup(content.apparatus.setup, rules);
    const contentHash = revisionHash(content, assessment);
    const [{ last }] = await tx
      .select({ last: sql<number>`coalesce(max(${applicationRevisions.revision}), 0)::int` })
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, app.id));
    const now = new Date();
    const [revision] = await tx
      .insert(applicationRevisions)
      .values({
        applicationId: app.id,
        revision: last + 1,
        content,
        assessment,
        tier: assessment.tier,
        contentHash,
        submittedById: actor.id,
        submittedAt: now,
      })
      .returning({ id: applicationRevisions.id, revision: applicationRevisions.revision });

    const named = [
      ...new Set(
        [content.event.responsible.userId, ...content.event.operators.map((o) => o.userId)].filter(
          (userId): userId is string => userId !== null,
        ),
      ),
    ];
    const submitted = await transition(tx, {
      applicationId: app.id,
      from: ["draft", "returned"],
      to: "submitted",
      expectedVersion,
      set: {
        currentRevisionId: revision.id,
        tier: assessment.tier,
        submittedAt: now,
        waitingSince: now,
        chainStep: 0,
        chainRulesVersion: (await currentChainRules(tx)).version,
        title: content.event.title,
        namedUserIds: named,
        apparatusId: content.apparatus.apparatusId,
        apparatusRevisionId: content.apparatus.apparatusRevisionId,
        // A returned application is edited from this draft again: the attestation is asked anew.
        draft: { ...draft, attestation: { accepted: false } },
      },
    });
    await writeAudit(tx, {
      actor,
      action: "application.submitted",
      entityType: "application",
      entityId: app.id,
      data: { revision: revision.revision, revisionId: revision.id, tier: assessment.tier, contentHash },
    });

    // The review chain takes over from here (a tier whose chain has no signers self-certifies).
    const { application: updated, permit } = await afterSubmit(tx, submitted, actor, now);
    if (updated.state === "submitted") {
      // Reviewers of the department hear of it; people who may not decide on it (the applicant
      // and those named on it) are left out even when they hold the reviewer role.
      const reviewers = await usersWithPermission(tx, "application.review", { departmentId: app.departmentId });
      const excluded = new Set([actor.id, ...named]);
      await queueMail(
        tx,
        reviewers.filter((r) => !excluded.has(r.id)).map((r) => r.email),
        {
          kind: "application_submitted",
          data: { applicationId: app.id, title: content.event.title, applicantName: actor.name, tier: assessment.tier },
        },
        { dedupeKey: `application_submitted:${revision.id}` },
      );
    }
    return {
      id: app.id,
      state: updated.state,
      version: updated.version,
      permitId: permit?.id ?? null,
      revision: revision.revision,
      revisionId: revision.id,
      tier: assessment.tier,
      contentHash,
    };
  });
}

/** Withdraws an application its applicant no longer wants reviewed (or a draft they abandon). */
export async function withdrawApplication(actor: CurrentUser, id: string, expectedVersion: number) {
  assertCan(actor, "application.withdraw");
  return db.transaction(async (tx) => {
    const [app] = await tx
      .select({ applicantId: applications.applicantId, state: applications.state })
      .from(applications)
      .where(eq(applications.id, id))
      .limit(1);
    if (!app || app.applicantId !== actor.id) throw notFound("That application");
    if (!(WITHDRAWABLE_STATES as readonly ApplicationState[]).includes(app.state)) {
      throw conflict(`This application is ${app.state.replace("_", " ")} and cannot be withdrawn.`);
    }
    const updated = await transition(tx, {
      applicationId: id,
      from: [...WITHDRAWABLE_STATES],
      to: "withdrawn",
      expectedVersion,
      set: { waitingSince: null },
    });
    await writeAudit(tx, {
      actor,
      action: "application.withdrawn",
      entityType: "application",
      entityId: id,
      data: { from: app.state },
    });
    return { id, state: updated.state, version: updated.version };
  });
}
