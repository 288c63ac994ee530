// The price book, the materials catalogue, and quotes with their versions and lines.
// Money is integer pence; quantities are integers in the smallest unit (thousandths of the
// unit: a quantity of 12.345 m² is 12345), so no float is ever stored.
import { sql } from 'drizzle-orm'
import { boolean, foreignKey, index, integer, jsonb, pgEnum, pgPolicy, pgTable, primaryKey, text, timestamp, unique, uniqueIndex, uuid } from 'drizzle-orm/pg-core'
import { firmColumn, sameFirm, timestamps } from './common'
import { firms } from './firms'
import { customers, enquiries, sites } from './ledger'
import { users } from './users'
import { visits } from './visits'

const firmPolicy = (name: string) => pgPolicy(`${name}_firm`, { for: 'all', using: sameFirm, withCheck: sameFirm })

export const materialType = pgEnum('material_type', ['finish', 'bonding-undercoat', 'browning', 'bead', 'scrim', 'bonding-agent', 'other'])
export const quotePricing = pgEnum('quote_pricing', ['measure', 'days', 'fixed'])
export const quoteStatus = pgEnum('quote_status', ['draft', 'sent', 'accepted', 'declined', 'superseded'])
export const lineKind = pgEnum('line_kind', ['labour', 'materials'])
export const vatTreatment = pgEnum('vat_treatment', ['standard', 'reverse-charge', 'not-registered'])

/** A making-good item the firm prices by the item (or by its own unit), not by measure. */
export interface MakingGoodItem { name: string, unit: string, pricePence: number }

/** One room's share of the materials estimate, at cost, as worked out when the draft was made from the visit. */
export interface RoomEstimate { roomName: string, materials: { name: string, packs: number, packLabel: string, costPence: number, derivation: string }[] }

/** The firm's rates and rules for pricing by measure (one row per firm). */
export const priceBooks = pgTable('price_books', {
  firmId: firmColumn().primaryKey().references(() => firms.id, { onDelete: 'cascade' }),
  skimWallsPerM2Pence: integer().notNull().default(0),
  skimCeilingsPerM2Pence: integer().notNull().default(0),
  undercoatPerM2Pence: integer().notNull().default(0),
  revealsPerLmPence: integer().notNull().default(0),
  beadsPerLmPence: integer().notNull().default(0),
  scrimPerLmPence: integer().notNull().default(0),
  materialsMarkupPercent: integer().notNull().default(0),
  /** Making good priced as items (a switch box, a patch round a new pipe), added to a quote as labour lines. */
  makingGoodItems: jsonb().$type<MakingGoodItem[]>().notNull().default([]),
  /** Voids up to this area are left in (0: deduct every opening; 5000 cm² = 0.5 m², the older rule). */
  minDeductCm2: integer().notNull().default(0),
  /** Reveals and strips up to this width are priced by the linear metre. */
  narrowMaxMm: integer().notNull().default(300),
  beadStockLengthsMm: jsonb().$type<number[]>().notNull().default([2500, 3000]),
  beadWastePercent: integer().notNull().default(10),
  materialsWastePercent: integer().notNull().default(10),
  /** For the days estimate: square metres of skim one person finishes in a day (rule of thumb). */
  m2PerDay: integer().notNull().default(30),
  /** Drying before decorating, in days (shared/utils/jobs.ts DEFAULT_DRYING): rules of thumb the firm can change. */
  drySkimDays: integer().notNull().default(7),
  dryUndercoatDays: integer().notNull().default(14),
  dryColdOrDampExtraDays: integer().notNull().default(7),
  /** For the set planner: an internal corner with a return narrower than this is a difficult one. */
  cornerTrowelMm: integer().notNull().default(100),
  /** ...and so is one where a wall is out of true by more than this. */
  outOfTrueToleranceMm: integer().notNull().default(10),
  /** What one person lays on and trowels up in a set, in bags (a rule of thumb the firm sets). */
  bagsPerPersonPerSet: integer().notNull().default(3),
  /** The set planner puts each room's ceiling in a set no later than its walls (common practice: plaster dropped from a ceiling spoils finished walls). */
  ceilingsFirst: boolean().notNull().default(true),
  /** For the day's timeline: minutes to mix a set (rule of thumb the firm sets). */
  mixMinutes: integer().notNull().default(15),
  /** ...and minutes from laying on until finish plaster has gone off and is trowelled up (common practice: about 1.5 to 2 hours). */
  goOffMinutes: integer().notNull().default(105),
  /** The working day for the timeline, in minutes after midnight (08:00 to 16:30 unless the firm says otherwise). */
  dayStartMinutes: integer().notNull().default(480),
  dayEndMinutes: integer().notNull().default(990),
  /** Packing out a bead, per metre of bead packed (labour, on top of fitting it). */
  packedBeadPerLmPence: integer().notNull().default(0),
  /** Making good a narrow return (narrower than the corner trowel), per metre of corner. */
  narrowReturnPerLmPence: integer().notNull().default(0),
  /** The quote's PDF carries "How we'll do the work": each measured room drawn set by set (the firm can leave it off). */
  quoteWorkPage: boolean().notNull().default(true),
  ...timestamps,
}, () => [firmPolicy('price_books')]).enableRLS()

/** The firm's materials: what a pack is, what it covers, what it costs. */
export const materials = pgTable('materials', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  key: text().notNull(),
  type: materialType().notNull(),
  name: text().notNull(),
  packLabel: text().notNull(),
  /** m² per pack (in cm², so 10.5 m² is 105000) at atThicknessMm; or metres per pack (in mm) for beads and scrim. */
  coverageCm2PerPack: integer(),
  atThicknessMm: integer(),
  coverageMmPerPack: integer(),
  costPence: integer().notNull(),
  supplier: text().notNull().default(''),
  source: text().notNull().default(''),
  active: boolean().notNull().default(true),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('materials_firm_key_unique').on(t.firmId, t.key),
  firmPolicy('materials'),
]).enableRLS()

