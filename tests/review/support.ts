// Fixtures for the review and permit tests: submitted applications made the way the submit path
// makes them (lib/applications/actions.ts submitApplication): a frozen revision whose content passes
// applicationContentSchema, its assessment from the engine, contentHash = revisionHash(content,
// assessment), the draft → submitted transition with waitingSince, chainStep 0 and the chain rules
// version in force, then afterSubmit (tier 0 self-certifies there).
import { eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import {
  applicationRevisions,
  applications,
  users,
  type Application,
  type Department,
  type Role,
  type User,
} from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import type { CurrentUser } from "@/lib/auth/guards";
import { assessSetup, requiredControls, type SetupInput, type Tier } from "@/lib/hazard";
import { draftFromContent } from "@/lib/applications/renewal";
import { afterSubmit } from "@/lib/applications/chain-start";
import { revisionHash } from "@/lib/signing/canonical";
import { transition } from "@/lib/applications/state";
import { currentChainRules } from "@/lib/rules/queries";
import { applicationContentSchema, type ApplicationContent } from "@/lib/applications/schemas";
import { createDepartment, createUser, uniq } from "../support/db";
import { onFileEnd } from "../support/file-cleanup";

/**
 * One capacitor per tier, checked against the engine in review-fixtures.test.ts. Values from
 * tests/hazard/tiers.test.ts and hazard-model.md's default table: 100 pF at 100 V is touch-safe;
 * 0.45 µF at 100 V exceeds the 0.1 µF capacitance level (tier 1); 0.5 µF at 1 kV holds 0.25 J
 * (tier 2); 1 µF at 10 kV holds 50 J ≥ 10 J at ≥ 100 V (tier 3); 1 mF at 5 kV holds 12.5 kJ ≥ 10 kJ
 * (tier 4, arc).
 */
export const TIER_SETUPS: Record<Tier, SetupInput> = {
  0: { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 100e-12, voltage_V: 100 }] },
  1: { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 0.45e-6, voltage_V: 100 }] },
  2: { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 0.5e-6, voltage_V: 1000, bleeder_ohm: 10e6 }] },
  3: { sources: [{ id: "Bank", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10e3, bleeder_ohm: 100e6 }] },
  4: { sources: [{ id: "Bank", kind: "capacitor", capacitance_F: 1e-3, voltage_V: 5000, bleeder_ohm: 1e6 }] },
};

export function isoDayFromNow(days: number): string {
  return new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
}

export function buildContent(options: {
  tier: Tier;
  title?: string;
  responsible: { id: string; name: string };
  operators?: { id: string | null; name: string }[];
  setup?: SetupInput;
  room?: string;
  /** The event days (YYYY-MM-DD); by default a week from now, two days long. */
  firstDay?: string;
  lastDay?: string;
  audience?: "none" | "students" | "public";
  audienceSize?: number;
  /** A registry record and revision the set-up comes from (its set-up is then `setup`). */
  apparatus?: { id: string; revisionId: string; name: string };
}): ApplicationContent {
  const setup = options.setup ?? TIER_SETUPS[options.tier];
  const assessment = assessSetup(setup);
  return applicationContentSchema.parse({
    event: {
      title: options.title ?? `Demonstration ${uniq("ev")}`,
      kind: "lecture_demonstration",
      room: options.room ?? "B12",
      audience: options.audience ?? "students",
      audienceSize: options.audienceSize ?? 40,
      firstDay: options.firstDay ?? isoDayFromNow(7),
      lastDay: options.lastDay ?? isoDayFromNow(8),
      responsible: { userId: options.responsible.id, name: options.responsible.name },
      operators: (options.operators ?? []).map((o) => ({ userId: o.id, name: o.name, trained: true })),
    },
    apparatus: {
      apparatusId: options.apparatus?.id ?? null,
      apparatusRevisionId: options.apparatus?.revisionId ?? null,
      name: options.apparatus?.name ?? "Capacitor bank on the lecture bench",
      room: options.room ?? "B12",
      notes: "",
      setup,
    },
    controls: {
      required: requiredControls(assessment.tier).map((c) => ({ code: c.id, text: c.text, confirmed: true, note: "" })),
      additional: "",
    },
    attachments: [],
    attestation: { accepted: true, text: "I confirm the set-up is as described and the controls are in place." },
  });
}

