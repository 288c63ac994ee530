import { idParam } from '#shared/schemas/common'

/** The firm's PDF of an invoice or credit note: `/invoices/<id>/pdf` (one level down, as for quotes). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  const view = await withFirm(auth, f => publicInvoiceView(f, id))
  return sendInvoicePdf(event, view)
})
