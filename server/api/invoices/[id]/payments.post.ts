import { invoices } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { paymentSchema } from '#shared/schemas/invoice'

/**
 * Record a bank transfer, cash or cheque by hand, with its date and reference; part payments add
 * up, an overpayment is flagged. The form's requestId makes it idempotent: the same payment sent
 * twice (even at the same moment) is recorded once, by a unique key in the database. An invoice
 * that credit notes have cancelled takes no payment (409).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, paymentSchema)
  return withFirm(auth, async (f) => {
    const inv = await findOr404(f, invoices, id, { lock: true })
    const repeat = await paymentByRequest(f, input.requestId)
    if (repeat) {
      if (repeat.invoiceId !== id) throw createError({ statusCode: 409, statusMessage: 'Already recorded', data: { message: 'That payment was already recorded against another invoice.' } })
      return invoiceDetail(f, id)
    }
    if (!inv.issuedOn || inv.kind === 'credit-note') throw createError({ statusCode: 409, statusMessage: 'Not payable', data: { message: 'Payments are recorded against issued invoices.' } })
    const { credited } = await moneyAgainst(f, [id])
    if ((credited.get(id) ?? 0) >= inv.amountDuePence) {
      throw createError({ statusCode: 409, statusMessage: 'Credited', data: { message: `Credit notes cancel everything on ${inv.reference}, so nothing is owed on it: record the money against the invoice it was meant for.` } })
    }
    await recordPayment(f, id, input)
    setResponseStatus(event, 201)
    return invoiceDetail(f, id)
  })
})
