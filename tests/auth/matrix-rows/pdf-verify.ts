import { createDepartment, createUser } from "../../support/db";
import { createPermitFixture } from "../../pdf/support";
import { everyone, type MatrixContext, type MatrixRow } from "../matrix-kit";

// The printable permit, its bench card, and the public page behind its QR code. A permit is visible
// to its holder and the people named on it, reviewers of its department and safety officers
// (lib/permits permitScope); anyone else gets the 404 of a permit that does not exist. The download
// links are opened in a browser, so a visitor without a session is sent to sign in.

/** A permit held by the matrix's instructor in the department of the matrix's reviewer. */
async function ownDepartmentPermit(c: MatrixContext) {
  const holder = c.users.instructor;
  const fixture = await createPermitFixture({
    tier: 2,
    holder: { id: holder.id, name: `Holder ${c.unique}` },
    departmentId: holder.departmentId!,
  });
  return { id: fixture.permit.id, code: fixture.permit.verificationCode };
}

/** Someone else's permit: another department, another holder. */
async function elsewherePermit() {
  const dept = await createDepartment();
  const holder = await createUser({ roles: ["instructor"], departmentId: dept.id });
  const fixture = await createPermitFixture({ tier: 1, holder, departmentId: dept.id });
  return { id: fixture.permit.id, code: fixture.permit.verificationCode };
}

const own = { anonymous: "→/sign-in", instructor: 200, reviewer: 200, safety_officer: 200, admin: 404 } as const;
const elsewhere = { anonymous: "→/sign-in", instructor: 404, reviewer: 404, safety_officer: 200, admin: 404 } as const;

export const PDF_VERIFY_ROWS: MatrixRow[] = [
  {
    route: "/permits/[id]/pdf",
    method: "GET",
    prepare: ownDepartmentPermit,
    path: (c) => `/permits/${c.data.id}/pdf`,
    expect: own,
  },
  {
    route: "/permits/[id]/pdf",
    method: "GET",
    prepare: elsewherePermit,
    path: (c) => `/permits/${c.data.id}/pdf?size=letter`,
    expect: elsewhere,
  },
  {
    route: "/permits/[id]/bench-card",
    method: "GET",
    prepare: ownDepartmentPermit,
    path: (c) => `/permits/${c.data.id}/bench-card`,
    expect: own,
  },
  {
    route: "/permits/[id]/bench-card",
    method: "GET",
    prepare: elsewherePermit,
    path: (c) => `/permits/${c.data.id}/bench-card`,
    expect: elsewhere,
  },
  // Public by design: the same answer whoever asks, for a real code and for a made-up one.
  {
    route: "/verify/[code]",
    method: "PAGE",
    prepare: elsewherePermit,
    path: (c) => `/verify/${c.data.code}`,
    expect: everyone(200),
  },
  { route: "/verify/[code]", method: "PAGE", path: () => `/verify/${"z".repeat(43)}`, expect: everyone(200) },
];
