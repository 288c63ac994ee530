import { eq } from 'drizzle-orm'
import { documents, purchases } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Delete a purchase recorded by mistake, with its split and its receipt files. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const keys = await withFirm(auth, async (f) => {
    await findOr404(f, purchases, id, { lock: true })
    const docs = await f.tx.select({ storageKey: documents.storageKey }).from(documents).where(f.where(documents, eq(documents.purchaseId, id)))
    await f.tx.delete(purchases).where(f.where(purchases, eq(purchases.id, id)))
    await f.audit('purchase.deleted', 'purchase', id, {})
    return docs.map(d => d.storageKey)
  })
  const store = useObjectStore()
  await Promise.allSettled(keys.map(k => store.remove(k)))
  setResponseStatus(event, 204)
  return null
})
