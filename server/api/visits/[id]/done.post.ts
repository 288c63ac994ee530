import { visitDoneSchema } from '#shared/schemas/visit'
import { idParam } from '#shared/schemas/common'

/**
 * Mark a visit done, at `at` (default now; not in the future). Owner and office, or the person
 * down to make the visit (crew see and mark only their own: findVisit). Sent again, it is a 200
 * that changes nothing: the phone may resend it from its queue.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  if (!can(auth.role, 'ledger:write') && !can(auth.role, 'work:log')) throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, visitDoneSchema)
  return withFirm(auth, f => markVisitDone(f, auth, id, input.at ? new Date(input.at) : new Date(), input.clientId ?? null))
})
