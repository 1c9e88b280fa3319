import { getDb } from "@/db";
import { courseTypes, trainingRecords } from "@/db/schema";
import { createSubmittedApplication } from "../../review/support";
import { createDepartment, createUser, uniq } from "../../support/db";
import {
  adminOnly,
  signedIn,
  type MatrixContext,
  type MatrixRow,
  type Principal,
  type Expectation,
} from "../matrix-kit";

// Training records (issue 17): course types (admins), people's records and certificates (safety
// officers and admins; everyone reads their own), and the final approver's training exception. Course
// types made here are required only in a department of their own, so no other row's approval sees them.

const only = (
  allowed: Partial<Record<Principal, Expectation>>,
  denied: Expectation,
  anonymous: Expectation,
): Record<Principal, Expectation> => ({
  anonymous,
  instructor: allowed.instructor ?? denied,
  reviewer: allowed.reviewer ?? denied,
  safety_officer: allowed.safety_officer ?? denied,
  admin: allowed.admin ?? denied,
});

async function courseType() {
  const dept = await createDepartment();
  const [row] = await getDb()
    .insert(courseTypes)
    .values({ name: uniq("Matrix course"), validityMonths: 24, minTier: 3, departmentId: dept.id })
    .returning({ id: courseTypes.id });
  return { id: row.id, departmentId: dept.id };
}

async function trainingRecord(ctx: MatrixContext) {
  const course = await courseType();
  const [row] = await getDb()
    .insert(trainingRecords)
    .values({
      userId: ctx.users.instructor.id,
      courseTypeId: course.id,
      completedOn: "2026-01-15",
      trainer: "Matrix trainer",
      recordedById: ctx.users.admin.id,
    })
    .returning({ id: trainingRecords.id });
  return { id: row.id, courseTypeId: course.id };
}

/** A tier-3 application waiting for its department's reviewer (step 1): no one may except training yet. */
async function waitingAtReview(ctx: MatrixContext) {
  const applicant = await createUser({ roles: ["instructor"], departmentId: ctx.users.reviewer.departmentId });
  const { application } = await createSubmittedApplication({ applicant, tier: 3 });
  return { id: application.id, version: String(application.version) };
}

export const TRAINING_ROWS: MatrixRow[] = [
  { route: "/api/training/course-types", method: "GET", expect: signedIn(200, 401) },
  {
    route: "/api/training/course-types",
    method: "POST",
    prepare: async () => ({ departmentId: (await createDepartment()).id }),
    body: (c) => ({ name: uniq("Matrix course"), validityMonths: 36, minTier: 2, departmentId: c.data.departmentId }),
    expect: adminOnly(201, 401, 403),
  },
  {
    route: "/api/training/course-types/[id]",
    method: "PATCH",
    prepare: courseType,
    path: (c) => `/api/training/course-types/${c.data.id}`,
    body: () => ({ covers: "Matrix check." }),
    expect: adminOnly(200, 401, 403),
  },
  { route: "/api/training/records", method: "GET", expect: signedIn(200, 401) },
  {
    route: "/api/training/records",
    method: "POST",
    prepare: courseType,
    body: (c) => ({
      userId: c.targetUserId,
      courseTypeId: c.data.id,
      completedOn: "2026-02-01",
      trainer: "Matrix trainer",
    }),
    expect: only({ safety_officer: 201, admin: 201 }, 403, 401),
  },
  {
    route: "/api/training/records/[id]",
    method: "DELETE",
    prepare: trainingRecord,
    path: (c) => `/api/training/records/${c.data.id}`,
    expect: only({ safety_officer: 200, admin: 200 }, 403, 401),
  },
  {
    // No multipart body: those allowed get past the record check to 415.
    route: "/api/training/records/[id]/certificate",
    method: "POST",
    prepare: trainingRecord,
    path: (c) => `/api/training/records/${c.data.id}/certificate`,
    expect: only({ safety_officer: 415, admin: 415 }, 403, 401),
  },
  {
    // The record has no certificate: its person and officers learn that (404), others the same 404.
    route: "/api/training/records/[id]/certificate",
    method: "GET",
    prepare: trainingRecord,
    path: (c) => `/api/training/records/${c.data.id}/certificate`,
    expect: signedIn(404, 401),
  },
  {
    route: "/api/review/[id]/training-exception",
    method: "POST",
    prepare: waitingAtReview,
    path: (c) => `/api/review/${c.data.id}/training-exception`,
    body: (c) => ({ expectedVersion: Number(c.data.version), reason: "Matrix check of the exception.", password: "x" }),
    expect: only({}, 403, 401),
  },
  { route: "/training", method: "PAGE", expect: only({ safety_officer: 200, admin: 200 }, "→/forbidden", "→/sign-in") },
  { route: "/admin/training", method: "PAGE", expect: adminOnly(200, "→/sign-in", "→/forbidden") },
];
