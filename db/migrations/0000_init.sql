CREATE TYPE "public"."role" AS ENUM('instructor', 'reviewer', 'safety_officer', 'admin');--> statement-breakpoint
CREATE TYPE "public"."application_state" AS ENUM('draft', 'submitted', 'in_review', 'returned', 'approved', 'rejected', 'withdrawn');--> statement-breakpoint
CREATE TYPE "public"."decision_kind" AS ENUM('recommend', 'return', 'approve', 'reject', 'revoke');--> statement-breakpoint
CREATE TYPE "public"."permit_state" AS ENUM('active', 'expired', 'revoked');--> statement-breakpoint
CREATE TABLE "department" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"code" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "department_name_unique" UNIQUE("name"),
	CONSTRAINT "department_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "app_user" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text,
	"roles" "role"[] DEFAULT '{instructor}'::role[] NOT NULL,
	"department_id" uuid,
	"session_version" integer DEFAULT 1 NOT NULL,
	"disabled_at" timestamp with time zone,
	"last_sign_in_at" timestamp with time zone,
	"calendar_token" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "app_user_calendarToken_unique" UNIQUE("calendar_token"),
	CONSTRAINT "app_user_roles_not_empty" CHECK (cardinality("app_user"."roles") > 0)
);
--> statement-breakpoint
CREATE TABLE "invitation" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"token_hash" text NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"roles" "role"[] NOT NULL,
	"department_id" uuid,
	"invited_by_id" uuid NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invitation_tokenHash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "sign_in_attempt" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "sign_in_attempt_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"email" text NOT NULL,
	"ip" text NOT NULL,
	"succeeded" boolean NOT NULL,
	"attempted_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_event" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "audit_event_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"occurred_at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" uuid,
	"actor_name" text NOT NULL,
	"action" text NOT NULL,
	"entity_type" text NOT NULL,
	"entity_id" text NOT NULL,
	"data" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mail_outbox" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "mail_outbox_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"kind" text NOT NULL,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"data" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"dedupe_key" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_outbox_dedupeKey_unique" UNIQUE("dedupe_key")
);
--> statement-breakpoint
CREATE TABLE "institution_settings" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"name" text NOT NULL,
	"time_zone" text DEFAULT 'UTC' NOT NULL,
	"emergency_contacts" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "institution_settings_single_row" CHECK ("institution_settings"."id" = 1)
);
--> statement-breakpoint
CREATE TABLE "apparatus" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"room" text NOT NULL,
	"department_id" uuid NOT NULL,
	"owner_id" uuid NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"current_revision" integer DEFAULT 1 NOT NULL,
	"tier" smallint NOT NULL,
	"energy_j" double precision NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "apparatus_tier_range" CHECK ("apparatus"."tier" BETWEEN 0 AND 4)
);
--> statement-breakpoint
CREATE TABLE "apparatus_revision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"apparatus_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"name" text NOT NULL,
	"room" text NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"setup" jsonb NOT NULL,
	"assessment" jsonb NOT NULL,
	"tier" smallint NOT NULL,
	"created_by_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "apparatus_revision_number_key" UNIQUE("apparatus_id","revision")
);
--> statement-breakpoint
CREATE TABLE "application_revision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"application_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"content" jsonb NOT NULL,
	"assessment" jsonb NOT NULL,
	"tier" smallint NOT NULL,
	"content_hash" text NOT NULL,
	"submitted_by_id" uuid NOT NULL,
	"submitted_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "application_revision_number_key" UNIQUE("application_id","revision")
);
--> statement-breakpoint
CREATE TABLE "application" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seq" bigint GENERATED ALWAYS AS IDENTITY (sequence name "application_seq_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"title" text DEFAULT '' NOT NULL,
	"applicant_id" uuid NOT NULL,
	"department_id" uuid NOT NULL,
	"state" "application_state" DEFAULT 'draft' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"draft" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"draft_step" smallint DEFAULT 1 NOT NULL,
	"named_user_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"apparatus_id" uuid,
	"apparatus_revision_id" uuid,
	"tier" smallint,
	"current_revision_id" uuid,
	"chain_rules_version" integer,
	"chain_step" smallint DEFAULT 0 NOT NULL,
	"submitted_at" timestamp with time zone,
	"waiting_since" timestamp with time zone,
	"decided_at" timestamp with time zone,
	"duplicated_from_id" uuid,
	"renewal_of_permit_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "application_seq_key" UNIQUE("seq"),
	CONSTRAINT "application_tier_range" CHECK ("application"."tier" IS NULL OR "application"."tier" BETWEEN 0 AND 4)
);
--> statement-breakpoint
CREATE TABLE "attachment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"application_id" uuid NOT NULL,
	"storage_key" text NOT NULL,
	"filename" text NOT NULL,
	"content_type" text NOT NULL,
	"size_b" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by_id" uuid NOT NULL,
	"removed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "attachment_storageKey_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
