-- Re-review when an apparatus changes (issue 17 item 4): one row per active permit and new apparatus
-- revision, written in the transaction that saves the revision (lib/rereview/actions.ts).
CREATE TABLE IF NOT EXISTS "permit_apparatus_change" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"permit_id" uuid NOT NULL,
	"apparatus_id" uuid NOT NULL,
	"apparatus_revision_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"permit_tier" smallint NOT NULL,
	"tier" smallint NOT NULL,
	"changed_by_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "permit_apparatus_change_key" UNIQUE("permit_id","apparatus_revision_id"),
	CONSTRAINT "permit_apparatus_change_tier_range" CHECK ("permit_apparatus_change"."tier" BETWEEN 0 AND 4)
);
--> statement-breakpoint
ALTER TABLE "permit_apparatus_change" ADD CONSTRAINT "permit_apparatus_change_permit_id_permit_id_fk" FOREIGN KEY ("permit_id") REFERENCES "public"."permit"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "permit_apparatus_change" ADD CONSTRAINT "permit_apparatus_change_apparatus_id_apparatus_id_fk" FOREIGN KEY ("apparatus_id") REFERENCES "public"."apparatus"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "permit_apparatus_change" ADD CONSTRAINT "permit_apparatus_change_apparatus_revision_id_apparatus_revision_id_fk" FOREIGN KEY ("apparatus_revision_id") REFERENCES "public"."apparatus_revision"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "permit_apparatus_change" ADD CONSTRAINT "permit_apparatus_change_changed_by_id_app_user_id_fk" FOREIGN KEY ("changed_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "permit_apparatus_change_permit_idx" ON "permit_apparatus_change" USING btree ("permit_id","created_at");
--> statement-breakpoint
-- An amendment is a new application started from a permit whose apparatus changed.
ALTER TABLE "application" ADD COLUMN IF NOT EXISTS "amendment_of_permit_id" uuid;
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "application_amendment_idx" ON "application" USING btree ("amendment_of_permit_id") WHERE "application"."amendment_of_permit_id" IS NOT NULL;
--> statement-breakpoint
-- The permits that cover an apparatus, found when a revision of it is saved.
CREATE INDEX IF NOT EXISTS "application_apparatus_idx" ON "application" USING btree ("apparatus_id") WHERE "application"."apparatus_id" IS NOT NULL;
