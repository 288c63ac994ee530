// The last six weeks of the demo firm's small jobs, invoiced without a job record (as the builder's
// overdue invoice is), and the firm's card purchases: so the bank statement the seed writes
// (seeds/statement.ts) has transfers to match. Two homeowners paid by card (Stripe pays those out
// together); the rest is owing until the statement is imported: a reference written oddly, the
// builder paying net of CIS, a landlord paying two at once, a part payment, and two invoices owing
// the same amount. Invented people, streets and figures, for the demo only.
import { and, eq, inArray } from 'drizzle-orm'
import * as schema from '../server/db/schema'
import { londonToday } from '../shared/utils/dates'
import { vatQuarter } from '../shared/utils/periods'
import { day, invoice } from './invoices'
import type { Tx } from './visit'

type Line = { kind: 'labour' | 'materials', description: string, quantityX1000: number, unit: string, unitPence: number, vatRatePercent: number }
const labour = (description: string, pence: number): Line => ({ kind: 'labour', description, quantityX1000: 1000, unit: 'item', unitPence: pence, vatRatePercent: 20 })
const materials = (description: string, pence: number): Line => ({ kind: 'materials', description, quantityX1000: 1000, unit: 'item', unitPence: pence, vatRatePercent: 20 })

/** Two more homeowners of the demo firm (invented people and streets). */
export const RECENT_CUSTOMERS = [
  { kind: 'homeowner' as const, name: 'Edwin Quarrendon', email: 'edwin.quarrendon@example.invalid', phone: '07700 900744', billingLine1: '8 Tenter Yard', billingTown: 'Kettlebury', billingPostcode: 'KB3 2JD', site: { line1: '8 Tenter Yard', town: 'Kettlebury', postcode: 'KB3 2JD' } },
  { kind: 'homeowner' as const, name: 'Morwenna Tilsley', email: 'morwenna.tilsley@example.invalid', phone: '07700 900652', billingLine1: '41 Hopkiln Road', billingTown: 'Kettlebury', billingPostcode: 'KB6 1WQ', site: { line1: '41 Hopkiln Road', town: 'Kettlebury', postcode: 'KB6 1WQ' } },
]

export type RecentKey = 'tilsley-fan' | 'fernhill-pipes' | 'dunmore-landing' | 'barn-stairwell' | 'millbeck-flat2' | 'millbeck-flat5' | 'quarrendon-kitchen' | 'tilsley-hall' | 'fernhill-ceiling'

export interface RecentInvoice {
  key: RecentKey
  customer: string
  /** The site's label, when the customer has more than one. */
  site?: string
  /** Days before the seed runs. */
  issued: number
  vat: 'standard' | 'reverse-charge'
  cis: 20 | null
  lines: Line[]
  /** Paid by card (through Stripe) this many days before the seed runs. */
  paidByCard?: number
}

/**
 * In the order they were issued (numbered after the builder's overdue invoice, before the deposit
 * on the job under way). The statement finds each by its customer and first line.
 */
export const RECENT_INVOICES: RecentInvoice[] = [
  { key: 'tilsley-fan', customer: 'Morwenna Tilsley', issued: -43, vat: 'standard', cis: null, lines: [labour('Make good round the new extractor fan', 70_00), materials('Finish plaster', 10_00)], paidByCard: -41 },
  { key: 'fernhill-pipes', customer: 'Fernhill Homes', issued: -40, vat: 'standard', cis: null, lines: [labour('Flat 1: patch round the new radiator pipes', 150_00), materials('Bonding undercoat and finish plaster', 15_00)], paidByCard: -38 },
  { key: 'dunmore-landing', customer: 'Alys Dunmore', issued: -36, vat: 'standard', cis: null, lines: [labour('Skim the landing ceiling', 290_00), materials('Finish plaster and scrim', 30_00)] },
  // the builder, under CIS at 20% and the reverse charge: due 1,350.00 less 20% of the 1,200.00 labour
  { key: 'barn-stairwell', customer: 'Pribbleworth Scarnholme Builds Ltd', site: 'Barn conversion', issued: -33, vat: 'reverse-charge', cis: 20, lines: [labour('Hollow Barn: board and skim the stairwell', 1200_00), materials('Plasterboard, finish plaster and beads', 150_00)] },
  { key: 'millbeck-flat2', customer: 'Millbeck Lettings', site: 'Flat 2', issued: -30, vat: 'standard', cis: null, lines: [labour('Flat 2: patch the bathroom wall after the tiler', 180_00), materials('Bonding undercoat and finish plaster', 20_00)] },
  { key: 'millbeck-flat5', customer: 'Millbeck Lettings', site: 'Flat 5', issued: -29, vat: 'standard', cis: null, lines: [labour('Flat 5: make good round the new consumer unit', 95_00), materials('Finish plaster', 10_00)] },
  { key: 'quarrendon-kitchen', customer: 'Edwin Quarrendon', issued: -27, vat: 'standard', cis: null, lines: [labour('Skim the kitchen and utility room', 720_00), materials('Finish plaster, beads and scrim', 80_00)] },
  // owes what Alys Dunmore's landing owes, to the penny
  { key: 'tilsley-hall', customer: 'Morwenna Tilsley', issued: -24, vat: 'standard', cis: null, lines: [labour('Patch and skim the hall', 290_00), materials('Bonding undercoat and finish plaster', 30_00)] },
  { key: 'fernhill-ceiling', customer: 'Fernhill Homes', site: 'Flat 1', issued: -22, vat: 'standard', cis: null, lines: [labour('Flat 1: skim the bathroom ceiling', 210_00), materials('Finish plaster and scrim', 30_00)] },
]

