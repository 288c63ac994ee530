// Invoices, credit notes and payments. An invoice is a draft until it is issued; issuing gives it
// the firm's next number (under a lock on the firm's row, so no gaps and no duplicates) and
// freezes it: a credit note corrects an issued invoice, never an edit. Its status (issued, part
// paid, paid, overdue, credited) follows from its payments and dates (shared/utils/invoices.ts),
// never set by hand. Money is integer pence; quantities thousandths.
import { sql } from 'drizzle-orm'
import { boolean, check, date, foreignKey, index, integer, jsonb, pgEnum, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { customers, sites } from './ledger'
import { users } from './users'
import { lineKind, vatTreatment } from './quotes'
import { jobs } from './jobs'
import { INVOICE_KINDS, PAYMENT_METHODS } from '../../../shared/utils/invoices'
import { PURCHASE_CATEGORIES } from '../../../shared/schemas/purchase'
import type { ChaseKind, ChaseOutcome } from '../../../shared/utils/chase'

/** What an issued invoice keeps of who it is from and to (see `invoices.parties`). */
export interface InvoiceParties {
  firm: { tradingName: string, addressLine1: string, addressLine2: string, town: string, postcode: string, vatRegistered: boolean, vatNumber: string | null }
  customer: { name: string, billingLine1: string, billingLine2: string, billingTown: string, billingPostcode: string, vatNumber: string | null }
  site: { line1: string, town: string, postcode: string } | null
}

const firmPolicy = (name: string) => pgPolicy(`${name}_firm`, { for: 'all', using: sameFirm, withCheck: sameFirm })

export const invoiceKind = pgEnum('invoice_kind', INVOICE_KINDS)
export const paymentMethod = pgEnum('payment_method', PAYMENT_METHODS)

export const invoices = pgTable('invoices', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  kind: invoiceKind().notNull(),
  /** The number series: invoices, or credit notes when the firm numbers them apart. */
  series: text().$type<'invoice' | 'credit-note'>().notNull().default('invoice'),
  /** Given when issued; drafts have none. Invoices and credit notes number apart or together, as the firm chooses. */
  number: integer(),
  reference: text(),
  customerId: uuid().notNull(),
  siteId: uuid(),
  jobId: uuid(),
  /** The invoice a credit note corrects. */
  creditsInvoiceId: uuid(),
  vat: vatTreatment().notNull(),
  /** Why the VAT treatment differs from the one suggested (kept when it was changed). */
  vatReason: text().notNull().default(''),
  cisRatePercent: integer(),
  issuedOn: date({ mode: 'string' }),
  dueOn: date({ mode: 'string' }),
  /** The totals (shared/utils/tax.ts invoiceTotals) as last saved; frozen once issued. */
  totals: jsonb().$type<Record<string, number>>().notNull().default({}),
  amountDuePence: integer().notNull().default(0),
  /**
   * Money received (less refunds) and issued credit notes against this invoice, kept up to date by
   * database triggers on payments and invoices (drizzle/0020_invoice_settled.sql) in the same
   * transaction as each write. The owed view finds what is unpaid by an index on it instead of
   * summing every invoice's payments (npm run bench).
   */
  settledPence: integer().notNull().default(0),
  /**
   * An issued invoice (not a credit note) with something still to pay, worked out by PostgreSQL
   * from the columns above as they are written. Queries for what is owed ask for `owing` itself:
   * under row-level security PostgreSQL uses a query's own conditions to reach an index only when
   * their operators are leakproof, and an enum's `<>` (on `kind`) is not; nor could it guess how
   * few rows `amount_due_pence > settled_pence` leaves (it took a third of the table and read all
   * of it). A column of its own is both leakproof and counted in the table's statistics
   * (npm run bench, EXPLAIN as the app's role: a whole-table scan of 100,000 invoices before).
   */
  owing: boolean().notNull().generatedAlwaysAs(sql`issued_on is not null and kind <> 'credit-note' and amount_due_pence > settled_pence`),
  notes: text().notNull().default(''),
  /**
   * The firm's and the customer's names and addresses (and VAT numbers) as they were when it was
   * issued, so an issued VAT invoice never changes when either is edited later. Null on drafts, and
   * on invoices issued before it was kept (those show the details as they are now).
   */
  parties: jsonb().$type<InvoiceParties>(),
  /** The customer's link to view and pay: only its hash. */
  tokenHash: text(),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('invoices_firm_number_unique').on(t.firmId, t.series, t.number),
  // unique within the firm; token_hash first, so a link from before links carried their firm is found by it alone
  unique('invoices_token_unique').on(t.tokenHash, t.firmId),
  // a reference is never given twice in a firm, whatever the prefixes and numbering (issue 13)
  uniqueIndex('invoices_firm_reference_unique').on(t.firmId, t.reference).where(sql`${t.reference} is not null`),
  foreignKey({ name: 'invoices_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }),
  foreignKey({ name: 'invoices_site_fk', columns: [t.firmId, t.siteId], foreignColumns: [sites.firmId, sites.id] }),
  foreignKey({ name: 'invoices_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }),
  foreignKey({ name: 'invoices_credits_fk', columns: [t.firmId, t.creditsInvoiceId], foreignColumns: [t.firmId, t.id] }),
  // the exports page through issued invoices in this order (keyset)
  index('invoices_firm_issued_idx').on(t.firmId, t.issuedOn, t.series, t.number),
  index('invoices_job_idx').on(t.firmId, t.jobId),
  // what has been credited against an invoice (the owed view, statuses, the invoice page): without
  // it every invoice scans every other one
  index('invoices_credits_idx').on(t.firmId, t.creditsInvoiceId).where(sql`${t.creditsInvoiceId} is not null`),
  // what is still owed (the owed view, the reminders, Today): a few rows among a busy firm's hundred
  // thousand, in due-date order, on the `owing` column (see there)
  index('invoices_owing_idx').on(t.firmId, t.dueOn, t.number).where(sql`${t.owing}`),
  pgPolicy('invoices_by_token', { for: 'select', using: sql`token_hash = nullif(current_setting('app.invoice_token_hash', true), '')` }),
  firmPolicy('invoices'),
]).enableRLS()

export const invoiceLines = pgTable('invoice_lines', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  invoiceId: uuid().notNull(),
  position: integer().notNull().default(0),
  kind: lineKind().notNull(),
  description: text().notNull(),
  quantityX1000: integer().notNull(),
  unit: text().notNull(),
  unitPence: integer().notNull(),
  vatRatePercent: integer().notNull().default(20),
  /**
   * Work beyond the job's agreed price, confirmed as such by the person drafting: it does not count
   * against the price (what a job's invoices claim of its price can never pass it).
   */
  extraWork: boolean().notNull().default(false),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'invoice_lines_invoice_fk', columns: [t.firmId, t.invoiceId], foreignColumns: [invoices.firmId, invoices.id] }).onDelete('cascade'),
  index('invoice_lines_invoice_idx').on(t.firmId, t.invoiceId, t.position),
  firmPolicy('invoice_lines'),
]).enableRLS()

/** Money received against an invoice (a refund is a negative amount). */
export const payments = pgTable('payments', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  invoiceId: uuid().notNull(),
  method: paymentMethod().notNull(),
  amountPence: integer().notNull(),
  receivedOn: date({ mode: 'string' }).notNull(),
  reference: text().notNull().default(''),
  /** Card payments: the PaymentIntent, once (a second event for it does nothing). */
  stripePaymentIntentId: text(),
  stripeRefundId: text(),
  /** Payments by hand: the key the form made for this payment, so the same request sent twice is one payment. */
  requestId: uuid(),
  recordedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('payments_intent_unique').on(t.firmId, t.stripePaymentIntentId),
  unique('payments_refund_unique').on(t.firmId, t.stripeRefundId),
  unique('payments_request_unique').on(t.firmId, t.requestId),
  foreignKey({ name: 'payments_invoice_fk', columns: [t.firmId, t.invoiceId], foreignColumns: [invoices.firmId, invoices.id] }).onDelete('cascade'),
  index('payments_invoice_idx').on(t.firmId, t.invoiceId),
  // the quarter's exports and the cash-basis VAT return read payments by the day received
  index('payments_received_idx').on(t.firmId, t.receivedOn, t.id),
  firmPolicy('payments'),
]).enableRLS()

