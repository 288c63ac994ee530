ALTER TABLE "visits" ADD COLUMN "done_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "visits" ADD COLUMN "cancel_reason" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "set_logs" ADD COLUMN "tasks" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "set_logs" ADD COLUMN "client_id" uuid;--> statement-breakpoint
ALTER TABLE "set_logs" ADD CONSTRAINT "set_logs_client_unique" UNIQUE("firm_id","client_id");