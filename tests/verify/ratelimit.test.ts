import { describe, expect, it } from "vitest";
import { hitRateLimit, peekRateLimit, secondsUntilAllowed } from "@/lib/ratelimit";
import { VERIFY_RATE_LIMIT, verifyGate } from "@/lib/verify";
import { countVerifyLookup } from "@/lib/verify/limit";
import { requireDatabase, uniq } from "../support/db";
import { randomIp } from "../support/http";

requireDatabase();

// The PostgreSQL rate limiter (lib/ratelimit) that the public verification page uses: a sliding-window
// estimate over fixed-window counters, every hit counted, the clock injected so windows are exact.

const RULE = { limit: 3, windowSeconds: 60 };
/**
 * A window boundary an hour or two ago (a whole hour is a whole number of 60 s and 600 s windows),
 * recent enough that the limiter's pruning of day-old counters never touches these rows.
 */
const T0 = new Date(Math.floor(Date.now() / 3_600_000) * 3_600_000 - 3_600_000);
const at = (seconds: number) => new Date(T0.getTime() + seconds * 1000);

describe("hitRateLimit", () => {
  it("allows the limit within a window, refuses the next hit, and tells how long to wait", async () => {
    const key = uniq("rl");
    for (let i = 1; i <= 3; i++) {
      const r = await hitRateLimit(key, RULE, at(i));
      expect(r.allowed, `hit ${i}`).toBe(true);
      expect(r.estimate).toBe(i);
    }
    const refused = await hitRateLimit(key, RULE, at(10));
    expect(refused.allowed).toBe(false);
    expect(refused.estimate).toBe(4);
    // 4 hits now; in the next window they weigh 4·(1 − t/60) ≤ 3 once t ≥ 15 s: 50 s + 15 s = 65 s.
    expect(refused.retryAfterSeconds).toBe(65);
  });

  it("weighs the previous window in, so a burst at a window's end does not double the limit", async () => {
    const key = uniq("rl");
    for (let i = 0; i < 3; i++) expect((await hitRateLimit(key, RULE, at(58))).allowed).toBe(true);
    // 1 s into the next window: 3·(59/60) + 1 = 3.95 > 3.
    const early = await hitRateLimit(key, RULE, at(61));
    expect(early.allowed).toBe(false);
    expect(early.estimate).toBeCloseTo(3 * (59 / 60) + 1, 6);
    // 50 s in: 3·(10/60) + 2 = 2.5 ≤ 3.
    const later = await hitRateLimit(key, RULE, at(110));
    expect(later.allowed).toBe(true);
    expect(later.estimate).toBeCloseTo(2.5, 6);
  });

  it("forgets a key two windows later", async () => {
    const key = uniq("rl");
    for (let i = 0; i < 5; i++) await hitRateLimit(key, RULE, at(5));
    expect((await hitRateLimit(key, RULE, at(125))).estimate).toBe(1);
  });

  it("keeps keys apart", async () => {
    const a = uniq("rl");
    const b = uniq("rl");
    for (let i = 0; i < 4; i++) await hitRateLimit(a, RULE, at(1));
    expect((await hitRateLimit(b, RULE, at(2))).allowed).toBe(true);
  });

  it("lets exactly the limit through when many servers hit one key at the same moment", async () => {
    const key = uniq("rl");
    const rule = { limit: 10, windowSeconds: 600 };
    const results = await Promise.all(Array.from({ length: 40 }, () => hitRateLimit(key, rule, at(30))));
    expect(results.filter((r) => r.allowed)).toHaveLength(10);
  });

  it("counts nothing on a peek, which answers for a hit made now", async () => {
    const key = uniq("rl");
    expect((await peekRateLimit(key, RULE, at(1))).allowed).toBe(true);
    for (let i = 0; i < 3; i++) await hitRateLimit(key, RULE, at(2));
    const peek = await peekRateLimit(key, RULE, at(3));
    expect(peek.allowed).toBe(false);
    expect(peek.estimate).toBe(4);
    expect((await peekRateLimit(key, RULE, at(3))).estimate).toBe(4);
  });

  it("refuses a key or rule it cannot keep", async () => {
    await expect(hitRateLimit("", RULE)).rejects.toThrow(/key/);
    await expect(hitRateLimit("k", { limit: 0, windowSeconds: 60 })).rejects.toThrow(/limit/);
    await expect(hitRateLimit("k", { limit: 1, windowSeconds: 2 * 86_400 })).rejects.toThrow(/window/);
  });
});

describe("secondsUntilAllowed", () => {
  it("is 0 within the limit", () => {
    expect(secondsUntilAllowed({ previous: 0, current: 3, elapsedSeconds: 10, windowSeconds: 60, limit: 3 })).toBe(0);
  });
  it("waits for the previous window's weight to shrink when this window alone fits", () => {
    // 6·(1 − (10 + t)/60) + 2 ≤ 3 ⇔ t ≥ 40 s.
    expect(secondsUntilAllowed({ previous: 6, current: 2, elapsedSeconds: 10, windowSeconds: 60, limit: 3 })).toBe(40);
  });
  it("waits into the next window when this window alone is over", () => {
    // 6 now at 30 s: next window from 30 s on, 6·(1 − t′/60) ≤ 3 ⇔ t′ ≥ 30 s: 60 s in all.
    expect(secondsUntilAllowed({ previous: 0, current: 6, elapsedSeconds: 30, windowSeconds: 60, limit: 3 })).toBe(60);
  });
});

describe("verifyGate (for proxy.ts in front of /verify/[code])", () => {
  it("lets a client through until the page has counted the limit, then answers 429 with Retry-After, noindex and no-store", async () => {
    const headers = new Headers({ "x-forwarded-for": randomIp() });
    expect(await verifyGate(headers)).toBeNull();
    for (let i = 0; i < VERIFY_RATE_LIMIT.limit; i++) await countVerifyLookup(headers);
    const refused = await verifyGate(headers);
    expect(refused?.status).toBe(429);
    expect(Number(refused?.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(refused?.headers.get("x-robots-tag")).toBe("noindex, nofollow");
    expect(refused?.headers.get("cache-control")).toContain("no-store");
    expect(await refused?.text()).toContain("Too many checks");
    // A peek counts nothing: the gate asked twice and the count is still the page's own.
    expect((await countVerifyLookup(headers)).estimate).toBeCloseTo(VERIFY_RATE_LIMIT.limit + 1, 0);
  });
});
