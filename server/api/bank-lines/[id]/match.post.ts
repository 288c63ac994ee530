import { idParam } from '#shared/schemas/common'
import { bankMatchSchema } from '#shared/schemas/bank'

/** Confirm what a statement line is: invoices it pays, a purchase or refund, a purchase made from it, or a Stripe payout. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const choice = await readBodyWith(event, bankMatchSchema)
  await withFirm(auth, f => confirmLine(f, id, choice))
  setResponseStatus(event, 201)
  return { id, state: 'matched' }
})
