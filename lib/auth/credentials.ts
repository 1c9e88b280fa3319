import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { env, type Env } from "@/lib/env";
import { addressBucket } from "@/lib/http/client-ip";
import { attempt, clear, forgive } from "@/lib/ratelimit";
import { demoAccountsRefused, isDemoAccount } from "./demo";
import { verifyPassword } from "./password";

export type CredentialsResult =
  | { ok: true; user: { id: string; email: string; name: string; sessionVersion: number } }
  | { ok: false; reason: "invalid" }
  | { ok: false; reason: "throttled"; retryAfterSeconds: number };

/** Where an attempt comes from: the client's address and whether this browser knows the account. */
export type SignInClient = { ip: string; knownDevice: boolean };

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/**
 * Checks an e-mail and password. An unknown e-mail, a disabled user, a user without a password yet
 * and a wrong password give the same answer after the same argon2 work (a dummy hash stands in).
 *
 * Throttling (lib/ratelimit): the attempt is counted against the account and, for a browser that
 * has not signed in to this account before, against the client's address — before the password is
 * checked, in one statement each, so parallel guesses cannot all slip past the check. A correct
 * password clears the account's count and gives the address its slot back. Every outcome is in the
 * audit trail: sign-in, failed sign-in, refused (throttled) sign-in.
 */
export async function checkCredentials(
  emailInput: string,
  password: string,
  client: SignInClient,
  config: Pick<Env, "NODE_ENV" | "BENCHCLEAR_LOCAL_DEMO"> = env(),
): Promise<CredentialsResult> {
  const email = normaliseEmail(emailInput);
  const bucket = addressBucket(client.ip);
  const countAddress = !client.knownDevice && client.ip !== "unknown";

  if (countAddress) {
    const byAddress = await attempt("signInAddress", bucket);
    if (!byAddress.allowed) {
      await auditAttempt("session.sign_in_refused", email, null, client, "too many failures from this address");
      return { ok: false, reason: "throttled", retryAfterSeconds: byAddress.retryAfterSeconds };
    }
  }
  const byAccount = await attempt("signInAccount", email);
  if (!byAccount.allowed) {
    // Refused without checking the password: that is no failure of this address's to count.
    if (countAddress) await forgive("signInAddress", bucket);
    await auditAttempt("session.sign_in_refused", email, null, client, "too many failures for this account");
    return { ok: false, reason: "throttled", retryAfterSeconds: byAccount.retryAfterSeconds };
  }

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
  if (!ok || !user) {
    await auditAttempt("session.sign_in_failed", email, user ?? null, client, "wrong e-mail or password");
    return { ok: false, reason: "invalid" };
  }
  if (demoAccountsRefused(config) && isDemoAccount(email, password)) {
    // The right password, but a published one: same answer as a wrong password, and it still counts.
    await auditAttempt("session.sign_in_failed", email, user, client, "demo account refused in production");
    return { ok: false, reason: "invalid" };
  }

  await clear("signInAccount", email);
  if (countAddress) await forgive("signInAddress", bucket);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
    await writeAudit(tx, {
      actor: { id: user.id, name: user.name },
      action: "session.signed_in",
      entityType: "user",
      entityId: user.id,
      data: { ip: client.ip, knownDevice: client.knownDevice },
    });
  });
  return { ok: true, user: { id: user.id, email: user.email, name: user.name, sessionVersion: user.sessionVersion } };
}

async function auditAttempt(
  action: "session.sign_in_failed" | "session.sign_in_refused",
  email: string,
  user: { id: string; name: string } | null,
  client: SignInClient,
  reason: string,
): Promise<void> {
  // The attempted e-mail is kept only as typed-and-normalised, cut to the column's sensible length.
  await writeAudit(db, {
    actor: null,
    action,
    entityType: "user",
    entityId: user?.id ?? `email:${email.slice(0, 320)}`,
    data: { email: email.slice(0, 320), ip: client.ip, knownDevice: client.knownDevice, reason },
  });
}
