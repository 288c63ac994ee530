CREATE TYPE "public"."day_portion" AS ENUM('day', 'half-day');--> statement-breakpoint
CREATE TYPE "public"."job_status" AS ENUM('booked', 'in-progress', 'finished', 'invoiced', 'paid', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."log_coat" AS ENUM('fill', 'tight-coat', 'first', 'second');--> statement-breakpoint
CREATE TABLE "calendar_feeds" (
	"firm_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "calendar_feeds_firm_id_user_id_pk" PRIMARY KEY("firm_id","user_id"),
	CONSTRAINT "calendar_feeds_token_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
ALTER TABLE "calendar_feeds" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "job_days" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"day" text NOT NULL,
	"user_id" uuid NOT NULL,
	"portion" "day_portion" DEFAULT 'day' NOT NULL,
	"worked" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "job_days_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "job_days_person_unique" UNIQUE("firm_id","job_id","day","user_id")
);
--> statement-breakpoint
ALTER TABLE "job_days" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "job_status_changes" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"from_status" "job_status",
	"to_status" "job_status" NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"changed_by" uuid,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "job_status_changes_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "job_status_changes" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "jobs" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"number" integer NOT NULL,
	"title" text NOT NULL,
	"customer_id" uuid NOT NULL,
	"site_id" uuid,
	"quote_id" uuid,
	"quote_version_id" uuid,
	"visit_id" uuid,
	"status" "job_status" DEFAULT 'booked' NOT NULL,
	"labour_net_pence" integer DEFAULT 0 NOT NULL,
	"materials_net_pence" integer DEFAULT 0 NOT NULL,
	"net_pence" integer DEFAULT 0 NOT NULL,
	"gross_pence" integer DEFAULT 0 NOT NULL,
	"estimated_days_x_100" integer DEFAULT 0 NOT NULL,
	"materials_estimate" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"plan_options" jsonb DEFAULT '{"people":1,"bagsPerPersonPerSet":3,"coverageM2PerBag":10}'::jsonb NOT NULL,
	"plan_moves" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "jobs_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "jobs_firm_number_unique" UNIQUE("firm_id","number"),
	CONSTRAINT "jobs_quote_unique" UNIQUE("firm_id","quote_id")
);
--> statement-breakpoint
ALTER TABLE "jobs" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "material_uses" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"log_id" uuid NOT NULL,
	"material_id" uuid NOT NULL,
	"packs_x_1000" integer NOT NULL,
	"cost_pence_per_pack" integer NOT NULL,
	CONSTRAINT "material_uses_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "material_uses" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "set_logs" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"kind" text DEFAULT 'set' NOT NULL,
	"set_number" integer,
	"started_at" timestamp with time zone,
	"ended_at" timestamp with time zone,
	"coat" "log_coat",
	"surface_ids" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"user_ids" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"cold_or_damp" boolean DEFAULT false NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"logged_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "set_logs_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "set_logs" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "dry_skim_days" integer DEFAULT 7 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "dry_undercoat_days" integer DEFAULT 14 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "dry_cold_or_damp_extra_days" integer DEFAULT 7 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "corner_trowel_mm" integer DEFAULT 100 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "out_of_true_tolerance_mm" integer DEFAULT 10 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "bags_per_person_per_set" integer DEFAULT 3 NOT NULL;--> statement-breakpoint
ALTER TABLE "calendar_feeds" ADD CONSTRAINT "calendar_feeds_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calendar_feeds" ADD CONSTRAINT "calendar_feeds_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_days" ADD CONSTRAINT "job_days_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_days" ADD CONSTRAINT "job_days_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_status_changes" ADD CONSTRAINT "job_status_changes_changed_by_users_id_fk" FOREIGN KEY ("changed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_status_changes" ADD CONSTRAINT "job_status_changes_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_site_fk" FOREIGN KEY ("firm_id","site_id") REFERENCES "public"."sites"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_quote_fk" FOREIGN KEY ("firm_id","quote_id") REFERENCES "public"."quotes"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_quote_version_fk" FOREIGN KEY ("firm_id","quote_version_id") REFERENCES "public"."quote_versions"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_visit_fk" FOREIGN KEY ("firm_id","visit_id") REFERENCES "public"."visits"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "material_uses" ADD CONSTRAINT "material_uses_log_fk" FOREIGN KEY ("firm_id","log_id") REFERENCES "public"."set_logs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "material_uses" ADD CONSTRAINT "material_uses_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "material_uses" ADD CONSTRAINT "material_uses_material_fk" FOREIGN KEY ("firm_id","material_id") REFERENCES "public"."materials"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_logs" ADD CONSTRAINT "set_logs_logged_by_users_id_fk" FOREIGN KEY ("logged_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_logs" ADD CONSTRAINT "set_logs_job_fk" FOREIGN KEY ("firm_id","job_id") REFERENCES "public"."jobs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "job_days_firm_day_idx" ON "job_days" USING btree ("firm_id","day");--> statement-breakpoint
CREATE INDEX "job_days_user_idx" ON "job_days" USING btree ("firm_id","user_id","day");--> statement-breakpoint
CREATE INDEX "job_status_changes_job_idx" ON "job_status_changes" USING btree ("firm_id","job_id");--> statement-breakpoint
CREATE INDEX "jobs_firm_status_idx" ON "jobs" USING btree ("firm_id","status");--> statement-breakpoint
CREATE INDEX "material_uses_job_idx" ON "material_uses" USING btree ("firm_id","job_id");--> statement-breakpoint
CREATE INDEX "set_logs_job_idx" ON "set_logs" USING btree ("firm_id","job_id");--> statement-breakpoint
CREATE POLICY "calendar_feeds_by_token" ON "calendar_feeds" AS PERMISSIVE FOR SELECT TO public USING (token_hash = nullif(current_setting('app.calendar_token_hash', true), ''));--> statement-breakpoint
CREATE POLICY "calendar_feeds_firm" ON "calendar_feeds" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "job_days_firm" ON "job_days" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "job_status_changes_firm" ON "job_status_changes" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "jobs_firm" ON "jobs" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "material_uses_firm" ON "material_uses" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "set_logs_firm" ON "set_logs" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());