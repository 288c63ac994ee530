// The firm's bank statements (issue 20): its accounts, each file imported, the statement's lines
// (each once, however many files hold it), and what each line was matched to. States are text with
// a check, not an enum: an enum's = is not leakproof, so under row-level security a condition on
// it never reaches an index (DEVELOPERS.md "Row-level security and indexes"), and Today counts the
// lines still open.
import { sql } from 'drizzle-orm'
import { boolean, check, date, foreignKey, index, integer, jsonb, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { users } from './users'
import { invoices, payments, purchases } from './invoices'
import type { BankMapping } from '../../../shared/utils/bank-csv'

const firmPolicy = (name: string) => pgPolicy(`${name}_firm`, { for: 'all', using: sameFirm, withCheck: sameFirm })

/** A bank account of the firm, with how its CSV files are laid out once the person has said. */
export const bankAccounts = pgTable('bank_accounts', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  name: text().notNull(),
  /** The columns of this bank's CSV files (shared/utils/bank-csv.ts), remembered from the last import that needed them. */
  csvLayout: jsonb().$type<{ headerRow: number, mapping: BankMapping } | null>(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('bank_accounts_firm_name_unique').on(t.firmId, t.name),
  firmPolicy('bank_accounts'),
]).enableRLS()

/** One file imported: what it added and what it held that was already there. */
export const bankStatements = pgTable('bank_statements', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  accountId: uuid().notNull(),
  fileName: text().notNull(),
  format: text().$type<'csv' | 'ofx'>().notNull(),
  linesNew: integer().notNull(),
  linesAlready: integer().notNull(),
  importedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'bank_statements_account_fk', columns: [t.firmId, t.accountId], foreignColumns: [bankAccounts.firmId, bankAccounts.id] }).onDelete('cascade'),
  check('bank_statements_format_check', sql`${t.format} in ('csv', 'ofx')`),
  firmPolicy('bank_statements'),
]).enableRLS()

export const BANK_LINE_STATES = ['open', 'matched', 'ignored'] as const
export type BankLineState = (typeof BANK_LINE_STATES)[number]

/** A line of an account's statement, once: its key (shared/utils/bank-csv.ts lineKeys) is unique in the account. */
export const bankLines = pgTable('bank_lines', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  accountId: uuid().notNull(),
  /** The file that first brought it. */
  statementId: uuid().notNull(),
  postedOn: date({ mode: 'string' }).notNull(),
  description: text().notNull(),
  amountPence: integer().notNull(),
  balancePence: integer(),
  lineKey: text().notNull(),
  state: text().$type<BankLineState>().notNull().default('open'),
  /** The partner's note on a line left for later. */
  note: text().notNull().default(''),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('bank_lines_key_unique').on(t.firmId, t.accountId, t.lineKey),
  foreignKey({ name: 'bank_lines_account_fk', columns: [t.firmId, t.accountId], foreignColumns: [bankAccounts.firmId, bankAccounts.id] }).onDelete('cascade'),
  foreignKey({ name: 'bank_lines_statement_fk', columns: [t.firmId, t.statementId], foreignColumns: [bankStatements.firmId, bankStatements.id] }).onDelete('cascade'),
  check('bank_lines_state_check', sql`${t.state} in ('open', 'matched', 'ignored')`),
  index('bank_lines_firm_posted_idx').on(t.firmId, t.postedOn, t.id),
  // Today's count and the list of lines left for later
  index('bank_lines_open_idx').on(t.firmId, t.postedOn).where(sql`${t.state} = 'open'`),
  firmPolicy('bank_lines'),
]).enableRLS()

export const BANK_MATCH_KINDS = ['payment', 'purchase', 'payout'] as const
export type BankMatchKind = (typeof BANK_MATCH_KINDS)[number]

/**
 * What a line was confirmed as: a payment recorded on an invoice (one row per invoice it paid), a
 * recorded purchase, or a purchase made from it. Undoing sets `undone_at`, clears `payment_id`, then
 * removes the payment (a composite key cannot set only its own column to null when the payment goes).
 */
export const bankMatches = pgTable('bank_matches', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  lineId: uuid().notNull(),
  /** A payment on an invoice, a purchase (recorded, or made from the line), or a Stripe payout (its card payments were recorded as they were paid). */
  kind: text().$type<BankMatchKind>().notNull(),
  invoiceId: uuid(),
  paymentId: uuid(),
  purchaseId: uuid(),
  /**
   * The payment or purchase was made from this line: undoing removes it (a purchase only while no
   * receipt has come). A recorded refund or purchase the line was matched to stays.
   */
  made: boolean().notNull().default(false),
  amountPence: integer().notNull(),
  certainty: text().notNull(),
  reasons: jsonb().$type<string[]>().notNull().default([]),
  confirmedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  confirmedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  undoneAt: timestamp({ withTimezone: true }),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'bank_matches_line_fk', columns: [t.firmId, t.lineId], foreignColumns: [bankLines.firmId, bankLines.id] }).onDelete('cascade'),
  foreignKey({ name: 'bank_matches_invoice_fk', columns: [t.firmId, t.invoiceId], foreignColumns: [invoices.firmId, invoices.id] }),
  foreignKey({ name: 'bank_matches_payment_fk', columns: [t.firmId, t.paymentId], foreignColumns: [payments.firmId, payments.id] }),
  foreignKey({ name: 'bank_matches_purchase_fk', columns: [t.firmId, t.purchaseId], foreignColumns: [purchases.firmId, purchases.id] }),
  check('bank_matches_one_thing', sql`(${t.kind} = 'payment' and ${t.invoiceId} is not null and ${t.purchaseId} is null)
    or (${t.kind} = 'purchase' and ${t.purchaseId} is not null and ${t.invoiceId} is null)
    or (${t.kind} = 'payout' and ${t.invoiceId} is null and ${t.purchaseId} is null)`),
  index('bank_matches_line_idx').on(t.firmId, t.lineId),
  index('bank_matches_invoice_idx').on(t.firmId, t.invoiceId).where(sql`${t.invoiceId} is not null`),
  firmPolicy('bank_matches'),
]).enableRLS()
