import "server-only";
import crypto from "node:crypto";
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { db } from "@/db";
import { departments, invitations, users, type Role } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { passwordProblem } from "@/lib/auth/password-policy";
import { AppError, conflict, notFound } from "@/lib/errors";
import { queueInvitationMail } from "@/lib/outbox/invitations";
import { invitationToken, invitationUrl } from "./invitation-token";
import { attempt, clear, peek, tooMany } from "@/lib/ratelimit";

// Writes for accounts: invitations, accepting them, role/department/disable changes and password
// changes. Each change and its audit row share one transaction.

export const INVITATION_DAYS = 7;

export function hashToken(token: string): string {
  return crypto.createHash("sha256").update(token).digest("hex");
}

export function newToken(): string {
  return crypto.randomBytes(32).toString("base64url"); // 256 bits
}

export { invitationUrl };

type InviteInput = { email: string; name: string; roles: Role[]; departmentId: string | null };

export async function inviteUser(actor: CurrentUser, input: InviteInput, now = new Date()) {
  assertCan(actor, "admin.users");
  // The token is derived from the id (./invitation-token.ts), so the mail can be rendered from the id.
  const id = crypto.randomUUID();
  const token = invitationToken(id);
  const expiresAt = new Date(now.getTime() + INVITATION_DAYS * 24 * 3600 * 1000);
  const invitation = await db.transaction(async (tx) => {
    const [existing] = await tx
      .select({ id: users.id })
      .from(users)
      .where(eq(sql`lower(${users.email})`, input.email));
    if (existing) throw conflict("A user with that e-mail already exists.");
    if (input.departmentId) {
      const [dept] = await tx
        .select({ id: departments.id })
        .from(departments)
        .where(eq(departments.id, input.departmentId));
      if (!dept)
        throw new AppError("invalid", "departmentId: unknown department", {
          issues: [{ path: "departmentId", message: "Unknown department." }],
        });
    }
    // A new invitation replaces any earlier open one for the same e-mail.
    await tx
      .update(invitations)
      .set({ revokedAt: now, updatedAt: now })
      .where(and(eq(invitations.email, input.email), isNull(invitations.usedAt), isNull(invitations.revokedAt)));
    const [row] = await tx
      .insert(invitations)
      .values({ ...input, id, tokenHash: hashToken(token), invitedById: actor.id, expiresAt })
      .returning({ id: invitations.id, email: invitations.email, expiresAt: invitations.expiresAt });
    await writeAudit(tx, {
      actor,
      action: "user.invited",
      entityType: "invitation",
      entityId: row.id,
      data: { email: input.email, roles: input.roles, departmentId: input.departmentId },
    });
    await queueInvitationMail(tx, {
      to: input.email,
      name: input.name,
      invitedBy: actor.name,
      invitationId: id,
      expiresAt,
    });
    return row;
  });
  return { invitation, token };
}

