import { count, eq } from 'drizzle-orm'
import { customers, enquiries, visits } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Remove a customer who has no enquiries or visits yet (a mistake); otherwise 409. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, async (f) => {
    const c = await findCustomer(f, id)
    const [e] = await f.tx.select({ n: count() }).from(enquiries).where(f.where(enquiries, eq(enquiries.customerId, id)))
    const [v] = await f.tx.select({ n: count() }).from(visits).where(f.where(visits, eq(visits.customerId, id)))
    if ((e?.n ?? 0) + (v?.n ?? 0) > 0) {
      throw createError({ statusCode: 409, statusMessage: 'Customer has work', data: { message: `${c.name} has enquiries or visits, so they stay in the ledger.` } })
    }
    await f.tx.delete(customers).where(f.where(customers, eq(customers.id, id)))
    await f.audit('customer.deleted', 'customer', id, { name: c.name })
  })
  setResponseStatus(event, 204)
  return null
})
