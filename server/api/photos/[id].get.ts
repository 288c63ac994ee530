import { idParam } from '#shared/schemas/common'

/** One photo's details and the addresses of its image and thumbnail. Any member of the firm. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const { id } = await readParamsWith(event, idParam)
  const row = await withFirm(auth, f => findPhoto(f, auth, id))
  return photoJson(row)
})
