// The words and arithmetic of invoices: kinds, payment methods, the status that follows from an
// invoice's payments and dates (never set by hand), aged debts, and the lines of a deposit, a
// stage or the final invoice worked out from the job's price. Pure; money in integer pence.
import { addDays, daysBetween } from './dates'

export const INVOICE_KINDS = ['deposit', 'stage', 'final', 'blank', 'credit-note'] as const
export type InvoiceKind = (typeof INVOICE_KINDS)[number]
export const INVOICE_KIND_LABELS: Record<InvoiceKind, string> = {
  'deposit': 'Deposit invoice',
  'stage': 'Stage invoice',
  'final': 'Final invoice',
  'blank': 'Invoice',
  'credit-note': 'Credit note',
}

export const PAYMENT_METHODS = ['card', 'transfer', 'cash', 'cheque'] as const
export type PaymentMethod = (typeof PAYMENT_METHODS)[number]
export const PAYMENT_METHOD_LABELS: Record<PaymentMethod, string> = { card: 'Card', transfer: 'Bank transfer', cash: 'Cash', cheque: 'Cheque' }

export type InvoiceStatus = 'draft' | 'issued' | 'part-paid' | 'paid' | 'overdue' | 'credited'
export const INVOICE_STATUS_LABELS: Record<InvoiceStatus, string> = {
  'draft': 'Draft',
  'issued': 'Issued',
  'part-paid': 'Part paid',
  'paid': 'Paid',
  'overdue': 'Overdue',
  'credited': 'Credited',
}

export interface StatusInput {
  issuedOn: string | null
  dueOn: string | null
  /** What the customer owes on the invoice (gross less any CIS deduction). */
  amountDuePence: number
  /** Payments less refunds. */
  paidPence: number
  /** Credit notes issued against it. */
  creditedPence: number
  /** ISO date. */
  today: string
}

/** What is still owed: never below 0 (an overpayment is flagged apart). */
export function outstandingPence(i: Pick<StatusInput, 'amountDuePence' | 'paidPence' | 'creditedPence'>): number {
  return Math.max(0, i.amountDuePence - i.paidPence - i.creditedPence)
}

export function overpaidPence(i: Pick<StatusInput, 'amountDuePence' | 'paidPence' | 'creditedPence'>): number {
  return Math.max(0, i.paidPence + i.creditedPence - i.amountDuePence)
}

/**
 * The status of an invoice from its dates, payments and credit notes:
 * a draft until issued; credited when credit notes cover it all; paid when nothing is owed;
 * overdue when something is owed after the due date; part paid; otherwise issued.
 */
export function invoiceStatus(i: StatusInput): InvoiceStatus {
  if (!i.issuedOn) return 'draft'
  if (i.creditedPence > 0 && i.creditedPence >= i.amountDuePence) return 'credited'
  if (outstandingPence(i) === 0) return 'paid'
  if (i.dueOn && i.today > i.dueOn) return 'overdue'
  if (i.paidPence > 0) return 'part-paid'
  return 'issued'
}

export const AGE_BUCKETS = ['not-due', '1-30', '31-60', '61-90', 'over-90'] as const
export type AgeBucket = (typeof AGE_BUCKETS)[number]
export const AGE_BUCKET_LABELS: Record<AgeBucket, string> = { 'not-due': 'Not yet due', '1-30': '1–30 days', '31-60': '31–60 days', '61-90': '61–90 days', 'over-90': 'Over 90 days' }

/**
 * The most days late each age holds (not yet due: none; the last age has no end). The server's
 * SQL totals (server/utils/owed.ts) are written from this same table.
 */
export const AGE_BUCKET_MOST_DAYS_LATE: Record<AgeBucket, number> = { 'not-due': 0, '1-30': 30, '31-60': 60, '61-90': 90, 'over-90': Number.POSITIVE_INFINITY }

/** Which age a debt is, by the days since its due date. */
export function ageBucket(dueOn: string, today: string): AgeBucket {
  return bucketOfDaysLate(daysBetween(dueOn, today))
}

/** Which age a debt is this many days after its due date (0 or less: not yet due). */
export function bucketOfDaysLate(late: number): AgeBucket {
  return AGE_BUCKETS.find(b => late <= AGE_BUCKET_MOST_DAYS_LATE[b]) ?? 'over-90'
}

/**
 * Whether two number series with these prefixes could ever give the same reference (a prefix and
 * a number of at least four digits, as issuing writes them): when the prefixes are the same
 * (ignoring case, which a reader would not tell apart), or when one is the other followed by
 * digits ("A" at number 10001 is "A10001", as "A1" is at 1). Only matters when credit notes
 * are numbered on their own.
 */
export function prefixesClash(a: string, b: string): boolean {
  const x = a.toUpperCase()
  const y = b.toUpperCase()
  if (x === y) return true
  const [short, long] = x.length < y.length ? [x, y] : [y, x]
  return long.startsWith(short) && /^[1-9]\d*$/.test(long.slice(short.length))
}

/** The due date: issued on + the firm's payment terms (days). */
export function dueDateFor(issuedOn: string, termsDays: number): string {
  return addDays(issuedOn, termsDays)
}

// ---------------------------------------------------------------------------------------------
// Lines from a job

