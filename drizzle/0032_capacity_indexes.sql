DROP INDEX "customers_firm_name_idx";--> statement-breakpoint
DROP INDEX "invoices_owing_idx";--> statement-breakpoint
CREATE INDEX "jobs_finished_idx" ON "jobs" USING btree ("firm_id","updated_at","id") WHERE "jobs"."status" = 'finished';--> statement-breakpoint
CREATE INDEX "customers_firm_name_idx" ON "customers" USING btree ("firm_id","name","id");--> statement-breakpoint
CREATE INDEX "invoices_owing_idx" ON "invoices" USING btree ("firm_id","due_on","number","customer_id","amount_due_pence","settled_pence") WHERE "invoices"."issued_on" is not null and "invoices"."kind" <> 'credit-note' and "invoices"."amount_due_pence" > "invoices"."settled_pence";