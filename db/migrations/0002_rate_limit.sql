CREATE TABLE "rate_limit_counter" (
	"key" text NOT NULL,
	"window_start" timestamp with time zone NOT NULL,
	"hits" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "rate_limit_counter_pkey" PRIMARY KEY("key","window_start")
);
--> statement-breakpoint
CREATE INDEX "rate_limit_counter_window_idx" ON "rate_limit_counter" USING btree ("window_start");