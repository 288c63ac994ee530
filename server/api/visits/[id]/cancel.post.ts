import { visitCancelSchema } from '#shared/schemas/visit'
import { idParam } from '#shared/schemas/common'

/** Cancel a booked visit, with a reason (owner and office). The enquiry it came from goes back a step. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, visitCancelSchema)
  return withFirm(auth, f => cancelVisit(f, auth, id, input.reason))
})
