import { invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Send a reminder now, in one click (with the firm's words for the step the invoice has reached). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, f => findOr404(f, invoices, id))
  const result = await sendReminder(auth, id, null)
  if (result === 'nothing owed') throw createError({ statusCode: 409, statusMessage: 'Nothing to chase', data: { message: 'Nothing is owed on this invoice, or the customer has no e-mail address.' } })
  return withFirm(auth, f => invoiceDetail(f, id))
})