/** Bought on the firm's card in the last six weeks (invented suppliers and figures). */
export const RECENT_PURCHASES = [
  { day: -34, supplier: 'Weir Valley Plaster Supplies', category: 'materials' as const, netPence: 122_40, vatPence: 24_48, reference: 'WVP-2388' },
  { day: -19, supplier: 'Kettlebury Builders\' Merchants', category: 'materials' as const, netPence: 64_50, vatPence: 12_90, reference: 'KBM-55702' },
  { day: -8, supplier: 'Trowel & Hawk Tool Hire', category: 'tools' as const, netPence: 45_00, vatPence: 9_00, reference: 'TH-10217', notes: 'Mixing drill, two days.' },
]

export async function seedRecent(tx: Tx, o: { firmId: string, prefix: string, termsDays: number, officeId: string, firstNumber: number }) {
  const { firmId } = o
  for (const { site, ...c } of RECENT_CUSTOMERS) {
    const [row] = await tx.insert(schema.customers).values({ firmId, ...c }).returning({ id: schema.customers.id })
    await tx.insert(schema.sites).values({ firmId, customerId: row!.id, ...site })
  }
  const names = [...new Set(RECENT_INVOICES.map(i => i.customer))]
  const found = await tx.select({ id: schema.customers.id, name: schema.customers.name, siteId: schema.sites.id, label: schema.sites.label })
    .from(schema.customers)
    .innerJoin(schema.sites, and(eq(schema.sites.firmId, schema.customers.firmId), eq(schema.sites.customerId, schema.customers.id)))
    .where(and(eq(schema.customers.firmId, firmId), inArray(schema.customers.name, names)))
  let number = o.firstNumber
  for (const r of RECENT_INVOICES) {
    const sites = found.filter(f => f.name === r.customer)
    const at = r.site ? sites.find(s => s.label === r.site) : sites[0]
    if (!at) throw new Error(`the demo has no customer ${r.customer} with the site ${r.site ?? '(any)'}`)
    const made = await invoice(tx, {
      firmId, number: number++, prefix: o.prefix, kind: 'blank', customerId: at.id, siteId: at.siteId, jobId: null, vat: r.vat, cis: r.cis,
      issued: r.issued, termsDays: o.termsDays, lines: r.lines, by: o.officeId,
    })
    if (r.paidByCard !== undefined) {
      await tx.insert(schema.payments).values({ firmId, invoiceId: made.id, method: 'card', amountPence: made.totals.amountDuePence, receivedOn: day(r.paidByCard), reference: 'Card payment', recordedBy: o.officeId })
    }
  }
  // never in the demo quarter (seeds/quarter.ts): its purchases are worked by hand in the quarter's test
  const quarterStart = vatQuarter(londonToday(), 1).start
  for (const { day: d, notes, ...p } of RECENT_PURCHASES) {
    const boughtOn = day(d) < quarterStart ? quarterStart : day(d)
    await tx.insert(schema.purchases).values({ firmId, ...p, boughtOn, notes: notes ?? '', createdBy: o.officeId })
  }
  return { invoices: RECENT_INVOICES.length }
}
