CREATE TYPE "public"."purchase_category" AS ENUM('materials', 'tools', 'fuel', 'vehicle', 'other');--> statement-breakpoint
CREATE TABLE "purchase_jobs" (
	"firm_id" uuid NOT NULL,
	"purchase_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"net_pence" integer NOT NULL,
	CONSTRAINT "purchase_jobs_firm_id_purchase_id_job_id_pk" PRIMARY KEY("firm_id","purchase_id","job_id")
);
--> statement-breakpoint
ALTER TABLE "purchase_jobs" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "purchases" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"supplier" text NOT NULL,
	"bought_on" date NOT NULL,
	"category" "purchase_category" NOT NULL,
	"net_pence" integer NOT NULL,
	"vat_pence" integer DEFAULT 0 NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "purchases_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "purchases" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "purchase_jobs" ADD CONSTRAINT "purchase_jobs_purchase_fk" FOREIGN KEY ("firm_id","purchase_id") REFERENCES "public"."purchases"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_jobs" ADD CONSTRAINT "purchase_jobs_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchases" ADD CONSTRAINT "purchases_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchases" ADD CONSTRAINT "purchases_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "purchase_jobs_job_idx" ON "purchase_jobs" USING btree ("firm_id","job_id");--> statement-breakpoint
CREATE INDEX "purchases_firm_date_idx" ON "purchases" USING btree ("firm_id","bought_on");--> statement-breakpoint
CREATE POLICY "purchase_jobs_firm" ON "purchase_jobs" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "purchases_firm" ON "purchases" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "purchases" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "purchase_jobs" FORCE ROW LEVEL SECURITY;
