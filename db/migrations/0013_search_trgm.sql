-- Search (issue 18, item 4): trigram indexes for the header's search box (lib/search), so a
-- substring match (ILIKE '%…%') on a permit number, a title, a room or a name reads an index rather
-- than every row. pg_trgm ships with PostgreSQL's contrib (Debian: postgresql-contrib, part of the
-- server package); it is a trusted extension, so the migration's owner role may create it.
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "permit_number_trgm_idx" ON "permit" USING gin ("number" gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "application_title_trgm_idx" ON "application" USING gin ("title" gin_trgm_ops);
--> statement-breakpoint
-- The room of a revision's event: the room a permit and an application are searched by.
CREATE INDEX IF NOT EXISTS "application_revision_room_trgm_idx" ON "application_revision" USING gin ((("content" -> 'event') ->> 'room') gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "app_user_name_trgm_idx" ON "app_user" USING gin ("name" gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "apparatus_name_trgm_idx" ON "apparatus" USING gin ("name" gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "apparatus_room_trgm_idx" ON "apparatus" USING gin ("room" gin_trgm_ops);