/** Looks up an open invitation by its token, for the accept page. */
export async function findOpenInvitation(token: string, now = new Date()) {
  const [row] = await db
    .select({ id: invitations.id, email: invitations.email, name: invitations.name, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(
      and(
        eq(invitations.tokenHash, hashToken(token)),
        isNull(invitations.usedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    );
  return row ?? null;
}

export async function acceptInvitation(token: string, password: string, now = new Date()) {
  return db.transaction(async (tx) => {
    // Lock the row, so two submissions of the same link cannot both create an account.
    const [inv] = await tx
      .select()
      .from(invitations)
      .where(eq(invitations.tokenHash, hashToken(token)))
      .for("update");
    if (!inv || inv.usedAt || inv.revokedAt || inv.expiresAt <= now) {
      throw new AppError("not_found", "This invitation link is not valid any more. Ask an admin for a new one.");
    }
    const problem = passwordProblem(password, { email: inv.email, name: inv.name });
    if (problem)
      throw new AppError("invalid", `password: ${problem}`, { issues: [{ path: "password", message: problem }] });
    const [taken] = await tx
      .select({ id: users.id })
      .from(users)
      .where(eq(sql`lower(${users.email})`, inv.email));
    if (taken) throw conflict("An account with this e-mail already exists.");
    const [user] = await tx
      .insert(users)
      .values({
        email: inv.email,
        name: inv.name,
        roles: inv.roles,
        departmentId: inv.departmentId,
        passwordHash: await hashPassword(password),
      })
      .returning({ id: users.id, email: users.email, name: users.name });
    await tx.update(invitations).set({ usedAt: now, updatedAt: now }).where(eq(invitations.id, inv.id));
    await writeAudit(tx, {
      actor: { id: user.id, name: user.name },
      action: "user.invitation_accepted",
      entityType: "user",
      entityId: user.id,
      data: { invitationId: inv.id },
    });
    return user;
  });
}

type UserChanges = { roles?: Role[]; departmentId?: string | null; disabled?: boolean };

export async function updateUser(actor: CurrentUser, userId: string, changes: UserChanges) {
  assertCan(actor, "admin.users");
  if (userId === actor.id) {
    if (changes.disabled) throw conflict("You cannot disable your own account.");
    if (changes.roles && !changes.roles.includes("admin")) throw conflict("You cannot remove your own admin role.");
  }
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select({ id: users.id, roles: users.roles, departmentId: users.departmentId, disabledAt: users.disabledAt })
      .from(users)
      .where(eq(users.id, userId))
      .for("update");
    if (!before) throw notFound("That user");
    if (userId === actor.id) {
      // Separation of duties: nobody widens or moves their own access. Another admin makes the change
      // on this account (the ordinary PATCH, as that admin), so every role change has a second person.
      const sameRoles =
        !changes.roles ||
        (changes.roles.length === before.roles.length && changes.roles.every((r) => before.roles.includes(r)));
      const sameDepartment = changes.departmentId === undefined || changes.departmentId === before.departmentId;
      if (!sameRoles || !sameDepartment) {
        throw conflict(
          "You cannot change your own roles or department: ask another admin to make the change on your account.",
        );
      }
    }
    const now = new Date();
    const set: Partial<typeof users.$inferInsert> = { updatedAt: now };
    if (changes.roles) set.roles = changes.roles;
    if (changes.departmentId !== undefined) set.departmentId = changes.departmentId;
    if (changes.disabled !== undefined) set.disabledAt = changes.disabled ? (before.disabledAt ?? now) : null;
    const [after] = await tx
      .update(users)
      // Any change to access ends the user's current sessions on their next request.
      .set({ ...set, sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, userId))
      .returning({ id: users.id, roles: users.roles, departmentId: users.departmentId, disabledAt: users.disabledAt });
    await writeAudit(tx, {
      actor,
      action:
        changes.disabled === true ? "user.disabled" : changes.disabled === false ? "user.enabled" : "user.updated",
      entityType: "user",
      entityId: userId,
      data: { before, after },
    });
    return after;
  });
}

export async function changePassword(actor: CurrentUser, currentPassword: string, newPassword: string) {
  // Wrong current passwords are counted (lib/ratelimit passwordChange), so a session left open cannot
  // be used to guess the password; the check is a peek, as for signing (lib/signing/password.ts).
  const limit = await peek("passwordChange", actor.id);
  if (!limit.allowed) throw tooMany(limit, "Too many wrong current passwords. Wait a little and try again.");
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, actor.id));
  if (!(await verifyPassword(row?.passwordHash, currentPassword))) {
    await attempt("passwordChange", actor.id);
    throw new AppError("invalid", "currentPassword: that is not your current password", {
      issues: [{ path: "currentPassword", message: "That is not your current password." }],
    });
  }
  const problem = passwordProblem(newPassword, { email: actor.email, name: actor.name });
  if (problem)
    throw new AppError("invalid", `newPassword: ${problem}`, { issues: [{ path: "newPassword", message: problem }] });
  await clear("passwordChange", actor.id);
  const passwordHash = await hashPassword(newPassword);
  await db.transaction(async (tx) => {
    await tx
      .update(users)
      .set({ passwordHash, updatedAt: new Date(), sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, actor.id));
    await writeAudit(tx, { actor, action: "user.password_changed", entityType: "user", entityId: actor.id });
  });
}

/** Signs a user out: ends every session (below) and records it in the audit trail, in one transaction. */
export async function signOutUser(actor: CurrentUser): Promise<void> {
  await db.transaction(async (tx) => {
    await tx
      .update(users)
      .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, actor.id));
    await writeAudit(tx, { actor, action: "session.signed_out", entityType: "user", entityId: actor.id });
  });
}

/**
 * Ends every session of a user at once (sign-out). Session tokens are stateless, so bumping the
 * version is what makes a copied or re-sent token useless on the next request.
 */
export async function endSessions(userId: string): Promise<void> {
  await db
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, userId));
}
