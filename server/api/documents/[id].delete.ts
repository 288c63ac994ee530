import { eq } from 'drizzle-orm'
import { documents } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Take a receipt or statement file away (the purchase or statement stays). Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const row = await withFirm(auth, async (f) => {
    const doc = await findOr404(f, documents, id)
    await f.tx.delete(documents).where(f.where(documents, eq(documents.id, id)))
    await f.audit('document.removed', doc.purchaseId ? 'purchase' : 'cis-statement', (doc.purchaseId ?? doc.cisStatementId)!, { documentId: id })
    return doc
  })
  await useObjectStore().remove(row.storageKey).catch(err => console.error('[documents] could not remove stored object', id, err))
  setResponseStatus(event, 204)
  return null
})
