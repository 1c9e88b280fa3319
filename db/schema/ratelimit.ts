import { index, integer, pgTable, primaryKey, text, timestamp } from "drizzle-orm/pg-core";

// Request counters for rate limits (lib/ratelimit): one row per key and fixed window, so a limit holds
// across app servers and restarts. The limiter weighs the previous window in (a sliding-window
// estimate); rows older than a day are pruned.
export const rateLimitCounters = pgTable(
  "rate_limit_counter",
  {
    // "<bucket>:<subject>", e.g. "verify:ip:2001:db8::1".
    key: text().notNull(),
    windowStart: timestamp({ withTimezone: true }).notNull(),
    hits: integer().notNull().default(0),
  },
  (t) => [
    primaryKey({ name: "rate_limit_counter_pkey", columns: [t.key, t.windowStart] }),
    index("rate_limit_counter_window_idx").on(t.windowStart),
  ],
);

export type RateLimitCounter = typeof rateLimitCounters.$inferSelect;
