// The proxy's quick read of a session cookie that needs no re-issue (edge-safe: no Node.js imports).
//
// Auth.js, run in proxy.ts for every request, decrypts the session cookie, then encrypts it again to
// move its last-seen time on, and on the way makes a CSRF token (a SHA-256 digest) and a callback-URL
// cookie this app never uses: about a third of a list request's CPU time (docs/performance.md). The
// cookie needs re-issuing at most once a minute (SESSION_REFRESH_SECONDS), so for a cookie that is
// "fresh" the proxy reads it here instead and sends no cookie back; anything else (no cookie, a cookie
// split into chunks, one that does not decrypt, one due for re-issue, one past a limit) goes to
// Auth.js exactly as before, which re-issues or clears it.
//
// The token is decrypted with Auth.js's own decode(), with the same secret and salt (the cookie's
// name) Auth.js uses, so only a token Auth.js issued is read. What was read is kept per token for
// the minute the token stays fresh, so a burst of requests with one cookie decrypts it once; the
// absolute and idle limits and the token's own expiry are checked again on every request.
import { decode } from "next-auth/jwt";
import { sessionTokenState } from "./session-policy";
import type { RequestSession } from "./request-session";

/** The claims of a session token this module reads (auth.config.ts writes them). */
type Claims = {
  sub?: unknown;
  sv?: unknown;
  authAt?: unknown;
  signedInAt?: unknown;
  lastSeen?: unknown;
  exp?: unknown;
};

// Tokens read recently, by their whole value. Bounded: past this many the oldest is dropped (a
// dropped token is only decrypted again). 1,000 tokens of about 1 kB each: about 1 MB.
const MAX_KEPT = 1000;
const kept = new Map<string, Claims>();

/**
 * The cookie Auth.js reads the session from, worked out as Auth.js does for the proxy: its
 * `__Secure-` form when the address Auth.js builds (AUTH_URL, else the forwarded protocol, else
 * https) is https.
 */
export function sessionCookieName(headers: Headers): string {
  const envUrl = process.env.AUTH_URL ?? process.env.NEXTAUTH_URL;
  let protocol: string;
  if (envUrl) {
    try {
      protocol = new URL(envUrl).protocol;
    } catch {
      protocol = "https:";
    }
  } else {
    const forwarded = headers.get("x-forwarded-proto") ?? "https";
    protocol = forwarded.endsWith(":") ? forwarded : `${forwarded}:`;
  }
  return `${protocol === "https:" ? "__Secure-" : ""}authjs.session-token`;
}

function secret(): string | undefined {
  return process.env.AUTH_SECRET ?? process.env.NEXTAUTH_SECRET;
}

async function claimsOf(token: string, salt: string, key: string): Promise<Claims | null> {
  const known = kept.get(key);
  if (known) return known;
  const s = secret();
  if (!s) return null;
  let payload: Claims | null;
  try {
    payload = (await decode({ token, secret: s, salt })) as Claims | null;
  } catch {
    return null;
  }
  if (!payload) return null;
  if (kept.size >= MAX_KEPT) kept.delete(kept.keys().next().value as string);
  kept.set(key, payload);
  return payload;
}

/**
 * The session of a request whose cookie is fresh (read without Auth.js, nothing to send back), or
 * `undefined` when Auth.js must read it: no cookie, chunks, not ours, ended, or due for re-issue.
 */
export async function freshSession(
  cookies: { getAll(): { name: string; value: string }[] },
  headers: Headers,
  now = Date.now(),
): Promise<RequestSession | undefined> {
  const name = sessionCookieName(headers);
  let value: string | undefined;
  for (const cookie of cookies.getAll()) {
    if (!cookie.name.startsWith(name)) continue;
    // Auth.js joins every cookie whose name starts with this one (a token split into chunks): leave
    // anything but one whole cookie to it.
    if (cookie.name !== name || value !== undefined) return undefined;
    value = cookie.value;
  }
  if (!value) return undefined;
  const key = `${name}\n${value}`;
  const claims = await claimsOf(value, name, key);
  if (!claims) return undefined;
  // The token's own expiry (jose checked it when decrypting; a kept token is checked here).
  if (typeof claims.exp !== "number" || claims.exp * 1000 <= now) {
    kept.delete(key);
    return undefined;
  }
  if (sessionTokenState(claims, now) !== "fresh") {
    kept.delete(key);
    return undefined;
  }
  if (typeof claims.sub !== "string" || !claims.sub) return undefined;
  return {
    id: claims.sub,
    ...(typeof claims.sv === "number" ? { sv: claims.sv } : {}),
    ...(typeof claims.authAt === "number" ? { authAt: claims.authAt } : {}),
  };
}
