// Institutional sign-in (OpenID Connect) without a browser: its settings, first-sign-in provisioning
// and linking (lib/auth/sso.ts against the test database), the start of the authorization-code flow
// against the local identity provider `npm test` runs, a stale institutional sign-in refused for a
// signature, the claims taken again on later sign-ins, a disabled account's session refused at its
// next request, the way back to the page asked for, and signing out at the provider.
// (The whole round trip in a browser, and password sign-in turned off: tests/e2e/institution-sign-in.test.ts.)
import { and, eq } from "drizzle-orm";
import { encode } from "next-auth/jwt";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, users } from "@/db/schema";
import { signInWithProvider, type SsoConfig } from "@/lib/auth/sso";
import { EnvError, parseEnv } from "@/lib/env";
import { decide } from "@/lib/review/decide";
import { asActor, createSubmittedApplication, createTeam, currentVersion } from "../review/support";
import { createDepartment, createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, signIn } from "../support/http";

requireDatabase();

const minimum = {
  DATABASE_URL: "postgres://u:p@127.0.0.1:54329/benchclear",
  AUTH_SECRET: "x".repeat(32),
  DECISION_HMAC_KEY: "k".repeat(32),
};
const institution = {
  OIDC_ISSUER: "https://login.aldermere.test",
  OIDC_CLIENT_ID: "benchclear",
  OIDC_CLIENT_SECRET: "s".repeat(24),
};

function problemsOf(source: Record<string, string | undefined>): string {
  try {
    parseEnv(source);
  } catch (error) {
    expect(error).toBeInstanceOf(EnvError);
    return (error as EnvError).problems.join("\n");
  }
  return "";
}

describe("institutional sign-in settings (lib/env.ts)", () => {
  it("are off by default, with password sign-in on", () => {
    const env = parseEnv(minimum);
    expect(env.OIDC_ISSUER).toBeUndefined();
    expect(env.PASSWORD_SIGN_IN).toBe(true);
    expect(env.OIDC_DEFAULT_ROLES).toEqual(["instructor"]);
  });

  it("name each missing or wrong setting", () => {
    expect(problemsOf({ ...minimum, OIDC_ISSUER: "https://login.aldermere.test" })).toMatch(
      /^OIDC_CLIENT_ID is required when OIDC_ISSUER is set/m,
    );
    expect(problemsOf({ ...minimum, PASSWORD_SIGN_IN: "false" })).toMatch(/^PASSWORD_SIGN_IN can be false only with/m);
    expect(problemsOf({ ...minimum, OIDC_CLIENT_ID: "x" })).toMatch(/^OIDC_CLIENT_ID is set but OIDC_ISSUER is not/m);
    expect(
      problemsOf({ ...minimum, ...institution, OIDC_CLAIM_GROUPS: "groups", OIDC_GROUP_ROLES: "hv=superuser" }),
    ).toMatch(/^OIDC_GROUP_ROLES must be group=role pairs/m);
    expect(problemsOf({ ...minimum, ...institution, OIDC_GROUP_ROLES: "hv=reviewer" })).toMatch(
      /^OIDC_CLAIM_GROUPS is required when OIDC_GROUP_ROLES is set/m,
    );
    expect(problemsOf({ ...minimum, ...institution, OIDC_SCOPES: "profile email" })).toMatch(
      /^OIDC_SCOPES must include "openid"/m,
    );
    // OIDC Core 1.0 §3.1.2.1 and RFC 6749 §10.4: codes and tokens travel over TLS.
    expect(
      problemsOf({ ...minimum, ...institution, NODE_ENV: "production", OIDC_ISSUER: "http://login.aldermere.test" }),
    ).toMatch(/^OIDC_ISSUER must be https:\/\/ in production/m);
  });

  it("read the group → role map and the default roles", () => {
    const env = parseEnv({
      ...minimum,
      ...institution,
      OIDC_CLAIM_GROUPS: "groups",
      OIDC_GROUP_ROLES: "hv-safety-office=safety_officer, dept-safety-contacts=reviewer",
      OIDC_DEFAULT_ROLES: "instructor,instructor",
      PASSWORD_SIGN_IN: "false",
    });
    expect(env.OIDC_GROUP_ROLES).toEqual([
      { group: "hv-safety-office", role: "safety_officer" },
      { group: "dept-safety-contacts", role: "reviewer" },
    ]);
    expect(env.OIDC_DEFAULT_ROLES).toEqual(["instructor"]);
    expect(env.PASSWORD_SIGN_IN).toBe(false);
  });
});

