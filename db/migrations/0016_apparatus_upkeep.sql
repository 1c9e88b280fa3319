-- Apparatus upkeep (issue 17, item 5): inspection and maintenance records on an apparatus, an
-- inspection interval with a reminder when it is due, and retiring an apparatus (kept for the record,
-- no longer offered for new applications).
ALTER TABLE "apparatus" ADD COLUMN "inspection_interval_days" integer;
--> statement-breakpoint
ALTER TABLE "apparatus" ADD COLUMN "retired_at" timestamp with time zone;
--> statement-breakpoint
ALTER TABLE "apparatus" ADD COLUMN "retired_by_id" uuid;
--> statement-breakpoint
ALTER TABLE "apparatus" ADD COLUMN "retired_reason" text;
--> statement-breakpoint
ALTER TABLE "apparatus" ADD CONSTRAINT "apparatus_retired_by_id_app_user_id_fk" FOREIGN KEY ("retired_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "apparatus" ADD CONSTRAINT "apparatus_inspection_interval_range" CHECK ("apparatus"."inspection_interval_days" IS NULL OR "apparatus"."inspection_interval_days" BETWEEN 1 AND 3660);
--> statement-breakpoint
CREATE TABLE "apparatus_inspection" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"apparatus_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"inspected_on" date NOT NULL,
	"inspected_by" text NOT NULL,
	"result" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"photo_key" text,
	"photo_filename" text,
	"photo_content_type" text,
	"photo_size_b" integer,
	"photo_sha256" text,
	"recorded_by_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "apparatus_inspection_photo_key_unique" UNIQUE("photo_key"),
	CONSTRAINT "apparatus_inspection_kind_check" CHECK ("apparatus_inspection"."kind" IN ('bleeder', 'jars_insulation', 'grounding_hook', 'maintenance')),
	CONSTRAINT "apparatus_inspection_result_check" CHECK ("apparatus_inspection"."result" IN ('pass', 'fail', 'repaired'))
);
--> statement-breakpoint
ALTER TABLE "apparatus_inspection" ADD CONSTRAINT "apparatus_inspection_apparatus_id_apparatus_id_fk" FOREIGN KEY ("apparatus_id") REFERENCES "public"."apparatus"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "apparatus_inspection" ADD CONSTRAINT "apparatus_inspection_recorded_by_id_app_user_id_fk" FOREIGN KEY ("recorded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "apparatus_inspection_apparatus_idx" ON "apparatus_inspection" USING btree ("apparatus_id","inspected_on");
--> statement-breakpoint
-- The daily job looks for apparatus with an interval that are not retired.
CREATE INDEX "apparatus_inspection_due_idx" ON "apparatus" USING btree ("id") WHERE "apparatus"."inspection_interval_days" IS NOT NULL AND "apparatus"."retired_at" IS NULL;
