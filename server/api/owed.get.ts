import { z } from 'zod'

const whole = (what: string, max: number) => z.coerce.number({ error: `${what} is a whole number from 1 to ${max}.` })
  .int({ error: `${what} is a whole number from 1 to ${max}.` }).min(1, { error: `${what} is a whole number from 1 to ${max}.` }).max(max, { error: `${what} is a whole number from 1 to ${max}.` })

const owedQuery = z.object({
  page: whole('page', 10_000).default(1),
  // customers a page; also how many of the longest overdue invoices come with it (the dashboard asks for 10)
  pageSize: whole('pageSize', 200).default(50),
})

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
