import { invoiceTokenParam } from '#shared/schemas/links'
/** Public: the customer's PDF of their invoice, by the link they were sent (`/i/<token>/pdf`). */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, invoiceTokenParam)
  const view = await useDb().transaction(async (tx) => {
    const { f, invoiceId } = await openInvoiceByToken(tx, token)
    return publicInvoiceView(f, invoiceId)
  })
  return sendInvoicePdf(event, view)
})
