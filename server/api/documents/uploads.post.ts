import { documents } from '../../db/schema'
import { DOCUMENT_TARGET_KEYS, documentTargetSchema } from '#shared/schemas/photo'
import { fieldErrors } from '#shared/schemas/common'

/**
 * Upload a receipt for a purchase, or a contractor's CIS statement: multipart/form-data with the
 * file in `file` and exactly one of `purchaseId`, `cisStatementId` (a form field or in the query
 * string). A PDF is kept as sent; a photo is re-encoded as JPEG without its metadata, like site
 * photos. At an /uploads path so the request guard leaves the body to this route.
 *
 * 201 the document. 401; 403 (crew, accountant); 404 (no such purchase or statement in this firm);
 * 400 (no file, no or two targets); 413 (over the size limit); 415 (not multipart, or neither a
 * PDF nor a photo); 422 (a photo over 40 megapixels or unreadable).
 */
export default defineEventHandler(async (event) => {
  const maxFileBytes = uploadMaxBytes()
  const maxRequestBytes = maxFileBytes + MULTIPART_OVERHEAD_BYTES
  limitUnreadBody(event, 2 * maxRequestBytes)
  const auth = await requireAuth(event, 'money:write')
  assertMultipartRequest(event, maxRequestBytes, maxFileBytes)

  const query = getQuery(event)
  const fromQuery = documentTargetSchema.safeParse({ purchaseId: query.purchaseId, cisStatementId: query.cisStatementId })
  if (fromQuery.success) await withFirm(auth, f => resolveDocumentTarget(f, fromQuery.data))

  const upload = await readMultipartUpload(event, { fileField: 'file', fields: DOCUMENT_TARGET_KEYS, maxFileBytes, maxRequestBytes })
  const merged: Record<string, unknown> = {}
  for (const key of DOCUMENT_TARGET_KEYS) {
    const q = typeof query[key] === 'string' ? query[key] as string : undefined
    const b = upload.fields[key]
    if (q !== undefined && b !== undefined && q !== b) throw fieldError({ [key]: 'Given twice with two values.' })
    merged[key] = b ?? q
  }
  const target = documentTargetSchema.safeParse(merged)
  if (!target.success) throw fieldError(fieldErrors(target.error.issues))
  if (!upload.file || upload.file.data.length === 0) throw fieldError({ file: 'Choose the receipt: a PDF or a photo.' })

  const type = await sniffDocument(upload.file)
  let data: Buffer
  let contentType: string
  if (type === 'application/pdf') {
    data = upload.file.data
    contentType = type
  }
  else {
    const { full } = await encodePhoto(upload.file.data, type)
    data = full.data
    contentType = full.contentType
  }
  const originalName = cleanFilename(upload.file.filename)
  upload.file.data = Buffer.alloc(0)

  const store = useObjectStore()
  const storageKey = newObjectKey('documents', auth.firmId, contentType === 'application/pdf' ? '.pdf' : '.jpg')
  await store.put(storageKey, data)
  try {
    const row = await withFirm(auth, async (f) => {
      const to = await resolveDocumentTarget(f, target.data)
      const [inserted] = await f.tx.insert(documents).values(f.values({ ...to, storageKey, contentType, bytes: data.length, originalName, uploadedBy: auth.userId })).returning()
      await f.audit('document.uploaded', to.purchaseId ? 'purchase' : 'cis-statement', (to.purchaseId ?? to.cisStatementId)!, { documentId: inserted!.id, contentType, bytes: data.length })
      return inserted!
    })
    setResponseStatus(event, 201)
    return documentJson(row)
  }
  catch (err) {
    await store.remove(storageKey).catch(() => {})
    throw err
  }
})
