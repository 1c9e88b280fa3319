import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { usersWithPermission } from "@/lib/auth/holders";
import { createDepartment, createUser, requireDatabase } from "../support/db";

requireDatabase();

// Who is asked to act is answered from the roles table of product.md ("People and roles"): a
// reviewer reviews applications of their department; a safety officer reviews any application and
// gives the final approval. Instructors and admins do neither. Disabled accounts act on nothing.

describe("usersWithPermission", () => {
  it("finds a department's reviewers, not its officers, other departments' reviewers or disabled accounts", async () => {
    const dept = await createDepartment();
    const other = await createDepartment();
    const reviewer = await createUser({ roles: ["reviewer"], departmentId: dept.id });
    const both = await createUser({ roles: ["reviewer", "safety_officer"], departmentId: dept.id });
    const officer = await createUser({ roles: ["safety_officer"], departmentId: dept.id });
    const instructor = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const elsewhere = await createUser({ roles: ["reviewer"], departmentId: other.id });
    const disabled = await createUser({ roles: ["reviewer"], departmentId: dept.id });
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, disabled.id));

    const found = await usersWithPermission(getDb(), "application.review", { departmentId: dept.id });
    const ids = found.map((u) => u.id).sort();
    expect(ids).toEqual([reviewer.id, both.id].sort());
    for (const absent of [officer, instructor, elsewhere, disabled]) expect(ids).not.toContain(absent.id);
  });

  it("finds every active approver whatever their department, and only them", async () => {
    const dept = await createDepartment();
    const officer = await createUser({ roles: ["safety_officer"], departmentId: dept.id });
    const officerNoDept = await createUser({ roles: ["safety_officer"] });
    const reviewer = await createUser({ roles: ["reviewer"], departmentId: dept.id });
    const admin = await createUser({ roles: ["admin"] });
    const disabled = await createUser({ roles: ["safety_officer"] });
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, disabled.id));

    const ids = (await usersWithPermission(getDb(), "permit.approve", "institution")).map((u) => u.id);
    expect(ids).toEqual(expect.arrayContaining([officer.id, officerNoDept.id]));
    for (const absent of [reviewer, admin, disabled]) expect(ids).not.toContain(absent.id);
  });
});
