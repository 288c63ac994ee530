// CIS deducted from the firm by its contractor customers (the firm is the subcontractor), month by
// month and customer by customer, worked from the invoices and the payments received against them,
// and checked against the monthly statements the contractors sent.
//
// A rule of thumb for the product, not tax advice: what the firm claims against its own tax bill
// is what the contractors' statements and HMRC's records say, and the firm's accountant decides.
// The product says so where these figures are shown; a row that differs is something to raise
// with the contractor, not a figure to correct by hand.
//
// Sources (../shared/DOMAIN.md, "Money rules", CIS; gov.uk "What you must do as a CIS contractor:
// make deductions and pay subcontractors"; HMRC manual CISR):
// - the contractor deducts when it pays, from the labour part (the total less VAT and less the
//   materials the subcontractor paid for), so a deduction belongs to the tax month of the payment;
// - the CIS tax month runs from the 6th of one month to the 5th of the next (`cisTaxMonth`);
// - the contractor's statement to the subcontractor for each tax month shows the gross amount paid
//   (excluding VAT), the cost of materials and the amount deducted.
//
// Our rules on top (as briefed):
// - a payment's share of its invoice is amountPence / amountDuePence (what the customer owed after
//   the deduction, so the deduction counts as taken along with the payment); the payment then
//   carries gross = (labour + materials) x share, materials x share and deduction x share, each
//   rounded once to the penny, halves away from zero (so a refund, a negative payment, takes back
//   exactly what the same payment added), in exact BigInt arithmetic. Part payments each round on
//   their own, so three thirds of an invoice can come to a penny more or less than the whole;
// - rows are per customer and tax month, summing that month's payments; a refund in a later month
//   shows there as negative figures;
// - a statement is matched on customerId + taxMonthStart: 'matches' when gross, materials and the
//   deduction are all equal; 'differs' otherwise; 'no-statement' when none was recorded;
//   'statement-only' when a statement has no payments behind it (our figures 0). differencePence
//   is the statement's deduction less ours whenever there is a statement, 0 when there is none;
// - a statement-only row takes the customer's name from an invoice of that customer, or its
//   customerId when there is none; rows sort by taxMonthStart, then customerName;
// - bad input (dates that are not real YYYY-MM-DD dates, a statement month that does not start on
//   a 6th, pence that are not whole numbers or are negative, a CIS rate other than 0, 20 or 30, an
//   invoice id given twice, a payment for an unknown invoice or for an invoice with nothing due,
//   two statements for one customer and month) is a RangeError naming the field.
import { cisTaxMonth } from './periods'
import { isoDate, pence, shareOf, text, toSafe } from './checks/exact'

export interface CisInvoice {
  id: string
  reference: string
  customerId: string
  customerName: string
  cisRatePercent: number
  labourNetPence: number
  materialsNetPence: number
  vatPence: number
  cisDeductionPence: number
  /** Gross less the CIS deduction: what the customer pays. */
  amountDuePence: number
}
/** Refunds are negative. */
export interface CisPayment { id: string, invoiceId: string, receivedOn: string, amountPence: number }
export interface CisStatementIn { id: string, customerId: string, taxMonthStart: string, grossPence: number, materialsPence: number, deductionPence: number }
export interface CisMonthRow {
  customerId: string
  customerName: string
  taxMonthStart: string
  taxMonthEnd: string
  /** Gross paid excluding VAT, as a CIS statement shows it. */
  grossPence: number
  materialsPence: number
  deductionPence: number
  /** References of the invoices the month's payments were for, sorted. */
  invoices: string[]
  statement: { id: string, grossPence: number, materialsPence: number, deductionPence: number } | null
  status: 'matches' | 'differs' | 'no-statement' | 'statement-only'
  /** The statement's deduction less ours; 0 when there is no statement. */
  differencePence: number
}
export interface CisSummaryInput { invoices: CisInvoice[], payments: CisPayment[], statements: CisStatementIn[] }

const CIS_RATES = [0, 20, 30]

/** The tax month of a date, worked out with `cisTaxMonth` after the field is checked. */
function taxMonth(date: unknown, field: string) {
  return cisTaxMonth(isoDate(date, field))
}

interface Month { customerId: string, customerName: string, start: string, end: string, gross: bigint, materials: bigint, deduction: bigint, invoices: Set<string>, paid: boolean }

/**
 * CIS suffered, by customer and CIS tax month, matched against the contractors' statements (see
 * the file's note for the rules, the sources and the rounding). Rules of thumb for the product,
 * not tax advice: the statements, HMRC and the firm's accountant decide.
 */
