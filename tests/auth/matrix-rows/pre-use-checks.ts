import crypto from "node:crypto";
import { getDb } from "@/db";
import { preUseCheckPhotos } from "@/db/schema";
import { getStorage, newKey } from "@/lib/storage";
import { createDepartment, createUser } from "../../support/db";
import { createPermitFixture } from "../../pdf/support";
import { checkBody } from "../../checks/support";
import type { MatrixContext, MatrixRow } from "../matrix-kit";

// Pre-use checks at the bench (lib/checks). The phone page and the check's routes follow the permit's
// visibility (holder and named people, reviewers of its department, safety officers; anyone else gets
// the 404 of a permit that does not exist). Recording needs permit.check and a place on the permit:
// its holder and the people named on it, or a safety officer on any permit. A reviewer of the
// department sees the permit but is not named on it (403); admins do not hold permit.check (403).

// The smallest valid PNG (1 × 1 px), for a stored photo.
const PNG_1PX = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==",
  "base64",
);

async function ownPermit(c: MatrixContext) {
  const holder = c.users.instructor;
  const f = await createPermitFixture({
    tier: 3,
    holder: { id: holder.id, name: `Holder ${c.unique}` },
    departmentId: holder.departmentId!,
  });
  return { id: f.permit.id, body: JSON.stringify(checkBody(f)) };
}

async function elsewherePermit() {
  const dept = await createDepartment();
  const holder = await createUser({ roles: ["instructor"], departmentId: dept.id });
  const f = await createPermitFixture({ tier: 3, holder, departmentId: dept.id });
  return { id: f.permit.id, body: JSON.stringify(checkBody(f)) };
}

async function withPhoto(permit: { id: string; body: string }, uploadedById: string) {
  const key = newKey("checks", "png");
  await (await getStorage()).put(key, PNG_1PX, "image/png");
  const [row] = await getDb()
    .insert(preUseCheckPhotos)
    .values({
      permitId: permit.id,
      uploadedById,
      storageKey: key,
      contentType: "image/png",
      size_B: PNG_1PX.length,
      sha256: crypto.createHash("sha256").update(PNG_1PX).digest("hex"),
    })
    .returning({ id: preUseCheckPhotos.id });
  return { ...permit, photoId: row.id };
}

export const PRE_USE_CHECK_ROWS: MatrixRow[] = [
  {
    route: "/permits/[id]/check",
    method: "PAGE",
    prepare: ownPermit,
    path: (c) => `/permits/${c.data.id}/check`,
    expect: { anonymous: "→/sign-in", instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 },
  },
  {
    route: "/permits/[id]/check",
    method: "PAGE",
    prepare: elsewherePermit,
    path: (c) => `/permits/${c.data.id}/check`,
    expect: { anonymous: "→/sign-in", instructor: 404, reviewer: 404, safety_officer: 200, admin: 404 },
  },
  {
    route: "/api/permits/[id]/checks",
    method: "POST",
    prepare: ownPermit,
    path: (c) => `/api/permits/${c.data.id}/checks`,
    body: (c) => JSON.parse(c.data.body),
    expect: { anonymous: 401, instructor: 201, reviewer: 403, safety_officer: 201, admin: 403 },
  },
  {
    route: "/api/permits/[id]/checks",
    method: "POST",
    prepare: elsewherePermit,
    path: (c) => `/api/permits/${c.data.id}/checks`,
    body: (c) => JSON.parse(c.data.body),
    expect: { anonymous: 401, instructor: 404, reviewer: 404, safety_officer: 201, admin: 403 },
  },
  // A JSON body where a photo belongs: whoever passes the record checks is told the type is wrong.
  {
    route: "/api/permits/[id]/checks/photos",
    method: "POST",
    prepare: ownPermit,
    path: (c) => `/api/permits/${c.data.id}/checks/photos`,
    body: () => ({ file: "not a photo" }),
    expect: { anonymous: 401, instructor: 415, reviewer: 403, safety_officer: 415, admin: 403 },
  },
  {
    route: "/api/permits/[id]/checks/photos",
    method: "POST",
    prepare: elsewherePermit,
    path: (c) => `/api/permits/${c.data.id}/checks/photos`,
    body: () => ({ file: "not a photo" }),
    expect: { anonymous: 401, instructor: 404, reviewer: 404, safety_officer: 415, admin: 403 },
  },
  {
    route: "/api/permits/[id]/checks/photos/[photoId]",
    method: "GET",
    prepare: async (c) => withPhoto(await ownPermit(c), c.users.instructor.id),
    path: (c) => `/api/permits/${c.data.id}/checks/photos/${c.data.photoId}`,
    expect: { anonymous: 401, instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 },
  },
  {
    route: "/api/permits/[id]/checks/photos/[photoId]",
    method: "GET",
    prepare: async (c) => {
      const permit = await elsewherePermit();
      return withPhoto(permit, c.users.safety_officer.id);
    },
    path: (c) => `/api/permits/${c.data.id}/checks/photos/${c.data.photoId}`,
    expect: { anonymous: 401, instructor: 404, reviewer: 404, safety_officer: 200, admin: 404 },
  },
];
