/** Invoices and credit notes, drafts first then newest, each with its status worked out from its payments and dates. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => listInvoices(f))
})