export type Fixture = {
  application: Application;
  revisionId: string;
  contentHash: string;
  content: ApplicationContent;
};

/** Inserts a draft and submits it into revision 1, like submitApplication does. */
export async function createSubmittedApplication(options: {
  applicant: Pick<User, "id" | "name" | "departmentId">;
  tier: Tier;
  namedUserIds?: string[];
  operators?: { id: string | null; name: string }[];
  title?: string;
  setup?: SetupInput;
  /** The event's room (and the apparatus's); "B12" by default. */
  room?: string;
  firstDay?: string;
  lastDay?: string;
  audience?: "none" | "students" | "public";
  audienceSize?: number;
  apparatus?: { id: string; revisionId: string; name: string };
  /** Back-date the wait (for the queue's age filter and sort). */
  waitingSince?: Date;
}): Promise<Fixture> {
  const content = buildContent({
    tier: options.tier,
    title: options.title,
    responsible: options.applicant,
    operators: options.operators,
    setup: options.setup,
    room: options.room,
    firstDay: options.firstDay,
    lastDay: options.lastDay,
    audience: options.audience,
    audienceSize: options.audienceSize,
    apparatus: options.apparatus,
  });
  const assessment = assessSetup(content.apparatus.setup);
  if (assessment.tier !== options.tier)
    throw new Error(`fixture set-up gives tier ${assessment.tier}, not ${options.tier}`);
  const departmentId = options.applicant.departmentId;
  if (!departmentId) throw new Error("the applicant needs a department");
  const actor = { id: options.applicant.id, name: options.applicant.name };
  return getDb().transaction(async (tx) => {
    const [draft] = await tx
      .insert(applications)
      .values({
        title: content.event.title,
        applicantId: options.applicant.id,
        departmentId,
        namedUserIds: options.namedUserIds ?? [],
        apparatusId: content.apparatus.apparatusId,
        apparatusRevisionId: content.apparatus.apparatusRevisionId,
        // The draft that produced this content, as the form would have saved it.
        draft: draftFromContent(content) as unknown as Record<string, unknown>,
        tier: assessment.tier,
      })
      .returning();
    const contentHash = revisionHash(content, assessment);
    const [revision] = await tx
      .insert(applicationRevisions)
      .values({
        applicationId: draft.id,
        revision: 1,
        content: content as unknown as Record<string, unknown>,
        assessment,
        tier: assessment.tier,
        contentHash,
        submittedById: options.applicant.id,
      })
      .returning({ id: applicationRevisions.id });
    const now = new Date();
    const { version } = await currentChainRules(tx);
    const submitted = await transition(tx, {
      applicationId: draft.id,
      from: ["draft"],
      to: "submitted",
      expectedVersion: draft.version,
      set: {
        currentRevisionId: revision.id,
        tier: assessment.tier,
        submittedAt: now,
        waitingSince: options.waitingSince ?? now,
        chainStep: 0,
        chainRulesVersion: version,
      },
    });
    await writeAudit(tx, {
      actor,
      action: "application.submitted",
      entityType: "application",
      entityId: draft.id,
      data: { revisionId: revision.id, revision: 1, contentHash, tier: assessment.tier },
    });
    const after = await afterSubmit(tx, submitted, actor, now);
    return { application: after.application, revisionId: revision.id, contentHash, content };
  });
}

