// POST /api/session — sign in with e-mail and password (JSON); 401 for any wrong pair, 429 with
// Retry-After when throttled. DELETE /api/session — sign out.
import { AuthError } from "next-auth";
import { signIn, signOut } from "@/auth";
import { checkThrottle, clientIp } from "@/lib/auth/throttle";
import { AppError } from "@/lib/http/errors";
import { route } from "@/lib/http/route";
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

export const DELETE = route({ access: "public" }, async () => {
  await signOut({ redirect: false });
  return { ok: true };
});
