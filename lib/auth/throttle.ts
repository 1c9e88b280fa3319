import "server-only";
import { and, count, eq, gt, lt, min, or, sql } from "drizzle-orm";
import { db } from "@/db";
import { signInAttempts } from "@/db/schema";

// Sign-in throttling kept in PostgreSQL, so it holds across app servers and restarts (ASVS 2.2.1 /
// 6.3.5). Failures are counted in a sliding window per e-mail and per client address; a success for
// an e-mail clears its count. The numbers are common practice, not from a standard.
export const THROTTLE_WINDOW_SECONDS = 15 * 60;
export const MAX_FAILURES_PER_EMAIL = 5;
export const MAX_FAILURES_PER_IP = 30;

export type ThrottleState = { limited: false } | { limited: true; retryAfterSeconds: number };

function windowStart(now: Date): Date {
  return new Date(now.getTime() - THROTTLE_WINDOW_SECONDS * 1000);
}

async function failuresSince(column: "email" | "ip", value: string, since: Date) {
  const col = column === "email" ? signInAttempts.email : signInAttempts.ip;
  // Failures after the last success for this key, inside the window.
  const lastSuccess = db
    .select({ at: sql`max(${signInAttempts.attemptedAt})` })
    .from(signInAttempts)
    .where(and(eq(col, value), eq(signInAttempts.succeeded, true)));
  const [row] = await db
    .select({ n: count(), oldest: min(signInAttempts.attemptedAt) })
    .from(signInAttempts)
    .where(
      and(
        eq(col, value),
        eq(signInAttempts.succeeded, false),
        gt(signInAttempts.attemptedAt, since),
        column === "email"
          ? or(sql`(${lastSuccess}) IS NULL`, sql`${signInAttempts.attemptedAt} > (${lastSuccess})`)
          : undefined,
      ),
    );
  return { n: Number(row?.n ?? 0), oldest: row?.oldest ?? null };
}

export async function checkThrottle(email: string, ip: string, now = new Date()): Promise<ThrottleState> {
  const since = windowStart(now);
  const [byEmail, byIp] = await Promise.all([failuresSince("email", email, since), failuresSince("ip", ip, since)]);
  const waits: number[] = [];
  for (const [state, max] of [
    [byEmail, MAX_FAILURES_PER_EMAIL],
    [byIp, MAX_FAILURES_PER_IP],
  ] as const) {
    if (state.n >= max && state.oldest) {
      const releaseAt = new Date(state.oldest).getTime() + THROTTLE_WINDOW_SECONDS * 1000;
      waits.push(Math.max(1, Math.ceil((releaseAt - now.getTime()) / 1000)));
    }
  }
  return waits.length ? { limited: true, retryAfterSeconds: Math.max(...waits) } : { limited: false };
}

export async function recordAttempt(email: string, ip: string, succeeded: boolean): Promise<void> {
  await db.insert(signInAttempts).values({ email, ip, succeeded });
  // Keep the table small: drop rows well outside any window (cheap with the index on attempted_at).
  if (Math.random() < 0.02) {
    await db.delete(signInAttempts).where(lt(signInAttempts.attemptedAt, new Date(Date.now() - 24 * 3600 * 1000)));
  }
}

/** The client's address: the right-most X-Forwarded-For entry (added by our own proxy), if any. */
export function clientIp(headers: Headers): string {
  const forwarded = headers.get("x-forwarded-for");
  if (forwarded) {
    const parts = forwarded
      .split(",")
      .map((p) => p.trim())
      .filter(Boolean);
    if (parts.length) return parts[parts.length - 1].slice(0, 64);
  }
  return (headers.get("x-real-ip") ?? "unknown").slice(0, 64);
}
