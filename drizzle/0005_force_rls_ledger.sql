-- Row-level security applies to the owner role too on the ledger and visit tables (see 0002).
ALTER TABLE "customers" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "sites" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "enquiries" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "enquiry_events" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "visits" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "rooms" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "surfaces" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "openings" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "conditions" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "corners" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "photos" FORCE ROW LEVEL SECURITY;
