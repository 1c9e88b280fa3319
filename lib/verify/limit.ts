import "server-only";
import { addressBucket, clientIp } from "@/lib/http/client-ip";
import { attempt, peek, RULES, type RateLimitResult } from "@/lib/ratelimit";

// The public verification page is rate-limited per client address under the statusPage rule
// (lib/ratelimit explains the figure). The address is the TCP peer, or what the configured number of
// trusted proxies say it is (lib/http/client-ip.ts) — never a header a client chose — so every client
// has its own count. An address that cannot be read (a misconfigured proxy chain) is answered without
// counting: one shared "unknown" count would let one scanner refuse everybody.
export const VERIFY_RATE_LIMIT = RULES.statusPage;

const UNCOUNTED: RateLimitResult = { allowed: true, estimate: 0, limit: RULES.statusPage.limit, retryAfterSeconds: 0 };

function subject(headers: Headers): string | null {
  const ip = clientIp(headers);
  return ip === "unknown" ? null : addressBucket(ip);
}

/** Counts one look-up from this client and says whether it may be answered. */
export async function countVerifyLookup(headers: Headers): Promise<RateLimitResult> {
  const who = subject(headers);
  return who ? attempt("statusPage", who) : UNCOUNTED;
}

/**
 * Whether this client is already over the limit, without counting: for proxy.ts, which can answer
 * 429 before the page renders (the page counts the look-up itself and refuses on its own too).
 */
export async function peekVerifyLookup(headers: Headers): Promise<RateLimitResult> {
  const who = subject(headers);
  return who ? peek("statusPage", who) : UNCOUNTED;
}
