-- The owed view and invoice statuses sum each invoice's payments: with the amount in the index,
-- PostgreSQL reads the sums from the index alone (an index-only scan) instead of every payment row.
-- Not expressible in the drizzle schema (INCLUDE), so written here by hand.
CREATE INDEX IF NOT EXISTS "payments_invoice_amount_idx" ON "payments" USING btree ("firm_id","invoice_id") INCLUDE ("amount_pence");