const config: SsoConfig = {
  OIDC_CLAIM_NAME: "name",
  OIDC_CLAIM_EMAIL: "mail",
  OIDC_CLAIM_DEPARTMENT: "dept",
  OIDC_CLAIM_GROUPS: "memberOf",
  OIDC_GROUP_ROLES: [{ group: "hv-safety-office", role: "safety_officer" }],
  OIDC_DEFAULT_ROLES: ["instructor"],
};
const ISSUER = "https://login.aldermere.test";

async function auditFor(userId: string, action: string) {
  return getDb()
    .select({ data: auditEvents.data })
    .from(auditEvents)
    .where(and(eq(auditEvents.entityId, userId), eq(auditEvents.action, action)));
}

describe("first sign-in through the institution (lib/auth/sso.ts)", () => {
  it("makes the account from the configured claims, in the department named by code or name, once", async () => {
    const dept = await createDepartment();
    const sub = uniq("sub");
    const email = `${uniq("person")}@aldermere.test`;
    const claims = { sub, name: "Ines Varga", mail: email.toUpperCase(), dept: dept.name.toLowerCase() };
    const first = await signInWithProvider(ISSUER, claims, config);
    expect(first).toMatchObject({ ok: true, provisioned: true });
    if (!first.ok) return;
    const [row] = await getDb().select().from(users).where(eq(users.id, first.user.id));
    expect(row).toMatchObject({ email, name: "Ines Varga", departmentId: dept.id, roles: ["instructor"] });
    expect(row.passwordHash).toBeNull();
    const [event] = await auditFor(row.id, "user.provisioned");
    expect(event.data).toMatchObject({ issuer: ISSUER, subject: sub, departmentId: dept.id });

    // Again: the same account, and the product's own changes (a role given by an admin) stay: a
    // sign-in whose groups map to nothing removes no role.
    await getDb()
      .update(users)
      .set({ roles: ["reviewer"] })
      .where(eq(users.id, row.id));
    const again = await signInWithProvider(ISSUER, { ...claims, memberOf: ["staff"] }, config);
    expect(again).toMatchObject({ ok: true, provisioned: false, user: { id: row.id } });
    const [after] = await getDb().select({ roles: users.roles }).from(users).where(eq(users.id, row.id));
    expect(after.roles).toEqual(["reviewer"]);
    expect(await auditFor(row.id, "user.provisioned")).toHaveLength(1);
    expect(await auditFor(row.id, "user.claims_updated")).toHaveLength(0);
    expect((await auditFor(row.id, "session.signed_in")).length).toBe(2);
  });

  it("takes name, e-mail, department and mapped roles again on each sign-in, with one audit row per change", async () => {
    const [physics, outreach] = [await createDepartment(), await createDepartment()];
    const sub = uniq("sub");
    const email = `${uniq("moved")}@aldermere.test`;
    const first = await signInWithProvider(
      ISSUER,
      { sub, name: "Wren Aldous", mail: email, dept: physics.name },
      config,
    );
    if (!first.ok) throw new Error(first.message);
    const id = first.user.id;
    // An admin makes them a reviewer in the product.
    await getDb()
      .update(users)
      .set({ roles: ["instructor", "reviewer"] })
      .where(eq(users.id, id));
    const [before] = await getDb().select().from(users).where(eq(users.id, id));

    // The directory renamed them, gave a new address, moved them to Outreach (by code, any case) and
    // put them in the safety office's group.
    const newEmail = `${uniq("wren")}@aldermere.test`;
    const moved = await signInWithProvider(
      ISSUER,
      {
        sub,
        name: "Wren Aldous-Kerr",
        mail: newEmail.toUpperCase(),
        dept: outreach.code.toLowerCase(),
        memberOf: ["hv-safety-office"],
      },
      config,
    );
    expect(moved).toMatchObject({
      ok: true,
      provisioned: false,
      user: { id, name: "Wren Aldous-Kerr", email: newEmail },
    });
    const [row] = await getDb().select().from(users).where(eq(users.id, id));
    expect(row).toMatchObject({
      name: "Wren Aldous-Kerr",
      email: newEmail,
      departmentId: outreach.id,
      // Added by the map (mode "add"); the admin's reviewer role stays.
      roles: ["instructor", "reviewer", "safety_officer"],
    });
    // A changed role set ends the account's other sessions, as an admin's change does.
    expect(row.sessionVersion).toBe(before.sessionVersion + 1);
    const [event] = await auditFor(id, "user.claims_updated");
    expect(event.data).toMatchObject({
      issuer: ISSUER,
      subject: sub,
      mode: "add",
      changes: {
        name: { from: "Wren Aldous", to: "Wren Aldous-Kerr" },
        email: { from: email, to: newEmail },
        departmentId: { from: physics.id, to: outreach.id },
        roles: { from: ["instructor", "reviewer"], to: ["instructor", "reviewer", "safety_officer"] },
      },
    });

    // Nothing new: no audit row. A department the claim names that does not exist here, an address
    // another account holds, and a missing group claim change nothing.
    const taken = await createUser({ roles: ["instructor"] });
    const same = await signInWithProvider(
      ISSUER,
      { sub, name: "Wren Aldous-Kerr", mail: newEmail, dept: outreach.name, memberOf: ["hv-safety-office"] },
      config,
    );
    expect(same.ok).toBe(true);
    expect(await auditFor(id, "user.claims_updated")).toHaveLength(1);
    const kept = await signInWithProvider(
      ISSUER,
      { sub, name: "Wren Kerr", mail: taken.email, dept: "Nowhere" },
      config,
    );
    expect(kept.ok).toBe(true);
    const [still] = await getDb().select().from(users).where(eq(users.id, id));
    expect(still).toMatchObject({
      name: "Wren Kerr",
      email: newEmail,
      departmentId: outreach.id,
      roles: ["instructor", "reviewer", "safety_officer"],
    });
    const events = await auditFor(id, "user.claims_updated");
    expect(events).toHaveLength(2);
    const last = events.map((e) => e.data as { changes: object; kept?: Record<string, string> }).find((d) => d.kept);
    expect(Object.keys(last!.changes)).toEqual(["name"]);
    expect(Object.keys(last!.kept!).sort()).toEqual(["departmentId", "email"]);
  });

  it("with OIDC_GROUP_ROLES_MODE=own takes back a mapped role no group gives, but keeps the product's roles", async () => {
    const own: SsoConfig = {
      ...config,
      OIDC_GROUP_ROLES: [
        { group: "hv-safety-office", role: "safety_officer" },
        { group: "dept-safety-contacts", role: "reviewer" },
      ],
      OIDC_GROUP_ROLES_MODE: "own",
    };
    const sub = uniq("sub");
    const mail = `${uniq("own")}@aldermere.test`;
    const first = await signInWithProvider(ISSUER, { sub, mail, memberOf: ["hv-safety-office"] }, own);
    if (!first.ok) throw new Error(first.message);
    const id = first.user.id;
    const rolesOf = async () =>
      (await getDb().select({ roles: users.roles }).from(users).where(eq(users.id, id)))[0].roles;
    expect(await rolesOf()).toEqual(["safety_officer"]);
    // An admin adds admin (outside the map): the directory never touches it.
    await getDb()
      .update(users)
      .set({ roles: ["safety_officer", "admin"] })
      .where(eq(users.id, id));
    // No group claim at all (the provider did not release it): nothing is taken back.
    await signInWithProvider(ISSUER, { sub, mail }, own);
    expect(await rolesOf()).toEqual(["safety_officer", "admin"]);
    // Moved from the safety office to the department contacts: officer out, reviewer in, admin stays.
    await signInWithProvider(ISSUER, { sub, mail, memberOf: ["dept-safety-contacts"] }, own);
    expect(await rolesOf()).toEqual(["reviewer", "admin"]);
    // In no mapped group and holding no other role: the default roles, never none.
    await getDb()
      .update(users)
      .set({ roles: ["reviewer"] })
      .where(eq(users.id, id));
    await signInWithProvider(ISSUER, { sub, mail, memberOf: [] }, own);
    expect(await rolesOf()).toEqual(["instructor"]);
    const events = await auditFor(id, "user.claims_updated");
    expect(events.map((e) => (e.data as { mode: string }).mode)).toEqual(["own", "own"]);
  });

  it("maps a listed group to its role, and leaves the department empty when the claim names none here", async () => {
    const result = await signInWithProvider(
      ISSUER,
      {
        sub: uniq("sub"),
        name: "Oren Castell",
        mail: `${uniq("p")}@aldermere.test`,
        dept: "No such department",
        memberOf: ["staff", "hv-safety-office"],
      },
      config,
    );
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const [row] = await getDb().select().from(users).where(eq(users.id, result.user.id));
    expect(row.roles).toEqual(["safety_officer"]);
    expect(row.departmentId).toBeNull();
    const [event] = await auditFor(row.id, "user.provisioned");
    expect(event.data).toMatchObject({ departmentClaim: "No such department", matchedGroups: ["hv-safety-office"] });
  });

  it("links an invited account by e-mail once, refuses an unverified address, and keeps a disabled account shut", async () => {
    const invited = await createUser({ roles: ["reviewer"] });
    const unverified = await signInWithProvider(
      ISSUER,
      { sub: uniq("sub"), mail: invited.email, email_verified: false },
      config,
    );
    expect(unverified).toMatchObject({ ok: false, reason: "unverified_email" });

    const sub = uniq("sub");
    const linked = await signInWithProvider(ISSUER, { sub, mail: invited.email, name: "Someone Else" }, config);
    // Linked, and from now on the directory's name is the account's (the invitation's is replaced).
    expect(linked).toMatchObject({ ok: true, provisioned: false, user: { id: invited.id, name: "Someone Else" } });
    expect(await auditFor(invited.id, "user.sso_linked")).toHaveLength(1);
    expect((await auditFor(invited.id, "user.claims_updated"))[0].data).toMatchObject({
      changes: { name: { from: invited.name, to: "Someone Else" } },
    });
    // A second identity with the same address does not take the account over.
    const other = await signInWithProvider(ISSUER, { sub: uniq("sub"), mail: invited.email }, config);
    expect(other).toMatchObject({ ok: false, reason: "identity_conflict" });

    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, invited.id));
    const disabled = await signInWithProvider(ISSUER, { sub, mail: invited.email }, config);
    expect(disabled).toMatchObject({ ok: false, reason: "disabled" });
    const refusals = await auditFor(invited.id, "session.sign_in_refused");
    expect(refusals.map((r) => (r.data as { reason: string }).reason).sort()).toEqual([
      "disabled",
      "identity_conflict",
      "unverified_email",
    ]);
  });

  it("refuses claims without a subject or e-mail", async () => {
    expect(await signInWithProvider(ISSUER, { name: "Nobody" }, config)).toMatchObject({
      ok: false,
      reason: "missing_claims",
    });
  });
});

