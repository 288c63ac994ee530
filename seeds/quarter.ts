// A quarter of invented activity for the demo firm, in the VAT quarter before the one today falls
// in: four jobs done, invoiced and paid (one a homeowner's, one a landlord's, two for a builder
// under CIS and the reverse charge), a credit note, purchases tied to the jobs and the firm's own
// running costs, and the builder's CIS statement for one of the two tax months. The accountant's
// quarter, the CIS page and the profit table have something true to show. Invented figures,
// people and streets, for the demo only.
import { randomUUID } from 'node:crypto'
import * as schema from '../server/db/schema'
import { addDays, londonToday } from '../shared/utils/dates'
import { cisTaxMonth, vatQuarter } from '../shared/utils/periods'
import { firmLetters, invoiceReference, jobReference } from '../shared/utils/references'
import { DEMO_FIRM } from './demo'
import { invoiceTotals } from '../shared/utils/tax'
import type { Tx } from './visit'

type Line = { kind: 'labour' | 'materials', description: string, quantityX1000: number, unit: string, unitPence: number, vatRatePercent: number }
type People = { ownerId: string, officeId: string, crewId: string }

const todayIso = () => londonToday()

/** The VAT quarter (stagger 1, the demo firm's) before today's: where the demo quarter happens. */
export function demoQuarter(today = todayIso()) {
  const current = vatQuarter(today, 1)
  return vatQuarter(addDays(current.start, -1), 1)
}

const at = (iso: string, hh: number) => new Date(`${iso}T${String(hh).padStart(2, '0')}:00:00Z`)

