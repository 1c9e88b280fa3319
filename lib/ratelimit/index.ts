import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db";
import { AppError } from "@/lib/errors";

// The one rate limiter: every limit Benchclear applies is a named rule below, counted here. Rate limits kept in PostgreSQL, so a limit holds across app servers and restarts. Each key counts
// hits in fixed windows of `windowSeconds`; the decision uses the sliding-window estimate
//   estimate = hits(previous window) · (1 − elapsed / window) + hits(current window)
// which smooths the burst a plain fixed window allows at its boundary. Every hit is counted, refused
// ones too, so a client that keeps hammering stays refused. Window starts come from the database's
// clock, so app servers with skewed clocks agree.

export type RateLimitRule = {
  /** Most hits allowed in any window-long stretch (estimated). */
  limit: number;
  /** Window length in seconds; at most one day (rows older than a day are pruned). */
  windowSeconds: number;
};

export type RateLimitResult = {
  allowed: boolean;
  /** The sliding-window estimate after this hit (for a peek: after a hit made now, not counted). */
  estimate: number;
  limit: number;
  /** Seconds until the estimate falls back to the limit, if no further hits come; 0 when allowed. */
  retryAfterSeconds: number;
};

/**
 * Every limit, by name. Figures are common practice, not from a standard; why each is what it is:
 *
 * - signInAccount — 5 wrong passwords per e-mail in 15 min, from anywhere. This is what stops
 *   guessing one account's password (ASVS 2.2.1 / 6.3.5: ≤ 100 failed attempts an hour; 5 per 15 min is
 *   20 an hour). A correct sign-in clears it.
 * - signInAddress — 100 failed sign-ins per client address (an IPv6 /64) in 15 min, counted only for
 *   devices that have not signed in to that account before (lib/auth/known-device.ts). This stops one
 *   machine spraying a common password across many accounts. A campus reaches us from one NAT
 *   address: at a busy start of term perhaps 1 000 sign-ins in a quarter hour with a 10 % typo rate is
 *   100 failures, and most of those come from devices that have signed in before, which this rule
 *   does not count or refuse — so one person hammering from the campus network cannot lock everyone
 *   out: known devices keep signing in, and only first sign-ins from new devices on that network wait
 *   at most 15 min. Successful sign-ins give their slot back.
 * - statusPage — 300 look-ups per client address in 10 min on the public permit status page. A person
 *   checks one permit per scan; a campus NAT with many phones at an open day stays well under one a
 *   second. Codes are 256-bit random, so this only bounds scraping load, not guessing.
 * - signing — 5 wrong passwords per signer in 15 min when approving, rejecting or revoking: a session
 *   left open cannot be used to guess the password.
 * - passwordChange — 5 wrong current passwords per user in 15 min on the password change form, for
 *   the same reason.
 */
export const RULES = {
  signInAccount: { prefix: "signin:account", limit: 5, windowSeconds: 15 * 60 },
  signInAddress: { prefix: "signin:address", limit: 100, windowSeconds: 15 * 60 },
  statusPage: { prefix: "verify:address", limit: 300, windowSeconds: 10 * 60 },
  signing: { prefix: "signing:user", limit: 5, windowSeconds: 15 * 60 },
  passwordChange: { prefix: "password-change:user", limit: 5, windowSeconds: 15 * 60 },
} as const satisfies Record<string, RateLimitRule & { prefix: string }>;

export type RuleName = keyof typeof RULES;

const MAX_WINDOW_SECONDS = 86_400;
const MAX_KEY_LENGTH = 200;

function checkRule(key: string, rule: RateLimitRule): void {
  if (!key || key.length > MAX_KEY_LENGTH) throw new Error(`rate limit key must be 1–${MAX_KEY_LENGTH} characters`);
  if (!Number.isInteger(rule.limit) || rule.limit < 1) throw new Error("rate limit must be a positive integer");
  if (!Number.isInteger(rule.windowSeconds) || rule.windowSeconds < 1 || rule.windowSeconds > MAX_WINDOW_SECONDS) {
    throw new Error(`rate limit window must be 1–${MAX_WINDOW_SECONDS} whole seconds`);
  }
}

/**
 * How long until `previous · (1 − (elapsed + t) / W) + current` (and, past the window's end, the
 * current window decaying the same way) is back at or under `limit`. Pure, exported for the tests.
 */
export function secondsUntilAllowed(input: {
  previous: number;
  current: number;
  elapsedSeconds: number;
  windowSeconds: number;
  limit: number;
}): number {
  const { previous, current, elapsedSeconds: e, windowSeconds: w, limit } = input;
  const estimate = previous * (1 - e / w) + current;
  if (estimate <= limit) return 0;
  if (current <= limit && previous > 0) {
    // Still inside this window: the previous window's weight shrinks until the sum fits.
    const t = w * (1 - (limit - current) / previous) - e;
    if (t <= w - e) return Math.max(1, Math.ceil(t));
  }
  // In the next window this window becomes the previous one: current · (1 − t′ / W) ≤ limit.
  const tNext = current > limit ? w * (1 - limit / current) : 0;
  return Math.max(1, Math.ceil(w - e + tNext));
}

type CounterRow = { previous: number | string | null; current: number | string | null; elapsed: number | string };