describe("the authorization-code flow against the local identity provider", () => {
  it("starts with PKCE (S256), state and nonce, and asks for a fresh login when signing", async () => {
    const res = await http("/api/session/institution", { method: "POST", body: { from: "/review" } });
    expect(res.status, res.text).toBe(200);
    const url = new URL(res.json!.redirectTo);
    expect(url.origin).toBe(process.env.OIDC_ISSUER);
    const q = url.searchParams;
    expect(q.get("response_type")).toBe("code");
    expect(q.get("client_id")).toBe(process.env.OIDC_CLIENT_ID);
    expect(q.get("redirect_uri")).toBe(`${baseUrl()}/api/auth/callback/institution`);
    // RFC 7636 §4.2: S256 challenge, 43 base64url characters of a SHA-256 digest.
    expect(q.get("code_challenge_method")).toBe("S256");
    expect(q.get("code_challenge")).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(q.get("state")).toBeTruthy();
    expect(q.get("nonce")).toBeTruthy();
    expect(q.get("scope")?.split(" ")).toContain("openid");
    expect(q.get("prompt")).toBeNull();
    const cookies = res.headers.getSetCookie().join("\n");
    expect(cookies).toMatch(/authjs\.pkce\.code_verifier=/);
    expect(cookies).toMatch(/HttpOnly/i);

    const again = await http("/api/session/institution", { method: "POST", body: { from: "/", reauth: true } });
    const fresh = new URL(again.json!.redirectTo).searchParams;
    // OIDC Core 1.0 §3.1.2.1: prompt=login and max_age=0 make the provider authenticate again.
    expect(fresh.get("prompt")).toBe("login");
    expect(fresh.get("max_age")).toBe("0");
  });

  it("serves only the provider's callback of Auth.js's endpoints", async () => {
    for (const path of [
      "/api/auth/signin",
      "/api/auth/session",
      "/api/auth/providers",
      "/api/auth/callback/credentials",
    ]) {
      expect((await http(path)).status, path).toBe(404);
    }
    const res = await http("/api/auth/callback/institution?code=made-up&state=made-up");
    expect(res.status).toBe(302);
    // Back to the sign-in page on the public address (APP_URL), not whatever host the server saw.
    expect(res.headers.get("location")).toMatch(new RegExp(`^${baseUrl()}/sign-in\\?error=`));
  });

  it("refuses a signature from an institutional session whose sign-in is older than 5 minutes", async () => {
    const team = await createTeam();
    const { application } = await createSubmittedApplication({ applicant: team.instructor, tier: 2 });
    await decide(asActor(team.reviewer), application.id, { kind: "recommend", expectedVersion: application.version });
    // An officer who signs in only through the institution (no Benchclear password).
    const [officer] = await getDb()
      .insert(users)
      .values({
        email: `${uniq("sso-officer")}@aldermere.test`,
        name: "Mirela Sand",
        roles: ["safety_officer"],
        oidcIssuer: process.env.OIDC_ISSUER!,
        oidcSubject: uniq("sub"),
      })
      .returning();
    const now = Date.now();
    const cookieName = "authjs.session-token";
    const session = async (authAt: number) =>
      `${cookieName}=${await encode({
        salt: cookieName,
        secret: process.env.AUTH_SECRET!,
        token: {
          sub: officer.id,
          sv: officer.sessionVersion,
          signedInAt: now,
          lastSeen: now,
          authAt,
          via: "institution",
        },
      })}`;
    const body = {
      kind: "reject",
      expectedVersion: await currentVersion(application.id),
      comment: "Not with this bench.",
    };
    const stale = await http(`/api/review/${application.id}/decisions`, {
      method: "POST",
      cookie: await session(now - 6 * 60_000),
      body,
    });
    expect(stale.status, stale.text).toBe(422);
    expect(stale.json?.error.issues).toEqual([
      { path: "password", message: expect.stringContaining("sign in again through your institution") },
    ]);
  });
});

