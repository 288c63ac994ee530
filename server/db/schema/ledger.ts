// The front of the ledger: customers, their sites, enquiries and their history.
import { sql } from 'drizzle-orm'
import { boolean, date, foreignKey, index, integer, pgEnum, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core'
import { CUSTOMER_KINDS, ENQUIRY_SOURCES, ENQUIRY_STATUSES } from '../../../shared/utils/ledger'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { users } from './users'

export const customerKind = pgEnum('customer_kind', CUSTOMER_KINDS)
export const enquirySource = pgEnum('enquiry_source', ENQUIRY_SOURCES)
export const enquiryStatus = pgEnum('enquiry_status', ENQUIRY_STATUSES)

const firmPolicies = (name: string) => [
  pgPolicy(`${name}_firm`, { for: 'all', using: sameFirm, withCheck: sameFirm }),
]

/**
 * Who the work is for. The tax flags (VAT, CIS, end user) decide VAT, the reverse charge and CIS
 * on invoices later; shared/schemas/customer.ts validates them together.
 */
export const customers = pgTable('customers', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  kind: customerKind().notNull(),
  name: text().notNull(),
  contactName: text().notNull().default(''),
  email: text().notNull().default(''),
  phone: text().notNull().default(''),
  billingLine1: text().notNull().default(''),
  billingLine2: text().notNull().default(''),
  billingTown: text().notNull().default(''),
  billingPostcode: text().notNull().default(''),
  notes: text().notNull().default(''),
  vatRegistered: boolean().notNull().default(false),
  vatNumber: text(),
  /** They pay us as a CIS contractor, deducting at this rate (0 gross, 20 registered, 30 not). */
  paysUnderCis: boolean().notNull().default(false),
  cisRatePercent: integer(),
  /** They told us in writing they are an end user or intermediary (no reverse charge). */
  endUserNotified: boolean().notNull().default(false),
  /** A key from an import (normalised e-mail, or name and postcode), so re-running a file writes nothing new. */
  importKey: text(),
  /** Lower-cased name, e-mail, postcode and phone digits, for the trigram search index. */
  searchText: text().generatedAlwaysAs(sql`lower(name || ' ' || email || ' ' || replace(billing_postcode, ' ', '') || ' ' || regexp_replace(phone, '[^0-9]', '', 'g'))`),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('customers_import_key_unique').on(t.firmId, t.importKey),
  index('customers_search_idx').using('gin', t.searchText.op('gin_trgm_ops')),
  // with the id: the customers list finds a page by name from the index alone (npm run bench)
  index('customers_firm_name_idx').on(t.firmId, t.name, t.id),
  index('customers_firm_created_idx').on(t.firmId, t.createdAt),
  ...firmPolicies('customers'),
]).enableRLS()

/** An address where work happens. */
export const sites = pgTable('sites', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  customerId: uuid().notNull(),
  label: text().notNull().default(''),
  line1: text().notNull(),
  line2: text().notNull().default(''),
  town: text().notNull().default(''),
  postcode: text().notNull().default(''),
  accessNotes: text().notNull().default(''),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'sites_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }).onDelete('cascade'),
  index('sites_customer_idx').on(t.firmId, t.customerId),
  ...firmPolicies('sites'),
]).enableRLS()

/** Someone asked for work: what, where, when, and how it is going. */
export const enquiries = pgTable('enquiries', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  customerId: uuid().notNull(),
  siteId: uuid(),
  source: enquirySource().notNull(),
  description: text().notNull(),
  preferredDates: text().notNull().default(''),
  followUpOn: date({ mode: 'string' }),
  status: enquiryStatus().notNull().default('new'),
  lostReason: text(),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'enquiries_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }).onDelete('cascade'),
  foreignKey({ name: 'enquiries_site_fk', columns: [t.firmId, t.siteId], foreignColumns: [sites.firmId, sites.id] }),
  index('enquiries_status_idx').on(t.firmId, t.status, t.createdAt),
  ...firmPolicies('enquiries'),
]).enableRLS()

/** Each move of an enquiry's status: who, when, and the reason when lost. */
export const enquiryEvents = pgTable('enquiry_events', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  enquiryId: uuid().notNull(),
  fromStatus: enquiryStatus(),
  toStatus: enquiryStatus().notNull(),
  reason: text(),
  byUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
  at: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'enquiry_events_enquiry_fk', columns: [t.firmId, t.enquiryId], foreignColumns: [enquiries.firmId, enquiries.id] }).onDelete('cascade'),
  index('enquiry_events_enquiry_idx').on(t.firmId, t.enquiryId, t.at),
  ...firmPolicies('enquiry_events'),
]).enableRLS()
