import { owedQuery } from '#shared/schemas/invoice'

/**
 * What is owed: the totals in the age buckets (not yet due, 1-30, 31-60, 61-90, over 90 days
 * late) over every issued invoice with something still to pay, and the counts; the customers most
 * owed a page at a time, each with its ages and invoices; and the longest overdue invoices (what
 * the office chases). server/utils/owed.ts.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, owedQuery)
  return withFirm(auth, f => owedView(f, todayIso(), q))
})
