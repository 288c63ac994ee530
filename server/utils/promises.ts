// Promises to pay that were not kept, as next actions (Today lists them; GET /api/promises/broken
// answers them on their own). For each invoice still owed, its latest promise (the partial index
// chase_notes_promise_idx), with the money received since the promise and whether anyone chased
// again after its day, all worked out in one SQL statement; `promiseBroken` (shared/utils/chase.ts)
// is the rule, `brokenPromiseWords` the words.
import { and, desc, eq, isNotNull, lt, sql } from 'drizzle-orm'
import { chaseNotes, customers, invoices } from '../db/schema'
import type { FirmScope } from './db'
import { owing } from './invoices'
import { addDays } from '#shared/utils/dates'
import { brokenPromiseWords, promiseBroken } from '#shared/utils/chase'
import { urgencyOf, type NextAction } from '#shared/utils/next-actions'

/** The firm's broken promises on `today` (a London day), oldest broken first. */
export async function brokenPromiseActions(f: FirmScope, today: string): Promise<NextAction[]> {
  const latest = f.tx.$with('latest').as(
    f.tx.selectDistinctOn([chaseNotes.invoiceId], { id: chaseNotes.id, invoiceId: chaseNotes.invoiceId, promisedOn: chaseNotes.promisedOn, promisedPence: chaseNotes.promisedPence, at: chaseNotes.at })
      .from(chaseNotes)
      .where(f.where(chaseNotes, isNotNull(chaseNotes.promisedOn)))
      .orderBy(chaseNotes.invoiceId, desc(chaseNotes.at)),
  )
  const rows = await f.tx.with(latest).select({
    id: latest.id,
    invoiceId: latest.invoiceId,
    promisedOn: latest.promisedOn,
    promisedPence: latest.promisedPence,
    reference: invoices.reference,
    customerName: customers.name,
    outstandingPence: sql<number>`(${invoices.amountDuePence} - ${invoices.settledPence})::int`,
    paidSincePence: sql<number>`coalesce((select sum(p.amount_pence) from payments p where p.firm_id = ${invoices.firmId} and p.invoice_id = ${invoices.id} and p.received_on >= (${latest.at} at time zone 'Europe/London')::date), 0)::int`,
    chasedAfter: sql<boolean>`exists (select 1 from chase_notes later where later.firm_id = ${invoices.firmId} and later.invoice_id = ${invoices.id} and later.kind <> 'reminder' and later.at > ${latest.at} and (later.at at time zone 'Europe/London')::date > ${latest.promisedOn})`,
  })
    .from(latest)
    .innerJoin(invoices, eq(invoices.id, latest.invoiceId))
    .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
    .where(owing(f, lt(latest.promisedOn, today)))
    .orderBy(latest.promisedOn)

  return rows
    .filter(r => promiseBroken({ promisedOn: r.promisedOn!, promisedPence: r.promisedPence, paidSincePence: Number(r.paidSincePence), outstandingPence: Number(r.outstandingPence), chasedAfter: Boolean(r.chasedAfter) }, today))
    .map(r => ({
      kind: 'promise-broken' as const,
      key: `promise-broken:${r.id}`,
      ...brokenPromiseWords({ customerName: r.customerName, reference: r.reference, promisedOn: r.promisedOn!, promisedPence: r.promisedPence, outstandingPence: Number(r.outstandingPence) }),
      href: `/invoices/${r.invoiceId}`,
      actionLabel: 'Chase',
      since: addDays(r.promisedOn!, 1),
      urgency: urgencyOf('promise-broken', addDays(r.promisedOn!, 1), today),
    }))
}
