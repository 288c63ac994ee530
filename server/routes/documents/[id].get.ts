import { documents } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/**
 * The bytes of a receipt or CIS statement, to those who may read the firm's money (owner, office,
 * accountant); another firm's document is the same 404 as a missing one. Always a download, in a
 * sandbox, under a name of ours: a PDF can carry scripts, and it is never shown inside Setwell.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const row = await withFirm(auth, f => findOr404(f, documents, id))
  const data = await useObjectStore().get(row.storageKey)
  if (!data) {
    console.error('[documents] stored object missing for document', id)
    notFound()
  }
  const ext = row.contentType === 'application/pdf' ? 'pdf' : 'jpg'
  setResponseHeaders(event, {
    'content-type': row.contentType,
    'content-length': data.length,
    'x-content-type-options': 'nosniff',
    'content-disposition': `attachment; filename="${row.purchaseId ? 'receipt' : 'cis-statement'}-${row.id}.${ext}"`,
    'cache-control': 'private, max-age=3600',
    'content-security-policy': 'default-src \'none\'; sandbox',
    'cross-origin-resource-policy': 'same-origin',
  })
  return data
})