export async function seedQuarter(tx: Tx, o: { firmId: string, prefix: string, termsDays: number, people: People, pribbleworth: string }) {
  const { firmId, people } = o
  const q = demoQuarter()
  const on = (days: number) => addDays(q.start, days)

  // customers of the quarter (invented), and a new plot for the builder
  const customer = async (c: typeof schema.customers.$inferInsert, site: { line1: string, town: string, postcode: string, label?: string }) => {
    const [row] = await tx.insert(schema.customers).values({ ...c, firmId }).returning({ id: schema.customers.id })
    const [s] = await tx.insert(schema.sites).values({ firmId, customerId: row!.id, ...site }).returning({ id: schema.sites.id })
    return { id: row!.id, siteId: s!.id }
  }
  const dunmore = await customer({ firmId, kind: 'homeowner', name: 'Alys Dunmore', email: 'alys.dunmore@example.invalid', phone: '07700 900561', billingLine1: '27 Ropewalk Lane', billingTown: 'Kettlebury', billingPostcode: 'KB2 5NS' }, { line1: '27 Ropewalk Lane', town: 'Kettlebury', postcode: 'KB2 5NS' })
  const fernhill = await customer({ firmId, kind: 'landlord', name: 'Fernhill Homes', contactName: 'Rhodri Penn', email: 'rhodri@fernhill-homes.example', phone: '01632 960 774', billingLine1: '2 Chandlers Court', billingTown: 'Kettlebury', billingPostcode: 'KB1 2GH', endUserNotified: true }, { label: 'Flat 1', line1: 'Flat 1, 9 Maltings Walk', town: 'Kettlebury', postcode: 'KB1 6TT' })
  const [plot3] = await tx.insert(schema.sites).values({ firmId, customerId: o.pribbleworth, label: 'Weir Meadow plot 3', line1: 'Plot 3, Weir Meadow', town: 'Lower Kettlebury', postcode: 'KB7 4EE' }).returning({ id: schema.sites.id })
  const [plot4] = await tx.insert(schema.sites).values({ firmId, customerId: o.pribbleworth, label: 'Weir Meadow plot 4', line1: 'Plot 4, Weir Meadow', town: 'Lower Kettlebury', postcode: 'KB7 4EE' }).returning({ id: schema.sites.id })

  let jobNumber = 0
  let invoiceNumber = 0
  interface DemoJob {
    customerId: string
    siteId: string
    title: string
    vat: 'standard' | 'reverse-charge'
    cis: 20 | null
    days: { day: number, who: 'owner' | 'crew', half?: boolean }[]
    lines: Line[]
    issued: number
    paid: { day: number, method: 'transfer' | 'card' | 'cash', reference: string }[]
  }
  async function job(j: DemoJob) {
    const number = ++jobNumber
    const totals = invoiceTotals(j.lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })), { vat: j.vat, cisRatePercent: j.cis })
    const first = Math.min(...j.days.map(d => d.day))
    const last = Math.max(...j.days.map(d => d.day))
    const [row] = await tx.insert(schema.jobs).values({
      firmId, number, title: j.title, customerId: j.customerId, siteId: j.siteId, status: 'paid',
      labourNetPence: totals.labourNetPence, materialsNetPence: totals.materialsNetPence, netPence: totals.netPence, grossPence: totals.grossPence,
      estimatedDaysX100: j.days.reduce((s, d) => s + (d.half ? 50 : 100), 0), createdBy: people.officeId,
    }).returning({ id: schema.jobs.id })
    const jobId = row!.id
    const paidOn = Math.max(...j.paid.map(p => p.day))
    await tx.insert(schema.jobStatusChanges).values([
      { firmId, jobId, fromStatus: null, toStatus: 'booked', changedBy: people.officeId, changedAt: at(on(first - 10), 9) },
      { firmId, jobId, fromStatus: 'booked', toStatus: 'in-progress', reason: 'First set logged', changedBy: people.crewId, changedAt: at(on(first), 11) },
      { firmId, jobId, fromStatus: 'in-progress', toStatus: 'finished', changedBy: people.ownerId, changedAt: at(on(last), 16) },
      { firmId, jobId, fromStatus: 'finished', toStatus: 'invoiced', reason: 'Final invoice issued', changedBy: people.officeId, changedAt: at(on(j.issued), 10) },
      { firmId, jobId, fromStatus: 'invoiced', toStatus: 'paid', reason: 'Paid in full', changedBy: people.officeId, changedAt: at(on(paidOn), 12) },
    ])
    await tx.insert(schema.jobDays).values(j.days.map(d => ({ firmId, jobId, day: on(d.day), userId: d.who === 'owner' ? people.ownerId : people.crewId, portion: d.half ? 'half-day' as const : 'day' as const, worked: true })))
    const id = randomUUID()
    const n = ++invoiceNumber
    await tx.insert(schema.invoices).values({
      firmId, id, kind: 'final', series: 'invoice', number: n, reference: invoiceReference(o.prefix, n), customerId: j.customerId, siteId: j.siteId, jobId,
      vat: j.vat, cisRatePercent: j.cis, issuedOn: on(j.issued), dueOn: on(j.issued + o.termsDays), totals: { ...totals }, amountDuePence: totals.amountDuePence, createdBy: people.officeId,
    })
    await tx.insert(schema.invoiceLines).values(j.lines.map((l, i) => ({ firmId, invoiceId: id, position: i, ...l })))
    return { jobId, invoiceId: id, totals, reference: jobReference(firmLetters(DEMO_FIRM.tradingName), number) }
  }
  const labour = (description: string, pence: number): Line => ({ kind: 'labour', description, quantityX1000: 1000, unit: 'item', unitPence: pence, vatRatePercent: 20 })
  const materials = (description: string, pence: number): Line => ({ kind: 'materials', description, quantityX1000: 1000, unit: 'item', unitPence: pence, vatRatePercent: 20 })
  const pay = async (invoiceId: string, amountPence: number, p: { day: number, method: 'transfer' | 'card' | 'cash', reference: string }) =>
    tx.insert(schema.payments).values({ firmId, invoiceId, method: p.method, amountPence, receivedOn: on(p.day), reference: p.reference, recordedBy: people.officeId })

  // 1. a homeowner's front room and hall; a credit note for beads not used, then paid the rest
  const front = await job({
    customerId: dunmore.id, siteId: dunmore.siteId, title: 'Skim the front room and hall', vat: 'standard', cis: null,
    days: [{ day: 8, who: 'owner' }, { day: 9, who: 'owner' }, { day: 8, who: 'crew' }, { day: 9, who: 'crew', half: true }],
    lines: [labour('Skim the front room walls and ceiling, and the hall', 780_00), materials('Finish plaster, beads and scrim', 95_00)], issued: 11, paid: [{ day: 20, method: 'transfer', reference: 'DUNMORE 27 ROPEWALK' }],
  })
  const noteId = randomUUID()
  const noteTotals = invoiceTotals([{ kind: 'materials', quantity: 1, unitPence: 20_00, vatRatePercent: 20 }], { vat: 'standard', cisRatePercent: null })
  await tx.insert(schema.invoices).values({
    firmId, id: noteId, kind: 'credit-note', series: 'credit-note', number: 1, reference: 'CN-0001', customerId: dunmore.id, siteId: dunmore.siteId, jobId: front.jobId,
    creditsInvoiceId: front.invoiceId, vat: 'standard', issuedOn: on(13), totals: { ...noteTotals }, amountDuePence: noteTotals.amountDuePence, notes: 'Angle beads returned unused.', createdBy: people.officeId,
  })
  await tx.insert(schema.invoiceLines).values({ firmId, invoiceId: noteId, position: 0, kind: 'materials', description: 'Angle beads returned unused', quantityX1000: 1000, unit: 'item', unitPence: 20_00, vatRatePercent: 20 })
  await pay(front.invoiceId, front.totals.amountDuePence - noteTotals.amountDuePence, { day: 20, method: 'transfer', reference: 'DUNMORE 27 ROPEWALK' })

  // 2. a landlord's flat kitchen, paid by card
  const kitchen = await job({
    customerId: fernhill.id, siteId: fernhill.siteId, title: 'Patch and skim the Flat 1 kitchen', vat: 'standard', cis: null,
    days: [{ day: 24, who: 'owner' }, { day: 25, who: 'owner', half: true }],
    lines: [labour('Patch back to brick and skim the kitchen walls', 420_00), materials('Bonding undercoat and finish plaster', 60_00)], issued: 26, paid: [{ day: 33, method: 'card', reference: 'Card payment' }],
  })
  await pay(kitchen.invoiceId, kitchen.totals.amountDuePence, { day: 33, method: 'card', reference: 'Card payment' })

  // 3 and 4. the builder's plots, under CIS at 20% and the reverse charge; paid less the deduction
  const p3 = await job({
    customerId: o.pribbleworth, siteId: plot3!.id, title: 'Weir Meadow plot 3: undercoat and skim throughout', vat: 'reverse-charge', cis: 20,
    days: [30, 31, 32, 35].flatMap(day => [{ day, who: 'owner' as const }, { day, who: 'crew' as const }]),
    lines: [labour('Plot 3: undercoat and skim, ground and first floors', 2400_00), materials('Bonding, finish plaster and beads', 380_00)], issued: 36, paid: [{ day: 41, method: 'transfer', reference: 'PRIBBLEWORTH PLOT 3' }],
  })
  await pay(p3.invoiceId, p3.totals.amountDuePence, { day: 41, method: 'transfer', reference: 'PRIBBLEWORTH PLOT 3' })
  const p4 = await job({
    customerId: o.pribbleworth, siteId: plot4!.id, title: 'Weir Meadow plot 4: skim throughout', vat: 'reverse-charge', cis: 20,
    days: [62, 63, 64].flatMap(day => [{ day, who: 'owner' as const }, { day, who: 'crew' as const }]),
    lines: [labour('Plot 4: skim walls and ceilings throughout', 1600_00), materials('Finish plaster and beads', 240_00)], issued: 66, paid: [{ day: 84, method: 'transfer', reference: 'PRIBBLEWORTH PLOT 4' }],
  })
  await pay(p4.invoiceId, p4.totals.amountDuePence, { day: 84, method: 'transfer', reference: 'PRIBBLEWORTH PLOT 4' })

  // the builder's statement for plot 3's tax month, as it arrived: it agrees with what was paid
  await tx.insert(schema.cisStatements).values({
    firmId, customerId: o.pribbleworth, taxMonthStart: cisTaxMonth(on(41)).start, grossPence: p3.totals.netPence, materialsPence: p3.totals.materialsNetPence,
    deductionPence: p3.totals.cisDeductionPence, reference: 'SB-CIS-0412', createdBy: people.officeId,
  })

  // purchases: materials for the jobs, a labourer on plot 3, and the firm's own running costs
  const purchase = async (p: { day: number, supplier: string, category: 'materials' | 'tools' | 'fuel' | 'vehicle' | 'labour' | 'other', netPence: number, vatPence: number, reference: string, jobs?: { jobId: string, netPence: number }[], notes?: string }) => {
    const [row] = await tx.insert(schema.purchases).values({ firmId, supplier: p.supplier, boughtOn: on(p.day), category: p.category, netPence: p.netPence, vatPence: p.vatPence, reference: p.reference, notes: p.notes ?? '', createdBy: people.officeId }).returning({ id: schema.purchases.id })
    if (p.jobs?.length) await tx.insert(schema.purchaseJobs).values(p.jobs.map(j => ({ firmId, purchaseId: row!.id, ...j })))
  }
  await purchase({ day: 6, supplier: 'Kettlebury Builders\' Merchants', category: 'materials', netPence: 88_40, vatPence: 17_68, reference: 'KBM-55120', jobs: [{ jobId: front.jobId, netPence: 88_40 }] })
  await purchase({ day: 22, supplier: 'Kettlebury Builders\' Merchants', category: 'materials', netPence: 97_20, vatPence: 19_44, reference: 'KBM-55361', jobs: [{ jobId: kitchen.jobId, netPence: 52_80 }, { jobId: p3.jobId, netPence: 44_40 }] })
  await purchase({ day: 29, supplier: 'Weir Valley Plaster Supplies', category: 'materials', netPence: 312_00, vatPence: 62_40, reference: 'WVP-2207', jobs: [{ jobId: p3.jobId, netPence: 312_00 }] })
  await purchase({ day: 36, supplier: 'Dylan Aske (labourer)', category: 'labour', netPence: 300_00, vatPence: 0, reference: 'Week 32', jobs: [{ jobId: p3.jobId, netPence: 300_00 }], notes: 'Four days mixing and clearing on plot 3.' })
  await purchase({ day: 60, supplier: 'Weir Valley Plaster Supplies', category: 'materials', netPence: 198_50, vatPence: 39_70, reference: 'WVP-2291', jobs: [{ jobId: p4.jobId, netPence: 198_50 }] })
  await purchase({ day: 14, supplier: 'Hobblecote Fuel Stop', category: 'fuel', netPence: 62_50, vatPence: 12_50, reference: 'Pump 4' })
  await purchase({ day: 47, supplier: 'Hobblecote Fuel Stop', category: 'fuel', netPence: 58_75, vatPence: 11_75, reference: 'Pump 2' })
  await purchase({ day: 40, supplier: 'Trowel & Hawk Tool Hire', category: 'tools', netPence: 149_99, vatPence: 30_00, reference: 'TH-9931', notes: 'New finishing trowel and mixing paddle.' })
  await purchase({ day: 70, supplier: 'Saltmarsh Garage', category: 'vehicle', netPence: 210_00, vatPence: 42_00, reference: 'Van service' })

  return { jobs: jobNumber, invoices: invoiceNumber }
}
