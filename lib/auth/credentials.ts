import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { verifyPassword } from "./password";
import { checkThrottle, recordAttempt } from "./throttle";

export type CredentialsResult =
  | { ok: true; user: { id: string; email: string; name: string; sessionVersion: number } }
  | { ok: false; reason: "invalid" }
  | { ok: false; reason: "throttled"; retryAfterSeconds: number };

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/**
 * Checks an e-mail and password. An unknown e-mail, a disabled user, a user without a password yet
 * and a wrong password give the same answer after the same argon2 work (a dummy hash stands in).
 */
export async function checkCredentials(emailInput: string, password: string, ip: string): Promise<CredentialsResult> {
  const email = normaliseEmail(emailInput);
  const throttle = await checkThrottle(email, ip);
  if (throttle.limited) return { ok: false, reason: "throttled", retryAfterSeconds: throttle.retryAfterSeconds };

  const [user] = await db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      passwordHash: users.passwordHash,
      sessionVersion: users.sessionVersion,
      disabledAt: users.disabledAt,
    })
    .from(users)
    .where(eq(sql`lower(${users.email})`, email))
    .limit(1);

  const passwordOk = await verifyPassword(user?.passwordHash, password);
  const ok = Boolean(user && user.passwordHash && !user.disabledAt && passwordOk);
  await recordAttempt(email, ip, ok);
  if (!ok || !user) return { ok: false, reason: "invalid" };
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
  return { ok: true, user: { id: user.id, email: user.email, name: user.name, sessionVersion: user.sessionVersion } };
}
