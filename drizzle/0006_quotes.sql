CREATE TYPE "public"."line_kind" AS ENUM('labour', 'materials');--> statement-breakpoint
CREATE TYPE "public"."material_type" AS ENUM('finish', 'bonding-undercoat', 'browning', 'bead', 'scrim', 'bonding-agent', 'other');--> statement-breakpoint
CREATE TYPE "public"."quote_pricing" AS ENUM('measure', 'days', 'fixed');--> statement-breakpoint
CREATE TYPE "public"."quote_status" AS ENUM('draft', 'sent', 'accepted', 'declined', 'superseded');--> statement-breakpoint
CREATE TYPE "public"."vat_treatment" AS ENUM('standard', 'reverse-charge', 'not-registered');--> statement-breakpoint
CREATE TABLE "materials" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"key" text NOT NULL,
	"type" "material_type" NOT NULL,
	"name" text NOT NULL,
	"pack_label" text NOT NULL,
	"coverage_cm2_per_pack" integer,
	"at_thickness_mm" integer,
	"coverage_mm_per_pack" integer,
	"cost_pence" integer NOT NULL,
	"supplier" text DEFAULT '' NOT NULL,
	"source" text DEFAULT '' NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "materials_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "materials_firm_key_unique" UNIQUE("firm_id","key")
);
--> statement-breakpoint
ALTER TABLE "materials" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "price_books" (
	"firm_id" uuid PRIMARY KEY NOT NULL,
	"skim_walls_per_m_2_pence" integer DEFAULT 0 NOT NULL,
	"skim_ceilings_per_m_2_pence" integer DEFAULT 0 NOT NULL,
	"undercoat_per_m_2_pence" integer DEFAULT 0 NOT NULL,
	"reveals_per_lm_pence" integer DEFAULT 0 NOT NULL,
	"beads_per_lm_pence" integer DEFAULT 0 NOT NULL,
	"scrim_per_lm_pence" integer DEFAULT 0 NOT NULL,
	"materials_markup_percent" integer DEFAULT 0 NOT NULL,
	"min_deduct_cm2" integer DEFAULT 0 NOT NULL,
	"narrow_max_mm" integer DEFAULT 300 NOT NULL,
	"bead_stock_lengths_mm" jsonb DEFAULT '[2500,3000]'::jsonb NOT NULL,
	"bead_waste_percent" integer DEFAULT 10 NOT NULL,
	"materials_waste_percent" integer DEFAULT 10 NOT NULL,
	"m2_per_day" integer DEFAULT 30 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "price_books" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "quote_lines" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"version_id" uuid NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"kind" "line_kind" NOT NULL,
	"description" text NOT NULL,
	"quantity_x_1000" integer NOT NULL,
	"unit" text NOT NULL,
	"unit_pence" integer NOT NULL,
	"vat_rate_percent" integer DEFAULT 20 NOT NULL,
	"derivation" text DEFAULT '' NOT NULL,
	CONSTRAINT "quote_lines_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "quote_lines" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "quote_versions" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"quote_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"status" "quote_status" DEFAULT 'draft' NOT NULL,
	"pricing" "quote_pricing" DEFAULT 'measure' NOT NULL,
	"estimated_days_x_100" integer DEFAULT 0 NOT NULL,
	"fixed_price_pence" integer,
	"vat" "vat_treatment" NOT NULL,
	"vat_rate_percent" integer DEFAULT 20 NOT NULL,
	"cis_rate_percent" integer,
	"valid_until" text NOT NULL,
	"terms" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"cautions" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"rules" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"totals" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"sent_at" timestamp with time zone,
	"token_hash" text,
	"token_expires_at" timestamp with time zone,
	"responded_at" timestamp with time zone,
	"accepted_name" text,
	"responded_ip" text,
	"decline_reason" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quote_versions_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "quote_versions_quote_version_unique" UNIQUE("firm_id","quote_id","version"),
	CONSTRAINT "quote_versions_token_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
ALTER TABLE "quote_versions" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "quotes" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"number" integer NOT NULL,
	"customer_id" uuid NOT NULL,
	"site_id" uuid,
	"enquiry_id" uuid,
	"visit_id" uuid,
	"current_version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "quotes_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "quotes_firm_number_unique" UNIQUE("firm_id","number")
);
--> statement-breakpoint
ALTER TABLE "quotes" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "materials" ADD CONSTRAINT "materials_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "price_books" ADD CONSTRAINT "price_books_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_lines" ADD CONSTRAINT "quote_lines_version_fk" FOREIGN KEY ("firm_id","version_id") REFERENCES "public"."quote_versions"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_versions" ADD CONSTRAINT "quote_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quote_versions" ADD CONSTRAINT "quote_versions_quote_fk" FOREIGN KEY ("firm_id","quote_id") REFERENCES "public"."quotes"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_site_fk" FOREIGN KEY ("firm_id","site_id") REFERENCES "public"."sites"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_enquiry_fk" FOREIGN KEY ("firm_id","enquiry_id") REFERENCES "public"."enquiries"("firm_id","id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_visit_fk" FOREIGN KEY ("firm_id","visit_id") REFERENCES "public"."visits"("firm_id","id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "quote_lines_version_idx" ON "quote_lines" USING btree ("firm_id","version_id","position");--> statement-breakpoint
CREATE INDEX "quotes_customer_idx" ON "quotes" USING btree ("firm_id","customer_id");--> statement-breakpoint
CREATE POLICY "materials_firm" ON "materials" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "price_books_firm" ON "price_books" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "quote_lines_firm" ON "quote_lines" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "quote_versions_by_token" ON "quote_versions" AS PERMISSIVE FOR SELECT TO public USING (token_hash = nullif(current_setting('app.quote_token_hash', true), ''));--> statement-breakpoint
CREATE POLICY "quote_versions_firm" ON "quote_versions" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "quotes_firm" ON "quotes" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());