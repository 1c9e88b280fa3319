// GET /api/auth/callback/institution — where the institution's OpenID Connect provider sends the
// browser back with an authorization code. Auth.js checks state, PKCE and nonce, redeems the code,
// validates the ID token, asks UserInfo, and the signIn callback (auth.ts → lib/auth/sso.ts) finds,
// links or makes the account; then the session cookie is set and the browser goes on to where the
// sign-in started (its own cookie, lib/auth/sso-return.ts). Only this one Auth.js endpoint is served: signing in and out otherwise goes
// through /api/session (JSON, route()), so every other path here answers 404. Not built with route():
// this is the provider's protocol (a redirect with query parameters, no JSON, no Origin header).
import { institutionCallback } from "@/auth";
import { INSTITUTION_PROVIDER } from "@/auth.config";
import { signInMethods } from "@/lib/auth/sign-in-methods";
import { setsSessionCookie, SSO_RETURN_COOKIE, SSO_RETURN_COOKIE_PATH, ssoReturnPathFrom } from "@/lib/auth/sso-return";
import { errorResponse } from "@/lib/http/route";
import { env } from "@/lib/env";
import { notFound } from "@/lib/errors";

const CALLBACK_PATH = `/api/auth/callback/${INSTITUTION_PROVIDER}`;

export async function GET(request: Request): Promise<Response> {
  try {
    const url = new URL(request.url);
    if (url.pathname !== CALLBACK_PATH || !signInMethods().institution) {
      return errorResponse(notFound("That page"));
    }
    // On the public address (APP_URL), whatever host name the server was reached by: the redirect
    // URI Auth.js sends when redeeming the code must be the one the sign-in started with (RFC 6749
    // §4.1.3), and its own redirects must stay on the site. Auth.js reads only the URL and cookies.
    const onAppUrl = new Request(new URL(url.pathname + url.search, env().APP_URL), {
      headers: request.headers,
      method: "GET",
    });
    const answer = await institutionCallback(onAppUrl);
    // A sign-in that went through returns to the page it was started from (lib/auth/sso-return.ts);
    // a refusal keeps Auth.js's way back to the sign-in page. Either way the return cookie is spent.
    const headers = new Headers(answer.headers);
    const asked = ssoReturnPathFrom(request.headers.get("cookie"));
    if (asked && answer.status >= 300 && answer.status < 400 && setsSessionCookie(answer)) {
      headers.set("location", new URL(asked, env().APP_URL).toString());
    }
    headers.append(
      "set-cookie",
      `${SSO_RETURN_COOKIE}=; Path=${SSO_RETURN_COOKIE_PATH}; Max-Age=0; HttpOnly; SameSite=Lax`,
    );
    return new Response(answer.body, { status: answer.status, statusText: answer.statusText, headers });
  } catch (error) {
    return errorResponse(error);
  }
}
