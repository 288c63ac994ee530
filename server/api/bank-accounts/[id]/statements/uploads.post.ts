import type { z } from 'zod'
import { bankLayoutSchema } from '#shared/schemas/bank'
import { fieldErrors, idParam } from '#shared/schemas/common'

/**
 * Import a statement file (CSV or OFX) into one of the firm's bank accounts: multipart/form-data
 * with the file in `file`, and `layout` (JSON: which column is which) when the CSV's header does not
 * say. At an /uploads path so the request guard leaves the body to this route.
 *
 * 200 { statementId, linesNew, linesAlready }. 400 (no file; a line that cannot be read, named);
 * 401; 403 (crew, accountant); 404 (no such account in this firm); 413; 415 (not multipart).
 */
export default defineEventHandler(async (event) => {
  const maxFileBytes = uploadMaxBytes()
  const maxRequestBytes = maxFileBytes + MULTIPART_OVERHEAD_BYTES
  limitUnreadBody(event, 2 * maxRequestBytes)
  const auth = await requireAuth(event, 'money:write')
  const { id: accountId } = await readParamsWith(event, idParam)
  assertMultipartRequest(event, maxRequestBytes, maxFileBytes)
  const upload = await readMultipartUpload(event, { fileField: 'file', fields: ['layout'], maxFileBytes, maxRequestBytes })
  if (!upload.file || upload.file.data.length === 0) throw fieldError({ file: 'Choose the statement file: CSV or OFX, as the bank gives it.' })
  let layout: z.output<typeof bankLayoutSchema> | undefined
  if (upload.fields.layout !== undefined) {
    let raw: unknown
    try {
      raw = JSON.parse(upload.fields.layout)
    }
    catch {
      throw fieldError({ layout: 'Choose which column is which.' })
    }
    const checked = bankLayoutSchema.safeParse(raw)
    if (!checked.success) throw fieldError(fieldErrors(checked.error.issues))
    layout = checked.data
  }
  const file = upload.file
  return withFirm(auth, f => importStatement(f, accountId, file, layout))
})
