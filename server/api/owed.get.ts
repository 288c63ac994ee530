import { AGE_BUCKETS, ageBucket, type AgeBucket } from '#shared/utils/invoices'

/**
 * What is owed: every issued invoice with something still to pay, by customer, in the age
 * buckets (not yet due, 1-30, 31-60, 61-90, over 90 days late), with the totals.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const today = todayIso()
  const owing = (await withFirm(auth, f => listOwing(f, today))).filter(i => i.outstandingPence > 0)
  const empty = () => Object.fromEntries(AGE_BUCKETS.map(b => [b, 0])) as Record<AgeBucket, number>
  const byCustomer = new Map<string, { customerId: string, customer: string, buckets: Record<AgeBucket, number>, totalPence: number, invoices: { id: string, reference: string | null, dueOn: string | null, outstandingPence: number, bucket: AgeBucket, status: string, kind: string }[] }>()
  const totals = empty()
  for (const i of owing) {
    const bucket = ageBucket(i.dueOn ?? today, today)
    const row = byCustomer.get(i.customerId) ?? { customerId: i.customerId, customer: i.customer, buckets: empty(), totalPence: 0, invoices: [] }
    row.buckets[bucket] += i.outstandingPence
    row.totalPence += i.outstandingPence
    row.invoices.push({ id: i.id, reference: i.reference, dueOn: i.dueOn, outstandingPence: i.outstandingPence, bucket, status: i.status, kind: i.kind })
    totals[bucket] += i.outstandingPence
    byCustomer.set(i.customerId, row)
  }
  const customers = [...byCustomer.values()].sort((a, b) => b.totalPence - a.totalPence)
  return { today, customers, totals, totalPence: customers.reduce((s, c) => s + c.totalPence, 0) }
})
