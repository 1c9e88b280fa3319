import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { incidentPhotos, incidents, permits, users } from "@/db/schema";
import { getStorage, newKey } from "@/lib/storage";
import { createSubmittedApplication } from "../../review/support";
import { createUser, TEST_PASSWORD } from "../../support/db";
import { signedIn, type MatrixContext, type MatrixRow, type Principal, type Expectation } from "../matrix-kit";

// Incident and near-miss reports (issue 17, item 3). Each cell's report is made by a fresh user, so
// no principal reads it as its reporter; the report names a permit held by the matrix instructor
// where a row checks the holder's view (lib/auth/permissions.ts INCIDENT_READ_BY_LINKED_PERMIT_HOLDER).

const cells = (values: Record<Principal, Expectation>) => values;

async function userRow(id: string) {
  const [row] = await getDb().select().from(users).where(eq(users.id, id));
  return row;
}

/** A tier-0 permit (self-certified at submission) held by `holderId`. */
async function permitHeldBy(holderId: string) {
  const { application } = await createSubmittedApplication({ applicant: await userRow(holderId), tier: 0 });
  const [permit] = await getDb()
    .select({ id: permits.id, version: permits.version })
    .from(permits)
    .where(eq(permits.applicationId, application.id));
  return permit;
}

async function reportBy(reporterId: string, permitId: string | null) {
  const [row] = await getDb()
    .insert(incidents)
    .values({
      kind: "near_miss",
      summary: "Matrix near miss",
      description: "The grounding hook was not on its bracket.",
      occurredAt: new Date(),
      location: "B12",
      injuries: false,
      permitId,
      reporterId,
    })
    .returning({ id: incidents.id });
  return row.id;
}

/** A report by a stranger naming a permit the matrix instructor holds. */
async function reportOnInstructorsPermit(ctx: MatrixContext) {
  const stranger = await createUser({ roles: ["instructor"], departmentId: ctx.users.reviewer.departmentId });
  const permit = await permitHeldBy(ctx.users.instructor.id);
  return { id: await reportBy(stranger.id, permit.id) };
}

/** A report by a stranger naming a permit another stranger holds (no principal is involved in it). */
async function reportOnUnrelatedPermit(ctx: MatrixContext) {
  const holder = await createUser({ roles: ["instructor"], departmentId: ctx.users.reviewer.departmentId });
  const permit = await permitHeldBy(holder.id);
  return { id: await reportBy(holder.id, permit.id), version: String(permit.version) };
}

async function reportWithPhoto(ctx: MatrixContext) {
  const { id } = await reportOnInstructorsPermit(ctx);
  // The smallest valid PDF header is enough for a stored file (the type is checked at upload).
  const bytes = Buffer.from("%PDF-1.4\n%%EOF\n", "latin1");
  const key = newKey("incidents", "pdf");
  await (await getStorage()).put(key, bytes, "application/pdf");
  const [photo] = await getDb()
    .insert(incidentPhotos)
    .values({
      incidentId: id,
      storageKey: key,
      filename: "matrix.pdf",
      contentType: "application/pdf",
      size_B: bytes.length,
      sha256: crypto.createHash("sha256").update(bytes).digest("hex"),
      uploadedById: ctx.users.instructor.id,
    })
    .returning({ id: incidentPhotos.id });
  return { id, photoId: photo.id };
}

const report = () => ({
  kind: "near_miss",
  summary: "Matrix: jar bank found charged",
  description: "The bank read 2 kV on the meter an hour after the show.",
  occurredAt: "2026-01-15T10:00",
  location: "B12 lecture theatre",
  injuries: false,
});

// The holder (the matrix instructor) and officers and admins read it; the reviewer does not.
const holderView = cells({ anonymous: 401, instructor: 200, reviewer: 404, safety_officer: 200, admin: 200 });

export const INCIDENT_ROWS: MatrixRow[] = [
  { route: "/api/incidents", method: "GET", expect: signedIn(200, 401) },
  { route: "/api/incidents", method: "POST", body: report, expect: signedIn(201, 401) },
  {
    route: "/api/incidents/[id]",
    method: "GET",
    prepare: reportOnInstructorsPermit,
    path: (c) => `/api/incidents/${c.data.id}`,
    expect: holderView,
  },
  {
    route: "/api/incidents/[id]",
    method: "PATCH",
    prepare: reportOnInstructorsPermit,
    path: (c) => `/api/incidents/${c.data.id}`,
    body: () => ({ expectedVersion: 1, state: "investigating" }),
    expect: cells({ anonymous: 401, instructor: 403, reviewer: 403, safety_officer: 200, admin: 403 }),
  },
  {
    route: "/api/incidents/[id]/revoke-permit",
    method: "POST",
    prepare: reportOnUnrelatedPermit,
    path: (c) => `/api/incidents/${c.data.id}/revoke-permit`,
    body: (c) => ({ expectedVersion: Number(c.data.version), password: TEST_PASSWORD, reason: "Matrix check." }),
    expect: cells({ anonymous: 401, instructor: 403, reviewer: 403, safety_officer: 200, admin: 403 }),
  },
  {
    route: "/api/incidents/[id]/photos",
    method: "POST",
    prepare: reportOnInstructorsPermit,
    path: (c) => `/api/incidents/${c.data.id}/photos`,
    // The matrix sends JSON: an officer gets past every check to the media type (415); the holder
    // reads but does not add photos; the multipart path is tested in tests/incidents/incidents.test.ts.
    body: () => ({}),
    expect: cells({ anonymous: 401, instructor: 403, reviewer: 404, safety_officer: 415, admin: 403 }),
  },
  {
    route: "/api/incidents/[id]/photos/[photoId]",
    method: "GET",
    prepare: reportWithPhoto,
    path: (c) => `/api/incidents/${c.data.id}/photos/${c.data.photoId}`,
    expect: holderView,
  },
  { route: "/incidents", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  { route: "/incidents/new", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  {
    route: "/incidents/[id]",
    method: "PAGE",
    prepare: reportOnInstructorsPermit,
    path: (c) => `/incidents/${c.data.id}`,
    expect: cells({ anonymous: "→/sign-in", instructor: 200, reviewer: 404, safety_officer: 200, admin: 200 }),
  },
];
