import crypto from "node:crypto";
import { getDb } from "@/db";
import { apparatus, apparatusRevisions, applications, attachments } from "@/db/schema";
import { assessSetup, type SetupInput } from "@/lib/hazard";
import { getStorage, newKey } from "@/lib/storage";
import { completeDraft } from "../../applications/support";
import { createDepartment, createUser } from "../../support/db";
import { signedIn, type MatrixContext, type MatrixRow, type Principal, type Expectation } from "../matrix-kit";

// The apparatus registry and the applicant's side of applications: the routes and pages of issue 5.
// Records are created per cell in the instructor's department (the reviewer shares it; the officer
// and the admin are in the other one), so each cell checks both the role and the record.

/** 4.7 nF at 10 kV: tier 1 (Q = 47 µC above the 45 µC level, E = 0.235 J below 0.25 J). */
const SETUP: SetupInput = { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 10_000 }] };

const cells = (values: Record<Principal, Expectation>) => values;

async function instructorsApparatus(
  ctx: MatrixContext,
  owner: { id: string; departmentId: string | null } = ctx.users.instructor,
) {
  const assessment = assessSetup(SETUP);
  const db = getDb();
  const [row] = await db
    .insert(apparatus)
    .values({
      name: `Matrix bench ${ctx.unique}`,
      room: "B12",
      departmentId: owner.departmentId!,
      ownerId: owner.id,
      tier: assessment.tier,
      energy_J: assessment.energy_J,
    })
    .returning({ id: apparatus.id });
  await db.insert(apparatusRevisions).values({
    apparatusId: row.id,
    revision: 1,
    name: `Matrix bench ${ctx.unique}`,
    room: "B12",
    setup: SETUP,
    assessment,
    tier: assessment.tier,
    createdById: owner.id,
  });
  return { apparatusId: row.id };
}

export async function instructorsDraft(ctx: MatrixContext) {
  const instructor = ctx.users.instructor;
  const draft = completeDraft(
    { id: instructor.id, name: "Matrix Instructor" },
    {
      setupText: {
        sources: [{ label: "C1", kind: "capacitor", capacitance_F: "4.7 nF", voltage_V: "10 kV" }],
      },
    },
  );
  const [row] = await getDb()
    .insert(applications)
    .values({
      title: draft.event.title,
      applicantId: instructor.id,
      departmentId: instructor.departmentId!,
      draft,
      tier: 1,
      namedUserIds: [instructor.id],
    })
    .returning({ id: applications.id });
  return { applicationId: row.id };
}

async function draftWithAttachment(ctx: MatrixContext) {
  const { applicationId } = await instructorsDraft(ctx);
  const bytes = Buffer.from("%PDF-1.4\n%%EOF\n", "latin1");
  const key = newKey("attachments", "pdf");
  await (await getStorage()).put(key, bytes, "application/pdf");
  const [row] = await getDb()
    .insert(attachments)
    .values({
      applicationId,
      storageKey: key,
      filename: "matrix.pdf",
      contentType: "application/pdf",
      size_B: bytes.length,
      sha256: crypto.createHash("sha256").update(bytes).digest("hex"),
      uploadedById: ctx.users.instructor.id,
    })
    .returning({ id: attachments.id });
  return { applicationId, attachmentId: row.id };
}

const apparatusBody = (c: MatrixContext) => ({ name: `Matrix coil ${c.unique}`, room: "C3", notes: "", setup: SETUP });

