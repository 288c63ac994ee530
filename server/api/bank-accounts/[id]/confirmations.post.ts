import { idParam } from '#shared/schemas/common'
import { bankConfirmAllSchema } from '#shared/schemas/bank'

/**
 * Confirm the sure proposals the partner saw, all at once. Each line's proposal is worked out again
 * here: one still sure is confirmed as proposed, anything else (matched meanwhile, or no longer
 * sure because what is owed changed) is left open and counted. Owner and office.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const { lineIds } = await readBodyWith(event, bankConfirmAllSchema)
  return withFirm(auth, f => confirmSure(f, id, lineIds))
})