export function cisSummary(input: CisSummaryInput): CisMonthRow[] {
  if (!Array.isArray(input.invoices)) throw new RangeError('invoices must be a list')
  if (!Array.isArray(input.payments)) throw new RangeError('payments must be a list')
  if (!Array.isArray(input.statements)) throw new RangeError('statements must be a list')

  const invoices = new Map<string, { inv: CisInvoice, labour: bigint, materials: bigint, deduction: bigint, due: bigint }>()
  const names = new Map<string, string>()
  input.invoices.forEach((inv, i) => {
    const f = `invoices[${i}]`
    const id = text(inv.id, `${f}.id`)
    if (invoices.has(id)) throw new RangeError(`${f}.id ${id} is given twice`)
    text(inv.reference, `${f}.reference`)
    const customerId = text(inv.customerId, `${f}.customerId`)
    const customerName = text(inv.customerName, `${f}.customerName`)
    if (!CIS_RATES.includes(inv.cisRatePercent)) throw new RangeError(`${f}.cisRatePercent must be 0, 20 or 30, got ${String(inv.cisRatePercent)}`)
    pence(inv.vatPence, `${f}.vatPence`)
    invoices.set(id, {
      inv,
      labour: pence(inv.labourNetPence, `${f}.labourNetPence`),
      materials: pence(inv.materialsNetPence, `${f}.materialsNetPence`),
      deduction: pence(inv.cisDeductionPence, `${f}.cisDeductionPence`),
      due: pence(inv.amountDuePence, `${f}.amountDuePence`),
    })
    if (!names.has(customerId)) names.set(customerId, customerName)
  })

  const months = new Map<string, Month>()
  const monthFor = (customerId: string, customerName: string, t: { start: string, end: string }) => {
    const key = JSON.stringify([customerId, t.start])
    let m = months.get(key)
    if (!m) {
      m = { customerId, customerName, start: t.start, end: t.end, gross: 0n, materials: 0n, deduction: 0n, invoices: new Set(), paid: false }
      months.set(key, m)
    }
    return m
  }

  input.payments.forEach((p, i) => {
    const f = `payments[${i}]`
    text(p.id, `${f}.id`)
    const invoiceId = text(p.invoiceId, `${f}.invoiceId`)
    const t = taxMonth(p.receivedOn, `${f}.receivedOn`)
    const amount = pence(p.amountPence, `${f}.amountPence`, null)
    const found = invoices.get(invoiceId)
    if (!found) throw new RangeError(`${f}.invoiceId ${invoiceId} is not one of the invoices given`)
    if (found.due === 0n) throw new RangeError(`${f}.invoiceId ${invoiceId}: the invoice has an amountDuePence of 0, so a payment's share of it cannot be worked out`)
    const m = monthFor(found.inv.customerId, names.get(found.inv.customerId)!, t)
    m.gross += shareOf(found.labour + found.materials, amount, found.due)
    m.materials += shareOf(found.materials, amount, found.due)
    m.deduction += shareOf(found.deduction, amount, found.due)
    m.invoices.add(found.inv.reference)
    m.paid = true
  })

  const statements = new Map<string, CisMonthRow['statement']>()
  input.statements.forEach((s, i) => {
    const f = `statements[${i}]`
    const id = text(s.id, `${f}.id`)
    const customerId = text(s.customerId, `${f}.customerId`)
    const t = taxMonth(s.taxMonthStart, `${f}.taxMonthStart`)
    if (t.start !== s.taxMonthStart) throw new RangeError(`${f}.taxMonthStart must be the 6th, the first day of a CIS tax month, got ${s.taxMonthStart}`)
    const key = JSON.stringify([customerId, t.start])
    if (statements.has(key)) throw new RangeError(`${f}: a second statement for customer ${customerId} in the tax month from ${t.start}`)
    statements.set(key, {
      id,
      grossPence: toSafe(pence(s.grossPence, `${f}.grossPence`), `${f}.grossPence`),
      materialsPence: toSafe(pence(s.materialsPence, `${f}.materialsPence`), `${f}.materialsPence`),
      deductionPence: toSafe(pence(s.deductionPence, `${f}.deductionPence`), `${f}.deductionPence`),
    })
    monthFor(customerId, names.get(customerId) ?? customerId, t)
  })

  const rows: CisMonthRow[] = []
  for (const [key, m] of months) {
    const statement = statements.get(key) ?? null
    const grossPence = toSafe(m.gross, 'the gross')
    const materialsPence = toSafe(m.materials, 'the materials')
    const deductionPence = toSafe(m.deduction, 'the deduction')
    let status: CisMonthRow['status']
    if (!statement) status = 'no-statement'
    else if (!m.paid) status = 'statement-only'
    else if (statement.grossPence === grossPence && statement.materialsPence === materialsPence && statement.deductionPence === deductionPence) status = 'matches'
    else status = 'differs'
    rows.push({
      customerId: m.customerId,
      customerName: m.customerName,
      taxMonthStart: m.start,
      taxMonthEnd: m.end,
      grossPence,
      materialsPence,
      deductionPence,
      invoices: [...m.invoices].sort(),
      statement,
      status,
      differencePence: statement ? statement.deductionPence - deductionPence : 0,
    })
  }
  return rows.sort((a, b) =>
    (a.taxMonthStart < b.taxMonthStart ? -1 : a.taxMonthStart > b.taxMonthStart ? 1 : 0)
    || a.customerName.localeCompare(b.customerName, 'en-GB')
    || (a.customerId < b.customerId ? -1 : a.customerId > b.customerId ? 1 : 0))
}
