DROP INDEX "invoices_owing_idx";--> statement-breakpoint
ALTER TABLE "jobs" ADD COLUMN "finished" boolean GENERATED ALWAYS AS (status = 'finished') STORED NOT NULL;--> statement-breakpoint
ALTER TABLE "invoices" ADD COLUMN "owing" boolean GENERATED ALWAYS AS (issued_on is not null and kind <> 'credit-note' and amount_due_pence > settled_pence) STORED NOT NULL;--> statement-breakpoint
CREATE INDEX "jobs_finished_idx" ON "jobs" USING btree ("firm_id","updated_at","id") WHERE "jobs"."finished";--> statement-breakpoint
CREATE INDEX "invoices_owing_idx" ON "invoices" USING btree ("firm_id","due_on","number") WHERE "invoices"."owing";