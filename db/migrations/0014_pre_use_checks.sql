CREATE TABLE "pre_use_check" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"permit_id" uuid NOT NULL,
	"recorded_by_id" uuid NOT NULL,
	"recorded_by_name" text NOT NULL,
	"idempotency_key" uuid NOT NULL,
	"items" jsonb NOT NULL,
	"any_no" boolean NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"checked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "pre_use_check_idempotency_key" UNIQUE("recorded_by_id","idempotency_key"),
	CONSTRAINT "pre_use_check_items_array" CHECK (jsonb_typeof("pre_use_check"."items") = 'array')
);
--> statement-breakpoint
CREATE TABLE "pre_use_check_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"permit_id" uuid NOT NULL,
	"uploaded_by_id" uuid NOT NULL,
	"storage_key" text NOT NULL,
	"content_type" text NOT NULL,
	"size_b" integer NOT NULL,
	"sha256" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "pre_use_check_photo_storageKey_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
ALTER TABLE "pre_use_check" ADD CONSTRAINT "pre_use_check_permit_id_permit_id_fk" FOREIGN KEY ("permit_id") REFERENCES "public"."permit"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "pre_use_check" ADD CONSTRAINT "pre_use_check_recorded_by_id_app_user_id_fk" FOREIGN KEY ("recorded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "pre_use_check_photo" ADD CONSTRAINT "pre_use_check_photo_permit_id_permit_id_fk" FOREIGN KEY ("permit_id") REFERENCES "public"."permit"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "pre_use_check_photo" ADD CONSTRAINT "pre_use_check_photo_uploaded_by_id_app_user_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "pre_use_check_permit_idx" ON "pre_use_check" USING btree ("permit_id","checked_at" DESC NULLS LAST);
--> statement-breakpoint
CREATE INDEX "pre_use_check_photo_permit_idx" ON "pre_use_check_photo" USING btree ("permit_id");
--> statement-breakpoint
-- A recorded check is a record: the app's role may add and read checks, never change or remove one.
REVOKE UPDATE, DELETE, TRUNCATE ON "pre_use_check" FROM benchclear_app;