/** The owner edits a returned application and submits it again: a new revision, like the edit page does. */
export async function resubmit(
  application: Pick<Application, "id">,
  applicant: Pick<User, "id" | "name">,
  change: (content: ApplicationContent) => ApplicationContent,
): Promise<Fixture> {
  return getDb().transaction(async (tx) => {
    const [app] = await tx.select().from(applications).where(eq(applications.id, application.id));
    const [latest] = await tx
      .select({ content: applicationRevisions.content, revision: applicationRevisions.revision })
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, app.id))
      .orderBy(sql`${applicationRevisions.revision} DESC`)
      .limit(1);
    const content = applicationContentSchema.parse(change(structuredClone(latest.content) as ApplicationContent));
    const assessment = assessSetup(content.apparatus.setup);
    const contentHash = revisionHash(content, assessment);
    const [revision] = await tx
      .insert(applicationRevisions)
      .values({
        applicationId: app.id,
        revision: latest.revision + 1,
        content: content as unknown as Record<string, unknown>,
        assessment,
        tier: assessment.tier,
        contentHash,
        submittedById: applicant.id,
      })
      .returning({ id: applicationRevisions.id });
    const now = new Date();
    const { version } = await currentChainRules(tx);
    const submitted = await transition(tx, {
      applicationId: app.id,
      from: ["returned"],
      to: "submitted",
      expectedVersion: app.version,
      set: {
        currentRevisionId: revision.id,
        tier: assessment.tier,
        title: content.event.title,
        draft: draftFromContent(content) as unknown as Record<string, unknown>,
        submittedAt: now,
        waitingSince: now,
        chainStep: 0,
        chainRulesVersion: version,
      },
    });
    await writeAudit(tx, {
      actor: applicant,
      action: "application.submitted",
      entityType: "application",
      entityId: app.id,
      data: { revisionId: revision.id, revision: latest.revision + 1, contentHash, tier: assessment.tier },
    });
    const after = await afterSubmit(tx, submitted, applicant, now);
    return { application: after.application, revisionId: revision.id, contentHash, content };
  });
}

/** The signed-in user as the guards hand it to business code. */
export function asActor(user: User): CurrentUser {
  return { id: user.id, email: user.email, name: user.name, roles: user.roles, departmentId: user.departmentId };
}

// Every recommendation mails every active safety officer (product.md), so officers made by one test
// file would receive the next files' mail by the thousand. Each file shares one safety office, and
// the officers a file made are disabled when it ends.
// This module is evaluated once for all the files a vitest process runs (no isolation), so the
// list and the shared office are emptied when each file ends (tests/support/file-cleanup.ts).
let officerIds: string[] = [];
let sharedOffice: Promise<{ office: Department; officer: User; officer2: User }> | undefined;
let cleanupRegistered = false;

async function disableFileOfficers() {
  const ids = officerIds;
  officerIds = [];
  cleanupRegistered = false;
  sharedOffice = undefined;
  if (ids.length === 0) return;
  await getDb().update(users).set({ disabledAt: new Date() }).where(inArray(users.id, ids));
}

/** A safety officer (or someone who also holds that role) who is disabled when the test file ends. */
export async function createOfficer(options: { departmentId: string | null; roles?: Role[] }): Promise<User> {
  if (!cleanupRegistered) {
    cleanupRegistered = true;
    onFileEnd(disableFileOfficers);
  }
  const user = await createUser({ roles: options.roles ?? ["safety_officer"], departmentId: options.departmentId });
  officerIds.push(user.id);
  return user;
}

function office() {
  sharedOffice ??= (async () => {
    const dept = await createDepartment();
    const [officer, officer2] = await Promise.all([
      createOfficer({ departmentId: dept.id }),
      createOfficer({ departmentId: dept.id }),
    ]);
    return { office: dept, officer, officer2 };
  })();
  return sharedOffice;
}

/**
 * A fresh department with an instructor and two reviewers, the file's safety office with its two
 * officers, and a reviewer of the office (a reviewer of another department).
 */
export async function createTeam() {
  const dept = await createDepartment();
  const { office: officeDept, officer, officer2 } = await office();
  const [instructor, reviewer, reviewer2, otherReviewer] = await Promise.all([
    createUser({ roles: ["instructor"], departmentId: dept.id }),
    createUser({ roles: ["reviewer"], departmentId: dept.id }),
    createUser({ roles: ["reviewer"], departmentId: dept.id }),
    createUser({ roles: ["reviewer"], departmentId: officeDept.id }),
  ]);
  return { dept, office: officeDept, instructor, reviewer, reviewer2, officer, officer2, otherReviewer };
}

export async function currentVersion(applicationId: string): Promise<number> {
  const [row] = await getDb()
    .select({ version: applications.version })
    .from(applications)
    .where(eq(applications.id, applicationId));
  return row.version;
}

export async function reload(applicationId: string): Promise<Application> {
  const [row] = await getDb().select().from(applications).where(eq(applications.id, applicationId));
  return row;
}

export async function userById(id: string): Promise<User> {
  const [row] = await getDb().select().from(users).where(eq(users.id, id));
  return row;
}
