-- The permit list's order index also carries state and tier, so a page's ids (the active or the
-- other half, a tier filter) and the list's capped count are read from the index alone. At 100k
-- permits page 400 read 10,386 buffers (a heap visit for each of the 10,000 permits it skipped, to
-- test its state), and 79 with this index (docs/performance.md).
DROP INDEX IF EXISTS "permit_list_order_idx";
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "permit_list_order_idx" ON "permit" USING btree ("valid_to","issued_at" DESC,"id","state","tier");
