-- Ready to spread firms across servers (README "Scaling out"): every key of a firm table includes
-- firm_id. The links' tokens were unique on their own; now unique within their firm, token_hash
-- first so that a link sent before links carried their firm is still found by its hash alone.
ALTER TABLE "invitations" DROP CONSTRAINT "invitations_token_unique";--> statement-breakpoint
ALTER TABLE "quote_versions" DROP CONSTRAINT "quote_versions_token_unique";--> statement-breakpoint
ALTER TABLE "calendar_feeds" DROP CONSTRAINT "calendar_feeds_token_unique";--> statement-breakpoint
ALTER TABLE "invoices" DROP CONSTRAINT "invoices_token_unique";--> statement-breakpoint
ALTER TABLE "invitations" ADD CONSTRAINT "invitations_token_unique" UNIQUE("token_hash","firm_id");--> statement-breakpoint
ALTER TABLE "quote_versions" ADD CONSTRAINT "quote_versions_token_unique" UNIQUE("token_hash","firm_id");--> statement-breakpoint
ALTER TABLE "calendar_feeds" ADD CONSTRAINT "calendar_feeds_token_unique" UNIQUE("token_hash","firm_id");--> statement-breakpoint
ALTER TABLE "invoices" ADD CONSTRAINT "invoices_token_unique" UNIQUE("token_hash","firm_id");--> statement-breakpoint
-- firms are spread by id: the enquiry form's key is looked up with the firm's id, or alone for an old link
ALTER TABLE "firms" DROP CONSTRAINT "firms_enquiry_form_key_unique";--> statement-breakpoint
CREATE INDEX "firms_enquiry_form_key_idx" ON "firms" USING btree ("enquiry_form_key");--> statement-breakpoint
-- sessions belong to a person, not a firm: keyed (user_id, id), spread by user_id; the firm the
-- person works in now is a plain column, renamed so that no one takes it for the tenant key
ALTER TABLE "sessions" DROP CONSTRAINT "sessions_pkey";--> statement-breakpoint
ALTER TABLE "sessions" ADD CONSTRAINT "sessions_user_id_id_pk" PRIMARY KEY("user_id","id");--> statement-breakpoint
DROP INDEX "sessions_user_idx";--> statement-breakpoint
ALTER TABLE "sessions" RENAME COLUMN "firm_id" TO "current_firm_id";
