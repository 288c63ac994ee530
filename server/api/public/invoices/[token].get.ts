import { invoiceTokenParam } from '#shared/schemas/links'
/** Public: the invoice behind a customer's link, and nothing else of the firm's. */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, invoiceTokenParam)
  return useDb().transaction(async (tx) => {
    const { f, invoiceId } = await openInvoiceByToken(tx, token)
    return publicInvoiceView(f, invoiceId)
  })
})
