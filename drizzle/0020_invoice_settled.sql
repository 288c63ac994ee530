ALTER TABLE "invoices" ADD COLUMN "settled_pence" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
CREATE INDEX "invoices_owing_idx" ON "invoices" USING btree ("firm_id","due_on") WHERE "invoices"."issued_on" is not null and "invoices"."kind" <> 'credit-note' and "invoices"."amount_due_pence" > "invoices"."settled_pence";--> statement-breakpoint
-- invoices.settled_pence is what has been received (payments less refunds) and credited (issued
-- credit notes) against each invoice, kept here by triggers in the same transaction as each write,
-- so no code path can forget it. The owed view reads it through invoices_owing_idx.
--
-- Payments: one statement-level trigger per event, with its transition tables, so a statement
-- that writes many payments (an import, the benchmark's seed) updates each invoice once. The
-- update adds a difference to the row as it is when locked, so two payments written at the same
-- moment both count (a sum worked out beforehand could miss the other's).
CREATE FUNCTION invoices_settle_payments() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    UPDATE invoices i SET settled_pence = i.settled_pence + d.delta
    FROM (SELECT firm_id, invoice_id, sum(amount_pence)::int AS delta FROM new_rows GROUP BY firm_id, invoice_id) d
    WHERE i.firm_id = d.firm_id AND i.id = d.invoice_id AND d.delta <> 0;
  ELSIF TG_OP = 'DELETE' THEN
    UPDATE invoices i SET settled_pence = i.settled_pence - d.delta
    FROM (SELECT firm_id, invoice_id, sum(amount_pence)::int AS delta FROM old_rows GROUP BY firm_id, invoice_id) d
    WHERE i.firm_id = d.firm_id AND i.id = d.invoice_id AND d.delta <> 0;
  ELSE
    UPDATE invoices i SET settled_pence = i.settled_pence + d.delta
    FROM (
      SELECT firm_id, invoice_id, sum(amount_pence)::int AS delta FROM (
        SELECT firm_id, invoice_id, amount_pence FROM new_rows
        UNION ALL
        SELECT firm_id, invoice_id, -amount_pence FROM old_rows
      ) c GROUP BY firm_id, invoice_id
    ) d
    WHERE i.firm_id = d.firm_id AND i.id = d.invoice_id AND d.delta <> 0;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER payments_settle_insert AFTER INSERT ON payments REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION invoices_settle_payments();
--> statement-breakpoint
CREATE TRIGGER payments_settle_update AFTER UPDATE ON payments REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION invoices_settle_payments();
--> statement-breakpoint
CREATE TRIGGER payments_settle_delete AFTER DELETE ON payments REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION invoices_settle_payments();
--> statement-breakpoint
-- Credit notes: an issued credit note settles the invoice it corrects by its amount. Row-level,
-- and only on the columns that decide it, so the update of settled_pence itself fires nothing.
CREATE FUNCTION invoices_settle_credit_notes() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP IN ('UPDATE', 'DELETE') AND OLD.kind = 'credit-note' AND OLD.issued_on IS NOT NULL AND OLD.credits_invoice_id IS NOT NULL THEN
    UPDATE invoices SET settled_pence = settled_pence - OLD.amount_due_pence WHERE firm_id = OLD.firm_id AND id = OLD.credits_invoice_id;
  END IF;
  IF TG_OP IN ('INSERT', 'UPDATE') AND NEW.kind = 'credit-note' AND NEW.issued_on IS NOT NULL AND NEW.credits_invoice_id IS NOT NULL THEN
    UPDATE invoices SET settled_pence = settled_pence + NEW.amount_due_pence WHERE firm_id = NEW.firm_id AND id = NEW.credits_invoice_id;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER invoices_settle_credit_notes AFTER INSERT OR DELETE OR UPDATE OF kind, issued_on, amount_due_pence, credits_invoice_id ON invoices FOR EACH ROW EXECUTE FUNCTION invoices_settle_credit_notes();
--> statement-breakpoint
-- What is already there. Row-level security is forced even on the owner, so it is lifted for this
-- one statement (inside the migration's transaction) and put back at once.
ALTER TABLE invoices NO FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE payments NO FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
UPDATE invoices i SET settled_pence =
  coalesce((SELECT sum(p.amount_pence) FROM payments p WHERE p.firm_id = i.firm_id AND p.invoice_id = i.id), 0)
  + coalesce((SELECT sum(n.amount_due_pence) FROM invoices n WHERE n.firm_id = i.firm_id AND n.credits_invoice_id = i.id AND n.kind = 'credit-note' AND n.issued_on IS NOT NULL), 0);
--> statement-breakpoint
ALTER TABLE invoices FORCE ROW LEVEL SECURITY;
--> statement-breakpoint
ALTER TABLE payments FORCE ROW LEVEL SECURITY;
