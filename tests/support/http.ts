// HTTP calls to the production build that scripts/test.mjs serves (TEST_BASE_URL): the real route
// handlers, proxy and pages, against the test database.
import crypto from "node:crypto";
import { TEST_PASSWORD } from "./db";

export function baseUrl(): string {
  const url = process.env.TEST_BASE_URL;
  if (!url) throw new Error("TEST_BASE_URL is not set: run the tests with `npm test`, which starts the app.");
  return url;
}

export type HttpOptions = {
  method?: string;
  body?: unknown;
  rawBody?: string;
  cookie?: string;
  headers?: Record<string, string>;
  /** Send no Origin header (a cross-site or non-browser client). */
  noOrigin?: boolean;
};

export async function http(path: string, options: HttpOptions = {}) {
  const headers: Record<string, string> = { ...(options.headers ?? {}) };
  if (!options.noOrigin) headers.origin ??= baseUrl();
  if (options.cookie) headers.cookie = options.cookie;
  headers["x-forwarded-for"] ??= randomIp();
  let body: string | undefined = options.rawBody;
  if (options.body !== undefined) {
    body = JSON.stringify(options.body);
    headers["content-type"] ??= "application/json";
  }
  const res = await fetch(baseUrl() + path, { method: options.method ?? "GET", headers, body, redirect: "manual" });
  const text = await res.text();
  let json: unknown;
  try {
    json = text ? JSON.parse(text) : undefined;
  } catch {
    json = undefined;
  }
  return { status: res.status, headers: res.headers, text, json: json as Record<string, any> | undefined };
}

/**
 * A fresh client address per call (from the IPv6 documentation prefix, RFC 3849: only ever a header
 * value, never a destination), so throttling in one test never spills into another. The random part
 * is in the network half: the app counts IPv6 clients per /64 (lib/http/client-ip.ts addressBucket).
 * The test server trusts one proxy hop (scripts/test.mjs), so the right-most X-Forwarded-For entry is
 * the client.
 */
export function randomIp(): string {
  const h = crypto.randomBytes(6).toString("hex");
  return `2001:db8:${h.slice(0, 4)}:${h.slice(4, 8)}::${h.slice(8, 12)}`;
}

function cookiesFrom(headers: Headers): string {
  return headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .filter((c) => !c.endsWith("="))
    .join("; ");
}

export async function signIn(email: string, password = TEST_PASSWORD): Promise<string> {
  const res = await http("/api/session", {
    method: "POST",
    body: { email, password },
    headers: { "x-forwarded-for": randomIp() },
  });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${res.text}`);
  const cookie = cookiesFrom(res.headers);
  if (!cookie.includes("authjs.session-token")) throw new Error("no session cookie in the sign-in answer");
  return cookie;
}

/**
 * A session cookie as the institution's sign-in leaves it (Auth.js's JWT, the same secret as the
 * server), signed in at `authAt` (ms since epoch): what a signature checks for freshness
 * (lib/signing/password.ts, 5 minutes). For signing tests without a browser round trip to the provider.
 */
export async function institutionSessionCookie(
  user: { id: string; sessionVersion: number },
  authAt: number,
): Promise<string> {
  const { encode } = await import("next-auth/jwt");
  const name = "authjs.session-token";
  const now = Date.now();
  const token = await encode({
    salt: name,
    secret: process.env.AUTH_SECRET!,
    token: { sub: user.id, sv: user.sessionVersion, signedInAt: now, lastSeen: now, authAt, via: "institution" },
  });
  return `${name}=${token}`;
}
