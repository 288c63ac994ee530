CREATE TABLE "bank_rates" (
	"firm_id" uuid NOT NULL,
	"from_date" date NOT NULL,
	"rate_bp" integer NOT NULL,
	CONSTRAINT "bank_rates_firm_id_from_date_pk" PRIMARY KEY("firm_id","from_date")
);
--> statement-breakpoint
ALTER TABLE "bank_rates" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "reminder_rules" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"offset_days" integer NOT NULL,
	"subject" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "reminder_rules_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "reminder_rules_offset_unique" UNIQUE("firm_id","offset_days")
);
--> statement-breakpoint
ALTER TABLE "reminder_rules" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "chase_notes" ADD COLUMN "reminder_key" text;--> statement-breakpoint
ALTER TABLE "chase_notes" ADD COLUMN "sent_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "bank_rates" ADD CONSTRAINT "bank_rates_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_rules" ADD CONSTRAINT "reminder_rules_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chase_notes" ADD CONSTRAINT "chase_notes_reminder_unique" UNIQUE("firm_id","reminder_key");--> statement-breakpoint
CREATE POLICY "firms_job_sweep" ON "firms" AS PERMISSIVE FOR SELECT TO public USING (current_setting('app.job_sweep', true) = 'on');--> statement-breakpoint
CREATE POLICY "bank_rates_firm" ON "bank_rates" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "reminder_rules_firm" ON "reminder_rules" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "reminder_rules" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "bank_rates" FORCE ROW LEVEL SECURITY;
