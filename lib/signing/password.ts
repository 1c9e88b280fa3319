import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import type { CurrentUser } from "@/lib/auth/guards";
import { verifyPassword } from "@/lib/auth/password";
import { checkThrottle, recordAttempt } from "@/lib/auth/throttle";
import { AppError } from "@/lib/http/errors";

// Approve, reject and revoke re-ask the signer's password first, outside the transaction of the
// decision so no row lock waits on argon2.

/** Where a signature was given from, for throttling password guesses per address. */
export type SigningContext = { ip?: string; now?: Date };

const WRONG_PASSWORD = "The password is not correct.";

/**
 * Re-asks the signer's password (security.md: approve, reject and revoke). Failures count toward
 * the same throttle as sign-in, so a left-open session cannot be used to guess the password.
 */
export async function verifySignerPassword(
  actor: CurrentUser,
  password: string,
  ctx: SigningContext = {},
): Promise<void> {
  const ip = ctx.ip ?? "unknown";
  const email = actor.email.toLowerCase();
  const throttle = await checkThrottle(email, ip);
  if (throttle.limited) {
    throw new AppError("rate_limited", "Too many wrong passwords. Wait a little and try again.", {
      retryAfterSeconds: throttle.retryAfterSeconds,
    });
  }
  const [row] = await db
    .select({ passwordHash: users.passwordHash })
    .from(users)
    .where(and(eq(users.id, actor.id), isNull(users.disabledAt)));
  const ok = await verifyPassword(row?.passwordHash, password);
  if (!ok) {
    await recordAttempt(email, ip, false);
    throw new AppError("invalid", `password: ${WRONG_PASSWORD}`, {
      issues: [{ path: "password", message: WRONG_PASSWORD }],
    });
  }
}
