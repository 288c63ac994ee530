import { eq } from 'drizzle-orm'
import { invoices } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Only a draft can be deleted (it has no number yet); an issued invoice is corrected by a credit note (409). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    if (inv.issuedOn) throw createError({ statusCode: 409, statusMessage: 'Issued', data: { message: 'An issued invoice is never deleted: correct it with a credit note.' } })
    await f.tx.delete(invoices).where(f.where(invoices, eq(invoices.id, id)))
    await f.audit('invoice.deleted', 'invoice', id, {})
  })
  setResponseStatus(event, 204)
  return null
})
