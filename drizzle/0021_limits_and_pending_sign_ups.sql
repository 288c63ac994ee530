CREATE TABLE "limit_hits" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"attempt" uuid NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pending_sign_ups" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"firm_name" text NOT NULL,
	"password_hash" text NOT NULL,
	"token_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
DROP TABLE "sign_in_failures" CASCADE;--> statement-breakpoint
DROP TABLE "public_form_hits" CASCADE;--> statement-breakpoint
CREATE INDEX "limit_hits_key_at_idx" ON "limit_hits" USING btree ("key","at");--> statement-breakpoint
CREATE INDEX "limit_hits_at_idx" ON "limit_hits" USING btree ("at");--> statement-breakpoint
CREATE INDEX "limit_hits_attempt_idx" ON "limit_hits" USING btree ("attempt");--> statement-breakpoint
CREATE UNIQUE INDEX "pending_sign_ups_token_unique" ON "pending_sign_ups" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "pending_sign_ups_expires_idx" ON "pending_sign_ups" USING btree ("expires_at");