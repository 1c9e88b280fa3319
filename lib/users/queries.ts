import "server-only";
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import { departments, invitations, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";

// Reads for the admin screens. Columns are listed explicitly: a password hash is never selected.

export async function listDepartments() {
  return db
    .select({ id: departments.id, name: departments.name, code: departments.code })
    .from(departments)
    .orderBy(asc(departments.name));
}

export async function listUsers(actor: CurrentUser) {
  assertCan(actor, "admin.users");
  return db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      roles: users.roles,
      departmentId: users.departmentId,
      departmentName: departments.name,
      disabledAt: users.disabledAt,
      lastSignInAt: users.lastSignInAt,
      hasPassword: sql<boolean>`${users.passwordHash} IS NOT NULL`,
      createdAt: users.createdAt,
    })
    .from(users)
    .leftJoin(departments, eq(departments.id, users.departmentId))
    .orderBy(asc(users.name));
}

export async function listPendingInvitations(actor: CurrentUser) {
  assertCan(actor, "admin.users");
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      name: invitations.name,
      roles: invitations.roles,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .where(sql`${invitations.usedAt} IS NULL AND ${invitations.revokedAt} IS NULL AND ${invitations.expiresAt} > now()`)
    .orderBy(desc(invitations.createdAt));
}

/** Counts for the admin's dashboard card. */
export async function adminOverview(actor: CurrentUser) {
  assertCan(actor, "admin.users");
  const [row] = await db
    .select({
      activeUsers: sql<number>`count(*) FILTER (WHERE ${users.disabledAt} IS NULL)::int`,
      disabledUsers: sql<number>`count(*) FILTER (WHERE ${users.disabledAt} IS NOT NULL)::int`,
    })
    .from(users);
  const [inv] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(invitations)
    .where(
      sql`${invitations.usedAt} IS NULL AND ${invitations.revokedAt} IS NULL AND ${invitations.expiresAt} > now()`,
    );
  return { activeUsers: row?.activeUsers ?? 0, disabledUsers: row?.disabledUsers ?? 0, openInvitations: inv?.n ?? 0 };
}

/** E-mail addresses of those of the given users who are not disabled, for mail queued in `tx`. */
export async function activeEmails(tx: DbOrTx, ids: readonly string[]): Promise<string[]> {
  if (ids.length === 0) return [];
  const rows = await tx
    .select({ email: users.email })
    .from(users)
    .where(and(inArray(users.id, [...ids]), isNull(users.disabledAt)));
  return rows.map((r) => r.email);
}
