// Demo invoices: the deposit on the job under way (paid by transfer), and an overdue invoice to
// Pribbleworth Scarnholme Builds Ltd (a VAT- and CIS-registered builder: reverse charge, CIS at 20%) with a
// reminder already sent, so "What is owed" and the late-payment claim have something to show.
// Invented figures, for the demo only.
import { randomUUID } from 'node:crypto'
import * as schema from '../server/db/schema'
import { partLines } from '../shared/utils/invoices'
import { invoiceReference } from '../shared/utils/references'
import { invoiceTotals } from '../shared/utils/tax'
import type { Tx } from './visit'

/** The day `offset` days from today (UTC), as the demo's invoices are dated. */
export const day = (offset: number) => {
  const d = new Date()
  d.setUTCDate(d.getUTCDate() + offset)
  return d.toISOString().slice(0, 10)
}

type Line = { kind: 'labour' | 'materials', description: string, quantityX1000: number, unit: string, unitPence: number, vatRatePercent: number }

/** An issued invoice with its lines, dated `issued` days from today. */
export async function invoice(tx: Tx, o: { firmId: string, number: number, prefix: string, kind: 'deposit' | 'blank', customerId: string, siteId: string | null, jobId: string | null, vat: 'standard' | 'reverse-charge', cis: 20 | null, issued: number, termsDays: number, lines: Line[], by: string }) {
  const totals = invoiceTotals(o.lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent as 0 | 5 | 20 })), { vat: o.vat, cisRatePercent: o.cis })
  const id = randomUUID()
  await tx.insert(schema.invoices).values({
    firmId: o.firmId, id, kind: o.kind, series: 'invoice', number: o.number, reference: invoiceReference(o.prefix, o.number),
    customerId: o.customerId, siteId: o.siteId, jobId: o.jobId, vat: o.vat, cisRatePercent: o.cis,
    issuedOn: day(o.issued), dueOn: day(o.issued + o.termsDays), totals: { ...totals }, amountDuePence: totals.amountDuePence, createdBy: o.by,
  })
  await tx.insert(schema.invoiceLines).values(o.lines.map((l, i) => ({ firmId: o.firmId, invoiceId: id, position: i, ...l })))
  return { id, totals }
}

export async function seedInvoices(tx: Tx, o: { firmId: string, prefix: string, termsDays: number, officeId: string, firstNumber?: number, depositNumber?: number, job: { id: string, reference: string, customerId: string, siteId: string, labourNetPence: number, materialsNetPence: number }, builder: { id: string, siteId: string } }) {
  const deposit = await invoice(tx, {
    firmId: o.firmId, number: o.depositNumber ?? (o.firstNumber ?? 1) + 1, prefix: o.prefix, kind: 'deposit', customerId: o.job.customerId, siteId: o.job.siteId, jobId: o.job.id, vat: 'standard', cis: null,
    issued: -7, termsDays: 7, by: o.officeId,
    lines: partLines('deposit', { reference: o.job.reference, labourNetPence: o.job.labourNetPence, materialsNetPence: o.job.materialsNetPence }, { percent: 25 }),
  })
  await tx.insert(schema.payments).values({ firmId: o.firmId, invoiceId: deposit.id, method: 'transfer', amountPence: deposit.totals.amountDuePence, receivedOn: day(-5), reference: 'MILLBECK FLAT5 DEP', recordedBy: o.officeId })

  const overdue = await invoice(tx, {
    firmId: o.firmId, number: o.firstNumber ?? 1, prefix: o.prefix, kind: 'blank', customerId: o.builder.id, siteId: o.builder.siteId, jobId: null, vat: 'reverse-charge', cis: 20,
    issued: -50, termsDays: o.termsDays, by: o.officeId,
    lines: [
      { kind: 'labour', description: 'Hollow Barn: skim the ground-floor walls and ceilings', quantityX1000: 1000, unit: 'item', unitPence: 1_850_00, vatRatePercent: 20 },
      { kind: 'materials', description: 'Finish plaster and beads', quantityX1000: 1000, unit: 'item', unitPence: 212_40, vatRatePercent: 20 },
    ],
  })
  await tx.insert(schema.chaseNotes).values([
    { firmId: o.firmId, invoiceId: overdue.id, kind: 'reminder', note: 'Reminder 14 days after the due date', reminderKey: `${overdue.id}:14`, sentAt: new Date(), byUserId: null },
    { firmId: o.firmId, invoiceId: overdue.id, kind: 'call', outcome: 'other', note: 'Spoke to Priti Hale: paperwork with their accounts team.', byUserId: o.officeId },
  ])
}
