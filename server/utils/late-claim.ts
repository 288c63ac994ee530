// Statutory late-payment claims (Late Payment of Commercial Debts (Interest) Act 1998) on a
// business customer's overdue invoice: interest and the fixed sum worked out by
// shared/utils/late-payment.ts from the firm's Bank Rate table, and a letter as PDF. A rule of
// thumb for the product, not legal advice.
import { asc } from 'drizzle-orm'
import { bankRates } from '../db/schema'
import { latePaymentClaim } from '#shared/utils/late-payment'

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
