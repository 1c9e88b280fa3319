import "server-only";
import { and, arrayOverlaps, eq, isNull, type SQL } from "drizzle-orm";
import { users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import type { Role } from "@/lib/roles";
import { PERMISSIONS, type Permission } from "./permissions";

// "Who may do this?" asked of the database, answered by the permission table — never by role names
// written into SQL. Used to address mail to the people who can act (reviewers of a department,
// approvers).

/**
 * Where a permission is held:
 * - `"institution"`: anyone holding it, whatever their department;
 * - `{ departmentId }`: members of that department who hold it through a department-scoped role —
 *   one that does not also carry the permission's institution-wide `.any` form (a reviewer reviews
 *   their own department's applications; a safety officer, who reviews any, is reached otherwise).
 */
export type PermissionScope = "institution" | { departmentId: string };

export type PermissionHolder = { id: string; email: string; name: string };

function rolesWith(permission: string): readonly Role[] {
  return (PERMISSIONS as Record<string, readonly Role[] | undefined>)[permission] ?? [];
}

/** The roles that hold `permission` only within their own department. */
export function departmentScopedRoles(permission: Permission): Role[] {
  const institutionWide = rolesWith(`${permission}.any`);
  return rolesWith(permission).filter((role) => !institutionWide.includes(role));
}

/** Active (not disabled) users who hold `permission` in `scope`. */
export async function usersWithPermission(
  tx: DbOrTx,
  permission: Permission,
  scope: PermissionScope,
): Promise<PermissionHolder[]> {
  const conditions: SQL[] = [isNull(users.disabledAt)];
  if (scope === "institution") {
    const roles = rolesWith(permission);
    if (roles.length === 0) return [];
    conditions.push(arrayOverlaps(users.roles, [...roles]));
  } else {
    const roles = departmentScopedRoles(permission);
    if (roles.length === 0) return [];
    conditions.push(eq(users.departmentId, scope.departmentId), arrayOverlaps(users.roles, roles));
  }
  return tx
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(...conditions));
}
