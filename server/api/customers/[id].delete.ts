import { eq } from 'drizzle-orm'
import { customers } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * Remove a customer no work names (a mistake; their sites go with them); otherwise 409 saying what
 * holds them. The row is locked before counting, so work recorded at the same moment either lands
 * first (and is counted) or waits and then finds the customer gone; a foreign key that still
 * refuses the delete is a 409 too.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  try {
    await withFirm(auth, async (f) => {
      await lockFirmForRemoval(f)
      const [c] = await f.tx.select({ name: customers.name }).from(customers).where(f.where(customers, eq(customers.id, id))).for('update')
      if (!c) notFound()
      const work = await workNaming(f, 'customerId', id)
      if (Object.values(work).some(n => n > 0)) heldByWork(c.name, work, 'customer')
      await f.tx.delete(customers).where(f.where(customers, eq(customers.id, id)))
      await f.audit('customer.deleted', 'customer', id, { name: c.name })
    })
  }
  catch (err) {
    if (isForeignKeyViolation(err)) heldByNewWork('this customer')
    throw err
  }
  setResponseStatus(event, 204)
  return null
})
