import { count, eq, ne, sql, type SQL } from 'drizzle-orm'
import { cisStatements, enquiries, invoices, jobs, quotes, sites, visits } from '../db/schema'
import { holdingWorkInWords, type HoldingWork } from '#shared/utils/ledger'

/** The site with this id in the current firm (and of this customer, when given), or 404. */
export async function findSite(f: FirmScope, id: string, customerId?: string) {
  return findOr404(f, sites, id, { where: customerId ? eq(sites.customerId, customerId) : undefined })
}

/** A 400 naming one field, for a reference that does not point at a row of this firm. */
export function badReference(field: string, message: string): never {
  throw fieldError({ [field]: message })
}

/**
 * How much work names this customer or site, counted in the transaction that would remove it (the
 * caller locks the row first, so nothing that names it can land between the count and the delete:
 * a new row's foreign key check waits on the lock, then finds the row gone).
 */
export async function workNaming(f: FirmScope, by: 'customerId' | 'siteId', id: string): Promise<Record<HoldingWork, number>> {
  const n = async (table: typeof invoices | typeof jobs | typeof quotes | typeof visits | typeof enquiries, ...more: (SQL | undefined)[]) => {
    const [row] = await f.tx.select({ n: count() }).from(table).where(f.where(table, eq(table[by], id), ...more))
    return row?.n ?? 0
  }
  const cis = by === 'customerId'
    ? (await f.tx.select({ n: count() }).from(cisStatements).where(f.where(cisStatements, eq(cisStatements.customerId, id))))[0]?.n ?? 0
    : 0
  return {
    invoices: await n(invoices, ne(invoices.kind, 'credit-note')),
    creditNotes: await n(invoices, eq(invoices.kind, 'credit-note')),
    jobs: await n(jobs),
    quotes: await n(quotes),
    visits: await n(visits),
    enquiries: await n(enquiries),
    cisStatements: cis,
  }
}

/**
 * Before a customer or site is locked for removal, the firm's row is share-locked
 * (FOR KEY SHARE, as the audit entry's foreign key would lock it later anyway): numbering a job or a
 * quote locks the firm's row before its foreign keys lock the customer, so taking the two locks in
 * that same order here is what keeps a removal and a new job from waiting on each other for ever
 * (PostgreSQL's deadlock, a 500, in tests/reliability/removals.test.ts).
 */
export async function lockFirmForRemoval(f: FirmScope) {
  await f.tx.execute(sql`select 1 from firms where id = ${f.firmId} for key share`)
}

/** A removal refused because work names the row: 409 with the counts in words. */
export function heldByWork(subject: string, counts: Record<HoldingWork, number>, noun: 'customer' | 'site'): never {
  throw createError({
    statusCode: 409,
    statusMessage: 'Still in use',
    data: { message: `${subject} has ${holdingWorkInWords(counts)}: they stay on the ${noun}'s record, so the ${noun} cannot be removed.`, holds: counts },
  })
}

/** A removal that lost a race with new work naming the row (the foreign key refused it): 409. */
export function heldByNewWork(what: string): never {
  throw createError({ statusCode: 409, statusMessage: 'Still in use', data: { message: `Something was just recorded for ${what}, so it stays. Reload to see it.` } })
}
