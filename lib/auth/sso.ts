import "server-only";
import { and, desc, eq, gt, isNull, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { departments, invitations, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { env, type Env } from "@/lib/env";
import type { Role } from "@/lib/roles";
import { normaliseEmail } from "./credentials";
import { SSO_REFUSALS as REFUSALS, type SsoRefusal } from "./sso-messages";

// Institutional sign-in (OpenID Connect): who the provider says someone is → a Benchclear account.
// The provider's issuer and subject identify the person (OIDC Core 1.0 §2: `sub` is never reassigned
// within an issuer). On the first sign-in an account is made from the configured claims (name, e-mail,
// department) with roles from the group claim (OIDC_GROUP_ROLES) or OIDC_DEFAULT_ROLES; afterwards the
// product owns roles and department (the admin pages), and a disabled account stays shut. An open
// invitation for the address gives the new account its roles and department instead (and is spent). An existing
// account with the same e-mail (an invited or demo user) is linked once, unless the provider says
// the address is unverified. Every outcome is in the audit trail.

export type SsoConfig = Pick<
  Env,
  | "OIDC_CLAIM_NAME"
  | "OIDC_CLAIM_EMAIL"
  | "OIDC_CLAIM_DEPARTMENT"
  | "OIDC_CLAIM_GROUPS"
  | "OIDC_GROUP_ROLES"
  | "OIDC_DEFAULT_ROLES"
>;

export type SsoClaims = Record<string, unknown>;

export type SsoUser = { id: string; email: string; name: string; sessionVersion: number };

export type SsoResult =
  { ok: true; user: SsoUser; provisioned: boolean } | { ok: false; reason: SsoRefusal; message: string };

/** A claim as text: a string, or the first string of a list; trimmed, cut to `max` characters. */
export function claimText(claims: SsoClaims, name: string | undefined, max = 320): string | null {
  if (!name) return null;
  const value = claims[name];
  const first = Array.isArray(value) ? value.find((v) => typeof v === "string") : value;
  if (typeof first !== "string") return null;
  const text = first.trim().slice(0, max);
  return text || null;
}

/** A claim as a list of strings (a group claim may be one string or an array). */
export function claimList(claims: SsoClaims, name: string | undefined): string[] {
  if (!name) return [];
  const value = claims[name];
  const list = Array.isArray(value) ? value : [value];
  return list.filter((v): v is string => typeof v === "string").map((v) => v.trim());
}

/** The roles a new account starts with: every role its groups map to, or the default roles. */
export function rolesFromGroups(
  groups: readonly string[],
  config: Pick<SsoConfig, "OIDC_GROUP_ROLES" | "OIDC_DEFAULT_ROLES">,
) {
  const mapped = new Set<Role>();
  const matched: string[] = [];
  for (const { group, role } of config.OIDC_GROUP_ROLES ?? []) {
    if (groups.includes(group)) {
      mapped.add(role);
      matched.push(group);
    }
  }
  return { roles: mapped.size ? [...mapped] : [...config.OIDC_DEFAULT_ROLES], matchedGroups: [...new Set(matched)] };
}

/**
 * Signs in (and on the first time provisions) the person the provider vouched for. `claims` are the
 * validated ID token's claims merged with the UserInfo answer; `issuer` is the configured issuer.
 */
export async function signInWithProvider(
  issuer: string,
  claims: SsoClaims,
  config: SsoConfig = env(),
): Promise<SsoResult> {
  const subject = typeof claims.sub === "string" && claims.sub.length <= 255 ? claims.sub : null;
  const emailText = claimText(claims, config.OIDC_CLAIM_EMAIL);
  const email = emailText && /^[^\s@]+@[^\s@]+$/.test(emailText) ? normaliseEmail(emailText) : null;
  if (!subject || !email) {
    await refusalAudit(null, email ?? "unknown", issuer, subject, "missing_claims");
    return refuse("missing_claims");
  }
  const name = claimText(claims, config.OIDC_CLAIM_NAME, 120) ?? email;
  const departmentClaim = claimText(claims, config.OIDC_CLAIM_DEPARTMENT, 200);

  return db.transaction(async (tx) => {
    const columns = {
      id: users.id,
      email: users.email,
      name: users.name,
      sessionVersion: users.sessionVersion,
      disabledAt: users.disabledAt,
      oidcSubject: users.oidcSubject,
    };
    // Lock the candidate rows, so two first sign-ins of one person at once make one account.
    const candidates = await tx
      .select(columns)
      .from(users)
      .where(
        or(and(eq(users.oidcIssuer, issuer), eq(users.oidcSubject, subject)), eq(sql`lower(${users.email})`, email)),
      )
      .for("update");
    const linked = candidates.find((c) => c.oidcSubject === subject);
    const byEmail = candidates.find((c) => c.email.toLowerCase() === email);
    const existing = linked ?? byEmail;

    if (existing?.disabledAt) {
      await refusalAudit(tx, email, issuer, subject, "disabled", existing);
      return refuse("disabled");
    }

    if (existing && !linked) {
      // An account made by invitation (or the demo data) meets its institutional identity.
      if (existing.oidcSubject) {
        await refusalAudit(tx, email, issuer, subject, "identity_conflict", existing);
        return refuse("identity_conflict");
      }
      if (claims.email_verified === false) {
        await refusalAudit(tx, email, issuer, subject, "unverified_email", existing);
        return refuse("unverified_email");
      }
      await tx
        .update(users)
        .set({ oidcIssuer: issuer, oidcSubject: subject, updatedAt: new Date() })
        .where(eq(users.id, existing.id));
      await writeAudit(tx, {
        actor: { id: existing.id, name: existing.name },
        action: "user.sso_linked",
        entityType: "user",
        entityId: existing.id,
        data: { issuer, subject, email },
      });
    }

    let user: SsoUser;
    let provisioned = false;
    if (existing) {
      user = { id: existing.id, email: existing.email, name: existing.name, sessionVersion: existing.sessionVersion };
    } else {
      const department = departmentClaim
        ? (
            await tx
              .select({ id: departments.id, name: departments.name })
              .from(departments)
              .where(
                or(
                  eq(sql`lower(${departments.code})`, departmentClaim.toLowerCase()),
                  eq(sql`lower(${departments.name})`, departmentClaim.toLowerCase()),
                ),
              )
              .limit(1)
          )[0]
        : undefined;
      const fromGroups = rolesFromGroups(claimList(claims, config.OIDC_CLAIM_GROUPS), config);
      // An admin's open invitation for this (verified) address decides roles and department: it is
      // how an admin sets them up before the person's first sign-in. It is spent here.
      const [invitation] =
        claims.email_verified === false
          ? []
          : await tx
              .select({ id: invitations.id, roles: invitations.roles, departmentId: invitations.departmentId })
              .from(invitations)
              .where(
                and(
                  eq(sql`lower(${invitations.email})`, email),
                  isNull(invitations.usedAt),
                  isNull(invitations.revokedAt),
                  gt(invitations.expiresAt, new Date()),
                ),
              )
              .orderBy(desc(invitations.createdAt))
              .limit(1)
              .for("update");
      const roles = invitation ? invitation.roles : fromGroups.roles;
      const matchedGroups = invitation ? [] : fromGroups.matchedGroups;
      const departmentId = invitation ? invitation.departmentId : (department?.id ?? null);
      if (invitation) {
        await tx
          .update(invitations)
          .set({ usedAt: new Date(), updatedAt: new Date() })
          .where(eq(invitations.id, invitation.id));
      }
      const [row] = await tx
        .insert(users)
        .values({
          email,
          name,
          roles,
          departmentId,
          passwordHash: null,
          oidcIssuer: issuer,
          oidcSubject: subject,
        })
        .returning({ id: users.id, email: users.email, name: users.name, sessionVersion: users.sessionVersion });
      user = row;
      provisioned = true;
      await writeAudit(tx, {
        actor: { id: row.id, name: row.name },
        action: "user.provisioned",
        entityType: "user",
        entityId: row.id,
        data: {
          issuer,
          subject,
          email,
          name,
          roles,
          matchedGroups,
          invitationId: invitation?.id ?? null,
          departmentId,
          // Kept when it matched no department, so an admin can see why none was set.
          departmentClaim,
        },
      });
    }

    await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
    await writeAudit(tx, {
      actor: { id: user.id, name: user.name },
      action: "session.signed_in",
      entityType: "user",
      entityId: user.id,
      data: { method: "institution", issuer, subject },
    });
    return { ok: true, user, provisioned };
  });
}

/** The account linked to this identity, for the session token (after signInWithProvider said yes). */
export async function ssoAccount(
  issuer: string,
  subject: string,
): Promise<{ id: string; sessionVersion: number } | null> {
  const [row] = await db
    .select({ id: users.id, sessionVersion: users.sessionVersion, disabledAt: users.disabledAt })
    .from(users)
    .where(and(eq(users.oidcIssuer, issuer), eq(users.oidcSubject, subject)))
    .limit(1);
  return row && !row.disabledAt ? { id: row.id, sessionVersion: row.sessionVersion } : null;
}

function refuse(reason: SsoRefusal): SsoResult {
  return { ok: false, reason, message: REFUSALS[reason] };
}

async function refusalAudit(
  tx: Parameters<typeof writeAudit>[0] | null,
  email: string,
  issuer: string,
  subject: string | null,
  reason: string,
  user?: { id: string },
): Promise<void> {
  await writeAudit(tx ?? db, {
    actor: null,
    action: "session.sign_in_refused",
    entityType: "user",
    entityId: user?.id ?? `email:${email.slice(0, 320)}`,
    data: { method: "institution", issuer, subject, email: email.slice(0, 320), reason },
  });
}