/** A quote for a customer's site; its content lives in versions (a sent version is never edited). */
export const quotes = pgTable('quotes', {
  firmId: firmColumn().references(() => firms.id, { onDelete: 'cascade' }),
  id: uuid().notNull().defaultRandom(),
  number: integer().notNull(),
  customerId: uuid().notNull(),
  siteId: uuid(),
  enquiryId: uuid(),
  visitId: uuid(),
  currentVersion: integer().notNull().default(1),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('quotes_firm_number_unique').on(t.firmId, t.number),
  foreignKey({ name: 'quotes_customer_fk', columns: [t.firmId, t.customerId], foreignColumns: [customers.firmId, customers.id] }),
  foreignKey({ name: 'quotes_site_fk', columns: [t.firmId, t.siteId], foreignColumns: [sites.firmId, sites.id] }),
  foreignKey({ name: 'quotes_enquiry_fk', columns: [t.firmId, t.enquiryId], foreignColumns: [enquiries.firmId, enquiries.id] }).onDelete('set null'),
  foreignKey({ name: 'quotes_visit_fk', columns: [t.firmId, t.visitId], foreignColumns: [visits.firmId, visits.id] }).onDelete('set null'),
  index('quotes_customer_idx').on(t.firmId, t.customerId),
  // Today: is there a quote made from this visit?
  index('quotes_visit_idx').on(t.firmId, t.visitId).where(sql`${t.visitId} is not null`),
  firmPolicy('quotes'),
]).enableRLS()

export const quoteVersions = pgTable('quote_versions', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  quoteId: uuid().notNull(),
  version: integer().notNull(),
  status: quoteStatus().notNull().default('draft'),
  pricing: quotePricing().notNull().default('measure'),
  /** Estimated days in hundredths (2.5 days = 250), shown however the quote is priced. */
  estimatedDaysX100: integer().notNull().default(0),
  fixedPricePence: integer(),
  /** The firm's day rate when the draft was last saved, for pricing by days. */
  dayRatePence: integer().notNull().default(0),
  vat: vatTreatment().notNull(),
  vatRatePercent: integer().notNull().default(20),
  cisRatePercent: integer(),
  validUntil: text().notNull(),
  terms: text().notNull().default(''),
  notes: text().notNull().default(''),
  cautions: jsonb().$type<string[]>().notNull().default([]),
  /** The void rule and options the take-off used, shown on the quote. */
  rules: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  /** The materials estimate room by room (at cost), from the visit the draft was made from; the lines hold the whole-quote estimate. */
  roomEstimates: jsonb().$type<RoomEstimate[]>().notNull().default([]),
  /** The totals as computed when the version was last saved (shared/utils/tax.ts invoiceTotals). */
  totals: jsonb().$type<Record<string, number>>().notNull().default({}),
  sentAt: timestamp({ withTimezone: true }),
  /** The customer's link: only its hash is kept; it expires. */
  tokenHash: text(),
  tokenExpiresAt: timestamp({ withTimezone: true }),
  respondedAt: timestamp({ withTimezone: true }),
  acceptedName: text(),
  respondedIp: text(),
  declineReason: text(),
  createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  unique('quote_versions_quote_version_unique').on(t.firmId, t.quoteId, t.version),
  // unique within the firm; token_hash first, so a link from before links carried their firm is found by it alone
  unique('quote_versions_token_unique').on(t.tokenHash, t.firmId),
  // one accepted version per quote at most: the database holds it whatever runs at once (issue 13)
  // Today: versions sent and waiting, or accepted (the job to book): a few among many superseded and done
  index('quote_versions_open_idx').on(t.firmId, t.status, t.sentAt).where(sql`${t.status} in ('sent', 'accepted')`),
  uniqueIndex('quote_versions_one_accepted').on(t.firmId, t.quoteId).where(sql`${t.status} = 'accepted'`),
  foreignKey({ name: 'quote_versions_quote_fk', columns: [t.firmId, t.quoteId], foreignColumns: [quotes.firmId, quotes.id] }).onDelete('cascade'),
  // someone holding the customer's link sees only that version (app.quote_token_hash), as with invitations
  pgPolicy('quote_versions_by_token', { for: 'select', using: sql`token_hash = nullif(current_setting('app.quote_token_hash', true), '')` }),
  firmPolicy('quote_versions'),
]).enableRLS()

export const quoteLines = pgTable('quote_lines', {
  firmId: firmColumn(),
  id: uuid().notNull().defaultRandom(),
  versionId: uuid().notNull(),
  position: integer().notNull().default(0),
  kind: lineKind().notNull(),
  description: text().notNull(),
  /** Thousandths of the unit (12.345 m² = 12345). */
  quantityX1000: integer().notNull(),
  unit: text().notNull(),
  unitPence: integer().notNull(),
  vatRatePercent: integer().notNull().default(20),
  derivation: text().notNull().default(''),
}, t => [
  primaryKey({ columns: [t.firmId, t.id] }),
  foreignKey({ name: 'quote_lines_version_fk', columns: [t.firmId, t.versionId], foreignColumns: [quoteVersions.firmId, quoteVersions.id] }).onDelete('cascade'),
  index('quote_lines_version_idx').on(t.firmId, t.versionId, t.position),
  firmPolicy('quote_lines'),
]).enableRLS()
