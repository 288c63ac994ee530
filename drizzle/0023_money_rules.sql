ALTER TABLE "invoice_lines" ADD COLUMN "extra_work" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "request_id" uuid;--> statement-breakpoint
CREATE UNIQUE INDEX "quote_versions_one_accepted" ON "quote_versions" USING btree ("firm_id","quote_id") WHERE "quote_versions"."status" = 'accepted';--> statement-breakpoint
CREATE UNIQUE INDEX "invoices_firm_reference_unique" ON "invoices" USING btree ("firm_id","reference") WHERE "invoices"."reference" is not null;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_request_unique" UNIQUE("firm_id","request_id");