import NextAuth from "next-auth";
import { NextResponse, type NextFetchEvent, type NextRequest } from "next/server";
import { ASKED_PATH_HEADER, authConfig } from "./auth.config";
import { SESSION_HEADER, sessionHeaderValue } from "@/lib/auth/request-session";
import { countAtVerifyGate, VERIFY_HEADERS, VERIFY_PATH_PREFIX } from "@/lib/verify/gate";

// Runs before every page request. It does three things only: sends signed-out visitors of signed-in
// pages to /sign-in, sets the Content-Security-Policy with a fresh nonce, and counts look-ups of the
// public verification page against their rate limit. It never authorizes: every page, route handler
// and server action checks access itself (lib/auth/guards.ts).

const { auth } = NextAuth(authConfig);

const PUBLIC_PREFIXES = ["/sign-in", "/invite/", "/verify/", "/api/"];

/** The path and query asked for, without the client router's own `_rsc` parameter. */
function askedPath(url: URL): string {
  const search = new URLSearchParams(url.search);
  search.delete("_rsc");
  const query = search.toString();
  return url.pathname + (query ? `?${query}` : "");
}

function contentSecurityPolicy(nonce: string): string {
  const dev = process.env.NODE_ENV !== "production";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

function withSecurityHeaders(request: NextRequest, extra?: Headers): NextResponse {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  // Never a client's own: set from what Auth.js read below, or removed (lib/auth/request-session.ts).
  headers.delete(SESSION_HEADER);
  extra?.forEach((value, key) => headers.set(key, value));
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", csp);
  return response;
}

// Every page but the status page: Auth.js reads (and refreshes) the session cookie; signed-out
// visitors of signed-in pages go to /sign-in.
const withSession = auth(async (request) => {
  const { pathname } = request.nextUrl;
  const asked = askedPath(request.nextUrl);
  const isPublic = PUBLIC_PREFIXES.some((p) => pathname === p.replace(/\/$/, "") || pathname.startsWith(p));
  if (!isPublic && !request.auth?.user?.id) {
    const url = new URL("/sign-in", request.nextUrl);
    if (asked !== "/") url.searchParams.set("from", asked);
    return NextResponse.redirect(url);
  }
  // The page asked for, for the page's own guard: a session the proxy let through can still be
  // refused there (a bumped session version, a disabled account), and the sign-in it sends the person
  // to should lead back here, query included (lib/auth/guards.ts requirePageUser). And the session
  // Auth.js just read, for the page or route handler (lib/auth/request-session.ts): it is not
  // decrypted a second time there.
  const user = request.auth?.user?.id ? request.auth : null;
  const extra = new Headers({
    [ASKED_PATH_HEADER]: asked,
    [SESSION_HEADER]: sessionHeaderValue(user ? { id: user.user.id, sv: user.sv, authAt: user.authAt } : null),
  });
  return withSecurityHeaders(request, extra);
}) as unknown as (request: NextRequest, event: NextFetchEvent) => Promise<Response>;

export default async function proxy(request: NextRequest, event: NextFetchEvent) {
  // The public verification page skips Auth.js (decrypting a session cookie its visitors rarely have
  // is wasted work on the page a busy open day loads most; docs/performance.md). The look-up is
  // counted here, once, and refused with a real 429 (pages cannot set a status); the page is told it
  // was counted, so it makes no second round trip. Every answer stays out of search engines.
  if (request.nextUrl.pathname.startsWith(VERIFY_PATH_PREFIX)) {
    const gate = await countAtVerifyGate(request.headers);
    if (gate.refused) return gate.refused;
    const response = withSecurityHeaders(request, gate.requestHeaders);
    for (const [key, value] of Object.entries(VERIFY_HEADERS)) response.headers.set(key, value);
    return response;
  }
  return withSession(request, event);
}

export const config = {
  // /api/session and Auth.js's callback (/api/auth/…) set and clear the session cookie themselves; a
  // refresh here would race them. Uploads
  // skip the proxy so their bodies (up to 10 MB) are not buffered twice.
  matcher: [
    "/((?!_next/static|_next/image|api/session|api/auth/|api/applications/[^/]+/attachments$|favicon.ico|mark.svg|robots.txt).*)",
  ],
};
