// GET /api/auth/callback/institution — where the institution's OpenID Connect provider sends the
// browser back with an authorization code. Auth.js checks state, PKCE and nonce, redeems the code,
// validates the ID token, asks UserInfo, and the signIn callback (auth.ts → lib/auth/sso.ts) finds,
// links or makes the account; then the session cookie is set and the browser goes on to where the
// sign-in started. Only this one Auth.js endpoint is served: signing in and out otherwise goes
// through /api/session (JSON, route()), so every other path here answers 404. Not built with route():
// this is the provider's protocol (a redirect with query parameters, no JSON, no Origin header).
import { institutionCallback } from "@/auth";
import { INSTITUTION_PROVIDER } from "@/auth.config";
import { signInMethods } from "@/lib/auth/sign-in-methods";
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
    return await institutionCallback(onAppUrl);
  } catch (error) {
    return errorResponse(error);
  }
}
