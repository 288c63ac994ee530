-- Row-level security applies to the owner role too on the job tables (see 0002).
ALTER TABLE "jobs" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "job_status_changes" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "job_days" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "set_logs" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "material_uses" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "calendar_feeds" FORCE ROW LEVEL SECURITY;
