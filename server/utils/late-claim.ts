// Statutory late-payment claims (Late Payment of Commercial Debts (Interest) Act 1998) on a
// business customer's overdue invoice: interest and the fixed sum worked out by
// shared/utils/late-payment.ts from the firm's Bank Rate table, and a letter as PDF. A rule of
// thumb for the product, not legal advice: CLAIM_CAUTION says so on the firm's claim screen; the
// letter to the customer (claimLetterText) states the claim and never carries that caution.
import { asc } from 'drizzle-orm'
import { bankRates } from '../db/schema'
import { fullDate } from '#shared/utils/dates'
import { latePaymentClaim, type LatePaymentClaim } from '#shared/utils/late-payment'
import { formatPence } from '#shared/utils/money'

export const CLAIM_CAUTION = 'This is worked out from the Late Payment of Commercial Debts (Interest) Act 1998 as a rule of thumb: it is not legal advice. It applies to business customers only. Check the figures and your contract with an accountant or solicitor before you claim, and take advice before going to court.'

/** The firm's Bank Rate table (it starts from the published figures when the firm is made: server/db/firm-defaults.ts). */
export async function bankRateTable(f: FirmScope) {
  return f.tx.select().from(bankRates).where(f.where(bankRates)).orderBy(asc(bankRates.fromDate))
}

/** The claim on an invoice as of today: 409 for a homeowner, an invoice not overdue, or one with nothing owed. */
export async function claimFor(f: FirmScope, invoiceId: string, asOf = todayIso()) {
  const d = await invoiceDetail(f, invoiceId)
  if (!d.businessCustomer) throw createError({ statusCode: 409, statusMessage: 'Not a business customer', data: { message: 'Statutory interest is claimed from business customers only, never from a homeowner.' } })
  if (!d.issuedOn || !d.dueOn || d.kind === 'credit-note' || d.outstandingPence <= 0 || d.dueOn >= asOf) throw createError({ statusCode: 409, statusMessage: 'Not overdue', data: { message: 'Only an overdue invoice with something still owed has a claim.' } })
  const rates = (await bankRateTable(f)).map(r => ({ from: r.fromDate, ratePercent: r.rateBp / 100 }))
  try {
    const claim = latePaymentClaim({ debtPence: d.outstandingPence, dueDate: d.dueOn, asOf, bankRates: rates })
    return { invoice: d, claim, asOf, caution: CLAIM_CAUTION }
  }
  catch (err) {
    throw createError({ statusCode: 409, statusMessage: 'No Bank Rate', data: { message: `The Bank Rate table has no rate for this period: add it under Settings, Firm. (${(err as Error).message})` } })
  }
}

export const LATE_PAYMENT_ACT = 'Late Payment of Commercial Debts (Interest) Act 1998'

export interface ClaimLetterInput {
  reference: string
  issuedOn: string
  dueOn: string
  debtPence: number
  asOf: string
  claim: LatePaymentClaim
  firmName: string
  /** The firm's bank account as lines (shared/utils/bank-details.ts bankAccountLines), or none. */
  bankLines: string[]
}

/**
 * The words of the claim letter, in order: the debt, the interest (rate, days, amount), the fixed
 * sum and the total, citing the Act, with dates in words; how to pay. For the customer: no
 * firm-facing caution.
 */
export function claimLetterText(i: ClaimLetterInput): { heading: string, paragraphs: string[] } {
  const c = i.claim
  const bankRate = Math.round((c.ratePercent - 8) * 100) / 100
  return {
    heading: `Invoice ${i.reference}: statutory interest and compensation for late payment`,
    paragraphs: [
      `Our invoice ${i.reference} of ${fullDate(i.issuedOn)} was due for payment by ${fullDate(i.dueOn)}. As of ${fullDate(i.asOf)}, ${formatPence(i.debtPence)} of it is still unpaid.`,
      `Under the ${LATE_PAYMENT_ACT} we are entitled to, and now claim, statutory interest on the debt and a fixed sum as compensation for the cost of recovering it.`,
      `The debt: ${formatPence(i.debtPence)}.`,
      `Statutory interest: ${c.ratePercent}% a year (8% over the Bank of England's Bank Rate of ${bankRate}%), from ${fullDate(c.interestStart)} to ${fullDate(i.asOf)}, ${c.days} ${c.days === 1 ? 'day' : 'days'}: ${formatPence(c.interestPence)}.`,
      `Fixed sum for a debt of this size (section 5A of the Act): ${formatPence(c.fixedSumPence)}.`,
      `Total now due: ${formatPence(c.totalPence)}. Interest continues to run, at about ${formatPence(Math.round(i.debtPence * c.ratePercent / 100 / 365))} a day until the debt is paid.`,
      i.bankLines.length
        ? `Please pay ${formatPence(c.totalPence)} by bank transfer, quoting ${i.reference}, to: ${i.bankLines.join('; ')}.`
        : `Please pay ${formatPence(c.totalPence)}, quoting ${i.reference}.`,
      `If you have paid since this letter was written, thank you: please let us know the date and amount. If you dispute any of this, please contact us straight away.`,
      `Yours faithfully,\n${i.firmName}`,
    ],
  }
}
