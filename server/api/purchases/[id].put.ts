import { eq, sql } from 'drizzle-orm'
import { purchases } from '../../db/schema'
import { idParam } from '#shared/schemas/common'
import { purchaseSchema } from '#shared/schemas/purchase'

/** Change a purchase and its split. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const { jobs: split, ...input } = await readBodyWith(event, purchaseSchema)
  return withFirm(auth, async (f) => {
    await findOr404(f, purchases, id, { lock: true })
    await checkJobs(f, split)
    await f.tx.update(purchases).set({ ...input, updatedAt: sql`now()` }).where(f.where(purchases, eq(purchases.id, id)))
    await saveSplit(f, id, split)
    await f.audit('purchase.changed', 'purchase', id, {})
    return purchaseDetail(f, id)
  })
})
