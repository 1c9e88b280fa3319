-- The permit list's count with a tier filter, read from the index alone (lib/permits/queries.ts).
CREATE INDEX IF NOT EXISTS "permit_tier_state_idx" ON "permit" USING btree ("tier","state","valid_to");
--> statement-breakpoint
-- The review queue's order over waiting applications only (lib/review/queries.ts listQueue).
CREATE INDEX IF NOT EXISTS "application_waiting_idx" ON "application" USING btree ("waiting_since" ASC NULLS LAST,"seq") WHERE "application"."state" IN ('submitted', 'in_review');