export interface JobPrice { reference: string, labourNetPence: number, materialsNetPence: number }
export interface InvoicedSoFar { labourNetPence: number, materialsNetPence: number }
export interface DraftInvoiceLine { kind: 'labour' | 'materials', description: string, quantityX1000: number, unit: string, unitPence: number, vatRatePercent: number, extraWork?: boolean }

/** a x num / den, rounded half up, in integers. */
function share(a: number, num: number, den: number): number {
  if (den === 0) return 0
  return Number((BigInt(a) * BigInt(num) * 2n + BigInt(den)) / (BigInt(den) * 2n))
}

const line = (kind: 'labour' | 'materials', description: string, pence: number, vatRatePercent: number): DraftInvoiceLine =>
  ({ kind, description, quantityX1000: 1000, unit: 'item', unitPence: pence, vatRatePercent })

/**
 * A deposit or stage invoice: a percentage of the job's price (rounded half up to the penny), or an
 * amount, split between labour and materials in the job's own proportion (so CIS, worked on the
 * labour, stays right): the labour share rounded half up, the materials the rest, so the two add
 * up to the invoice's amount exactly.
 */
export function partLines(kind: 'deposit' | 'stage', job: JobPrice, part: { percent: number } | { amountPence: number }, vatRatePercent = 20): DraftInvoiceLine[] {
  const total = job.labourNetPence + job.materialsNetPence
  const word = kind === 'deposit' ? 'Deposit' : 'Stage payment'
  let amount: number
  let what: string
  if ('percent' in part) {
    if (!(part.percent > 0 && part.percent <= 100)) throw new RangeError(`percent must be over 0 and at most 100, got ${part.percent}`)
    // the percentage of the whole price, then split like an amount: rounding labour and materials
    // each on its own could put the invoice a penny off the percentage (50% of 1p + 1p was 2p)
    amount = share(total, Math.round(part.percent * 100), 10_000)
    what = `${part.percent}% of ${job.reference}`
  }
  else {
    if (!Number.isSafeInteger(part.amountPence) || part.amountPence <= 0 || part.amountPence > total) throw new RangeError(`amountPence must be over 0 and at most the job's price (${total}), got ${part.amountPence}`)
    amount = part.amountPence
    what = `towards ${job.reference}`
  }
  const labour = share(amount, job.labourNetPence, total)
  const materials = amount - labour
  return [
    ...(labour > 0 ? [line('labour', `${word} ${what}: labour`, labour, vatRatePercent)] : []),
    ...(materials > 0 ? [line('materials', `${word} ${what}: materials`, materials, vatRatePercent)] : []),
  ]
}

/**
 * The final invoice: the job's price less what was already invoiced, labour and materials apart.
 * Several deposits and stages, each rounded half up, can claim a penny or so more than the job's
 * labour (or materials) while the other side is short by as much: that side's excess is taken off
 * the other's remainder, so the invoices together never come to more than the job's price.
 */
export function finalLines(job: JobPrice, invoiced: InvoicedSoFar, vatRatePercent = 20): DraftInvoiceLine[] {
  const labourLeft = job.labourNetPence - invoiced.labourNetPence
  const materialsLeft = job.materialsNetPence - invoiced.materialsNetPence
  const labour = materialsLeft < 0 ? labourLeft + materialsLeft : labourLeft
  const materials = labourLeft < 0 ? materialsLeft + labourLeft : materialsLeft
  const less = invoiced.labourNetPence + invoiced.materialsNetPence > 0
  return [
    ...(labour > 0 ? [line('labour', less ? `Labour for ${job.reference}, less invoiced before` : `Labour for ${job.reference}`, labour, vatRatePercent)] : []),
    ...(materials > 0 ? [line('materials', less ? `Materials for ${job.reference}, less invoiced before` : `Materials for ${job.reference}`, materials, vatRatePercent)] : []),
  ]
}

// ---------------------------------------------------------------------------------------------
// The final invoice from an accepted quote

/** What one invoice of the job claimed (less what credit notes gave back), by kind and VAT rate. */
export interface InvoicedBefore { reference: string, kind: 'labour' | 'materials', vatRatePercent: number, netPence: number }

/**
 * The final invoice of a job made from an accepted quote: the quote's own lines and wording, as
 * the customer accepted them, then one line taking off each invoice before it ("Less invoiced
 * before: BP-3"), at that invoice's kind and VAT rate. Totalled by the same arithmetic as the
 * quote (shared/utils/tax.ts invoiceTotals over the same lines), so with nothing invoiced before
 * it equals the quote to the penny. An invoice that claimed both labour and materials has a line
 * for each, told apart by its kind in brackets.
 */
export function finalFromQuote(quoteLines: readonly Omit<DraftInvoiceLine, 'extraWork'>[], before: readonly InvoicedBefore[]): DraftInvoiceLine[] {
  const lines: DraftInvoiceLine[] = quoteLines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent }))
  const kindsOf = new Map<string, Set<string>>()
  for (const b of before) if (b.netPence > 0) kindsOf.set(b.reference, (kindsOf.get(b.reference) ?? new Set()).add(b.kind))
  for (const b of before) {
    if (b.netPence <= 0) continue
    const both = (kindsOf.get(b.reference)?.size ?? 0) > 1
    lines.push({ kind: b.kind, description: `Less invoiced before: ${b.reference}${both ? ` (${b.kind})` : ''}`, quantityX1000: 1000, unit: 'item', unitPence: -b.netPence, vatRatePercent: b.vatRatePercent })
  }
  return lines
}
