import { idParam } from '#shared/schemas/common'

/** One job: customer, site, days, the set plan with its reasons, the set log, materials used, drying. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'jobs:read-assigned')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, f => jobDetail(f, auth, id))
})
