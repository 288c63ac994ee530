-- Second wall behind the firm conditions in every query: row-level security applies even to the
-- tables' owner, and the server connects as setwell_app, which owns nothing.
ALTER TABLE "firms" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "memberships" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "invitations" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE "audit_log" FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
-- The audit log is append-only for the app.
REVOKE UPDATE, DELETE ON "audit_log" FROM setwell_app;
