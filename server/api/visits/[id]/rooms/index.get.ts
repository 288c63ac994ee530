import { idParam } from '#shared/schemas/common'

/**
 * The rooms of a visit, each whole (surfaces with openings and conditions, corners), ordered by
 * position, with its revision and its totals in cm². Anyone who may see the visit (findVisit).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const visit = await findVisit(f, auth, id)
    return { rooms: await loadRooms(f, visit.id) }
  })
})
