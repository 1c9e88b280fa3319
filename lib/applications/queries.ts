import "server-only";
import { and, asc, desc, eq, ilike, inArray, isNull, sql, type SQL } from "drizzle-orm";
import { db } from "@/db";
import {
  applicationRevisions,
  applications,
  attachments,
  departments,
  users,
  type ApplicationState,
} from "@/db/schema";
import { likePattern } from "@/lib/apparatus/queries";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { applicationDraftSchema, type ApplicationListQuery, type AttachmentRef } from "@/lib/applications/schemas";
import { canReadApplication, isEditable } from "./access";

// Reads of applications for their applicant (the lists, the draft the form edits, attachments). The
// review helper's screens read applications for reviewers; canReadApplication is shared.

const SORT_COLUMNS = {
  updated: applications.updatedAt,
  title: sql`lower(${applications.title})`,
  state: applications.state,
  tier: applications.tier,
  submitted: applications.submittedAt,
} as const;

/** The applicant's own applications, paged and sorted on the server. */
export async function listMyApplications(
  user: CurrentUser,
  options: Pick<ApplicationListQuery, "page" | "pageSize" | "sort"> & {
    dir?: "asc" | "desc";
    state?: ApplicationState | readonly ApplicationState[];
  },
) {
  const conditions: SQL[] = [eq(applications.applicantId, user.id)];
  if (typeof options.state === "string") conditions.push(eq(applications.state, options.state));
  else if (options.state && options.state.length > 0) conditions.push(inArray(applications.state, [...options.state]));
  const where = and(...conditions);
  const order = (options.dir ?? "desc") === "asc" ? asc : desc;
  const sortColumn = SORT_COLUMNS[options.sort];

  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: applications.id,
        seq: applications.seq,
        title: applications.title,
        state: applications.state,
        tier: applications.tier,
        version: applications.version,
        apparatusName: sql<string | null>`nullif(${applications.draft}->'apparatus'->>'name', '')`,
        submittedAt: applications.submittedAt,
        updatedAt: applications.updatedAt,
        createdAt: applications.createdAt,
      })
      .from(applications)
      .where(where)
      // Never-submitted rows sort last whichever way "submitted" runs; the id keeps pages stable.
      .orderBy(
        ...(options.sort === "submitted" ? [sql`${applications.submittedAt} IS NULL`] : []),
        order(sortColumn),
        order(applications.id),
      )
      .limit(options.pageSize)
      .offset((options.page - 1) * options.pageSize),
    db
      .select({ total: sql<number>`count(*)::int` })
      .from(applications)
      .where(where),
  ]);
  return { rows, total, page: options.page, pageSize: options.pageSize };
}

export type MyApplicationRow = Awaited<ReturnType<typeof listMyApplications>>["rows"][number];

/** What the instructor's dashboard shows: drafts, and applications waiting on someone. */
export async function myDashboardApplications(user: CurrentUser, limit = 10) {
  const [drafts, open] = await Promise.all([
    listMyApplications(user, { page: 1, pageSize: limit, sort: "updated", state: "draft" }),
    listMyApplications(user, {
      page: 1,
      pageSize: limit,
      sort: "updated",
      state: ["submitted", "in_review", "returned"],
    }),
  ]);
  return {
    drafts: drafts.rows.map((r) => ({
      id: r.id,
      title: r.title || "Untitled application",
      apparatusName: r.apparatusName,
      tier: r.tier as 0 | 1 | 2 | 3 | 4 | null,
      updatedAt: r.updatedAt,
    })),
    open: open.rows.map((r) => ({
      id: r.id,
      title: r.title || "Untitled application",
      state: r.state as "submitted" | "in_review" | "returned",
      tier: r.tier as 0 | 1 | 2 | 3 | 4 | null,
      submittedAt: r.submittedAt,
    })),
  };
}

export async function listActiveAttachments(applicationId: string) {
  return db
    .select({
      id: attachments.id,
      filename: attachments.filename,
      contentType: attachments.contentType,
      size_B: attachments.size_B,
      sha256: attachments.sha256,
      createdAt: attachments.createdAt,
    })
    .from(attachments)
    .where(and(eq(attachments.applicationId, applicationId), isNull(attachments.removedAt)))
    .orderBy(asc(attachments.createdAt), asc(attachments.id));
}

export function toAttachmentRef(row: {
  id: string;
  filename: string;
  contentType: string;
  size_B: number;
  sha256: string;
}): AttachmentRef {
  return { id: row.id, filename: row.filename, contentType: row.contentType, size_B: row.size_B, sha256: row.sha256 };
}

