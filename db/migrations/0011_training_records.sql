-- Training records (issue 17, item 1): course types the admins define, the courses people completed,
-- and the signed exceptions an approver records when a named operator's training is lapsed or missing.
CREATE TABLE "course_type" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"covers" text DEFAULT '' NOT NULL,
	"validity_months" smallint NOT NULL,
	"min_tier" smallint NOT NULL,
	"department_id" uuid,
	"retired_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "course_type_name_key" UNIQUE("name"),
	CONSTRAINT "course_type_validity_range" CHECK ("course_type"."validity_months" BETWEEN 1 AND 240),
	CONSTRAINT "course_type_tier_range" CHECK ("course_type"."min_tier" BETWEEN 1 AND 4)
);
--> statement-breakpoint
CREATE TABLE "training_record" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"course_type_id" uuid NOT NULL,
	"completed_on" date NOT NULL,
	"trainer" text NOT NULL,
	"certificate_key" text,
	"certificate_filename" text,
	"certificate_content_type" text,
	"certificate_size_b" integer,
	"certificate_sha256" text,
	"recorded_by_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"removed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "training_exception" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"application_id" uuid NOT NULL,
	"revision_id" uuid NOT NULL,
	"through_day" date NOT NULL,
	"gaps" jsonb NOT NULL,
	"reason" text NOT NULL,
	"signer_id" uuid NOT NULL,
	"signer_name" text NOT NULL,
	"signer_role" text NOT NULL,
	"meaning" text NOT NULL,
	"content_hash" text NOT NULL,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"hmac" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "course_type" ADD CONSTRAINT "course_type_department_id_department_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."department"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_record" ADD CONSTRAINT "training_record_user_id_app_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_record" ADD CONSTRAINT "training_record_course_type_id_course_type_id_fk" FOREIGN KEY ("course_type_id") REFERENCES "public"."course_type"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_record" ADD CONSTRAINT "training_record_recorded_by_id_app_user_id_fk" FOREIGN KEY ("recorded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_exception" ADD CONSTRAINT "training_exception_application_id_application_id_fk" FOREIGN KEY ("application_id") REFERENCES "public"."application"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_exception" ADD CONSTRAINT "training_exception_revision_id_application_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."application_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "training_exception" ADD CONSTRAINT "training_exception_signer_id_app_user_id_fk" FOREIGN KEY ("signer_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "training_record_user_course_idx" ON "training_record" USING btree ("user_id","course_type_id","completed_on");--> statement-breakpoint
CREATE INDEX "training_exception_revision_idx" ON "training_exception" USING btree ("revision_id");--> statement-breakpoint
-- A signed exception is kept like a decision: the app may add one, never change or delete it.
REVOKE UPDATE, DELETE, TRUNCATE, REFERENCES, TRIGGER ON "training_exception" FROM benchclear_app;
