CREATE TABLE "bank_accounts" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"csv_layout" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bank_accounts_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "bank_accounts_firm_name_unique" UNIQUE("firm_id","name")
);
--> statement-breakpoint
ALTER TABLE "bank_accounts" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "bank_lines" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"account_id" uuid NOT NULL,
	"statement_id" uuid NOT NULL,
	"posted_on" date NOT NULL,
	"description" text NOT NULL,
	"amount_pence" integer NOT NULL,
	"balance_pence" integer,
	"line_key" text NOT NULL,
	"state" text DEFAULT 'open' NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bank_lines_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "bank_lines_key_unique" UNIQUE("firm_id","account_id","line_key"),
	CONSTRAINT "bank_lines_state_check" CHECK ("bank_lines"."state" in ('open', 'matched', 'ignored'))
);
--> statement-breakpoint
ALTER TABLE "bank_lines" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "bank_matches" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"line_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"invoice_id" uuid,
	"payment_id" uuid,
	"purchase_id" uuid,
	"made" boolean DEFAULT false NOT NULL,
	"amount_pence" integer NOT NULL,
	"certainty" text NOT NULL,
	"reasons" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"confirmed_by" uuid,
	"confirmed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"undone_at" timestamp with time zone,
	CONSTRAINT "bank_matches_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "bank_matches_one_thing" CHECK (("bank_matches"."kind" = 'payment' and "bank_matches"."invoice_id" is not null and "bank_matches"."purchase_id" is null)
    or ("bank_matches"."kind" = 'purchase' and "bank_matches"."purchase_id" is not null and "bank_matches"."invoice_id" is null)
    or ("bank_matches"."kind" = 'payout' and "bank_matches"."invoice_id" is null and "bank_matches"."purchase_id" is null))
);
--> statement-breakpoint
ALTER TABLE "bank_matches" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "bank_statements" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"account_id" uuid NOT NULL,
	"file_name" text NOT NULL,
	"format" text NOT NULL,
	"lines_new" integer NOT NULL,
	"lines_already" integer NOT NULL,
	"imported_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bank_statements_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "bank_statements_format_check" CHECK ("bank_statements"."format" in ('csv', 'ofx'))
);
--> statement-breakpoint
ALTER TABLE "bank_statements" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "bank_accounts" ADD CONSTRAINT "bank_accounts_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_lines" ADD CONSTRAINT "bank_lines_account_fk" FOREIGN KEY ("firm_id","account_id") REFERENCES "public"."bank_accounts"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_lines" ADD CONSTRAINT "bank_lines_statement_fk" FOREIGN KEY ("firm_id","statement_id") REFERENCES "public"."bank_statements"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_matches" ADD CONSTRAINT "bank_matches_confirmed_by_users_id_fk" FOREIGN KEY ("confirmed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_matches" ADD CONSTRAINT "bank_matches_line_fk" FOREIGN KEY ("firm_id","line_id") REFERENCES "public"."bank_lines"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_matches" ADD CONSTRAINT "bank_matches_invoice_fk" FOREIGN KEY ("firm_id","invoice_id") REFERENCES "public"."invoices"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_matches" ADD CONSTRAINT "bank_matches_payment_fk" FOREIGN KEY ("firm_id","payment_id") REFERENCES "public"."payments"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_matches" ADD CONSTRAINT "bank_matches_purchase_fk" FOREIGN KEY ("firm_id","purchase_id") REFERENCES "public"."purchases"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_statements" ADD CONSTRAINT "bank_statements_imported_by_users_id_fk" FOREIGN KEY ("imported_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bank_statements" ADD CONSTRAINT "bank_statements_account_fk" FOREIGN KEY ("firm_id","account_id") REFERENCES "public"."bank_accounts"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "bank_lines_firm_posted_idx" ON "bank_lines" USING btree ("firm_id","posted_on","id");--> statement-breakpoint
CREATE INDEX "bank_lines_open_idx" ON "bank_lines" USING btree ("firm_id","posted_on") WHERE "bank_lines"."state" = 'open';--> statement-breakpoint
CREATE INDEX "bank_matches_line_idx" ON "bank_matches" USING btree ("firm_id","line_id");--> statement-breakpoint
CREATE INDEX "bank_matches_invoice_idx" ON "bank_matches" USING btree ("firm_id","invoice_id") WHERE "bank_matches"."invoice_id" is not null;--> statement-breakpoint
CREATE POLICY "bank_accounts_firm" ON "bank_accounts" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "bank_lines_firm" ON "bank_lines" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "bank_matches_firm" ON "bank_matches" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "bank_statements_firm" ON "bank_statements" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "bank_accounts" FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "bank_statements" FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "bank_lines" FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "bank_matches" FORCE ROW LEVEL SECURITY;
