import { safeReturnPath } from "@/lib/http/return-path";

// Where an institutional sign-in returns to. Auth.js keeps its own "callback URL" in one cookie
// (`authjs.callback-url`) that every Auth.js call may rewrite: the session check proxy.ts runs on each
// page request sets it to the site's root when a request arrives without it, so a page request that
// was already under way when the sign-in started (a prefetch, a second tab) could answer after the
// start and put "/" back; the sign-in then ended on the dashboard instead of the page asked for. The
// asked page is kept here instead, in a cookie only the start (POST /api/session/institution) writes
// and only the provider's callback (its path) receives; the callback sends a successful sign-in there
// and clears it. The value is reduced to a path on this site when written and again when read.

export const SSO_RETURN_COOKIE = "benchclear.sso-return";
export const SSO_RETURN_COOKIE_PATH = "/api/auth/callback/institution";
/** Long enough for a person to finish signing in at the provider (s). */
export const SSO_RETURN_MAX_AGE_SECONDS = 15 * 60;

export function ssoReturnCookieOptions(appUrl: string) {
  return {
    httpOnly: true,
    sameSite: "lax" as const,
    secure: new URL(appUrl).protocol === "https:",
    path: SSO_RETURN_COOKIE_PATH,
    maxAge: SSO_RETURN_MAX_AGE_SECONDS,
  };
}

/** The return path a cookie header carries, or null (absent, or not a path on this site). */
export function ssoReturnPathFrom(cookieHeader: string | null): string | null {
  if (!cookieHeader) return null;
  for (const part of cookieHeader.split(";")) {
    const at = part.indexOf("=");
    if (at < 0 || part.slice(0, at).trim() !== SSO_RETURN_COOKIE) continue;
    let value: string;
    try {
      value = decodeURIComponent(part.slice(at + 1).trim());
    } catch {
      return null;
    }
    return safeReturnPath(value);
  }
  return null;
}

/** Whether an Auth.js answer set a (non-empty) session cookie: the sign-in succeeded. */
export function setsSessionCookie(response: Response): boolean {
  return response.headers.getSetCookie().some((c) => /^(__Secure-)?authjs\.session-token(\.\d+)?=[^;]+/.test(c));
}