/** The draft the form edits, for its applicant only (anyone else gets 404, as for a missing id). */
export async function getDraftForEdit(user: CurrentUser, id: string) {
  const [row] = await db
    .select({
      id: applications.id,
      seq: applications.seq,
      applicantId: applications.applicantId,
      departmentId: applications.departmentId,
      state: applications.state,
      version: applications.version,
      draft: applications.draft,
      draftStep: applications.draftStep,
      tier: applications.tier,
      currentRevisionId: applications.currentRevisionId,
      submittedAt: applications.submittedAt,
      updatedAt: applications.updatedAt,
    })
    .from(applications)
    .where(eq(applications.id, id))
    .limit(1);
  if (!row || row.applicantId !== user.id) throw notFound("That application");
  const parsed = applicationDraftSchema.safeParse(row.draft);
  const [files, [revisions]] = await Promise.all([
    listActiveAttachments(id),
    db
      .select({ count: sql<number>`count(*)::int` })
      .from(applicationRevisions)
      .where(eq(applicationRevisions.applicationId, id)),
  ]);
  return {
    id: row.id,
    seq: row.seq,
    departmentId: row.departmentId,
    state: row.state,
    editable: isEditable(row.state),
    version: row.version,
    step: row.draftStep,
    // A stored draft that no longer fits the schema is kept in the database and shown as far as it
    // reads; the form starts from what parses.
    draft: parsed.success ? parsed.data : applicationDraftSchema.parse({}),
    tier: row.tier,
    revisions: revisions.count,
    submittedAt: row.submittedAt,
    updatedAt: row.updatedAt,
    attachments: files.map((f) => ({ ...toAttachmentRef(f), createdAt: f.createdAt })),
  };
}

export type DraftForEdit = Awaited<ReturnType<typeof getDraftForEdit>>;

/** The access facts of one application, or a 404 when this user may not read it. */
export async function loadReadableApplication(user: CurrentUser, id: string) {
  const [row] = await db
    .select({
      id: applications.id,
      applicantId: applications.applicantId,
      departmentId: applications.departmentId,
      namedUserIds: applications.namedUserIds,
      submittedAt: applications.submittedAt,
      state: applications.state,
    })
    .from(applications)
    .where(eq(applications.id, id))
    .limit(1);
  if (!row || !canReadApplication(user, row)) throw notFound("That application");
  return row;
}

/**
 * An attachment's record, for download by anyone who may read the application. A file removed from
 * the draft stays readable only while a submitted revision lists it.
 */
export async function getAttachmentForDownload(user: CurrentUser, applicationId: string, attachmentId: string) {
  const app = await loadReadableApplication(user, applicationId);
  const [row] = await db
    .select({
      id: attachments.id,
      storageKey: attachments.storageKey,
      filename: attachments.filename,
      contentType: attachments.contentType,
      size_B: attachments.size_B,
      removedAt: attachments.removedAt,
    })
    .from(attachments)
    .where(and(eq(attachments.id, attachmentId), eq(attachments.applicationId, app.id)))
    .limit(1);
  if (!row) throw notFound("That attachment");
  const listed = await attachmentListedInRevision(app.id, row.id);
  // Before submission only the applicant reads the application at all; afterwards reviewers see the
  // files of the revisions they review, not what the applicant is adding to a returned draft.
  if (app.applicantId !== user.id && !listed) throw notFound("That attachment");
  if (row.removedAt && !listed) throw notFound("That attachment");
  return row;
}

export async function attachmentListedInRevision(applicationId: string, attachmentId: string): Promise<boolean> {
  const [hit] = await db
    .select({ id: applicationRevisions.id })
    .from(applicationRevisions)
    .where(
      and(
        eq(applicationRevisions.applicationId, applicationId),
        sql`${applicationRevisions.content}->'attachments' @> ${JSON.stringify([{ id: attachmentId }])}::jsonb`,
      ),
    )
    .limit(1);
  return Boolean(hit);
}

/** People to name on an application: active users whose name matches. No e-mail addresses. */
export async function searchPeople(user: CurrentUser, q: string) {
  assertCan(user, "application.create");
  return db
    .select({ id: users.id, name: users.name, departmentName: departments.name })
    .from(users)
    .leftJoin(departments, eq(departments.id, users.departmentId))
    .where(and(isNull(users.disabledAt), ilike(users.name, likePattern(q))))
    .orderBy(asc(users.name), asc(users.id))
    .limit(10);
}
