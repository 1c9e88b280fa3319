import "server-only";
import { clientIp } from "@/lib/auth/throttle";
import { hitRateLimit, peekRateLimit, type RateLimitResult, type RateLimitRule } from "@/lib/ratelimit";

// The public verification page is rate-limited per client address: a person checks a few permits a
// minute, a scraper thousands. The limit is generous because a campus shares a few NAT addresses
// among many phones (common practice, not from a standard). The address is the right-most
// X-Forwarded-For entry, which our own proxy appends (lib/auth/throttle.ts clientIp).
export const VERIFY_RATE_LIMIT: RateLimitRule = { limit: 60, windowSeconds: 10 * 60 };

function keyFor(headers: Headers): string {
  return `verify:ip:${clientIp(headers)}`;
}

/** Counts one look-up from this client and says whether it may be answered. */
export function countVerifyLookup(headers: Headers): Promise<RateLimitResult> {
  return hitRateLimit(keyFor(headers), VERIFY_RATE_LIMIT);
}

/**
 * Whether this client is already over the limit, without counting: for proxy.ts, which can answer
 * 429 before the page renders (the page counts the look-up itself and refuses on its own too).
 */
export function peekVerifyLookup(headers: Headers): Promise<RateLimitResult> {
  return peekRateLimit(keyFor(headers), VERIFY_RATE_LIMIT);
}
