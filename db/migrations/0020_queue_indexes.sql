-- The review queue's "waiting for my signature" test, its capped count and the dashboard's counts by
-- tier (lib/review/queries.ts). Waiting applications by the step they wait at and their tier, so a
-- role's candidates are read from an index and a capped count stops early instead of visiting every
-- waiting application's row; and each signer's decisions by revision, for separation of duties
-- ("not one I signed"), probed per candidate. At 100k permits: the queue's count 9,602 → 2,010
-- buffers, its page 2,317 → 2,090, the dashboard's counts by tier 17,704 → 6,831 (docs/performance.md).
CREATE INDEX IF NOT EXISTS "application_waiting_step_idx" ON "application" USING btree ("chain_step","tier") WHERE "application"."state" IN ('submitted', 'in_review');
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "decision_signer_idx" ON "decision" USING btree ("signer_id","revision_id");
