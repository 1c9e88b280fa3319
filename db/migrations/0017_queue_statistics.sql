-- The review queue's "waiting for my signature" test is a role per (chain rules version, tier, step)
-- (lib/review/queries.ts waitsForRole). PostgreSQL takes state, tier and chain_step as independent,
-- but they are not (only waiting applications are in review at step 1): without these statistics it
-- estimated 151 of 10 016 waiting applications at 100k permits where 2 001 matched, and sorted every
-- waiting application for each page instead of walking application_waiting_idx in order
-- (docs/performance.md). Statistics are read by the planner only; they change no result.
CREATE STATISTICS IF NOT EXISTS "application_queue_stats" (mcv) ON "state", "tier", "chain_step" FROM "application";
--> statement-breakpoint
ANALYZE "application";
