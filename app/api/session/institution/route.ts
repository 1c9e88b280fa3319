// POST /api/session/institution — starts signing in through the institution's OpenID Connect provider
// (authorization code with PKCE): Auth.js sets its state, PKCE-verifier and nonce cookies and the
// answer names the provider's authorization address for the browser to go to. `reauth: true` asks
// the provider to make the person sign in again even with a session there (prompt=login, max_age=0;
// OIDC Core 1.0 §3.1.2.1): signing a decision needs a fresh sign-in (lib/signing/password.ts).
// 404 when institutional sign-in is not configured.
import { signIn } from "@/auth";
import { INSTITUTION_PROVIDER } from "@/auth.config";
import { institutionSignInSchema } from "@/lib/auth/schemas";
import { signInMethods } from "@/lib/auth/sign-in-methods";
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
  return { ok: true, redirectTo: url };
});
