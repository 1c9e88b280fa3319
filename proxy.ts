import NextAuth from "next-auth";
import { NextResponse } from "next/server";
import { authConfig } from "./auth.config";
import { VERIFY_HEADERS, verifyGate } from "@/lib/verify";

// Runs before every page request. It does two things only: sends signed-out visitors of signed-in
// pages to /sign-in, and sets the Content-Security-Policy with a fresh nonce. It never authorizes:
// every page, route handler and server action checks access itself (lib/auth/guards.ts).

const { auth } = NextAuth(authConfig);

const PUBLIC_PREFIXES = ["/sign-in", "/invite/", "/verify/", "/api/"];

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

export default auth(async (request) => {
  const { pathname, search } = request.nextUrl;
  const isPublic = PUBLIC_PREFIXES.some((p) => pathname === p.replace(/\/$/, "") || pathname.startsWith(p));
  if (!isPublic && !request.auth?.user?.id) {
    const url = new URL("/sign-in", request.nextUrl);
    if (pathname !== "/") url.searchParams.set("from", pathname + search);
    return NextResponse.redirect(url);
  }

  // The public verification page: refuse with 429 over the per-address limit (the page itself counts
  // each look-up; pages cannot set a status), and keep it out of search engines.
  const verifying = pathname.startsWith("/verify/");
  if (verifying) {
    const refused = await verifyGate(request.headers);
    if (refused) return refused;
  }

  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", csp);
  if (verifying) for (const [key, value] of Object.entries(VERIFY_HEADERS)) response.headers.set(key, value);
  return response;
});

export const config = {
  // /api/session sets and clears the session cookie itself; a refresh here would race it. Uploads
  // skip the proxy so their bodies (up to 10 MB) are not buffered twice.
  matcher: [
    "/((?!_next/static|_next/image|api/session|api/applications/[^/]+/attachments$|favicon.ico|mark.svg|robots.txt).*)",
  ],
};
