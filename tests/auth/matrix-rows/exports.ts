import { createDepartment, createUser } from "../../support/db";
import { createPermitFixture } from "../../pdf/support";
import { signedIn, type MatrixContext, type MatrixRow } from "../matrix-kit";

// Fuller exports (issue 18, item 5): the apparatus inventory CSV (each user's readable records) and
// the full assessment PDF of a permit (whoever may see the permit, as its other PDFs).

async function ownDepartmentPermit(c: MatrixContext) {
  const holder = c.users.instructor;
  const fixture = await createPermitFixture({
    tier: 2,
    holder: { id: holder.id, name: `Holder ${c.unique}` },
    departmentId: holder.departmentId!,
  });
  return { id: fixture.permit.id };
}

async function elsewherePermit() {
  const dept = await createDepartment();
  const holder = await createUser({ roles: ["instructor"], departmentId: dept.id });
  const fixture = await createPermitFixture({ tier: 1, holder, departmentId: dept.id });
  return { id: fixture.permit.id };
}

export const EXPORT_ROWS: MatrixRow[] = [
  { route: "/api/apparatus/export.csv", method: "GET", expect: signedIn(200, 401) },
  {
    route: "/permits/[id]/assessment",
    method: "GET",
    prepare: ownDepartmentPermit,
    path: (c) => `/permits/${c.data.id}/assessment`,
    expect: { anonymous: "→/sign-in", instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 },
  },
  {
    route: "/permits/[id]/assessment",
    method: "GET",
    prepare: elsewherePermit,
    path: (c) => `/permits/${c.data.id}/assessment?size=letter`,
    expect: { anonymous: "→/sign-in", instructor: 404, reviewer: 404, safety_officer: 200, admin: 404 },
  },
];
