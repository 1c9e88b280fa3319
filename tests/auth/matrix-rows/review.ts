import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { decisions, permits, users } from "@/db/schema";
import { decide } from "@/lib/review/decide";
import { asActor, createSubmittedApplication } from "../../review/support";
import { createUser, TEST_PASSWORD } from "../../support/db";
import {
  adminOnly,
  signedIn,
  type MatrixContext,
  type MatrixRow,
  type Principal,
  type Expectation,
} from "../matrix-kit";

// Review chain, permits, rules and the audit exports. Records are made per cell with the review
// fixture (a submitted application, frozen revision, afterSubmit), in the matrix users' department.

async function userRow(id: string) {
  const [row] = await getDb().select().from(users).where(eq(users.id, id));
  return row;
}

/** A tier-3 application by a fresh instructor of the matrix reviewer's department, waiting at step 1. */
async function waitingApplication(ctx: MatrixContext) {
  const applicant = await createUser({ roles: ["instructor"], departmentId: ctx.users.reviewer.departmentId });
  const { application } = await createSubmittedApplication({ applicant, tier: 3 });
  return { id: application.id, version: String(application.version) };
}

/** The matrix instructor's application, returned with a comment by a reviewer of its department. */
async function returnedToInstructor(ctx: MatrixContext) {
  const applicant = await userRow(ctx.users.instructor.id);
  const reviewer = await createUser({ roles: ["reviewer"], departmentId: applicant.departmentId });
  const { application } = await createSubmittedApplication({ applicant, tier: 1 });
  await decide(asActor(reviewer), application.id, {
    kind: "return",
    expectedVersion: application.version,
    comment: "Measure the gap again.",
    pinnedTo: "step:2",
  });
  const [decision] = await getDb()
    .select({ id: decisions.id })
    .from(decisions)
    .where(eq(decisions.applicationId, application.id));
  return { id: application.id, decisionId: decision.id };
}

/** A tier-0 permit (self-certified at submission) held by `holderId`. */
async function permitHeldBy(holderId: string) {
  const holder = await userRow(holderId);
  const { application } = await createSubmittedApplication({ applicant: holder, tier: 0 });
  const [permit] = await getDb()
    .select({ id: permits.id, version: permits.version })
    .from(permits)
    .where(eq(permits.applicationId, application.id));
  return { id: permit.id, version: String(permit.version), applicationId: application.id };
}

/** A tier-0 permit held by a fresh instructor of the matrix department (no principal is involved in it). */
async function unrelatedPermit(ctx: MatrixContext) {
  const holder = await createUser({ roles: ["instructor"], departmentId: ctx.users.reviewer.departmentId });
  return permitHeldBy(holder.id);
}

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

export const REVIEW_ROWS: MatrixRow[] = [
  // The queue.
  { route: "/api/review", method: "GET", expect: only({ reviewer: 200, safety_officer: 200 }, 403, 401) },
  {
    route: "/review",
    method: "PAGE",
    expect: only({ reviewer: 200, safety_officer: 200 }, "→/forbidden", "→/sign-in"),
  },
  // Decisions: the department's reviewer signs step 1 of a tier-3 chain; nobody else may.
  {
    route: "/api/review/[id]/decisions",
    method: "POST",
    prepare: waitingApplication,
    path: (c) => `/api/review/${c.data.id}/decisions`,
    body: (c) => ({ kind: "recommend", expectedVersion: Number(c.data.version), comment: "Matrix check." }),
    expect: only({ reviewer: 201 }, 403, 401),
  },
  // The application page: applicant, the department's reviewer and officers; an admin is not involved.
  {
    route: "/applications/[id]",
    method: "PAGE",
    prepare: async (c) => {
      const { application } = await createSubmittedApplication({
        applicant: await userRow(c.users.instructor.id),
        tier: 2,
      });
      return { id: application.id };
    },
    path: (c) => `/applications/${c.data.id}`,
    expect: only({ instructor: 200, reviewer: 200, safety_officer: 200 }, 404, "→/sign-in"),
  },
  // Permits.
  { route: "/api/permits", method: "GET", expect: signedIn(200, 401) },
  { route: "/permits", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  {
    route: "/api/permits/[id]",
    method: "GET",
    prepare: (c) => permitHeldBy(c.users.instructor.id),
    path: (c) => `/api/permits/${c.data.id}`,
    expect: only({ instructor: 200, reviewer: 200, safety_officer: 200 }, 404, 401),
  },
  {
    route: "/permits/[id]",
    method: "PAGE",
    prepare: (c) => permitHeldBy(c.users.instructor.id),
    path: (c) => `/permits/${c.data.id}`,
    expect: only({ instructor: 200, reviewer: 200, safety_officer: 200 }, 404, "→/sign-in"),
  },
  {
    route: "/api/permits/[id]/revoke",
    method: "POST",
    prepare: unrelatedPermit,
    path: (c) => `/api/permits/${c.data.id}/revoke`,
    body: (c) => ({ expectedVersion: Number(c.data.version), password: TEST_PASSWORD, reason: "Matrix check." }),
    expect: only({ safety_officer: 200 }, 403, 401),
  },
  {
    route: "/api/permits/[id]/renew",
    method: "POST",
    prepare: (c) => permitHeldBy(c.users.instructor.id),
    path: (c) => `/api/permits/${c.data.id}/renew`,
    body: () => ({}),
    // Only the holder renews; others who may create applications learn nothing about the permit.
    expect: only({ instructor: 201, reviewer: 404, safety_officer: 404 }, 403, 401),
  },
  { route: "/api/permits/export.csv", method: "GET", expect: only({ safety_officer: 200 }, 403, 401) },
  // The audit trail export.
  { route: "/api/audit/export.csv", method: "GET", expect: only({ safety_officer: 200 }, 403, 401) },
  // Rules.
  { route: "/api/admin/rules", method: "GET", expect: adminOnly(200, 401, 403) },
  {
    route: "/api/admin/rules",
    method: "POST",
    // Re-adopting the default schedule: a new version that changes nothing for other tests.
    body: () => ({ kind: "reminders", rules: { daysBefore: [30, 7, 1, 0] }, note: "Matrix check." }),
    expect: adminOnly(201, 401, 403),
  },
  { route: "/admin/rules", method: "PAGE", expect: adminOnly(200, "→/sign-in", "→/forbidden") },
  // The applicant answers a return comment; reviewers read replies but do not write them here.
  {
    route: "/api/applications/[id]/replies",
    method: "POST",
    prepare: returnedToInstructor,
    path: (c) => `/api/applications/${c.data.id}/replies`,
    body: (c) => ({ decisionId: c.data.decisionId, body: "Measured again: 9.4 mm." }),
    expect: { anonymous: 401, instructor: 201, reviewer: 404, safety_officer: 404, admin: 403 },
  },
  // Institution settings (the permit number prefix), edited on the rules page.
  { route: "/api/admin/settings", method: "GET", expect: adminOnly(200, 401, 403) },
  {
    route: "/api/admin/settings",
    method: "PATCH",
    // The default prefix again: permit numbers in other tests keep HV.
    body: () => ({ permitPrefix: "HV" }),
    expect: adminOnly(200, 401, 403),
  },
  // Tamper evidence: the audit chain and the decision seals, walked on every view.
  { route: "/admin/records", method: "PAGE", expect: adminOnly(200, "→/sign-in", "→/forbidden") },
];
