ALTER TABLE "firms" ALTER COLUMN "invoice_prefix" SET DEFAULT '';--> statement-breakpoint
ALTER TABLE "firms" ALTER COLUMN "credit_note_prefix" SET DEFAULT '';--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "reference_letters" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "takes_transfer" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "bank_account_name" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "bank_sort_code" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "firms" ADD COLUMN "bank_account_number" text DEFAULT '' NOT NULL;--> statement-breakpoint
-- The back-fills below run as the owner, which row-level security binds too (0002): lifted for them only.
ALTER TABLE "firms" NO FORCE ROW LEVEL SECURITY;--> statement-breakpoint
-- The firm's letters: the initials of its trading name, up to three, leaving out Ltd, and, the...
UPDATE "firms" SET "reference_letters" = coalesce(nullif((
  SELECT upper(left(string_agg(left(w.word, 1), '' ORDER BY w.n), 3))
  FROM regexp_split_to_table("trading_name", '[^A-Za-z]+') WITH ORDINALITY AS w(word, n)
  WHERE w.word <> '' AND lower(w.word) NOT IN ('ltd', 'limited', 'and', 'the', 'of', 'plc', 'llp', 'co')
), ''), 'S');--> statement-breakpoint
-- The old free-text bank details, read into sort code and account number where both are plain to
-- see; the account name is left for the firm to fill in (it must be the name the bank holds).
UPDATE "firms" SET
  "bank_sort_code" = regexp_replace(substring("bank_details" from '(?:^|\D)(\d\d[- ]?\d\d[- ]?\d\d)(?:\D|$)'), '\D', '', 'g'),
  "bank_account_number" = substring("bank_details" from '(?:^|\D)(\d{8})(?:\D|$)')
WHERE "bank_details" ~ '(?:^|\D)\d\d[- ]?\d\d[- ]?\d\d(?:\D|$)' AND "bank_details" ~ '(?:^|\D)\d{8}(?:\D|$)';--> statement-breakpoint
ALTER TABLE "firms" FORCE ROW LEVEL SECURITY;
