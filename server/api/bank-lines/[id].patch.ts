import { idParam } from '#shared/schemas/common'
import { bankLineChangeSchema } from '#shared/schemas/bank'

/** A note on a line left for later, or the line set aside or brought back. Owner and office. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const change = await readBodyWith(event, bankLineChangeSchema)
  await withFirm(auth, f => noteLine(f, id, change))
  return { id, ...change }
})
