// The session of one request, read once. proxy.ts runs Auth.js for every request it sees (it decrypts
// the session cookie, applies the idle and absolute limits in auth.config.ts and sends the refreshed
// cookie back); running Auth.js a second time in the page or route handler decrypted and re-encrypted
// the same cookie again, about a third of an API request's CPU time (docs/performance.md). So the
// proxy hands what it read to the handler in a request header, and the handler trusts that header
// only when it carries this process's random token: a client cannot send it (the proxy overwrites the
// header on every request it sees, and the token never leaves the server), and a request that did not
// pass through the proxy (uploads, /api/session) is read by Auth.js as before.
//
// Only who the session belongs to travels: the user's roles, name and disabled flag are still read
// from the database on every request (lib/auth/guards.ts), so a disabled account loses access at its
// next request. Edge-safe: no Node.js imports (proxy.ts loads it).

export const SESSION_HEADER = "x-benchclear-session";

/** What a request's session says: whose it is, the session version, and the provider's auth_time. */
export type RequestSession = { id: string; sv?: number; authAt?: number };

// The proxy and the handlers run in one Node.js process but load separate copies of this module
// (different bundles), so the token lives on globalThis; a handler served by another process, or a
// proxy that did not run, sees no match and falls back to Auth.js.
const holder = globalThis as unknown as { benchclearSessionToken?: string };
function processToken(): string {
  holder.benchclearSessionToken ??= `${crypto.randomUUID()}${crypto.randomUUID()}`.replace(/-/g, "");
  return holder.benchclearSessionToken;
}

/** For proxy.ts: the header value that hands this session (or its absence) to the handler. */
export function sessionHeaderValue(session: RequestSession | null): string {
  const payload = session?.id
    ? JSON.stringify({
        id: session.id,
        ...(typeof session.sv === "number" ? { sv: session.sv } : {}),
        ...(typeof session.authAt === "number" ? { authAt: session.authAt } : {}),
      })
    : "null";
  return `${processToken()}.${encodeURIComponent(payload)}`;
}

/** Constant-time comparison of two ASCII strings of the token's shape. */
function sameToken(a: string, b: string): boolean {
  if (a.length !== b.length) return false;
  let diff = 0;
  for (let i = 0; i < a.length; i++) diff |= a.charCodeAt(i) ^ b.charCodeAt(i);
  return diff === 0;
}

/**
 * The session proxy.ts read for this request: `undefined` when the header is missing or not this
 * process's (read the cookie with Auth.js then), `null` for a request without a valid session.
 */
export function sessionFromProxy(headers: Headers): RequestSession | null | undefined {
  const value = headers.get(SESSION_HEADER);
  if (!value) return undefined;
  const dot = value.indexOf(".");
  if (dot <= 0 || !sameToken(value.slice(0, dot), processToken())) return undefined;
  try {
    const parsed = JSON.parse(decodeURIComponent(value.slice(dot + 1))) as unknown;
    if (parsed === null) return null;
    if (typeof parsed !== "object") return undefined;
    const { id, sv, authAt } = parsed as Record<string, unknown>;
    if (typeof id !== "string") return undefined;
    return {
      id,
      ...(typeof sv === "number" ? { sv } : {}),
      ...(typeof authAt === "number" ? { authAt } : {}),
    };
  } catch {
    return undefined;
  }
}
