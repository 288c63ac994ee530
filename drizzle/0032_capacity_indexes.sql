DROP INDEX "customers_firm_name_idx";--> statement-breakpoint
CREATE INDEX "jobs_finished_idx" ON "jobs" USING btree ("firm_id","updated_at","id") WHERE "jobs"."status" = 'finished';--> statement-breakpoint
CREATE INDEX "customers_firm_name_idx" ON "customers" USING btree ("firm_id","name","id");