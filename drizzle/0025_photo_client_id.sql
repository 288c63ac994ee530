ALTER TABLE "photos" ADD COLUMN "client_id" uuid;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_client_unique" UNIQUE("firm_id","client_id");