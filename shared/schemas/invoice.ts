import { z } from 'zod'
import { isoDate, queryWholeNumber, text, whenObject } from './common'
import { invoiceLineSchema } from './line'
import { PAYMENT_METHODS } from '../utils/invoices'
import { formatPence } from '../utils/money'
import { invoiceTotals } from '../utils/tax'

/**
 * The most one invoice (and so one line) may come to: £20,000,000.00. Amounts are kept as 32-bit
 * whole pence (at most £21,474,836.47), and no plasterer's invoice comes near this.
 */
export const MAX_INVOICE_PENCE = 20_000_000_00

const pence = (what: string) => z.int({ error: `Enter ${what} in pounds and pence.` }).min(0, { error: `${what} cannot be negative.` }).max(1_000_000_00, { error: `${what} looks too high.` })

export const newInvoiceSchema = z.object({
  kind: z.enum(['deposit', 'stage', 'final', 'blank'], { error: 'Choose the kind of invoice.' }),
  jobId: z.uuid().nullable().default(null),
  customerId: z.uuid({ error: 'Choose the customer.' }).nullable().default(null),
  /** Deposit or stage: a percentage of the job's price... */
  percent: z.number({ error: 'Enter a percentage.' }).min(0.01, { error: 'Enter a percentage from 1 to 100.' }).max(100, { error: 'Enter a percentage from 1 to 100.' }).nullable().default(null),
  /** ...or an amount (before VAT). */
  amountPence: pence('The amount').nullable().default(null),
})
  .refine(v => v.kind === 'blank' || v.jobId !== null, { path: ['jobId'], error: 'Choose the job to invoice.', when: whenObject })
  .refine(v => v.kind !== 'blank' || v.customerId !== null, { path: ['customerId'], error: 'Choose the customer.', when: whenObject })

export { invoiceLineSchema }

export const invoiceDraftSchema = z.object({
  vat: z.enum(['standard', 'reverse-charge', 'not-registered']),
  /** Why the VAT treatment was changed from the one suggested; kept with the invoice. */
  vatReason: text().trim().max(500).default(''),
  cisRatePercent: z.union([z.literal(0), z.literal(20), z.literal(30)]).nullable().default(null),
  notes: text().trim().max(4000).default(''),
  lines: z.array(invoiceLineSchema).max(200).default([]),
})
  .refine(v => v.vat !== 'reverse-charge' || v.cisRatePercent !== null, { path: ['cisRatePercent'], error: 'The reverse charge applies to work paid under CIS: choose the CIS rate.', when: whenObject })
  .superRefine((v, ctx) => {
    // each line, then the whole invoice with its VAT, within what an invoice can come to; zod runs
    // this even when a line has its own errors, so lines that are not whole numbers are left to them
    const whole = (n: unknown) => Number.isSafeInteger(n) && (n as number) >= 0
    if (!Array.isArray(v.lines) || !v.lines.every(l => whole(l?.quantityX1000) && Number.isSafeInteger(l?.unitPence))) return
    let tooBig = false
    v.lines.forEach((l, i) => {
      const net = (BigInt(l.quantityX1000) * BigInt(Math.abs(l.unitPence)) + 500n) / 1000n
      if (net > BigInt(MAX_INVOICE_PENCE)) {
        tooBig = true
        ctx.addIssue({ code: 'custom', path: ['lines', i, 'unitPence'], message: `This line comes to more than ${formatPence(MAX_INVOICE_PENCE)}, the most an invoice can be: check the quantity and the price.` })
      }
    })
    if (tooBig) return
    let totals: ReturnType<typeof invoiceTotals>
    try {
      totals = invoiceTotals(v.lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: l.vatRatePercent })), { vat: v.vat, cisRatePercent: v.cisRatePercent })
    }
    catch (err) {
      // lines taking off more than the invoice charges (labour, materials or VAT below 0)
      if (err instanceof RangeError && /taking off/.test(err.message)) {
        const first = v.lines.findIndex(l => l.unitPence < 0)
        ctx.addIssue({ code: 'custom', path: ['lines', Math.max(0, first), 'unitPence'], message: 'A line taking off what was invoiced before may not come to more than the work on this invoice: check the amounts.' })
      }
      return // a treatment or rate that is wrong has its own message
    }
    if (totals.grossPence > MAX_INVOICE_PENCE) {
      ctx.addIssue({ code: 'custom', path: ['lines'], message: `The invoice comes to ${formatPence(totals.grossPence)}; one invoice can be at most ${formatPence(MAX_INVOICE_PENCE)}. Split the work across invoices.` })
    }
  })

export const paymentSchema = z.object({
  method: z.enum(['transfer', 'cash', 'cheque'], { error: 'Choose transfer, cash or cheque (card payments arrive by themselves).' }),
  amountPence: z.int({ error: 'Enter the amount in pounds and pence.' }).min(1, { error: 'Enter the amount received.' }).max(1_000_000_00),
  receivedOn: isoDate('Pick the date it arrived.'),
  reference: text().trim().max(200).default(''),
  /**
   * Made by the form, one per payment the person means to record: the same request sent twice (a
   * double tap, a retry after the signal dropped) is recorded once. Required, because without it two
   * real payments of the same amount on the same day could not be told from one sent twice.
   */
  requestId: z.uuid({ error: 'Send the payment again from the invoice page.' }),
})

export { PAYMENT_METHODS }

/** The invoices list's query: the newest `pageSize`. */
export const invoiceListQuery = z.object({
  pageSize: queryWholeNumber('A page size', 1, 200, 50),
})

/** Who owes what: customers a page; pageSize is also how many of the longest overdue invoices come with it (the dashboard asks for 10). */
export const owedQuery = z.object({
  page: queryWholeNumber('page', 1, 10_000, 1),
  pageSize: queryWholeNumber('pageSize', 1, 200, 50),
})

/** A refund of (part of) a card payment. */
export const refundSchema = z.object({
  paymentId: z.uuid({ error: 'Choose the payment to refund.' }),
  amountPence: z.int({ error: 'Enter the amount in pounds and pence.' }).min(1, { error: 'Enter the amount to refund.' }).max(1_000_000_00),
  reference: text().trim().max(200).default(''),
  /** One per refund the person means to make (the form makes it): a repeat of the same request is one refund. */
  requestId: z.uuid({ error: 'That is not a request id.' }).optional(),
})

/** What Setwell puts in a card payment's metadata at Stripe, read back from its webhook. */
export const stripePaymentMetadataSchema = z.object({ firmId: z.uuid(), invoiceId: z.uuid() })
