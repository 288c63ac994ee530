import { eq } from 'drizzle-orm'
import { purchases } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    await findPurchase(f, id, true)
    await f.tx.delete(purchases).where(f.where(purchases, eq(purchases.id, id)))
    await f.audit('purchase.deleted', 'purchase', id, {})
    return { deleted: true }
  })
})
