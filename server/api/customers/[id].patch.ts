import { eq, sql } from 'drizzle-orm'
import { customers } from '../../db/schema'
import { customerSchema } from '#shared/schemas/customer'
import { idParam } from '#shared/schemas/common'

/** Change a customer (the whole record, validated together). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, customerSchema)
  return withFirm(auth, async (f) => {
    const [c] = await f.tx.update(customers).set({ ...input, updatedAt: sql`now()` }).where(f.where(customers, eq(customers.id, id))).returning()
    if (!c) notFound()
    await f.audit('customer.updated', 'customer', id, { fields: Object.keys(input) })
    return c
  })
})
