import { newInvoiceSchema } from '#shared/schemas/invoice'

/** A draft invoice: from a job (deposit or stage as a percentage or an amount, or the final less what was invoiced), or blank. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const input = await readBodyWith(event, newInvoiceSchema)
  return withFirm(auth, async (f) => {
    const row = await createDraft(f, input)
    setResponseStatus(event, 201)
    return invoiceDetail(f, row.id)
  })
})
