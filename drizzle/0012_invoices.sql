CREATE TYPE "public"."invoice_kind" AS ENUM('deposit', 'stage', 'final', 'blank', 'credit-note');--> statement-breakpoint
CREATE TYPE "public"."payment_method" AS ENUM('card', 'transfer', 'cash', 'cheque');--> statement-breakpoint
CREATE TABLE "chase_notes" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"invoice_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"promised_on" date,
	"by_user_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "chase_notes_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "chase_notes" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "invoice_lines" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"invoice_id" uuid NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"kind" "line_kind" NOT NULL,
	"description" text NOT NULL,
	"quantity_x_1000" integer NOT NULL,
	"unit" text NOT NULL,
	"unit_pence" integer NOT NULL,
	"vat_rate_percent" integer DEFAULT 20 NOT NULL,
	CONSTRAINT "invoice_lines_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "invoice_lines" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "invoices" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"kind" "invoice_kind" NOT NULL,
	"series" text DEFAULT 'invoice' NOT NULL,
	"number" integer,
	"reference" text,
	"customer_id" uuid NOT NULL,
	"site_id" uuid,
	"job_id" uuid,
	"credits_invoice_id" uuid,
	"vat" "vat_treatment" NOT NULL,
	"vat_reason" text DEFAULT '' NOT NULL,
	"cis_rate_percent" integer,
	"issued_on" date,
	"due_on" date,
	"totals" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"amount_due_pence" integer DEFAULT 0 NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"token_hash" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invoices_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "invoices_firm_number_unique" UNIQUE("firm_id","series","number"),
	CONSTRAINT "invoices_token_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
ALTER TABLE "invoices" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "payments" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"invoice_id" uuid NOT NULL,
	"method" "payment_method" NOT NULL,
	"amount_pence" integer NOT NULL,
	"received_on" date NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"stripe_payment_intent_id" text,
	"stripe_refund_id" text,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payments_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "payments_intent_unique" UNIQUE("firm_id","stripe_payment_intent_id"),
	CONSTRAINT "payments_refund_unique" UNIQUE("firm_id","stripe_refund_id")
);
--> statement-breakpoint
ALTER TABLE "payments" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "stripe_events" (
	"firm_id" uuid NOT NULL,
	"event_id" text NOT NULL,
	"type" text NOT NULL,
	"outcome" text DEFAULT '' NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stripe_events_firm_id_event_id_pk" PRIMARY KEY("firm_id","event_id")
);
--> statement-breakpoint
ALTER TABLE "stripe_events" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "credit_note_numbering" text DEFAULT 'own' NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "credit_note_prefix" text DEFAULT 'CN-' NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "bank_details" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "chase_notes" ADD CONSTRAINT "chase_notes_by_user_id_users_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chase_notes" ADD CONSTRAINT "chase_notes_invoice_fk" FOREIGN KEY ("firm_id","invoice_id") REFERENCES "public"."invoices"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice_lines" ADD CONSTRAINT "invoice_lines_invoice_fk" FOREIGN KEY ("firm_id","invoice_id") REFERENCES "public"."invoices"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_site_fk" FOREIGN KEY ("firm_id","site_id") REFERENCES "public"."sites"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_credits_fk" FOREIGN KEY ("firm_id","credits_invoice_id") REFERENCES "public"."invoices"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_invoice_fk" FOREIGN KEY ("firm_id","invoice_id") REFERENCES "public"."invoices"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stripe_events" ADD CONSTRAINT "stripe_events_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "chase_notes_invoice_idx" ON "chase_notes" USING btree ("firm_id","invoice_id");--> statement-breakpoint
CREATE INDEX "invoice_lines_invoice_idx" ON "invoice_lines" USING btree ("firm_id","invoice_id","position");--> statement-breakpoint
CREATE INDEX "invoices_firm_issued_idx" ON "invoices" USING btree ("firm_id","issued_on");--> statement-breakpoint
CREATE INDEX "invoices_job_idx" ON "invoices" USING btree ("firm_id","job_id");--> statement-breakpoint
CREATE INDEX "payments_invoice_idx" ON "payments" USING btree ("firm_id","invoice_id");--> statement-breakpoint
CREATE POLICY "chase_notes_firm" ON "chase_notes" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "invoice_lines_firm" ON "invoice_lines" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "invoices_by_token" ON "invoices" AS PERMISSIVE FOR SELECT TO public USING (token_hash = nullif(current_setting('app.invoice_token_hash', true), ''));--> statement-breakpoint
CREATE POLICY "invoices_firm" ON "invoices" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "payments_firm" ON "payments" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "stripe_events_firm" ON "stripe_events" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "invoices" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "invoice_lines" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "payments" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "stripe_events" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "chase_notes" FORCE ROW LEVEL SECURITY;
