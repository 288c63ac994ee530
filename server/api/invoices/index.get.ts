import { invoiceListQuery } from '#shared/schemas/invoice'

/** Invoices and credit notes, drafts first then newest, each with its status worked out from its payments and dates; the newest `pageSize`. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { pageSize } = await readQueryWith(event, invoiceListQuery)
  return withFirm(auth, f => listInvoices(f, undefined, { limit: pageSize }))
})
