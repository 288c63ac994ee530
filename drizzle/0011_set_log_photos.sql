CREATE TABLE "set_log_photos" (
	"firm_id" uuid NOT NULL,
	"photo_id" uuid NOT NULL,
	"set_log_id" uuid NOT NULL,
	CONSTRAINT "set_log_photos_firm_id_photo_id_pk" PRIMARY KEY("firm_id","photo_id")
);
--> statement-breakpoint
ALTER TABLE "set_log_photos" ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "set_log_photos" ADD CONSTRAINT "set_log_photos_photo_fk" FOREIGN KEY ("firm_id","photo_id") REFERENCES "public"."photos"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_log_photos" ADD CONSTRAINT "set_log_photos_log_fk" FOREIGN KEY ("firm_id","set_log_id") REFERENCES "public"."set_logs"("firm_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "set_log_photos_log_idx" ON "set_log_photos" USING btree ("firm_id","set_log_id");--> statement-breakpoint
CREATE POLICY "set_log_photos_firm" ON "set_log_photos" AS PERMISSIVE FOR ALL TO public USING (firm_id = app_firm_id()) WITH CHECK (firm_id = app_firm_id());--> statement-breakpoint
ALTER TABLE "set_log_photos" FORCE ROW LEVEL SECURITY;
