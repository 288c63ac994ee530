// The quarter: the period asked for (a VAT quarter by its stagger, or a date range), the VAT
// return's boxes with what makes up each (shared/utils/vat-return.ts), and the CIS deducted by
// contractor customers per tax month against their statements (shared/utils/cis-summary.ts).
// The sums are pure and tested; this file only reads the rows they need, in a few queries.
import { and, asc, eq, gte, inArray, isNotNull, lte } from 'drizzle-orm'
import { cisStatements, customers, firms, invoices, payments, purchases } from '../db/schema'
import type { FirmScope } from './db'
import type { PeriodQuery } from '#shared/schemas/quarter'
import { cisTaxMonth, vatQuarter } from '#shared/utils/periods'
import { vatReturn, type VatPayment, type VatSale } from '#shared/utils/vat-return'
import { cisSummary, type CisInvoice } from '#shared/utils/cis-summary'

export const VAT_CAUTION = 'A working of the boxes from what is recorded in Setwell, as a rule of thumb: check it with the firm\'s accountant and HMRC\'s guidance (VAT Notice 700/12) before the return is submitted.'
export const CIS_CAUTION = 'Worked from the payments recorded against CIS invoices. The contractor\'s monthly statements are what HMRC holds: where they differ, ask the contractor, and check with the firm\'s accountant.'

export interface Period { start: string, end: string, returnDue: string | null, isQuarter: boolean }

export async function firmTaxSettings(f: FirmScope) {
  const [firm] = await f.tx.select({ vatRegistered: firms.vatRegistered, vatStagger: firms.vatStagger, vatCashAccounting: firms.vatCashAccounting, cisStatus: firms.cisStatus })
    .from(firms).where(eq(firms.id, f.firmId))
  if (!firm) notFound()
  return firm
}

/** The period a query names: the VAT quarter its `quarterOf` date falls in (on the firm's stagger), or from and to. */
export async function periodOf(f: FirmScope, q: PeriodQuery): Promise<Period> {
  if (q.quarterOf) {
    const { vatStagger } = await firmTaxSettings(f)
    const quarter = vatQuarter(q.quarterOf, vatStagger)
    return { ...quarter, isQuarter: true }
  }
  return { start: q.from!, end: q.to!, returnDue: null, isQuarter: false }
}

const num = (v: unknown) => Number(v ?? 0)

function saleOf(r: { id: string, reference: string | null, issuedOn: string | null, kind: string, vat: string, totals: Record<string, number>, amountDuePence: number, customerName: string }): VatSale {
  return {
    id: r.id,
    reference: r.reference ?? '',
    issuedOn: r.issuedOn!,
    kind: r.kind === 'credit-note' ? 'credit-note' : 'invoice',
    vat: r.vat as VatSale['vat'],
    netPence: num(r.totals.netPence),
    vatPence: num(r.totals.vatPence),
    amountDuePence: r.amountDuePence,
    customerName: r.customerName,
  }
}

const saleColumns = {
  id: invoices.id, reference: invoices.reference, issuedOn: invoices.issuedOn, kind: invoices.kind, vat: invoices.vat,
  totals: invoices.totals, amountDuePence: invoices.amountDuePence, customerName: customers.name,
}

