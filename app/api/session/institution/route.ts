// POST /api/session/institution — starts signing in through the institution's OpenID Connect provider
// (authorization code with PKCE): Auth.js sets its state, PKCE-verifier and nonce cookies and the
// answer names the provider's authorization address for the browser to go to. `reauth: true` asks
// the provider to make the person sign in again even with a session there (prompt=login, max_age=0;
// OIDC Core 1.0 §3.1.2.1): signing a decision needs a fresh sign-in (lib/signing/password.ts).
// 404 when institutional sign-in is not configured.
import { cookies } from "next/headers";
import { signIn } from "@/auth";
import { INSTITUTION_PROVIDER } from "@/auth.config";
import { institutionSignInSchema } from "@/lib/auth/schemas";
import { signInMethods } from "@/lib/auth/sign-in-methods";
import { SSO_RETURN_COOKIE, ssoReturnCookieOptions } from "@/lib/auth/sso-return";
import { env } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { route } from "@/lib/http/route";

export const POST = route({ access: "public", body: institutionSignInSchema }, async ({ body }) => {
  if (!signInMethods().institution) throw notFound("Institutional sign-in");
  let url: string;
  try {
    url = await signIn(
      INSTITUTION_PROVIDER,
      { redirect: false, redirectTo: body.from },
      body.reauth ? { prompt: "login", max_age: "0" } : {},
    );
  } catch (error) {
    // Discovery failed: the provider is down or misconfigured. Say so; the detail goes to the log.
    console.error("[sso] starting sign-in failed:", error instanceof Error ? error.message : error);
    throw new AppError("unavailable", "Your institution's sign-in cannot be reached just now. Try again shortly.");
  }
  // Where the callback sends the person once signed in (lib/auth/sso-return.ts says why not Auth.js's
  // own callback-URL cookie). `from` was already reduced to a path on this site by the schema.
  (await cookies()).set(SSO_RETURN_COOKIE, body.from, ssoReturnCookieOptions(env().APP_URL));
  return { ok: true, redirectTo: url };
});
