ALTER TABLE "openings" ADD COLUMN "from_left_mm" integer;--> statement-breakpoint
ALTER TABLE "openings" ADD COLUMN "from_floor_mm" integer;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "ceilings_first" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "mix_minutes" integer DEFAULT 15 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "go_off_minutes" integer DEFAULT 105 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "day_start_minutes" integer DEFAULT 480 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "day_end_minutes" integer DEFAULT 990 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "packed_bead_per_lm_pence" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "narrow_return_per_lm_pence" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "price_books" ADD COLUMN "quote_work_page" boolean DEFAULT true NOT NULL;