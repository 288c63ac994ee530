CREATE TYPE "public"."customer_kind" AS ENUM('homeowner', 'landlord', 'builder', 'business');--> statement-breakpoint
CREATE TYPE "public"."enquiry_source" AS ENUM('phone', 'message', 'web-form', 'referral', 'repeat');--> statement-breakpoint
CREATE TYPE "public"."enquiry_status" AS ENUM('new', 'visit-booked', 'quoted', 'won', 'lost');--> statement-breakpoint
CREATE TYPE "public"."background" AS ENUM('sound-plaster', 'paper-stripped', 'plasterboard', 'undercoat', 'masonry', 'other');--> statement-breakpoint
CREATE TYPE "public"."condition_kind" AS ENUM('patch-undercoat', 'patch-masonry', 'crack', 'frame-gap', 'out-of-true', 'damaged-corner', 'textured-coating');--> statement-breakpoint
CREATE TYPE "public"."corner_kind" AS ENUM('internal', 'external');--> statement-breakpoint
CREATE TYPE "public"."opening_kind" AS ENUM('door', 'window', 'void');--> statement-breakpoint
CREATE TYPE "public"."surface_kind" AS ENUM('wall', 'ceiling', 'chimney-breast', 'reveal', 'strip');--> statement-breakpoint
CREATE TYPE "public"."visit_status" AS ENUM('booked', 'done', 'cancelled');--> statement-breakpoint
CREATE TABLE "customers" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"kind" "customer_kind" NOT NULL,
	"name" text NOT NULL,
	"contact_name" text DEFAULT '' NOT NULL,
	"email" text DEFAULT '' NOT NULL,
	"phone" text DEFAULT '' NOT NULL,
	"billing_line1" text DEFAULT '' NOT NULL,
	"billing_line2" text DEFAULT '' NOT NULL,
	"billing_town" text DEFAULT '' NOT NULL,
	"billing_postcode" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"vat_registered" boolean DEFAULT false NOT NULL,
	"vat_number" text,
	"pays_under_cis" boolean DEFAULT false NOT NULL,
	"cis_rate_percent" integer,
	"end_user_notified" boolean DEFAULT false NOT NULL,
	"import_key" text,
	"search_text" text GENERATED ALWAYS AS (lower(name || ' ' || email || ' ' || replace(billing_postcode, ' ', '') || ' ' || regexp_replace(phone, '[^0-9]', '', 'g'))) STORED,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "customers_firm_id_id_pk" PRIMARY KEY("firm_id","id"),
	CONSTRAINT "customers_import_key_unique" UNIQUE("firm_id","import_key")
);
--> statement-breakpoint
ALTER TABLE "customers" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "enquiries" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"site_id" uuid,
	"source" "enquiry_source" NOT NULL,
	"description" text NOT NULL,
	"preferred_dates" text DEFAULT '' NOT NULL,
	"follow_up_on" date,
	"status" "enquiry_status" DEFAULT 'new' NOT NULL,
	"lost_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "enquiries_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "enquiries" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "enquiry_events" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"enquiry_id" uuid NOT NULL,
	"from_status" "enquiry_status",
	"to_status" "enquiry_status" NOT NULL,
	"reason" text,
	"by_user_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "enquiry_events_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "enquiry_events" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "public_form_hits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"ip" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"line1" text NOT NULL,
	"line2" text DEFAULT '' NOT NULL,
	"town" text DEFAULT '' NOT NULL,
	"postcode" text DEFAULT '' NOT NULL,
	"access_notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sites_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "sites" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "conditions" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"surface_id" uuid NOT NULL,
	"kind" "condition_kind" NOT NULL,
	"area_cm2" integer,
	"length_mm" integer,
	"out_of_true_mm" integer,
	"scrimmed" boolean DEFAULT false NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	CONSTRAINT "conditions_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "conditions" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "corners" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"room_id" uuid NOT NULL,
	"surface_a_id" uuid NOT NULL,
	"surface_b_id" uuid NOT NULL,
	"kind" "corner_kind" NOT NULL,
	"length_mm" integer NOT NULL,
	"return_width_mm" integer,
	"needs_bead" boolean DEFAULT false NOT NULL,
	"packed_out" boolean DEFAULT false NOT NULL,
	CONSTRAINT "corners_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "corners" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "openings" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"surface_id" uuid NOT NULL,
	"kind" "opening_kind" NOT NULL,
	"width_mm" integer NOT NULL,
	"height_mm" integer NOT NULL,
	CONSTRAINT "openings_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "openings" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "photos" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"storage_key" text NOT NULL,
	"thumb_key" text NOT NULL,
	"content_type" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"bytes" integer NOT NULL,
	"original_name" text DEFAULT '' NOT NULL,
	"caption" text DEFAULT '' NOT NULL,
	"enquiry_id" uuid,
	"visit_id" uuid,
	"surface_id" uuid,
	"condition_id" uuid,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "photos_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "photos" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "rooms" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"visit_id" uuid NOT NULL,
	"name" text NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rooms_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "rooms" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "surfaces" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"room_id" uuid NOT NULL,
	"kind" "surface_kind" NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"length_mm" integer NOT NULL,
	"second_mm" integer NOT NULL,
	"background" "background" DEFAULT 'sound-plaster' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	CONSTRAINT "surfaces_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "surfaces" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
