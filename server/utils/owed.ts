// What is owed (GET /api/owed, the office's chase list): the totals by age over every owing
// invoice, the customers most owed a page at a time, and the longest overdue.
//
// Two statements. The first adds up, in PostgreSQL, what each customer owes by age and ranks them,
// with the firm's whole totals and counts beside the page (the owing invoices come from the
// partial index on what is unsettled: invoices.settled_pence, kept by triggers); the second reads
// the invoices of the customers on the page and the longest overdue, with their status. No owing
// invoice is sent to the server beyond those shown (npm run bench: 2,000 owing at a busy firm).
import { and, asc, eq, inArray, sql, type SQL } from 'drizzle-orm'
import { customers, invoices } from '../db/schema'
import type { FirmScope } from './db'
import { creditedColumn, owing, paidColumn, statusOf } from './invoices'
import { AGE_BUCKET_MOST_DAYS_LATE, AGE_BUCKETS, ageBucket, type AgeBucket } from '#shared/utils/invoices'

export interface OwedInvoice { id: string, reference: string | null, dueOn: string | null, outstandingPence: number, bucket: AgeBucket, status: string, kind: string }
export interface OwedCustomer { customerId: string, customer: string, buckets: Record<AgeBucket, number>, totalPence: number, invoices: OwedInvoice[] }

/** Each age as a SQL condition on `late` (days after the due date), from the table the pages use. */
function ageCondition(bucket: AgeBucket): SQL {
  const i = AGE_BUCKETS.indexOf(bucket)
  const most = AGE_BUCKET_MOST_DAYS_LATE[bucket]
  const least = i === 0 ? null : AGE_BUCKET_MOST_DAYS_LATE[AGE_BUCKETS[i - 1]!]
  return sql.join([
    least === null ? undefined : sql`late > ${sql.raw(String(least))}`,
    Number.isFinite(most) ? sql`late <= ${sql.raw(String(most))}` : undefined,
  ].filter((c): c is SQL => c !== undefined), sql` and `)
}
/** Column names of the sums by age: b0 (not yet due) to b4. */
const ageColumn = (i: number) => sql.raw(`b${i}`)

/** A row of rankedCustomers' statement: the firm's totals (b0-b4 by age), and a customer on the page (c0-c4) or nulls. */
type RankedRow = Record<string, unknown> & { customers: string, invoices: string, overdue: string, total: string, customer_id: string | null, c_total: string | null, c_ids: string[] | null, overdue_ids: string[] | null }

/**
 * What each customer owes by age, ranked (the most owed first; the same total by id, so a page
 * boundary never moves between requests), a page of them, and the firm's totals: one statement.
 */
async function rankedCustomers(f: FirmScope, today: string, page: number, pageSize: number) {
  const byAge = (column: (i: number) => SQL, source: string) => sql.join(AGE_BUCKETS.map((b, i) =>
    sql`coalesce(sum(${sql.raw(source)}) filter (where ${ageCondition(b)}), 0)::bigint as ${column(i)}`), sql`, `)
  const { rows } = await f.tx.execute<RankedRow>(sql`
    with owing as materialized (
      select ${invoices.id} as id, ${invoices.customerId} as customer_id, ${invoices.dueOn} as due_on, ${invoices.number} as number,
        (${invoices.amountDuePence} - ${invoices.settledPence})::bigint as owed, coalesce(${today}::date - ${invoices.dueOn}, 0) as late
      from ${invoices} where ${owing(f)}
    ), by_customer as (
      select customer_id, sum(owed)::bigint as total, count(*) as invoices, count(*) filter (where late > 0) as overdue,
        array_agg(id::text order by due_on, number) as ids,
        ${byAge(ageColumn, 'owed')}
      from owing group by customer_id
    ), whole as (
      select count(*) as customers, coalesce(sum(invoices), 0)::bigint as invoices, coalesce(sum(overdue), 0)::bigint as overdue,
        coalesce(sum(total), 0)::bigint as total,
        ${sql.join(AGE_BUCKETS.map((_, i) => sql`coalesce(sum(${ageColumn(i)}), 0)::bigint as ${ageColumn(i)}`), sql`, `)},
        (select array_agg(id::text) from (select id from owing where late > 0 order by due_on, number limit ${pageSize}) o) as overdue_ids
      from by_customer
    )
    select whole.*, shown.* from whole left join lateral (
      select customer_id, total as c_total, ids as c_ids, ${sql.join(AGE_BUCKETS.map((_, i) => sql`${ageColumn(i)} as ${sql.raw(`c${i}`)}`), sql`, `)}
      from by_customer order by total desc, customer_id limit ${pageSize} offset ${(page - 1) * pageSize}
    ) shown on true
    order by shown.c_total desc, shown.customer_id`)
  const whole = rows[0]!
  const buckets = (prefix: 'b' | 'c', r: Record<string, unknown>) =>
    Object.fromEntries(AGE_BUCKETS.map((b, i) => [b, Number(r[`${prefix}${i}`] ?? 0)])) as Record<AgeBucket, number>
  return {
    totals: buckets('b', whole),
    totalPence: Number(whole.total),
    counts: { customers: Number(whole.customers), invoices: Number(whole.invoices), overdue: Number(whole.overdue) },
    shown: rows.filter(r => r.customer_id !== null).map(r => ({ customerId: r.customer_id!, totalPence: Number(r.c_total), buckets: buckets('c', r), ids: r.c_ids ?? [] })),
    overdueIds: whole.overdue_ids ?? [],
  }
}

export async function owedView(f: FirmScope, today: string, { page, pageSize }: { page: number, pageSize: number }) {
  const { totals, totalPence, counts, shown, overdueIds } = await rankedCustomers(f, today, page, pageSize)
  // the invoices of the customers shown, and the longest overdue (in due-date order), by their ids
  // from the first statement, with each one's status; one paid between the two is left out
  const ids = [...new Set([...shown.flatMap(c => c.ids), ...overdueIds])]
  const detail = !ids.length
    ? []
    : await f.tx.select({
        id: invoices.id, customerId: invoices.customerId, kind: invoices.kind, reference: invoices.reference, issuedOn: invoices.issuedOn,
        dueOn: invoices.dueOn, amountDuePence: invoices.amountDuePence, customer: customers.name, paid: paidColumn, credited: creditedColumn,
      }).from(invoices)
        .innerJoin(customers, and(eq(customers.firmId, invoices.firmId), eq(customers.id, invoices.customerId)))
        .where(owing(f, inArray(invoices.id, ids)))
        .orderBy(asc(invoices.dueOn), asc(invoices.number))
  const money = { paid: new Map(detail.map(i => [i.id, i.paid])), credited: new Map(detail.map(i => [i.id, i.credited])) }
  const line = (i: typeof detail[number]): OwedInvoice => {
    const s = statusOf(i, money, today)
    return { id: i.id, reference: i.reference, dueOn: i.dueOn, outstandingPence: s.outstandingPence, bucket: ageBucket(i.dueOn ?? today, today), status: s.status, kind: i.kind }
  }
  const names = new Map(detail.map(i => [i.customerId, i.customer]))
  const longest = new Set(overdueIds)
  const overdue = detail.filter(i => longest.has(i.id))
  return {
    today,
    page,
    pageSize,
    customers: shown.map((c): OwedCustomer => ({
      customerId: c.customerId, buckets: c.buckets, totalPence: c.totalPence, customer: names.get(c.customerId) ?? '',
      invoices: detail.filter(i => i.customerId === c.customerId).map(line),
    })),
    overdue: overdue.map(i => ({ ...line(i), customer: i.customer })),
    counts,
    totals,
    totalPence,
  }
}
