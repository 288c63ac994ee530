import { eq } from 'drizzle-orm'
import { customers, sites } from '../db/schema'

/** The customer with this id in the current firm, or 404. */
export async function findCustomer(f: FirmScope, id: string) {
  const [c] = await f.tx.select().from(customers).where(f.where(customers, eq(customers.id, id)))
  if (!c) notFound()
  return c
}

/** The site with this id in the current firm (and of this customer, when given), or 404. */
export async function findSite(f: FirmScope, id: string, customerId?: string) {
  const [s] = await f.tx.select().from(sites)
    .where(f.where(sites, eq(sites.id, id), customerId ? eq(sites.customerId, customerId) : undefined))
  if (!s) notFound()
  return s
}

/** A 400 naming one field, for a reference that does not point at a row of this firm. */
export function badReference(field: string, message: string): never {
  throw fieldError({ [field]: message })
}
