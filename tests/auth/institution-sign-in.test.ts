// Institutional sign-in (OpenID Connect) without a browser: its settings, first-sign-in provisioning
// and linking (lib/auth/sso.ts against the test database), the start of the authorization-code flow
// against the local identity provider `npm test` runs, a stale institutional sign-in refused for a
// signature, and a second server of the same build with password sign-in turned off.
// (The whole round trip in a browser: tests/e2e/institution-sign-in.test.ts.)
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import { and, eq } from "drizzle-orm";
import { encode } from "next-auth/jwt";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, users } from "@/db/schema";
import { signInWithProvider, type SsoConfig } from "@/lib/auth/sso";
import { EnvError, parseEnv } from "@/lib/env";
import { decide } from "@/lib/review/decide";
import { nextCommand } from "@/scripts/lib/next-server.mjs";
import { asActor, createSubmittedApplication, createTeam, currentVersion } from "../review/support";
import { createDepartment, createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, randomIp } from "../support/http";

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

    // Again: the same account, and the product's own changes (a role given by an admin) stay.
    await getDb()
      .update(users)
      .set({ roles: ["reviewer"] })
      .where(eq(users.id, row.id));
    const again = await signInWithProvider(ISSUER, { ...claims, memberOf: ["hv-safety-office"] }, config);
    expect(again).toMatchObject({ ok: true, provisioned: false, user: { id: row.id } });
    const [after] = await getDb().select({ roles: users.roles }).from(users).where(eq(users.id, row.id));
    expect(after.roles).toEqual(["reviewer"]);
    expect(await auditFor(row.id, "user.provisioned")).toHaveLength(1);
    expect((await auditFor(row.id, "session.signed_in")).length).toBe(2);
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
    expect(linked).toMatchObject({ ok: true, provisioned: false, user: { id: invited.id, name: invited.name } });
    expect(await auditFor(invited.id, "user.sso_linked")).toHaveLength(1);
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

describe("password sign-in turned off (PASSWORD_SIGN_IN=false), on a second server of the same build", () => {
  let base = "";
  let server: ChildProcess | undefined;

  beforeAll(async () => {
    // A port the system gives out, so the second server meets no other copy's or checkout's ports.
    const port = await new Promise<number>((resolve) => {
      const probe = net.createServer().listen(0, "127.0.0.1", () => {
        const { port } = probe.address() as net.AddressInfo;
        probe.close(() => resolve(port));
      });
    });
    base = `http://127.0.0.1:${port}`;
    const [cmd, args] = nextCommand(["start", "-p", String(port), "-H", "127.0.0.1"]);
    server = spawn(cmd, args, {
      env: {
        ...process.env,
        NODE_ENV: "production",
        NEXT_DIST_DIR: process.env.TEST_DIST_DIR ?? ".next",
        APP_URL: base,
        AUTH_URL: base,
        PASSWORD_SIGN_IN: "false",
        WORKER_IN_APP: "false",
      },
      detached: true,
      stdio: "ignore",
    });
    const deadline = Date.now() + 90_000;
    for (;;) {
      try {
        if ((await fetch(`${base}/api/health/live`)).ok) break;
      } catch {
        // not up yet
      }
      if (Date.now() > deadline) throw new Error("the second server did not start");
      await new Promise((r) => setTimeout(r, 250));
    }
  }, 120_000);

  afterAll(() => {
    if (server?.pid) process.kill(-server.pid, "SIGTERM");
  });

  async function call(path: string, init: { method?: string; body?: unknown; cookie?: string } = {}) {
    const headers: Record<string, string> = { origin: base, "x-forwarded-for": randomIp() };
    if (init.body !== undefined) headers["content-type"] = "application/json";
    if (init.cookie) headers.cookie = init.cookie;
    const res = await fetch(base + path, {
      method: init.method ?? "GET",
      headers,
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
      redirect: "manual",
    });
    return { status: res.status, text: await res.text(), headers: res.headers };
  }

  it("refuses the password form's API, offers only the institution's button, and refuses setting passwords", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const res = await call("/api/session", {
      method: "POST",
      body: { email: user.email, password: "correct horse battery staple 42" },
    });
    expect(res.status, res.text).toBe(403);
    expect(JSON.parse(res.text).error.message).toMatch(/Password sign-in is turned off/);
    expect(res.headers.getSetCookie().join("")).not.toMatch(/session-token/);

    const page = await call("/sign-in");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Sign in with your Aldermere account");
    expect(page.text).not.toMatch(/type="password"/);

    const accept = await call("/api/invitations/accept", {
      method: "POST",
      body: { token: "x".repeat(43), password: "a long enough passphrase" },
    });
    expect(accept.status).toBe(403);
  });
});
