import NextAuth from "next-auth";
import { NextResponse, type NextFetchEvent, type NextRequest } from "next/server";
import { ASKED_PATH_HEADER, authConfig } from "./auth.config";
import { SESSION_HEADER, sessionHeaderValue, type RequestSession } from "@/lib/auth/request-session";
import { freshSession } from "@/lib/auth/session-cookie";
import { COUNTED_HEADER, countAtVerifyGate, VERIFY_HEADERS, VERIFY_PATH_PREFIX } from "@/lib/verify/gate";
import {
  codeOfPath,
  isOwnRender,
  keptPage,
  lookUpForPage,
  OUTCOME_HEADER,
  outcomeHeaders,
  servesKeptPage,
} from "@/lib/verify/rendered";

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

function newNonce(): string {
  return Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
}

function withSecurityHeaders(request: NextRequest, extra?: Headers): NextResponse {
  const nonce = newNonce();
  const csp = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  // Never a client's own: set from what Auth.js read below, or removed (lib/auth/request-session.ts);
  // likewise the status page's "counted" token and content (lib/verify/rendered.ts).
  headers.delete(SESSION_HEADER);
  headers.delete(COUNTED_HEADER);
  headers.delete(OUTCOME_HEADER);
  extra?.forEach((value, key) => headers.set(key, value));
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", csp);
  return response;
}

/** Signed-out visitors of signed-in pages go to /sign-in; everyone else on, with their session. */
function afterSession(request: NextRequest, session: RequestSession | null): NextResponse {
  const { pathname } = request.nextUrl;
  const asked = askedPath(request.nextUrl);
  const isPublic = PUBLIC_PREFIXES.some((p) => pathname === p.replace(/\/$/, "") || pathname.startsWith(p));
  if (!isPublic && !session) {
    const url = new URL("/sign-in", request.nextUrl);
    if (asked !== "/") url.searchParams.set("from", asked);
    return NextResponse.redirect(url);
  }
  // The page asked for, for the page's own guard: a session the proxy let through can still be
  // refused there (a bumped session version, a disabled account), and the sign-in it sends the person
  // to should lead back here, query included (lib/auth/guards.ts requirePageUser). And the session
  // just read, for the page or route handler (lib/auth/request-session.ts): it is not decrypted a
  // second time there.
  const extra = new Headers({ [ASKED_PATH_HEADER]: asked, [SESSION_HEADER]: sessionHeaderValue(session) });
  return withSecurityHeaders(request, extra);
}

// A session cookie due for re-issue (or none, or one past a limit): Auth.js reads it, re-issues or
// clears it.
const withSession = auth(async (request) => {
  const user = request.auth?.user?.id ? request.auth : null;
  return afterSession(request, user ? { id: user.user.id, sv: user.sv, authAt: user.authAt } : null);
}) as unknown as (request: NextRequest, event: NextFetchEvent) => Promise<Response>;

// The public verification page skips Auth.js (decrypting a session cookie its visitors rarely have
// is wasted work on the page a busy open day loads most; docs/performance.md). The look-up is
// counted here, once, and refused with a real 429 (pages cannot set a status). Then the permit is
// read here, live, and a browser's load of the page is answered with the HTML this process rendered
// for exactly that content, under a fresh nonce (lib/verify/rendered.ts); otherwise the page renders
// what was read. Every answer stays out of search engines.
async function verifyPage(request: NextRequest): Promise<Response> {
  const { pathname } = request.nextUrl;
  // This process rendering a page to keep: already counted, its content handed over by the token.
  if (isOwnRender(request.headers)) {
    const handed = new Headers();
    for (const name of [COUNTED_HEADER, OUTCOME_HEADER]) handed.set(name, request.headers.get(name)!);
    return withVerifyHeaders(withSecurityHeaders(request, handed));
  }
  const gate = await countAtVerifyGate(request.headers);
  if (gate.refused) return gate.refused;
  const code = servesKeptPage(request) ? codeOfPath(pathname, VERIFY_PATH_PREFIX) : null;
  // next dev recompiles the page: keep nothing there.
  if (code === null || process.env.NODE_ENV !== "production") {
    return withVerifyHeaders(withSecurityHeaders(request, gate.requestHeaders));
  }
  const outcome = await lookUpForPage(code);
  const nonce = newNonce();
  const page = await keptPage(pathname, code, outcome, nonce);
  if (!page) return withVerifyHeaders(withSecurityHeaders(request, new Headers(outcomeHeaders(outcome))));
  const response = new NextResponse(new Uint8Array(page.body.buffer, page.body.byteOffset, page.body.byteLength), {
    status: 200,
    headers: { "Content-Type": page.contentType, "Content-Security-Policy": contentSecurityPolicy(nonce) },
  });
  if (page.vary) response.headers.set("Vary", page.vary);
  return withVerifyHeaders(response);
}

function withVerifyHeaders(response: NextResponse): NextResponse {
  for (const [key, value] of Object.entries(VERIFY_HEADERS)) response.headers.set(key, value);
  return response;
}

export default async function proxy(request: NextRequest, event: NextFetchEvent) {
  if (request.nextUrl.pathname.startsWith(VERIFY_PATH_PREFIX)) return verifyPage(request);
  // A cookie re-issued less than a minute ago is read without Auth.js and not sent back
  // (lib/auth/session-cookie.ts); Auth.js handles every other case as before.
  const fresh = await freshSession(request.cookies, request.headers);
  if (fresh) return afterSession(request, fresh);
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