/** A session cookie as Auth.js would issue it after an institutional sign-in of `user`. */
async function institutionalSession(
  user: { id: string; sessionVersion: number },
  extra: { authAt?: number; idToken?: string } = {},
) {
  const now = Date.now();
  const cookieName = "authjs.session-token";
  const value = await encode({
    salt: cookieName,
    secret: process.env.AUTH_SECRET!,
    token: {
      sub: user.id,
      sv: user.sessionVersion,
      signedInAt: now,
      lastSeen: now,
      authAt: extra.authAt ?? now,
      via: "institution",
      ...(extra.idToken ? { idToken: extra.idToken } : {}),
    },
  });
  return `${cookieName}=${value}`;
}

async function institutionalUser(roles: ("instructor" | "reviewer" | "safety_officer" | "admin")[]) {
  const [row] = await getDb()
    .insert(users)
    .values({
      email: `${uniq("sso")}@aldermere.test`,
      name: "Lior Matheson",
      roles,
      oidcIssuer: process.env.OIDC_ISSUER!,
      oidcSubject: uniq("sub"),
    })
    .returning();
  return row;
}

describe("an institutional session in the product", () => {
  it("ends at the next request once an admin disables the account", async () => {
    const person = await institutionalUser(["instructor"]);
    const cookie = await institutionalSession(person);
    const admin = await createUser({ roles: ["admin"] });
    const adminCookie = await signIn(admin.email);
    expect((await http("/api/search?q=bench", { cookie })).status).toBe(200);
    expect((await http("/applications", { cookie })).status).toBe(200);

    const disable = await http(`/api/admin/users/${person.id}`, {
      method: "PATCH",
      cookie: adminCookie,
      body: { disabled: true },
    });
    expect(disable.status, disable.text).toBe(200);
    // The same, still unexpired cookie: refused by the API, sent to sign in by the pages.
    const api = await http("/api/search?q=bench", { cookie });
    expect(api.status).toBe(401);
    const page = await http("/applications", { cookie });
    expect(page.status).toBe(307);
    expect(page.headers.get("location")).toMatch(/\/sign-in\?from=%2Fapplications$/);
  });

  it("refused by a page's own guard, returns to that page with its query after signing in again", async () => {
    const person = await institutionalUser(["instructor"]);
    // A session issued before the account's sessions were ended (a role change, a sign-out elsewhere):
    // proxy.ts lets it through, the page's guard refuses it.
    const stale = await institutionalSession({ id: person.id, sessionVersion: person.sessionVersion - 1 });
    const res = await http("/search?q=induction+coil&kind=permits", { cookie: stale });
    expect(res.status).toBe(307);
    const location = new URL(res.headers.get("location")!, baseUrl());
    expect(location.pathname).toBe("/sign-in");
    expect(location.searchParams.get("from")).toBe("/search?q=induction+coil&kind=permits");
    // A header a client sends is overwritten by the proxy: the return stays the page asked for.
    const forged = await http("/search?q=x", {
      cookie: stale,
      headers: { "x-benchclear-asked-path": "//evil.example" },
    });
    expect(new URL(forged.headers.get("location")!, baseUrl()).searchParams.get("from")).toBe("/search?q=x");
  });

  it("remembers the page asked for in its own cookie, scoped to the callback, and spends it there", async () => {
    const res = await http("/api/session/institution", {
      method: "POST",
      body: { from: "/review?tier=3&sort=age" },
    });
    expect(res.status, res.text).toBe(200);
    const set = res.headers.getSetCookie().find((c) => c.startsWith("benchclear.sso-return="));
    expect(set).toBeDefined();
    expect(decodeURIComponent(set!.split(";")[0].split("=").slice(1).join("="))).toBe("/review?tier=3&sort=age");
    expect(set).toMatch(/Path=\/api\/auth\/callback\/institution/);
    expect(set).toMatch(/HttpOnly/i);
    // Off-site targets were reduced to "/" before they were kept (lib/http/return-path.ts).
    const offsite = await http("/api/session/institution", { method: "POST", body: { from: "//evil.example/x" } });
    const kept = offsite.headers.getSetCookie().find((c) => c.startsWith("benchclear.sso-return="));
    expect(decodeURIComponent(kept!.split(";")[0].split("=").slice(1).join("="))).toBe("/");
    // A callback that fails (a made-up code) goes back to sign in, not to the page, and clears the cookie.
    const failed = await http("/api/auth/callback/institution?code=made-up&state=made-up", {
      headers: { cookie: "benchclear.sso-return=%2Freview" },
    });
    expect(failed.status).toBe(302);
    expect(failed.headers.get("location")).toMatch(/\/sign-in\?error=/);
    expect(failed.headers.getSetCookie().join("\n")).toMatch(/benchclear\.sso-return=;.*Max-Age=0/);
  });

  it("signs out at the provider too (RP-initiated logout), a password session here only", async () => {
    const person = await institutionalUser(["instructor"]);
    // The provider's own discovery document names its end-session endpoint (OpenID Connect
    // RP-Initiated Logout 1.0 §2.1).
    const discovery = (await (await fetch(`${process.env.OIDC_ISSUER}/.well-known/openid-configuration`)).json()) as {
      end_session_endpoint: string;
    };
    const idToken = "eyJhbGciOiJSUzI1NiJ9.e30.c2lnbmF0dXJl"; // kept verbatim; the provider checks it
    const out = await http("/api/session", {
      method: "DELETE",
      cookie: await institutionalSession(person, { idToken }),
    });
    expect(out.status, out.text).toBe(200);
    const url = new URL(out.json!.redirectTo);
    expect(url.origin + url.pathname).toBe(discovery.end_session_endpoint);
    expect(url.searchParams.get("id_token_hint")).toBe(idToken);
    expect(url.searchParams.get("post_logout_redirect_uri")).toBe(`${baseUrl()}/sign-in`);
    expect(url.searchParams.get("client_id")).toBe(process.env.OIDC_CLIENT_ID);
    // The session here ended as well.
    expect(out.headers.getSetCookie().join("\n")).toMatch(/authjs\.session-token=;/);

    const local = await createUser({ roles: ["instructor"] });
    const plain = await http("/api/session", { method: "DELETE", cookie: await signIn(local.email) });
    expect(plain.status).toBe(200);
    expect(plain.json!.redirectTo).toBe("/sign-in");
  });
});