CREATE TABLE "decision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"application_id" uuid NOT NULL,
	"revision_id" uuid NOT NULL,
	"kind" "decision_kind" NOT NULL,
	"step" smallint,
	"signer_id" uuid NOT NULL,
	"signer_name" text NOT NULL,
	"signer_role" text NOT NULL,
	"meaning" text NOT NULL,
	"content_hash" text NOT NULL,
	"comment" text,
	"pinned_to" text,
	"conditions" jsonb,
	"signed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "decision_revision_step_key" UNIQUE("revision_id","step")
);
--> statement-breakpoint
CREATE TABLE "rule_set" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"version" integer NOT NULL,
	"rules" jsonb NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rule_set_kind_version_key" UNIQUE("kind","version")
);
--> statement-breakpoint
CREATE TABLE "permit_counter" (
	"year" smallint PRIMARY KEY NOT NULL,
	"last" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "permit" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" text NOT NULL,
	"year" smallint NOT NULL,
	"seq" integer NOT NULL,
	"application_id" uuid NOT NULL,
	"revision_id" uuid NOT NULL,
	"holder_id" uuid NOT NULL,
	"state" "permit_state" DEFAULT 'active' NOT NULL,
	"tier" smallint NOT NULL,
	"valid_from" date NOT NULL,
	"valid_to" date NOT NULL,
	"conditions" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"verification_code" text NOT NULL,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone,
	"revoked_by_id" uuid,
	"revoked_reason" text,
	"renewed_by_application_id" uuid,
	"pdf_key" text,
	"pdf_rendered_state" "permit_state",
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "permit_number_unique" UNIQUE("number"),
	CONSTRAINT "permit_applicationId_unique" UNIQUE("application_id"),
	CONSTRAINT "permit_verificationCode_unique" UNIQUE("verification_code"),
	CONSTRAINT "permit_year_seq_key" UNIQUE("year","seq"),
	CONSTRAINT "permit_window" CHECK ("permit"."valid_from" <= "permit"."valid_to")
);
--> statement-breakpoint
ALTER TABLE "app_user" ADD CONSTRAINT "app_user_department_id_department_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."department"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_department_id_department_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."department"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_invited_by_id_app_user_id_fk" FOREIGN KEY ("invited_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_event" ADD CONSTRAINT "audit_event_actor_id_app_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "apparatus" ADD CONSTRAINT "apparatus_department_id_department_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."department"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "apparatus" ADD CONSTRAINT "apparatus_owner_id_app_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "apparatus_revision" ADD CONSTRAINT "apparatus_revision_apparatus_id_apparatus_id_fk" FOREIGN KEY ("apparatus_id") REFERENCES "public"."apparatus"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "apparatus_revision" ADD CONSTRAINT "apparatus_revision_created_by_id_app_user_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application_revision" ADD CONSTRAINT "application_revision_application_id_application_id_fk" FOREIGN KEY ("application_id") REFERENCES "public"."application"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application_revision" ADD CONSTRAINT "application_revision_submitted_by_id_app_user_id_fk" FOREIGN KEY ("submitted_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application" ADD CONSTRAINT "application_applicant_id_app_user_id_fk" FOREIGN KEY ("applicant_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application" ADD CONSTRAINT "application_department_id_department_id_fk" FOREIGN KEY ("department_id") REFERENCES "public"."department"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application" ADD CONSTRAINT "application_apparatus_id_apparatus_id_fk" FOREIGN KEY ("apparatus_id") REFERENCES "public"."apparatus"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "application" ADD CONSTRAINT "application_apparatus_revision_id_apparatus_revision_id_fk" FOREIGN KEY ("apparatus_revision_id") REFERENCES "public"."apparatus_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_application_id_application_id_fk" FOREIGN KEY ("application_id") REFERENCES "public"."application"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_uploaded_by_id_app_user_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_application_id_application_id_fk" FOREIGN KEY ("application_id") REFERENCES "public"."application"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_revision_id_application_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."application_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_signer_id_app_user_id_fk" FOREIGN KEY ("signer_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rule_set" ADD CONSTRAINT "rule_set_created_by_id_app_user_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "permit" ADD CONSTRAINT "permit_application_id_application_id_fk" FOREIGN KEY ("application_id") REFERENCES "public"."application"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "permit" ADD CONSTRAINT "permit_revision_id_application_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."application_revision"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "permit" ADD CONSTRAINT "permit_holder_id_app_user_id_fk" FOREIGN KEY ("holder_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "permit" ADD CONSTRAINT "permit_revoked_by_id_app_user_id_fk" FOREIGN KEY ("revoked_by_id") REFERENCES "public"."app_user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "app_user_email_key" ON "app_user" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "app_user_department_idx" ON "app_user" USING btree ("department_id");--> statement-breakpoint
CREATE INDEX "invitation_email_idx" ON "invitation" USING btree ("email");--> statement-breakpoint
CREATE INDEX "sign_in_attempt_email_idx" ON "sign_in_attempt" USING btree ("email","attempted_at");--> statement-breakpoint
CREATE INDEX "sign_in_attempt_ip_idx" ON "sign_in_attempt" USING btree ("ip","attempted_at");--> statement-breakpoint
CREATE INDEX "audit_event_entity_idx" ON "audit_event" USING btree ("entity_type","entity_id","occurred_at");--> statement-breakpoint
CREATE INDEX "audit_event_actor_idx" ON "audit_event" USING btree ("actor_id","occurred_at");--> statement-breakpoint
CREATE INDEX "mail_outbox_status_idx" ON "mail_outbox" USING btree ("status","created_at");--> statement-breakpoint
CREATE INDEX "apparatus_department_idx" ON "apparatus" USING btree ("department_id");--> statement-breakpoint
CREATE INDEX "apparatus_name_idx" ON "apparatus" USING btree (lower("name"));--> statement-breakpoint
CREATE INDEX "application_applicant_idx" ON "application" USING btree ("applicant_id","updated_at");--> statement-breakpoint
CREATE INDEX "application_queue_idx" ON "application" USING btree ("state","waiting_since");--> statement-breakpoint
CREATE INDEX "application_department_idx" ON "application" USING btree ("department_id","state");--> statement-breakpoint
CREATE INDEX "attachment_application_idx" ON "attachment" USING btree ("application_id");--> statement-breakpoint
CREATE INDEX "decision_application_idx" ON "decision" USING btree ("application_id","signed_at");--> statement-breakpoint
CREATE INDEX "permit_holder_idx" ON "permit" USING btree ("holder_id");--> statement-breakpoint
CREATE INDEX "permit_valid_to_idx" ON "permit" USING btree ("state","valid_to");