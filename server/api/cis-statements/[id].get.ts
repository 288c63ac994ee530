import { idParam } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, f => cisStatementDetail(f, id))
})