export const APPLICATION_ROWS: MatrixRow[] = [
  // The apparatus registry.
  { route: "/api/apparatus", method: "GET", expect: signedIn(200, 401) },
  {
    route: "/api/apparatus",
    method: "POST",
    body: apparatusBody,
    expect: cells({ anonymous: 401, instructor: 201, reviewer: 201, safety_officer: 201, admin: 403 }),
  },
  {
    route: "/api/apparatus/[id]",
    method: "GET",
    prepare: (c) => instructorsApparatus(c),
    path: (c) => `/api/apparatus/${c.data.apparatusId}`,
    // The admin sits in the other department and holds no institution-wide read.
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 }),
  },
  {
    // Someone else's apparatus in another department: only the officer reads it.
    route: "/api/apparatus/[id]",
    method: "GET",
    prepare: async (c) => {
      const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
      return instructorsApparatus(c, stranger);
    },
    path: (c) => `/api/apparatus/${c.data.apparatusId}`,
    expect: cells({ anonymous: 401, instructor: 404, reviewer: 404, safety_officer: 200, admin: 404 }),
  },
  {
    route: "/api/apparatus/[id]",
    method: "PATCH",
    prepare: (c) => instructorsApparatus(c),
    path: (c) => `/api/apparatus/${c.data.apparatusId}`,
    body: (c) => ({ ...apparatusBody(c), expectedRevision: 1 }),
    // Owner and department edit; the officer reads but is of another department.
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 200, safety_officer: 403, admin: 403 }),
  },
  // Applications: the applicant's own.
  { route: "/api/applications", method: "GET", expect: signedIn(200, 401) },
  {
    route: "/api/applications",
    method: "POST",
    body: () => ({}),
    expect: cells({ anonymous: 401, instructor: 201, reviewer: 201, safety_officer: 201, admin: 403 }),
  },
  {
    route: "/api/applications/people",
    method: "GET",
    path: () => "/api/applications/people?q=test",
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 200, safety_officer: 200, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/draft",
    method: "GET",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/draft`,
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 404 }),
  },
  {
    route: "/api/applications/[id]/draft",
    method: "PATCH",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/draft`,
    body: () => ({ expectedVersion: 1, step: 2, draft: {} }),
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/submit",
    method: "POST",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/submit`,
    body: () => ({ expectedVersion: 1 }),
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/withdraw",
    method: "POST",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/withdraw`,
    body: () => ({ expectedVersion: 1 }),
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/duplicate",
    method: "POST",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/duplicate`,
    body: () => ({}),
    expect: cells({ anonymous: 401, instructor: 201, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/attachments",
    method: "POST",
    prepare: instructorsDraft,
    path: (c) => `/api/applications/${c.data.applicationId}/attachments`,
    // The matrix sends JSON: the applicant gets past every check to the media type (415); the
    // multipart path itself is tested in tests/applications/attachments.test.ts.
    body: () => ({}),
    expect: cells({ anonymous: 401, instructor: 415, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  {
    route: "/api/applications/[id]/attachments/[attachmentId]",
    method: "GET",
    prepare: draftWithAttachment,
    path: (c) => `/api/applications/${c.data.applicationId}/attachments/${c.data.attachmentId}`,
    // A draft is its applicant's alone.
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 404 }),
  },
  {
    route: "/api/applications/[id]/attachments/[attachmentId]",
    method: "DELETE",
    prepare: draftWithAttachment,
    path: (c) => `/api/applications/${c.data.applicationId}/attachments/${c.data.attachmentId}`,
    expect: cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 404, admin: 403 }),
  },
  // Pages.
  { route: "/apparatus", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  {
    route: "/apparatus/new",
    method: "PAGE",
    expect: cells({
      anonymous: "→/sign-in",
      instructor: 200,
      reviewer: 200,
      safety_officer: 200,
      admin: "→/forbidden",
    }),
  },
  {
    route: "/apparatus/[id]",
    method: "PAGE",
    prepare: (c) => instructorsApparatus(c),
    path: (c) => `/apparatus/${c.data.apparatusId}`,
    expect: cells({ anonymous: "→/sign-in", instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 }),
  },
  {
    route: "/apparatus/[id]/edit",
    method: "PAGE",
    prepare: (c) => instructorsApparatus(c),
    path: (c) => `/apparatus/${c.data.apparatusId}/edit`,
    expect: cells({
      anonymous: "→/sign-in",
      instructor: 200,
      reviewer: 200,
      safety_officer: "→/forbidden",
      admin: "→/forbidden",
    }),
  },
  { route: "/applications", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  {
    route: "/applications/new",
    method: "PAGE",
    expect: cells({
      anonymous: "→/sign-in",
      instructor: 200,
      reviewer: 200,
      safety_officer: 200,
      admin: "→/forbidden",
    }),
  },
  {
    route: "/applications/[id]/edit",
    method: "PAGE",
    prepare: instructorsDraft,
    path: (c) => `/applications/${c.data.applicationId}/edit`,
    expect: cells({
      anonymous: "→/sign-in",
      instructor: 200,
      reviewer: 404,
      safety_officer: 404,
      admin: "→/forbidden",
    }),
  },
];
