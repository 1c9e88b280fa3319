ALTER TABLE "institution_settings" ADD COLUMN "permit_prefix" text DEFAULT 'HV' NOT NULL;
--> statement-breakpoint
ALTER TABLE "institution_settings" ADD CONSTRAINT "institution_settings_permit_prefix_format" CHECK ("institution_settings"."permit_prefix" ~ '^[A-Z][A-Z0-9]{0,5}$');
--> statement-breakpoint
-- Permits numbered under the product's former name (prefix AW) take the default prefix, and every
-- stored PDF is printed again on its next request, with the new name, tier glyph and signal word.
-- Verification codes and the year's sequence are unchanged, so posted QR codes keep working.
UPDATE "permit" SET "number" = 'HV' || substr("number", 3) WHERE "number" ~ '^AW-[0-9]{4}-[0-9]{4,}$';
--> statement-breakpoint
UPDATE "permit" SET "pdf_key" = NULL, "pdf_rendered_state" = NULL WHERE "pdf_key" IS NOT NULL;