/** Stripe events already acted on, written in the same transaction as their effect. */
export const stripeEvents = pgTable('stripe_events', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  eventId: text().notNull(),
  type: text().notNull(),
  outcome: text().notNull().default(''),
  receivedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  primaryKey({ columns: [t.firmId, t.eventId] }),
  firmPolicy('stripe_events'),
]).enableRLS()

/**
 * The chase log of an invoice: the partner's calls, messages and letters (how each went, and a
 * promise to pay when there was one), and the reminders sent by the schedule or by hand.
 */
export const chaseNotes = pgTable('chase_notes', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  invoiceId: uuid().notNull(),
  kind: text().$type<ChaseKind | 'reminder'>().notNull(),
  /** How it went (shared/utils/chase.ts); null on reminders. */
  outcome: text().$type<ChaseOutcome>(),
  note: text().notNull().default(''),
  /** With the outcome "promised": the day they promised to pay by... */
  promisedOn: date({ mode: 'string' }),
  /** ...and how much (null on promises logged before amounts were kept: the whole of what was owed). */
  promisedPence: integer(),
  /** A reminder sent by the schedule: invoice + step, so a retried job never sends twice. */
  reminderKey: text(),
  /** When the reminder's e-mail went (null while sending, or when it failed). */
  sentAt: timestamp({ withTimezone: true }),
  byUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'chase_notes_invoice_fk', columns: [t.firmId, t.invoiceId], foreignColumns: [invoices.firmId, invoices.id] }).onDelete('cascade'),
  index('chase_notes_invoice_idx').on(t.firmId, t.invoiceId),
  /** The promises of a firm, newest first per invoice: the broken-promise list (server/utils/promises.ts). */
  index('chase_notes_promise_idx').on(t.firmId, t.invoiceId, t.at).where(sql`${t.promisedOn} is not null`),
  unique('chase_notes_reminder_unique').on(t.firmId, t.reminderKey),
  check('chase_notes_kind', sql`${t.kind} in ('call', 'message', 'letter', 'reminder')`),
  check('chase_notes_outcome', sql`(${t.kind} = 'reminder') = (${t.outcome} is null) and (${t.outcome} is null or ${t.outcome} in ('promised', 'no-reply', 'disputed', 'says-paid', 'other'))`),
  check('chase_notes_promise', sql`(coalesce(${t.outcome}, '') = 'promised') = (${t.promisedOn} is not null) and (${t.promisedPence} is null or (${t.promisedOn} is not null and ${t.promisedPence} > 0))`),
  firmPolicy('chase_notes'),
]).enableRLS()

