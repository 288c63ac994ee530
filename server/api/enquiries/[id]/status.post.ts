import { enquiryMoveSchema } from '#shared/schemas/enquiry'
import { idParam } from '#shared/schemas/common'

/** Move an enquiry: new -> visit booked -> quoted -> won, or lost with a reason. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const { to, reason } = await readBodyWith(event, enquiryMoveSchema)
  return withFirm(auth, f => moveEnquiry(f, id, to, reason || null))
})