CREATE TABLE "visits" (
	"firm_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"customer_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"enquiry_id" uuid,
	"starts_at" timestamp with time zone NOT NULL,
	"duration_minutes" integer DEFAULT 60 NOT NULL,
	"visitor_user_id" uuid,
	"status" "visit_status" DEFAULT 'booked' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "visits_firm_id_id_pk" PRIMARY KEY("firm_id","id")
);
--> statement-breakpoint
ALTER TABLE "visits" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "enquiry_form_key" text DEFAULT replace(gen_random_uuid()::text, '-', '') NOT NULL;--> statement-breakpoint
ALTER TABLE "customers" ADD CONSTRAINT "customers_firm_id_firms_id_fk" FOREIGN KEY ("firm_id") REFERENCES "public"."firms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "enquiries" ADD CONSTRAINT "enquiries_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "enquiries" ADD CONSTRAINT "enquiries_site_fk" FOREIGN KEY ("firm_id","site_id") REFERENCES "public"."sites"("firm_id","id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "enquiry_events" ADD CONSTRAINT "enquiry_events_by_user_id_users_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "enquiry_events" ADD CONSTRAINT "enquiry_events_enquiry_fk" FOREIGN KEY ("firm_id","enquiry_id") REFERENCES "public"."enquiries"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "conditions" ADD CONSTRAINT "conditions_surface_fk" FOREIGN KEY ("firm_id","surface_id") REFERENCES "public"."surfaces"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "corners" ADD CONSTRAINT "corners_room_fk" FOREIGN KEY ("firm_id","room_id") REFERENCES "public"."rooms"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "corners" ADD CONSTRAINT "corners_surface_a_fk" FOREIGN KEY ("firm_id","surface_a_id") REFERENCES "public"."surfaces"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "corners" ADD CONSTRAINT "corners_surface_b_fk" FOREIGN KEY ("firm_id","surface_b_id") REFERENCES "public"."surfaces"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "openings" ADD CONSTRAINT "openings_surface_fk" FOREIGN KEY ("firm_id","surface_id") REFERENCES "public"."surfaces"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_enquiry_fk" FOREIGN KEY ("firm_id","enquiry_id") REFERENCES "public"."enquiries"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_visit_fk" FOREIGN KEY ("firm_id","visit_id") REFERENCES "public"."visits"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rooms" ADD CONSTRAINT "rooms_visit_fk" FOREIGN KEY ("firm_id","visit_id") REFERENCES "public"."visits"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "surfaces" ADD CONSTRAINT "surfaces_room_fk" FOREIGN KEY ("firm_id","room_id") REFERENCES "public"."rooms"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_visitor_user_id_users_id_fk" FOREIGN KEY ("visitor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_customer_fk" FOREIGN KEY ("firm_id","customer_id") REFERENCES "public"."customers"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_site_fk" FOREIGN KEY ("firm_id","site_id") REFERENCES "public"."sites"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_enquiry_fk" FOREIGN KEY ("firm_id","enquiry_id") REFERENCES "public"."enquiries"("firm_id","id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "customers_search_idx" ON "customers" USING gin ("search_text" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "customers_firm_name_idx" ON "customers" USING btree ("firm_id","name");--> statement-breakpoint
CREATE INDEX "customers_firm_created_idx" ON "customers" USING btree ("firm_id","created_at");--> statement-breakpoint
CREATE INDEX "enquiries_status_idx" ON "enquiries" USING btree ("firm_id","status","created_at");--> statement-breakpoint
CREATE INDEX "enquiry_events_enquiry_idx" ON "enquiry_events" USING btree ("firm_id","enquiry_id","at");--> statement-breakpoint
CREATE INDEX "public_form_hits_ip_idx" ON "public_form_hits" USING btree ("ip","at");--> statement-breakpoint
CREATE INDEX "sites_customer_idx" ON "sites" USING btree ("firm_id","customer_id");--> statement-breakpoint
CREATE INDEX "conditions_surface_idx" ON "conditions" USING btree ("firm_id","surface_id");--> statement-breakpoint
CREATE INDEX "corners_room_idx" ON "corners" USING btree ("firm_id","room_id");--> statement-breakpoint
CREATE INDEX "openings_surface_idx" ON "openings" USING btree ("firm_id","surface_id");--> statement-breakpoint
CREATE INDEX "photos_visit_idx" ON "photos" USING btree ("firm_id","visit_id");--> statement-breakpoint
CREATE INDEX "photos_enquiry_idx" ON "photos" USING btree ("firm_id","enquiry_id");--> statement-breakpoint
CREATE INDEX "rooms_visit_idx" ON "rooms" USING btree ("firm_id","visit_id");--> statement-breakpoint
CREATE INDEX "surfaces_room_idx" ON "surfaces" USING btree ("firm_id","room_id");--> statement-breakpoint
CREATE INDEX "visits_firm_starts_idx" ON "visits" USING btree ("firm_id","starts_at");--> statement-breakpoint
ALTER TABLE "firms" ADD CONSTRAINT "firms_enquiry_form_key_unique" UNIQUE("enquiry_form_key");--> statement-breakpoint
CREATE POLICY "customers_firm" ON "customers" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "enquiries_firm" ON "enquiries" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "enquiry_events_firm" ON "enquiry_events" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "sites_firm" ON "sites" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "conditions_firm" ON "conditions" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "corners_firm" ON "corners" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "openings_firm" ON "openings" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "photos_firm" ON "photos" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "rooms_firm" ON "rooms" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "surfaces_firm" ON "surfaces" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
CREATE POLICY "visits_firm" ON "visits" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER POLICY "firms_visible" ON "firms" TO public USING (id = app_firm_id() or id in (select m.firm_id from memberships m where m.user_id = app_user_id()) or enquiry_form_key = nullif(current_setting('app.enquiry_form_key', true), ''));