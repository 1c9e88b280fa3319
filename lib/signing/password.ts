import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { currentSessionAuthAt, type CurrentUser } from "@/lib/auth/guards";
import { verifyPassword } from "@/lib/auth/password";
import { signInMethods } from "@/lib/auth/sign-in-methods";
import { AppError, invalidField } from "@/lib/errors";
import { attempt, clear, peek, tooMany } from "@/lib/ratelimit";

// Approve, reject and revoke re-ask the signer's password first, outside the transaction of the
// decision so no row lock waits on argon2.

/** Where a signature was given from (the client address; the clock, for tests). */
export type SigningContext = { ip?: string; now?: Date };

const WRONG_PASSWORD = "The password is not correct.";

/**
 * How long an institutional sign-in counts as fresh for a signature: 5 minutes (300 s), the time to
 * read a decision and sign it after confirming who you are (common practice for step-up sign-in).
 */
export const FRESH_SIGN_IN_SECONDS = 300;

/** How a signer confirms a signature: their Benchclear password, or a fresh institutional sign-in. */
export type SigningMethod = "password" | "institution";

/**
 * A person signs with a fresh institutional sign-in when the institution's provider is configured
 * and they have no Benchclear password, or passwords are turned off (PASSWORD_SIGN_IN=false).
 */
export async function signingMethodOf(userId: string): Promise<SigningMethod> {
  const methods = signInMethods();
  if (!methods.institution) return "password";
  if (!methods.password) return "institution";
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, userId));
  return row?.passwordHash ? "password" : "institution";
}

/** What a signing panel needs to know (app/_components/auth/signer-check.tsx): how this person signs. */
export async function signingFor(
  userId: string,
  returnTo: string,
): Promise<{ method: "password" } | { method: "institution"; name: string; fresh: boolean; returnTo: string }> {
  const institution = signInMethods().institution;
  if (!institution || (await signingMethodOf(userId)) === "password") return { method: "password" };
  return { method: "institution", name: institution.name, fresh: (await freshSignInUntil()) !== null, returnTo };
}

/** Until when (ms since epoch) this request's session may sign by institutional sign-in; null when not. */
export async function freshSignInUntil(): Promise<number | null> {
  const authAt = await currentSessionAuthAt();
  if (!authAt) return null;
  const until = authAt + FRESH_SIGN_IN_SECONDS * 1000;
  return until > Date.now() ? until : null;
}

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
  password: string | undefined,
  _ctx: SigningContext = {},
): Promise<void> {
  if ((await signingMethodOf(actor.id)) === "institution") {
    // The session's own sign-in at the provider, within the last 5 minutes (prompt=login, max_age=0
    // made the provider ask again): a left-open session cannot sign.
    if (!(await freshSignInUntil())) {
      throw invalidField(
        "password",
        "Confirm it is you: sign in again through your institution, then sign within 5 minutes.",
      );
    }
    return;
  }
  if (!password) throw invalidField("password", "Enter your password to sign.");
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
