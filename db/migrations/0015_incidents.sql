-- Incident and near-miss reports (issue 17, item 3). Anyone signed in reports one; safety officers
-- move it open → investigating → closed with findings and actions. A report may name the permit and
-- the apparatus it concerns; photos are stored through lib/storage like application attachments.
CREATE TABLE "incident" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seq" bigint GENERATED ALWAYS AS IDENTITY (sequence name "incident_seq_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"kind" text NOT NULL,
	"summary" text NOT NULL,
	"description" text NOT NULL,
	"occurred_at" timestamp with time zone NOT NULL,
	"location" text NOT NULL,
	"injuries" boolean NOT NULL,
	"injury_note" text DEFAULT '' NOT NULL,
	"permit_id" uuid,
	"apparatus_id" uuid,
	"reporter_id" uuid NOT NULL,
	"state" text DEFAULT 'open' NOT NULL,
	"findings" text DEFAULT '' NOT NULL,
	"actions" text DEFAULT '' NOT NULL,
	"triaged_by_id" uuid,
	"closed_at" timestamp with time zone,
	"permit_revoked_at" timestamp with time zone,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "incident_seq_key" UNIQUE("seq"),
	CONSTRAINT "incident_kind_check" CHECK ("incident"."kind" IN ('incident', 'near_miss')),
	CONSTRAINT "incident_state_check" CHECK ("incident"."state" IN ('open', 'investigating', 'closed'))
);
--> statement-breakpoint
ALTER TABLE "incident" ADD CONSTRAINT "incident_permit_id_permit_id_fk" FOREIGN KEY ("permit_id") REFERENCES "public"."permit"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "incident" ADD CONSTRAINT "incident_apparatus_id_apparatus_id_fk" FOREIGN KEY ("apparatus_id") REFERENCES "public"."apparatus"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "incident" ADD CONSTRAINT "incident_reporter_id_app_user_id_fk" FOREIGN KEY ("reporter_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "incident" ADD CONSTRAINT "incident_triaged_by_id_app_user_id_fk" FOREIGN KEY ("triaged_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "incident_permit_idx" ON "incident" USING btree ("permit_id","occurred_at");
--> statement-breakpoint
CREATE INDEX "incident_apparatus_idx" ON "incident" USING btree ("apparatus_id","occurred_at");
--> statement-breakpoint
CREATE INDEX "incident_reporter_idx" ON "incident" USING btree ("reporter_id","occurred_at");
--> statement-breakpoint
-- The committee report counts reports per month; the list reads the newest first.
CREATE INDEX "incident_occurred_idx" ON "incident" USING btree ("occurred_at","id");
--> statement-breakpoint
CREATE TABLE "incident_photo" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"incident_id" uuid NOT NULL,
	"storage_key" text NOT NULL,
	"filename" text NOT NULL,
	"content_type" text NOT NULL,
	"size_b" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "incident_photo_storage_key_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
ALTER TABLE "incident_photo" ADD CONSTRAINT "incident_photo_incident_id_incident_id_fk" FOREIGN KEY ("incident_id") REFERENCES "public"."incident"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
ALTER TABLE "incident_photo" ADD CONSTRAINT "incident_photo_uploaded_by_id_app_user_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;
--> statement-breakpoint
CREATE INDEX "incident_photo_incident_idx" ON "incident_photo" USING btree ("incident_id","created_at");
