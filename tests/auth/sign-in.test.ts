import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { addressBucket } from "@/lib/http/client-ip";
import { attempt, clear, peek, RULES } from "@/lib/ratelimit";
import { createUser, requireDatabase, TEST_PASSWORD } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";

requireDatabase();

const post = (body: unknown, ip = randomIp()) =>
  http("/api/session", { method: "POST", body, headers: { "x-forwarded-for": ip } });

describe("POST /api/session (sign-in)", () => {
  it("signs in with the right password and the session opens a signed-in page", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    const page = await http("/account", { cookie });
    expect(page.status).toBe(200);
    expect(page.text).toContain(user.name);
  });

  it("accepts the e-mail in any case", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const res = await post({ email: user.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  it("gives the same answer for a wrong password and an unknown e-mail", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const wrong = await post({ email: user.email, password: "not the password at all" });
    const unknown = await post({ email: "nobody-here@example.test", password: "not the password at all" });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.json).toEqual(unknown.json);
    expect(wrong.headers.get("set-cookie") ?? "").not.toContain("authjs.session-token");
  });

  it("takes about the same time for an unknown e-mail as for a wrong password", async () => {
    // Both verify one argon2id hash (a dummy for the unknown e-mail). Medians over 5 tries each.
    const user = await createUser({ roles: ["instructor"] });
    const time = async (email: string) => {
      const samples: number[] = [];
      for (let i = 0; i < 5; i++) {
        const t0 = performance.now();
        await post({ email, password: `wrong password ${i}` });
        samples.push(performance.now() - t0);
      }
      return samples.sort((a, b) => a - b)[2];
    };
    const known = await time(user.email);
    const unknown = await time(`ghost-${Date.now()}@example.test`);
    expect(unknown).toBeGreaterThan(known * 0.5);
    expect(unknown).toBeLessThan(known * 2);
  });

  it("refuses a disabled user with the same message", async () => {
    const user = await createUser({ roles: ["instructor"] });
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, user.id));
    const res = await post({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(401);
  });

  it("answers 422 naming the field for a malformed body, 415 for a non-JSON body", async () => {
    const res = await post({ email: "not-an-email", password: "" });
    expect(res.status).toBe(422);
    const paths = (res.json?.error.issues as { path: string }[]).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(["email", "password"]));
    const form = await http("/api/session", {
      method: "POST",
      rawBody: "email=a&password=b",
      headers: { "content-type": "application/x-www-form-urlencoded" },
    });
    expect(form.status).toBe(415);
  });

  it("refuses a cross-site sign-in (foreign Origin) and one with no Origin", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const foreign = await http("/api/session", {
      method: "POST",
      body: { email: user.email, password: TEST_PASSWORD },
      headers: { origin: "https://elsewhere.example" },
    });
    expect(foreign.status).toBe(403);
    const none = await http("/api/session", {
      method: "POST",
      body: { email: user.email, password: TEST_PASSWORD },
      noOrigin: true,
    });
    expect(none.status).toBe(403);
  });

  const MAX_FAILURES_PER_EMAIL = RULES.signInAccount.limit;
  const THROTTLE_WINDOW_SECONDS = RULES.signInAccount.windowSeconds;

  it(`throttles an e-mail after ${RULES.signInAccount.limit} failures with 429 and Retry-After, then releases`, async () => {
    const user = await createUser({ roles: ["instructor"] });
    for (let i = 0; i < MAX_FAILURES_PER_EMAIL; i++) {
      const res = await post({ email: user.email, password: `guess number ${i}` });
      expect(res.status).toBe(401);
    }
    // Even the right password is refused while throttled, from another address too.
    const limited = await post({ email: user.email, password: TEST_PASSWORD });
    expect(limited.status).toBe(429);
    const retryAfter = Number(limited.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThan(0);
    // Six hits counted (five failures and this refusal): when they fall in the first sixth of a
    // window, the wait runs past the window's end until 6 · (1 − t′/W) ≤ 5 in the next one, so
    // more than W but never two windows (lib/ratelimit secondsUntilAllowed; the test met 911 s and
    // 918 s of a 900 s window just after a quarter hour).
    expect(retryAfter).toBeLessThan(2 * THROTTLE_WINDOW_SECONDS);

    // The window slides: two windows later the e-mail is released.
    const later = new Date(Date.now() + 2 * THROTTLE_WINDOW_SECONDS * 1000 + 1000);
    expect((await peek("signInAccount", user.email, later)).allowed).toBe(true);
    await clear("signInAccount", user.email);
    expect((await post({ email: user.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it(`throttles one client address that tries many e-mails (${RULES.signInAddress.limit} failures)`, async () => {
    const ip = randomIp();
    // Most of the failures counted straight into the limiter (fast), the last few over HTTP.
    for (let i = 0; i < RULES.signInAddress.limit - 3; i++) await attempt("signInAddress", addressBucket(ip));
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) {
      statuses.push(
        (await post({ email: `spray-${i}-${Date.now()}@example.test`, password: "wrong password!" }, ip)).status,
      );
    }
    expect(statuses).toEqual([401, 401, 401, 429]);
  });
});

describe("sessions follow the database", () => {
  it("refuses a disabled user's still-valid token on the next request", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    expect((await http("/api/admin/users", { cookie })).status).toBe(403);
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, user.id));
    expect((await http("/api/admin/users", { cookie })).status).toBe(401);
    const page = await http("/account", { cookie });
    expect(page.status).toBe(307);
    expect(page.headers.get("location")).toContain("/sign-in");
  });

  it("applies a role change on the next request and ends the old session", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    expect((await http("/api/admin/users", { cookie })).status).toBe(403);
    await getDb()
      .update(users)
      .set({ roles: ["admin"] })
      .where(eq(users.id, user.id));
    // Roles are read from the database on every request: the new role applies at once.
    expect((await http("/api/admin/users", { cookie })).status).toBe(200);
  });

  it("ends sessions when the session version is bumped (password change, admin edit)", async () => {
    const user = await createUser({ roles: ["admin"] });
    const cookie = await signIn(user.email);
    expect((await http("/api/admin/users", { cookie })).status).toBe(200);
    await getDb()
      .update(users)
      .set({ sessionVersion: user.sessionVersion + 1 })
      .where(eq(users.id, user.id));
    expect((await http("/api/admin/users", { cookie })).status).toBe(401);
  });

  it("refuses a session handed over in the proxy's header by the client itself", async () => {
    // proxy.ts hands the session it read to the handler in x-benchclear-session, with a token only
    // this server process knows (lib/auth/request-session.ts). A client naming an admin there, with
    // no cookie or with its own instructor's cookie, must stay who its cookie says it is.
    const admin = await createUser({ roles: ["admin"] });
    const instructor = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(instructor.email);
    for (const token of ["", "guess", "0".repeat(64)]) {
      const forged = `${token}.${encodeURIComponent(JSON.stringify({ id: admin.id, sv: admin.sessionVersion }))}`;
      const headers = { "x-benchclear-session": forged };
      expect((await http("/api/admin/users", { headers })).status).toBe(401);
      expect((await http("/api/admin/users", { headers, cookie })).status).toBe(403);
      // A route the proxy does not see (uploads) reads the cookie itself: 401 before anything else.
      const upload = await http(`/api/applications/${admin.id}/attachments`, {
        method: "POST",
        headers: { ...headers, origin: baseUrl() },
      });
      expect(upload.status).toBe(401);
    }
  });

  it("refuses a protected route even when the request claims to be a middleware subrequest", async () => {
    const res = await http("/api/admin/users", {
      headers: { "x-middleware-subrequest": "proxy:proxy:proxy:proxy:proxy" },
    });
    expect(res.status).toBe(401);
    const page = await http("/admin/users", {
      headers: { "x-middleware-subrequest": "proxy:proxy:proxy:proxy:proxy" },
    });
    expect([307, 308]).toContain(page.status);
    expect(page.headers.get("location")).toContain("/sign-in");
  });

  it("signs out with DELETE /api/session", async () => {
    const user = await createUser({ roles: ["instructor"] });
    const cookie = await signIn(user.email);
    const out = await http("/api/session", { method: "DELETE", cookie });
    expect(out.status).toBe(200);
    const cleared = out.headers.getSetCookie().filter((c) => c.startsWith("authjs.session-token="));
    expect(cleared).toHaveLength(1);
    expect(cleared[0]).toMatch(/authjs\.session-token=;|Max-Age=0|Expires=Thu, 01 Jan 1970/);
    // The old token is dead on the server too, even if a client keeps sending it.
    expect((await http("/api/admin/users", { cookie })).status).toBe(401);
  });
});
