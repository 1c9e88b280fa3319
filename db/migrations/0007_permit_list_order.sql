-- The permit list reads each half of its order (active, then the rest) through this index, so a page
-- costs the same at 100k permits as at 1k (lib/permits/queries.ts listPermits).
CREATE INDEX IF NOT EXISTS "permit_list_order_idx" ON "permit" USING btree ("valid_to","issued_at" DESC,"id");
