DROP INDEX "customers_firm_name_idx";--> statement-breakpoint
DROP INDEX "invoices_owing_idx";--> statement-breakpoint
CREATE INDEX "customers_firm_name_idx" ON "customers" USING btree ("firm_id","name","id");--> statement-breakpoint
CREATE INDEX "invoices_owing_idx" ON "invoices" USING btree ("firm_id","due_on","number") WHERE "invoices"."issued_on" is not null and "invoices"."amount_due_pence" > "invoices"."settled_pence";