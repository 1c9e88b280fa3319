// The session cookie's limits and its re-issue (proxy.ts, lib/auth/session-cookie.ts, auth.config.ts):
// a session ends 60 min after its last re-issue and 12 h after sign-in whatever happens (security
// design, ASVS 3.3 / 7.3); the cookie is re-issued with its last-seen time moved on at most once a
// minute (SESSION_REFRESH_SECONDS), so a request within that minute gets no cookie back. Tokens are
// written here as Auth.js writes them (its encode, the server's secret and the cookie's name as
// salt), with their times set in the past rather than waited for.
import { eq } from "drizzle-orm";
import { decode, encode } from "next-auth/jwt";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { users } from "@/db/schema";
import { createUser, requireDatabase } from "../support/db";
import { http } from "../support/http";

requireDatabase();

const COOKIE = "authjs.session-token";
const MINUTE = 60_000;

type Times = { signedInAt: number; lastSeen: number };

async function cookieFor(
  user: { id: string; sessionVersion: number },
  times: Times,
  options: { secret?: string; salt?: string; maxAge?: number } = {},
): Promise<string> {
  const value = await encode({
    salt: options.salt ?? COOKIE,
    secret: options.secret ?? process.env.AUTH_SECRET!,
    ...(options.maxAge !== undefined ? { maxAge: options.maxAge } : {}),
    token: { sub: user.id, sv: user.sessionVersion, ...times },
  });
  return `${COOKIE}=${value}`;
}

/** The session cookies an answer sets: name → value ("" when it clears one). */
function sessionCookiesSet(headers: Headers): Map<string, string> {
  const out = new Map<string, string>();
  for (const line of headers.getSetCookie()) {
    const [pair] = line.split(";");
    const at = pair.indexOf("=");
    const name = pair.slice(0, at);
    if (name.startsWith(COOKIE)) out.set(name, pair.slice(at + 1));
  }
  return out;
}

async function instructor() {
  return createUser({ roles: ["instructor"] });
}

describe("session cookie re-issue and limits", () => {
  it("a cookie re-issued under a minute ago is accepted and not sent back", async () => {
    const user = await instructor();
    const now = Date.now();
    const cookie = await cookieFor(user, { signedInAt: now - 30 * MINUTE, lastSeen: now - 20_000 });
    for (const path of ["/api/permits", "/api/permits?page=2"]) {
      const res = await http(path, { cookie });
      expect(res.status, res.text).toBe(200);
      expect([...sessionCookiesSet(res.headers).keys()]).toEqual([]);
    }
    // Nor the CSRF and callback-address cookies Auth.js makes on every run (the app uses neither).
    const page = await http("/permits", { cookie });
    expect(page.status).toBe(200);
    expect(page.headers.getSetCookie().filter((c) => c.startsWith("authjs."))).toEqual([]);
  });

  it("a cookie last re-issued a minute or more ago is re-issued with its last-seen time moved on", async () => {
    const user = await instructor();
    const before = Date.now();
    const signedInAt = before - 3 * 60 * MINUTE;
    const res = await http("/api/permits", {
      cookie: await cookieFor(user, { signedInAt, lastSeen: before - 5 * MINUTE }),
    });
    expect(res.status, res.text).toBe(200);
    const issued = sessionCookiesSet(res.headers).get(COOKIE);
    expect(issued).toBeTruthy();
    const token = await decode({ token: issued!, secret: process.env.AUTH_SECRET!, salt: COOKIE });
    expect(token?.sub).toBe(user.id);
    expect(token?.signedInAt).toBe(signedInAt);
    expect(Number(token?.lastSeen)).toBeGreaterThanOrEqual(before);
    // The new cookie is itself fresh: the next request gets nothing back.
    const again = await http("/api/permits", { cookie: `${COOKIE}=${issued}` });
    expect(again.status).toBe(200);
    expect(sessionCookiesSet(again.headers).size).toBe(0);
  });

  it("idle limit: a cookie last re-issued more than 60 min ago is refused and cleared", async () => {
    const user = await instructor();
    const now = Date.now();
    const cookie = await cookieFor(user, { signedInAt: now - 2 * 60 * MINUTE, lastSeen: now - 61 * MINUTE });
    const api = await http("/api/permits", { cookie });
    expect(api.status).toBe(401);
    expect(sessionCookiesSet(api.headers).get(COOKIE)).toBe("");
    const page = await http("/permits", { cookie });
    expect(page.status).toBe(307);
    expect(page.headers.get("location")).toMatch(/\/sign-in\?from=%2Fpermits$/);
  });

  it("absolute limit: 12 h after sign-in the session ends, even one re-issued seconds ago", async () => {
    const user = await instructor();
    const now = Date.now();
    const cookie = await cookieFor(user, { signedInAt: now - 12 * 60 * MINUTE - MINUTE, lastSeen: now - 10_000 });
    const res = await http("/api/permits", { cookie });
    expect(res.status).toBe(401);
    expect(sessionCookiesSet(res.headers).get(COOKIE)).toBe("");
  });

  it("a token past its own expiry, under another secret or written for another cookie is refused", async () => {
    const user = await instructor();
    const now = Date.now();
    const times = { signedInAt: now - MINUTE, lastSeen: now - 10_000 };
    const cookies = [
      await cookieFor(user, times, { maxAge: -60 }),
      await cookieFor(user, times, { secret: "another secret, not the server's, 32+ characters" }),
      await cookieFor(user, times, { salt: `__Secure-${COOKIE}` }),
      `${COOKIE}=not-a-token`,
    ];
    for (const cookie of cookies) {
      const res = await http("/api/permits", { cookie });
      expect(res.status, cookie.slice(0, 60)).toBe(401);
    }
  });

  it("a fresh cookie read a moment ago still meets the account's state: disabled, refused at the next request", async () => {
    const user = await instructor();
    const now = Date.now();
    const cookie = await cookieFor(user, { signedInAt: now - MINUTE, lastSeen: now - 5_000 });
    expect((await http("/api/permits", { cookie })).status).toBe(200);
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, user.id));
    expect((await http("/api/permits", { cookie })).status).toBe(401);
  });
});
