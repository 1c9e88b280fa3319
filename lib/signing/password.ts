import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import type { CurrentUser } from "@/lib/auth/guards";
import { verifyPassword } from "@/lib/auth/password";
import { AppError } from "@/lib/errors";
import { attempt, clear, peek, tooMany } from "@/lib/ratelimit";

// Approve, reject and revoke re-ask the signer's password first, outside the transaction of the
// decision so no row lock waits on argon2.

/** Where a signature was given from (the client address; the clock, for tests). */
export type SigningContext = { ip?: string; now?: Date };

const WRONG_PASSWORD = "The password is not correct.";

/**
 * Re-asks the signer's password (security.md: approve, reject and revoke). Wrong passwords are
 * counted under the signing rule (lib/ratelimit), so a left-open session cannot be used to guess the
 * password; a correct password clears the count. Unlike sign-in, the check is a peek and only a
 * failure is counted: one signer approving several applications at the same moment must not be
 * refused by their own correct passwords in flight. A burst of parallel wrong guesses from one
 * session can therefore exceed the limit by the number in flight — bounded by the session, which
 * sign-in's atomic limit already protects. (The real clock, not ctx.now: counters live in real time.)
 */
export async function verifySignerPassword(
  actor: CurrentUser,
  password: string,
  _ctx: SigningContext = {},
): Promise<void> {
  const limit = await peek("signing", actor.id);
  if (!limit.allowed) throw tooMany(limit, "Too many wrong passwords. Wait a little and try again.");
  const [row] = await db
    .select({ passwordHash: users.passwordHash })
    .from(users)
    .where(and(eq(users.id, actor.id), isNull(users.disabledAt)));
  const ok = await verifyPassword(row?.passwordHash, password);
  if (!ok) {
    await attempt("signing", actor.id);
    throw new AppError("invalid", `password: ${WRONG_PASSWORD}`, {
      issues: [{ path: "password", message: WRONG_PASSWORD }],
    });
  }
  await clear("signing", actor.id);
}