// The two statements, written once: $1 the injected clock (null: the database's), $2 the key, $3 the
// window in seconds. One statement each, so the window start is computed from the same clock reading
// as the elapsed time. Sent as named prepared statements straight to the pool: the public status
// page counts every look-up, and building the query text (drizzle) and planning it (PostgreSQL) each
// time was a visible part of that page's cost (docs/performance.md).
const CLOCK = `clock AS (SELECT coalesce($1::timestamptz, now()) AS t)`;
const WINDOW_START = `to_timestamp(floor(extract(epoch FROM (SELECT t FROM clock)) / $3::int) * $3::int)`;
const PREVIOUS = `(SELECT hits FROM rate_limit_counter
    WHERE key = $2 AND window_start = ${WINDOW_START} - make_interval(secs => $3::int)) AS previous`;
const ELAPSED = `extract(epoch FROM (SELECT t FROM clock)) - extract(epoch FROM ${WINDOW_START}) AS elapsed`;
const STATEMENTS = {
  hit: {
    name: "ratelimit_hit",
    text: `WITH ${CLOCK},
  bumped AS (
    INSERT INTO rate_limit_counter (key, window_start, hits)
    VALUES ($2, ${WINDOW_START}, 1)
    ON CONFLICT (key, window_start) DO UPDATE SET hits = rate_limit_counter.hits + 1
    RETURNING hits
  )
  SELECT (SELECT hits FROM bumped) AS current, ${PREVIOUS}, ${ELAPSED}`,
  },
  peek: {
    name: "ratelimit_peek",
    text: `WITH ${CLOCK}
  SELECT (SELECT hits FROM rate_limit_counter WHERE key = $2 AND window_start = ${WINDOW_START}) AS current,
    ${PREVIOUS}, ${ELAPSED}`,
  },
} as const;

async function read(key: string, rule: RateLimitRule, mode: "hit" | "peek", now?: Date): Promise<RateLimitResult> {
  checkRule(key, rule);
  const w = rule.windowSeconds;
  const at = now ? now.toISOString() : null;
  const result = await db.$client.query<CounterRow>({ ...STATEMENTS[mode], values: [at, key, w] });
  const row = result.rows[0];
  // A peek answers for a hit made now, without counting it.
  const current = Number(row?.current ?? 0) + (mode === "peek" ? 1 : 0);
  const previous = Number(row?.previous ?? 0);
  const elapsedSeconds = Math.min(w, Math.max(0, Number(row?.elapsed ?? 0)));
  const estimate = previous * (1 - elapsedSeconds / w) + current;
  const allowed = estimate <= rule.limit;
  if (mode === "hit" && Math.random() < 0.01) await prune(now);
  return {
    allowed,
    estimate,
    limit: rule.limit,
    retryAfterSeconds: allowed
      ? 0
      : secondsUntilAllowed({ previous, current, elapsedSeconds, windowSeconds: w, limit: rule.limit }),
  };
}

/** Counts one hit for `key` and says whether it is within the limit. */
export function hitRateLimit(key: string, rule: RateLimitRule, now?: Date): Promise<RateLimitResult> {
  return read(key, rule, "hit", now);
}

/** Whether a hit now would be allowed, without counting it (for an early refusal in front of a page
 * that counts its own hits). */
export function peekRateLimit(key: string, rule: RateLimitRule, now?: Date): Promise<RateLimitResult> {
  return read(key, rule, "peek", now);
}

/** Drops counters no window can still read (windows are at most a day long). */
export async function prune(now?: Date): Promise<void> {
  const at = now ? now.toISOString() : null;
  await db.execute(
    sql`DELETE FROM rate_limit_counter WHERE window_start < coalesce(${at}::timestamptz, now()) - interval '2 days'`,
  );
}

function keyOf(name: RuleName, subject: string): string {
  return `${RULES[name].prefix}:${subject.toLowerCase().slice(0, 150)}`;
}

/**
 * Counts one attempt under a named rule, atomically: the count is bumped and read in one statement,
 * so of N parallel attempts exactly `limit` (less what the window already holds) are allowed. Count
 * before doing the guarded work (checking a password), not after, or parallel requests all pass the
 * check before any of them is recorded.
 */
export function attempt(name: RuleName, subject: string, now?: Date): Promise<RateLimitResult> {
  return hitRateLimit(keyOf(name, subject), RULES[name], now);
}

/** Whether an attempt now would be allowed, without counting it. */
export function peek(name: RuleName, subject: string, now?: Date): Promise<RateLimitResult> {
  return peekRateLimit(keyOf(name, subject), RULES[name], now);
}

/** Gives back one counted attempt (it turned out fine: a correct password). */
export async function forgive(name: RuleName, subject: string): Promise<void> {
  const key = keyOf(name, subject);
  await db.execute(sql`
    UPDATE rate_limit_counter SET hits = greatest(hits - 1, 0)
    WHERE key = ${key}
      AND window_start = (SELECT max(window_start) FROM rate_limit_counter WHERE key = ${key})`);
}

/** Forgets every attempt under a rule for a subject (a correct sign-in clears the account's count). */
export async function clear(name: RuleName, subject: string): Promise<void> {
  await db.execute(sql`DELETE FROM rate_limit_counter WHERE key = ${keyOf(name, subject)}`);
}

/** The 429 answer for a refused attempt, with Retry-After. */
export function tooMany(result: RateLimitResult, message: string): AppError {
  return new AppError("rate_limited", message, { retryAfterSeconds: Math.max(1, result.retryAfterSeconds) });
}
