-- Row-level security applies to the owner role too on the quote tables (see 0002).
ALTER TABLE "price_books" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "materials" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "quotes" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "quote_versions" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "quote_lines" FORCE ROW LEVEL SECURITY;
