// POST /api/session — sign in with e-mail and password (JSON); 401 for any wrong pair, 429 with
// Retry-After when throttled. DELETE /api/session — sign out (every session of the user).
import { AuthError } from "next-auth";
import { signIn, signOut } from "@/auth";
import { checkThrottle, clientIp } from "@/lib/auth/throttle";
import { AppError } from "@/lib/http/errors";
import { route } from "@/lib/http/route";
import { endSessions } from "@/lib/users/actions";
import { signInSchema } from "@/lib/validation/auth";

const WRONG = "That e-mail and password do not match an active account.";

export const POST = route({ access: "public", body: signInSchema }, async ({ request, body }) => {
  const ip = clientIp(request.headers);
  const throttle = await checkThrottle(body.email, ip);
  if (throttle.limited) {
    throw new AppError("rate_limited", "Too many failed sign-ins. Wait before trying again.", {
      retryAfterSeconds: throttle.retryAfterSeconds,
    });
  }
  try {
    await signIn("credentials", { email: body.email, password: body.password, redirect: false });
  } catch (error) {
    if (error instanceof AuthError) {
      if ((error as AuthError & { code?: string }).code === "throttled") {
        const again = await checkThrottle(body.email, ip);
        throw new AppError("rate_limited", "Too many failed sign-ins. Wait before trying again.", {
          retryAfterSeconds: again.limited ? again.retryAfterSeconds : 60,
        });
      }
      throw new AppError("unauthenticated", WRONG);
    }
    throw error;
  }
  return { ok: true, redirectTo: body.from };
});

// Signing out ends all of the user's sessions (their tokens carry the old session version), so a
// token re-sent by a request still in flight when the cookie was cleared is refused too.
export const DELETE = route({ access: "public" }, async ({ user }) => {
  if (user) await endSessions(user.id);
  await signOut({ redirect: false });
  return { ok: true };
});
