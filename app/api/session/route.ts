// POST /api/session — sign in with e-mail and password (JSON); 401 for any wrong pair, 429 with
// Retry-After when throttled, 403 when password sign-in is turned off (PASSWORD_SIGN_IN=false).
// DELETE /api/session — sign out (every session of the user; at the institution's provider too).
import { cookies } from "next/headers";
import { AuthError } from "next-auth";
import { signIn, signOut, ThrottledSignin } from "@/auth";
import { KNOWN_DEVICE_COOKIE, KNOWN_DEVICE_MAX_AGE_SECONDS, knownDeviceCookieValue } from "@/lib/auth/known-device";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { PASSWORDS_OFF_MESSAGE, signInMethods } from "@/lib/auth/sign-in-methods";
import { providerSignOutUrl } from "@/lib/auth/sso-logout";
import { route } from "@/lib/http/route";
import { signOutUser } from "@/lib/users/actions";
import { signInSchema } from "@/lib/auth/schemas";

const WRONG = "That e-mail and password do not match an active account.";

// The password is checked, and each attempt counted, once: in the Credentials provider's authorize()
// (auth.ts → lib/auth/credentials.ts). `from` was already reduced to a path on this site by the schema.
export const POST = route({ access: "public", body: signInSchema }, async ({ request, body }) => {
  // Turned off (PASSWORD_SIGN_IN=false): refused before any password is looked at or counted.
  if (!signInMethods().password) throw new AppError("forbidden", PASSWORDS_OFF_MESSAGE);
  try {
    await signIn("credentials", { email: body.email, password: body.password, redirect: false });
  } catch (error) {
    if (error instanceof AuthError && (error as AuthError & { code?: string }).code === "throttled") {
      const wait = error instanceof ThrottledSignin ? error.retryAfterSeconds : 60;
      throw new AppError("rate_limited", "Too many failed sign-ins. Wait before trying again.", {
        retryAfterSeconds: Math.max(1, wait),
      });
    }
    if (error instanceof AuthError) throw new AppError("unauthenticated", WRONG);
    throw error;
  }
  // This browser now knows the account: the per-address limit no longer counts or refuses it.
  (await cookies()).set(KNOWN_DEVICE_COOKIE, knownDeviceCookieValue(request.headers.get("cookie"), body.email), {
    httpOnly: true,
    sameSite: "lax",
    secure: new URL(env().APP_URL).protocol === "https:",
    path: "/api/session",
    maxAge: KNOWN_DEVICE_MAX_AGE_SECONDS,
  });
  return { ok: true, redirectTo: body.from };
});

// Signing out ends all of the user's sessions (their tokens carry the old session version), so a
// token re-sent by a request still in flight when the cookie was cleared is refused too. After an
// institutional sign-in the answer's `redirectTo` is the provider's sign-out address (RP-initiated
// logout, lib/auth/sso-logout.ts), which returns to /sign-in; otherwise it is /sign-in itself.
export const DELETE = route({ access: "public" }, async ({ request, user }) => {
  const atProvider = await providerSignOutUrl(request);
  if (user) await signOutUser(user);
  await signOut({ redirect: false });
  return { ok: true, redirectTo: atProvider ?? "/sign-in" };
});
