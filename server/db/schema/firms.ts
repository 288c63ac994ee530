import { sql } from 'drizzle-orm'
import { boolean, index, integer, pgEnum, pgPolicy, pgTable, text, uuid } from 'drizzle-orm/pg-core'
import { timestamps } from './common'

export const cisStatus = pgEnum('cis_status', ['not-registered', 'registered', 'gross'])

/** A plastering firm: the tenant. Everything firm-owned points here through firm_id. */
export const firms = pgTable('firms', {
  id: uuid().primaryKey().defaultRandom(),
  tradingName: text().notNull(),
  addressLine1: text().notNull().default(''),
  addressLine2: text().notNull().default(''),
  town: text().notNull().default(''),
  postcode: text().notNull().default(''),
  email: text().notNull().default(''),
  phone: text().notNull().default(''),
  vatRegistered: boolean().notNull().default(false),
  vatNumber: text(),
  /** Which months the firm's VAT quarters end in (shared/utils/periods.ts vatQuarter): 1 March/June/..., 2 April/..., 3 May/.... */
  vatStagger: integer().$type<1 | 2 | 3>().notNull().default(1),
  /** On HMRC's cash accounting scheme: VAT counted when money moves, not when invoices are issued. */
  vatCashAccounting: boolean().notNull().default(false),
  cisStatus: cisStatus().notNull().default('not-registered'),
  utr: text(),
  dayRatePence: integer().notNull().default(0),
  paymentTermsDays: integer().notNull().default(30),
  /** Days after a quote is sent before Today asks the firm to follow it up (shared/utils/next-actions.ts). */
  quoteChaseDays: integer().notNull().default(7),
  /**
   * The firm's letters at the front of its references (shared/utils/references.ts): the initials of
   * the trading name when the firm is made ("Brackenridge Plastering" gives BP), which the owner can change.
   */
  referenceLetters: text().notNull().default(''),
  /** Blank means the firm's letters then a dash: BP-12 (shared/utils/references.ts invoicePrefixOf). */
  invoicePrefix: text().notNull().default(''),
  /** Credit notes numbered with the invoices ('shared') or in a series of their own ('own', with their prefix). */
  creditNoteNumbering: text().$type<'shared' | 'own'>().notNull().default('own'),
  /** Blank means the firm's letters then -C: BP-C3. */
  creditNotePrefix: text().notNull().default(''),
  /** Whether invoices offer payment by bank transfer: then the three fields below must be filled in before one is issued. */
  takesTransfer: boolean().notNull().default(true),
  /** The name on the firm's bank account, as a payer's bank checks it. */
  bankAccountName: text().notNull().default(''),
  /** Six digits, kept without dashes (shared/utils/bank-details.ts). */
  bankSortCode: text().notNull().default(''),
  /** Eight digits. */
  bankAccountNumber: text().notNull().default(''),
  /**
   * The secret part of the firm's public enquiry form link; the owner can reset it. The link
   * carries the firm's id in front (server/utils/tokens.ts publicFormKey), so the key is looked up
   * with the firm's id; not unique on its own (firms are spread across servers by id).
   */
  enquiryFormKey: text().notNull().default(sql`replace(gen_random_uuid()::text, '-', '')`),
  ...timestamps,
}, t => [
  // links made before links carried their firm name the key alone (server/utils/public-form.ts)
  index('firms_enquiry_form_key_idx').on(t.enquiryFormKey),
  // A firm is visible when it is the current firm, or one the signed-in person belongs to (the firm switcher).
  pgPolicy('firms_visible', {
    for: 'select',
    // ...and the firm behind a public enquiry form link, to someone holding that link (app.enquiry_form_key)
    using: sql`id = app_firm_id() or id in (select m.firm_id from memberships m where m.user_id = app_user_id()) or enquiry_form_key = nullif(current_setting('app.enquiry_form_key', true), '')`,
  }),
  // the background jobs' sweep (server/plugins/jobs.ts) lists the firms, in its own transaction only
  pgPolicy('firms_job_sweep', { for: 'select', using: sql`current_setting('app.job_sweep', true) = 'on'` }),
  pgPolicy('firms_write', {
    for: 'all',
    using: sql`id = app_firm_id()`,
    withCheck: sql`id = app_firm_id()`,
  }),
]).enableRLS()
