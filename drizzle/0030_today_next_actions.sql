ALTER TABLE "firms" ADD COLUMN "quote_chase_days" integer DEFAULT 7 NOT NULL;--> statement-breakpoint
CREATE INDEX "visits_booked_idx" ON "visits" USING btree ("firm_id","starts_at") WHERE "visits"."status" = 'booked';--> statement-breakpoint
CREATE INDEX "visits_done_idx" ON "visits" USING btree ("firm_id","done_at") WHERE "visits"."status" = 'done';--> statement-breakpoint
CREATE INDEX "quote_versions_open_idx" ON "quote_versions" USING btree ("firm_id","status","sent_at") WHERE "quote_versions"."status" in ('sent', 'accepted');--> statement-breakpoint
CREATE INDEX "quotes_visit_idx" ON "quotes" USING btree ("firm_id","visit_id") WHERE "quotes"."visit_id" is not null;