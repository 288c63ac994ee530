import { idParam } from '#shared/schemas/common'

/** One quote: its versions, and the current one with its lines and totals. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, f => quoteDetail(f, id))
})