/** The VAT return for a period, on the firm's basis (invoice, or cash accounting). */
export async function vatSummary(f: FirmScope, period: Period) {
  const firm = await firmTaxSettings(f)
  const basis = firm.vatCashAccounting ? 'cash' as const : 'invoice' as const
  const joinCustomer = and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId))
  let sales: VatSale[]
  let paid: VatPayment[] = []
  if (basis === 'invoice') {
    const rows = await f.tx.select(saleColumns).from(invoices).innerJoin(customers, joinCustomer)
      .where(f.where(invoices, isNotNull(invoices.issuedOn), gte(invoices.issuedOn, period.start), lte(invoices.issuedOn, period.end)))
      .orderBy(asc(invoices.issuedOn), asc(invoices.series), asc(invoices.number))
    sales = rows.map(saleOf)
  }
  else {
    const money = await f.tx.select({ id: payments.id, invoiceId: payments.invoiceId, receivedOn: payments.receivedOn, amountPence: payments.amountPence })
      .from(payments).where(f.where(payments, gte(payments.receivedOn, period.start), lte(payments.receivedOn, period.end)))
      .orderBy(asc(payments.receivedOn), asc(payments.createdAt))
    paid = money
    const ids = [...new Set(money.map(p => p.invoiceId))]
    const rows = ids.length
      ? await f.tx.select(saleColumns).from(invoices).innerJoin(customers, joinCustomer).where(f.where(invoices, inArray(invoices.id, ids)))
      : []
    // and everything issued in the period: the pure working decides what counts when (credit notes
    // and reverse-charge sales go by the invoice even on the cash scheme; see shared/utils/vat-return.ts)
    const issued = await f.tx.select(saleColumns).from(invoices).innerJoin(customers, joinCustomer)
      .where(f.where(invoices, isNotNull(invoices.issuedOn), gte(invoices.issuedOn, period.start), lte(invoices.issuedOn, period.end)))
    sales = [...rows, ...issued.filter(n => !ids.includes(n.id))].map(saleOf)
  }
  const bought = await f.tx.select({ id: purchases.id, reference: purchases.reference, supplier: purchases.supplier, boughtOn: purchases.boughtOn, netPence: purchases.netPence, vatPence: purchases.vatPence })
    .from(purchases).where(f.where(purchases, gte(purchases.boughtOn, period.start), lte(purchases.boughtOn, period.end)))
    .orderBy(asc(purchases.boughtOn), asc(purchases.createdAt))
  const result = vatReturn({ basis, start: period.start, end: period.end, sales, payments: paid, purchases: bought })
  return { period, vatRegistered: firm.vatRegistered, ...result, caution: VAT_CAUTION }
}

/** CIS deducted by contractor customers, per contractor and tax month, for payments received in the period. */
export async function cisDeductions(f: FirmScope, period: Period) {
  const money = await f.tx.select({ id: payments.id, invoiceId: payments.invoiceId, receivedOn: payments.receivedOn, amountPence: payments.amountPence })
    .from(payments)
    .innerJoin(invoices, and(eq(invoices.firmId, payments.firmId), eq(invoices.id, payments.invoiceId)))
    .where(f.where(payments, gte(payments.receivedOn, period.start), lte(payments.receivedOn, period.end), isNotNull(invoices.cisRatePercent)))
    .orderBy(asc(payments.receivedOn))
  const ids = [...new Set(money.map(p => p.invoiceId))]
  const rows = ids.length
    ? await f.tx.select({ id: invoices.id, reference: invoices.reference, customerId: invoices.customerId, customerName: customers.name, cisRatePercent: invoices.cisRatePercent, totals: invoices.totals, amountDuePence: invoices.amountDuePence })
        .from(invoices).innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
        .where(f.where(invoices, inArray(invoices.id, ids)))
    : []
  const cisInvoices: CisInvoice[] = rows.map(r => ({
    id: r.id, reference: r.reference ?? '', customerId: r.customerId, customerName: r.customerName, cisRatePercent: r.cisRatePercent ?? 0,
    labourNetPence: num(r.totals.labourNetPence), materialsNetPence: num(r.totals.materialsNetPence), vatPence: num(r.totals.vatPence),
    cisDeductionPence: num(r.totals.cisDeductionPence), amountDuePence: r.amountDuePence,
  }))
  // statements for the tax months the period touches: from the month the start falls in
  const firstMonth = cisTaxMonth(period.start).start
  const statements = await f.tx.select().from(cisStatements)
    .where(f.where(cisStatements, gte(cisStatements.taxMonthStart, firstMonth), lte(cisStatements.taxMonthStart, period.end)))
  const names = new Map<string, string>()
  for (const r of rows) names.set(r.customerId, r.customerName)
  const missingNames = [...new Set(statements.map(s => s.customerId))].filter(id => !names.has(id))
  if (missingNames.length) {
    for (const c of await f.tx.select({ id: customers.id, name: customers.name }).from(customers).where(f.where(customers, inArray(customers.id, missingNames)))) names.set(c.id, c.name)
  }
  const summary = cisSummary({
    invoices: cisInvoices,
    payments: money.filter(p => cisInvoices.some(i => i.id === p.invoiceId && i.amountDuePence > 0)),
    statements: statements.map(s => ({ id: s.id, customerId: s.customerId, taxMonthStart: s.taxMonthStart, grossPence: s.grossPence, materialsPence: s.materialsPence, deductionPence: s.deductionPence })),
  })
  return { period, rows: summary.map(r => ({ ...r, customerName: r.customerName || names.get(r.customerId) || '' })), caution: CIS_CAUTION }
}
