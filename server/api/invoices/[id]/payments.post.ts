import { idParam } from '#shared/schemas/common'
import { paymentSchema } from '#shared/schemas/invoice'

/** Record a bank transfer, cash or cheque by hand, with its date and reference; part payments add up, an overpayment is flagged. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, paymentSchema)
  return withFirm(auth, async (f) => {
    const inv = await findInvoice(f, id, true)
    if (!inv.issuedOn || inv.kind === 'credit-note') throw createError({ statusCode: 409, statusMessage: 'Not payable', data: { message: 'Payments are recorded against issued invoices.' } })
    await recordPayment(f, id, input)
    setResponseStatus(event, 201)
    return invoiceDetail(f, id)
  })
})
