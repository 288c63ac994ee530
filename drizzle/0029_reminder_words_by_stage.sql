-- Firms still on the old starting words for a step get the new ones: the old overdue words said
-- "a week" or "a month" whatever the day, and ended with the firm's name, which the e-mail's sign-off
-- now carries. Words a firm changed are left as they are. Run as the owner, which row-level
-- security binds too (0002): lifted for this only.
ALTER TABLE "reminder_rules" NO FORCE ROW LEVEL SECURITY;--> statement-breakpoint
UPDATE "reminder_rules" SET "subject" = 'Invoice {reference} is due on {due}', "body" = 'Hello {customer},

A friendly note that invoice {reference} for {amount} is due on {due}. If you have already paid, thank you, and please ignore this.', "updated_at" = now() WHERE "offset_days" = -3 AND "subject" = 'Invoice {reference} is due on {due}' AND "body" = 'Hello {customer},

A friendly note that invoice {reference} for {amount} from {firm} is due on {due}.

Thank you,
{firm}';--> statement-breakpoint
UPDATE "reminder_rules" SET "subject" = 'Invoice {reference} is due today', "body" = 'Hello {customer},

Invoice {reference} for {amount} is due today, {due}. If you have already paid, thank you, and please ignore this.', "updated_at" = now() WHERE "offset_days" = 0 AND "subject" = 'Invoice {reference} is due today' AND "body" = 'Hello {customer},

Invoice {reference} for {amount} is due today. If you have already paid, thank you, and please ignore this.

{firm}';--> statement-breakpoint
UPDATE "reminder_rules" SET "subject" = 'Invoice {reference} is overdue', "body" = 'Hello {customer},

Invoice {reference} was due on {due} and is now {overdue}: {amount} is still to pay. Please pay it, or let us know if something is wrong.', "updated_at" = now() WHERE "offset_days" = 7 AND "subject" = 'Invoice {reference} is a week overdue' AND "body" = 'Hello {customer},

Invoice {reference} was due on {due} and {amount} is still to pay. Please pay it, or let us know if something is wrong.

{firm}';--> statement-breakpoint
UPDATE "reminder_rules" SET "subject" = 'Invoice {reference} is still unpaid', "body" = 'Hello {customer},

Invoice {reference} is now {overdue} and {amount} is still to pay. Please pay it this week, or give us a ring to agree a date.', "updated_at" = now() WHERE "offset_days" = 14 AND "subject" = 'Invoice {reference} is two weeks overdue' AND "body" = 'Hello {customer},

Invoice {reference} is now two weeks overdue: {amount} is still to pay. Please pay it this week, or call us to agree a date.

{firm}';--> statement-breakpoint
UPDATE "reminder_rules" SET "subject" = 'Invoice {reference}: please pay now', "body" = 'Hello {customer},

Invoice {reference} was due on {due} and is now {overdue}. {amount} is still to pay: please pay it now, or give us a ring.', "updated_at" = now() WHERE "offset_days" = 30 AND "subject" = 'Invoice {reference}: a month overdue' AND "body" = 'Hello {customer},

Invoice {reference} is a month overdue and {amount} is still to pay. Please pay it now, or call us.

{firm}';--> statement-breakpoint
ALTER TABLE "reminder_rules" FORCE ROW LEVEL SECURITY;
