ALTER TABLE "permit" ADD COLUMN "validity_reason" text;
--> statement-breakpoint
ALTER TABLE "decision" ADD COLUMN "valid_from" date;
--> statement-breakpoint
ALTER TABLE "decision" ADD COLUMN "valid_to" date;
--> statement-breakpoint
ALTER TABLE "decision" ADD COLUMN "validity_reason" text;
