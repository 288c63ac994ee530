import { eq } from 'drizzle-orm'
import { rooms } from '../../../../db/schema'
import { roomParams } from '#shared/schemas/room'

/** Delete a room and everything measured in it. Owner, office, and crew on their own visits. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  if (!canMeasure(auth)) throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  const { id: visitId, roomId } = await readParamsWith(event, roomParams)
  await withFirm(auth, async (f) => {
    const visit = await findVisit(f, auth, visitId, { lock: true })
    const [gone] = await f.tx.delete(rooms)
      .where(f.where(rooms, eq(rooms.id, roomId), eq(rooms.visitId, visit.id)))
      .returning({ id: rooms.id, name: rooms.name, revision: rooms.revision })
    if (!gone) notFound()
    await f.audit('room.deleted', 'room', roomId, { visitId: visit.id, name: gone.name, revision: gone.revision })
  })
  setResponseStatus(event, 204)
  return null
})
