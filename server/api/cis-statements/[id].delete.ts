import { eq } from 'drizzle-orm'
import { cisStatements, documents } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Remove a statement recorded by mistake, with its files. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const keys = await withFirm(auth, async (f) => {
    await findOr404(f, cisStatements, id, { lock: true })
    const docs = await f.tx.select({ storageKey: documents.storageKey }).from(documents).where(f.where(documents, eq(documents.cisStatementId, id)))
    await f.tx.delete(cisStatements).where(f.where(cisStatements, eq(cisStatements.id, id)))
    await f.audit('cis-statement.removed', 'cis-statement', id, {})
    return docs.map(d => d.storageKey)
  })
  const store = useObjectStore()
  await Promise.allSettled(keys.map(k => store.remove(k)))
  setResponseStatus(event, 204)
  return null
})
