-- Institutional sign-in (OpenID Connect): the provider's issuer and subject identify a person for good
-- (OIDC Core 1.0 §2: "sub" is unique and never reassigned within an issuer); e-mail addresses change.
ALTER TABLE "app_user" ADD COLUMN "oidc_issuer" text;
--> statement-breakpoint
ALTER TABLE "app_user" ADD COLUMN "oidc_subject" text;
--> statement-breakpoint
ALTER TABLE "app_user" ADD CONSTRAINT "app_user_oidc_pair" CHECK (("oidc_issuer" IS NULL) = ("oidc_subject" IS NULL));
--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS "app_user_oidc_identity_key" ON "app_user" USING btree ("oidc_issuer","oidc_subject") WHERE "app_user"."oidc_subject" IS NOT NULL;
