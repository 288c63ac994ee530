ALTER TYPE "public"."purchase_category" ADD VALUE 'labour' BEFORE 'other';--> statement-breakpoint
CREATE TABLE "cis_statements" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"tax_month_start" date NOT NULL,
	"gross_pence" integer NOT NULL,
	"materials_pence" integer DEFAULT 0 NOT NULL,
	"deduction_pence" integer NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "cis_statements_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "cis_statements_month_unique" UNIQUE("firm_id","customer_id","tax_month_start")
);
--> statement-breakpoint
ALTER TABLE "cis_statements" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "documents" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"purchase_id" uuid,
	"cis_statement_id" uuid,
	"storage_key" text NOT NULL,
	"content_type" text NOT NULL,
	"bytes" integer NOT NULL,
	"original_name" text DEFAULT '' NOT NULL,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "documents_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "documents_one_target" CHECK (num_nonnulls("documents"."purchase_id", "documents"."cis_statement_id") = 1)
);
--> statement-breakpoint
ALTER TABLE "documents" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
DROP INDEX "invoices_firm_issued_idx";--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "vat_stagger" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "vat_cash_accounting" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "cis_statements" ADD CONSTRAINT "cis_statements_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cis_statements" ADD CONSTRAINT "cis_statements_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cis_statements" ADD CONSTRAINT "cis_statements_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_purchase_fk" FOREIGN KEY ("firm_id","purchase_id") REFERENCES "public"."purchases"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_cis_statement_fk" FOREIGN KEY ("firm_id","cis_statement_id") REFERENCES "public"."cis_statements"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "documents_purchase_idx" ON "documents" USING btree ("firm_id","purchase_id");--> statement-breakpoint
CREATE INDEX "documents_cis_statement_idx" ON "documents" USING btree ("firm_id","cis_statement_id");--> statement-breakpoint
CREATE INDEX "payments_received_idx" ON "payments" USING btree ("firm_id","received_on","id");--> statement-breakpoint
CREATE INDEX "invoices_firm_issued_idx" ON "invoices" USING btree ("firm_id","issued_on","series","number");--> statement-breakpoint
CREATE POLICY "cis_statements_firm" ON "cis_statements" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "documents_firm" ON "documents" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "cis_statements" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "documents" FORCE ROW LEVEL SECURITY;
