// What is owed (GET /api/owed, the dashboard, the office's chase list): the totals by age over
// every owing invoice, the customers most owed a page at a time, and the longest overdue.
//
// The owing invoices come from the partial index on what is unsettled (invoices.settled_pence,
// kept by triggers) as four small columns each; the full detail and status (listOwing) is read
// only for the invoices on the page. A busy firm with 2,000 invoices owing answers with 50
// customers, not every one of them (npm run bench).
import { asc, inArray, isNotNull, ne, sql } from 'drizzle-orm'
import { customers, invoices } from '../db/schema'
import type { FirmScope } from './db'
import { listOwing } from './invoices'
import { AGE_BUCKETS, ageBucket, type AgeBucket } from '#shared/utils/invoices'

export interface OwedInvoice { id: string, reference: string | null, dueOn: string | null, outstandingPence: number, bucket: AgeBucket, status: string, kind: string }
export interface OwedCustomer { customerId: string, customer: string, buckets: Record<AgeBucket, number>, totalPence: number, invoices: OwedInvoice[] }

const emptyBuckets = () => Object.fromEntries(AGE_BUCKETS.map(b => [b, 0])) as Record<AgeBucket, number>

export async function owedView(f: FirmScope, today: string, { page, pageSize }: { page: number, pageSize: number }) {
  // no join here: the customers' names are read for the page only (joining every owing invoice to
  // its customer made this four times slower at a busy firm)
  const owing = await f.tx.select({
    id: invoices.id, customerId: invoices.customerId, dueOn: invoices.dueOn,
    outstandingPence: sql<number>`(${invoices.amountDuePence} - ${invoices.settledPence})::int`,
  })
    .from(invoices)
    .where(f.where(invoices, isNotNull(invoices.issuedOn), ne(invoices.kind, 'credit-note'), sql`${invoices.amountDuePence} > ${invoices.settledPence}`))
    .orderBy(asc(invoices.dueOn), asc(invoices.number))

  const totals = emptyBuckets()
  const byCustomer = new Map<string, { customerId: string, buckets: Record<AgeBucket, number>, totalPence: number, ids: string[] }>()
  const overdueIds: string[] = []
  for (const i of owing) {
    const bucket = ageBucket(i.dueOn ?? today, today)
    const row = byCustomer.get(i.customerId) ?? { customerId: i.customerId, buckets: emptyBuckets(), totalPence: 0, ids: [] }
    row.buckets[bucket] += i.outstandingPence
    row.totalPence += i.outstandingPence
    row.ids.push(i.id)
    byCustomer.set(i.customerId, row)
    totals[bucket] += i.outstandingPence
    if (bucket !== 'not-due') overdueIds.push(i.id)
  }
  // the most owed first; the same total, by id (a page boundary must not move between requests)
  const ranked = [...byCustomer.values()].sort((a, b) => b.totalPence - a.totalPence || a.customerId.localeCompare(b.customerId))
  const shown = ranked.slice((page - 1) * pageSize, page * pageSize)
  // already in due-date order: the longest overdue first
  const overdueShown = overdueIds.slice(0, pageSize)

  const detail = new Map((await listOwing(f, today, [...new Set([...shown.flatMap(c => c.ids), ...overdueShown])])).map(i => [i.id, i]))
  // an invoice paid between the two reads is left out of the lists (each read sees what is committed)
  const lines = (ids: string[]): OwedInvoice[] => ids.flatMap((id) => {
    const i = detail.get(id)
    return i ? [{ id: i.id, reference: i.reference, dueOn: i.dueOn, outstandingPence: i.outstandingPence, bucket: ageBucket(i.dueOn ?? today, today), status: i.status, kind: i.kind }] : []
  })
  const customerOf = new Map(owing.map(i => [i.id, i.customerId]))
  const wanted = [...new Set([...shown.map(c => c.customerId), ...overdueShown.map(id => customerOf.get(id)!)])]
  const names = new Map(wanted.length
    ? (await f.tx.select({ id: customers.id, name: customers.name }).from(customers).where(f.where(customers, inArray(customers.id, wanted)))).map(c => [c.id, c.name])
    : [])
  return {
    today,
    page,
    pageSize,
    customers: shown.map(({ ids, ...c }): OwedCustomer => ({ ...c, customer: names.get(c.customerId) ?? '', invoices: lines(ids) })),
    overdue: lines(overdueShown).map(i => ({ ...i, customer: names.get(customerOf.get(i.id)!) ?? '' })),
    counts: { customers: ranked.length, invoices: owing.length, overdue: overdueIds.length },
    totals,
    totalPence: ranked.reduce((s, c) => s + c.totalPence, 0),
  }
}
