import "server-only";
import { and, desc, eq, gt, isNull, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { departments, invitations, users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { env, type Env } from "@/lib/env";
import { ROLES, type Role } from "@/lib/roles";
import { normaliseEmail } from "./credentials";
import { SSO_REFUSALS as REFUSALS, type SsoRefusal } from "./sso-messages";

// Institutional sign-in (OpenID Connect): who the provider says someone is → a Benchclear account.
// The provider's issuer and subject identify the person (OIDC Core 1.0 §2: `sub` is never reassigned
// within an issuer). On the first sign-in an account is made from the configured claims (name, e-mail,
// department) with roles from the group claim (OIDC_GROUP_ROLES) or OIDC_DEFAULT_ROLES. On every later
// sign-in the directory's word on name, e-mail and department is taken again (refreshFromClaims:
// a claim that is absent, names no department here, or an address another account holds changes
// nothing), and the group map adds roles (OIDC_GROUP_ROLES_MODE=add) or also takes back the mapped
// roles no group gives any more (=own); roles outside the map stay the product's. A disabled account
// stays shut. An open invitation for the address gives the new account its roles and department
// instead (and is spent). An existing account with the same e-mail (an invited or demo user) is
// linked once, unless the provider says the address is unverified. Every outcome is in the audit trail.

export type SsoConfig = Pick<
  Env,
  | "OIDC_CLAIM_NAME"
  | "OIDC_CLAIM_EMAIL"
  | "OIDC_CLAIM_DEPARTMENT"
  | "OIDC_CLAIM_GROUPS"
  | "OIDC_GROUP_ROLES"
  | "OIDC_DEFAULT_ROLES"
> &
  Partial<Pick<Env, "OIDC_GROUP_ROLES_MODE">>;

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
      departmentId: users.departmentId,
      roles: users.roles,
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
    const department = departmentClaim ? await departmentNamed(tx, departmentClaim) : undefined;
    if (existing) {
      user = await refreshFromClaims(tx, existing, {
        issuer,
        subject,
        claims,
        config,
        name: claimText(claims, config.OIDC_CLAIM_NAME, 120),
        email,
        emailHolder: candidates.find((c) => c.id !== existing.id && c.email.toLowerCase() === email),
        departmentClaim,
        department,
      });
    } else {
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

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** The department a claim names, by code or by name (either spelling, any case). */
async function departmentNamed(tx: Tx, claim: string) {
  const [row] = await tx
    .select({ id: departments.id, name: departments.name })
    .from(departments)
    .where(
      or(
        eq(sql`lower(${departments.code})`, claim.toLowerCase()),
        eq(sql`lower(${departments.name})`, claim.toLowerCase()),
      ),
    )
    .limit(1);
  return row;
}

/**
 * The roles an existing account holds after this sign-in's group claim: `add` unions in every mapped
 * role; `own` also drops a mapped role no present group gives (when the claim is there at all).
 * Roles outside the map are the product's and never change here. Null: no group map configured.
 */
export function rolesAfterSignIn(
  current: readonly Role[],
  claims: SsoClaims,
  config: Pick<SsoConfig, "OIDC_CLAIM_GROUPS" | "OIDC_GROUP_ROLES" | "OIDC_DEFAULT_ROLES" | "OIDC_GROUP_ROLES_MODE">,
): Role[] | null {
  const map = config.OIDC_GROUP_ROLES ?? [];
  if (!map.length || !config.OIDC_CLAIM_GROUPS) return null;
  const groups = claimList(claims, config.OIDC_CLAIM_GROUPS);
  const given = new Set(map.filter((m) => groups.includes(m.group)).map((m) => m.role));
  const next = new Set<Role>(current);
  for (const role of given) next.add(role);
  const claimPresent = claims[config.OIDC_CLAIM_GROUPS] !== undefined && claims[config.OIDC_CLAIM_GROUPS] !== null;
  if (config.OIDC_GROUP_ROLES_MODE === "own" && claimPresent) {
    for (const { role } of map) if (!given.has(role)) next.delete(role);
    // An account keeps at least one role (the admin forms require one): the default roles.
    if (next.size === 0) for (const role of config.OIDC_DEFAULT_ROLES) next.add(role);
  }
  return ROLES.filter((r) => next.has(r));
}

/**
 * A later sign-in of a known account: the provider's current name, e-mail, department and (with a
 * group map) roles replace the stored ones, in the sign-in's transaction, with one
 * `user.claims_updated` audit row listing each change (from → to) when anything changed. A changed
 * role set also ends the account's other sessions (session version + 1), as an admin's change does;
 * the session this sign-in makes is issued under the new version.
 */
async function refreshFromClaims(
  tx: Tx,
  account: {
    id: string;
    email: string;
    name: string;
    sessionVersion: number;
    departmentId: string | null;
    roles: Role[];
  },
  input: {
    issuer: string;
    subject: string;
    claims: SsoClaims;
    config: SsoConfig;
    name: string | null;
    email: string;
    /** Another account that already has the claimed address (it stays theirs). */
    emailHolder: { id: string } | undefined;
    departmentClaim: string | null;
    department: { id: string; name: string } | undefined;
  },
): Promise<SsoUser> {
  const changes: Record<string, { from: unknown; to: unknown }> = {};
  const kept: Record<string, string> = {};
  const set: Partial<typeof users.$inferInsert> = {};
  if (input.name && input.name !== account.name) {
    changes.name = { from: account.name, to: input.name };
    set.name = input.name;
  }
  if (input.email !== account.email.toLowerCase()) {
    if (input.claims.email_verified === false) kept.email = "the provider marks the new address unverified";
    else if (input.emailHolder) kept.email = "another account has the new address";
    else {
      changes.email = { from: account.email, to: input.email };
      set.email = input.email;
    }
  }
  if (input.department && input.department.id !== account.departmentId) {
    changes.departmentId = { from: account.departmentId, to: input.department.id };
    set.departmentId = input.department.id;
  } else if (input.departmentClaim && !input.department) {
    kept.departmentId = `no department here is called "${input.departmentClaim}"`;
  }
  const roles = rolesAfterSignIn(account.roles, input.claims, input.config);
  if (roles && roles.join(",") !== ROLES.filter((r) => account.roles.includes(r)).join(",")) {
    changes.roles = { from: account.roles, to: roles };
    set.roles = roles;
  }
  if (Object.keys(changes).length === 0) {
    return { id: account.id, email: account.email, name: account.name, sessionVersion: account.sessionVersion };
  }
  const [row] = await tx
    .update(users)
    .set({
      ...set,
      updatedAt: new Date(),
      ...(set.roles ? { sessionVersion: sql`${users.sessionVersion} + 1` } : {}),
    })
    .where(eq(users.id, account.id))
    .returning({ id: users.id, email: users.email, name: users.name, sessionVersion: users.sessionVersion });
  await writeAudit(tx, {
    actor: { id: row.id, name: row.name },
    action: "user.claims_updated",
    entityType: "user",
    entityId: row.id,
    data: {
      issuer: input.issuer,
      subject: input.subject,
      changes,
      ...(Object.keys(kept).length ? { kept } : {}),
      ...(changes.roles ? { mode: input.config.OIDC_GROUP_ROLES_MODE ?? "add" } : {}),
    },
  });
  return row;
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