/** The firm's reminder schedule: days from the due date (negative: before it), with the e-mail's words. */
export const reminderRules = pgTable('reminder_rules', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  offsetDays: integer().notNull(),
  subject: text().notNull(),
  body: text().notNull(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('reminder_rules_offset_unique').on(t.firmId, t.offsetDays),
  firmPolicy('reminder_rules'),
]).enableRLS()

/** The Bank of England Bank Rate as the firm keeps it, for statutory interest (shared/utils/late-payment.ts). */
export const bankRates = pgTable('bank_rates', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  fromDate: date({ mode: 'string' }).notNull(),
  /** Hundredths of a percent (4.25% = 425). */
  rateBp: integer().notNull(),
}, t => [
  primaryKey({ columns: [t.firmId, t.fromDate] }),
  firmPolicy('bank_rates'),
]).enableRLS()

export const purchaseCategory = pgEnum('purchase_category', PURCHASE_CATEGORIES)

/** Materials and other costs as they are bought (issue 7): what the VAT return's input side and the profit table read. */
export const purchases = pgTable('purchases', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  supplier: text().notNull(),
  boughtOn: date({ mode: 'string' }).notNull(),
  category: purchaseCategory().notNull(),
  netPence: integer().notNull(),
  vatPence: integer().notNull().default(0),
  reference: text().notNull().default(''),
  notes: text().notNull().default(''),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  index('purchases_firm_date_idx').on(t.firmId, t.boughtOn),
  firmPolicy('purchases'),
]).enableRLS()

/** A purchase's net split across the jobs it was for (the rest is the firm's overhead). */
export const purchaseJobs = pgTable('purchase_jobs', {
  firmId: firmColumn(),
  purchaseId: uuid().notNull(),
  jobId: uuid().notNull(),
  netPence: integer().notNull(),
}, t => [
  primaryKey({ columns: [t.firmId, t.purchaseId, t.jobId] }),
  foreignKey({ name: 'purchase_jobs_purchase_fk', columns: [t.firmId, t.purchaseId], foreignColumns: [purchases.firmId, purchases.id] }).onDelete('cascade'),
  foreignKey({ name: 'purchase_jobs_job_fk', columns: [t.firmId, t.jobId], foreignColumns: [jobs.firmId, jobs.id] }),
  index('purchase_jobs_job_idx').on(t.firmId, t.jobId),
  firmPolicy('purchase_jobs'),
]).enableRLS()

/**
 * What a contractor customer's monthly CIS statement says it paid and deducted (issue 7), one per
 * contractor and tax month (the month starting on the 6th), to reconcile against the firm's own figures.
 */
export const cisStatements = pgTable('cis_statements', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  customerId: uuid().notNull(),
  /** The first day (the 6th) of the tax month the statement covers. */
  taxMonthStart: date({ mode: 'string' }).notNull(),
  grossPence: integer().notNull(),
  materialsPence: integer().notNull().default(0),
  deductionPence: integer().notNull(),
  reference: text().notNull().default(''),
  notes: text().notNull().default(''),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('cis_statements_month_unique').on(t.firmId, t.customerId, t.taxMonthStart),
  foreignKey({ name: 'cis_statements_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }),
  firmPolicy('cis_statements'),
]).enableRLS()

/**
 * A stored file that is not a site photo: a receipt (photo or PDF) for a purchase, or the PDF or
 * photo of a contractor's CIS statement. Uploaded through the same checked, streamed path as photos.
 */
export const documents = pgTable('documents', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  purchaseId: uuid(),
  cisStatementId: uuid(),
  storageKey: text().notNull(),
  contentType: text().notNull(),
  bytes: integer().notNull(),
  originalName: text().notNull().default(''),
  uploadedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'documents_purchase_fk', columns: [t.firmId, t.purchaseId], foreignColumns: [purchases.firmId, purchases.id] }).onDelete('cascade'),
  foreignKey({ name: 'documents_cis_statement_fk', columns: [t.firmId, t.cisStatementId], foreignColumns: [cisStatements.firmId, cisStatements.id] }).onDelete('cascade'),
  index('documents_purchase_idx').on(t.firmId, t.purchaseId),
  index('documents_cis_statement_idx').on(t.firmId, t.cisStatementId),
  check('documents_one_target', sql`num_nonnulls(${t.purchaseId}, ${t.cisStatementId}) = 1`),
  firmPolicy('documents'),
]).enableRLS()
