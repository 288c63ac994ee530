import { eq } from 'drizzle-orm'
import { photos } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Delete a photo: the row (audited), then its stored image and thumbnail. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const row = await withFirm(auth, async (f) => {
    // crew delete only photos of their own visits (and never an enquiry's)
    await findPhoto(f, auth, id)
    const [deleted] = await f.tx.delete(photos).where(f.where(photos, eq(photos.id, id))).returning()
    if (!deleted) notFound()
    await f.audit('photo.deleted', 'photo', id, {
      enquiryId: deleted.enquiryId,
      visitId: deleted.visitId,
      surfaceId: deleted.surfaceId,
      conditionId: deleted.conditionId,
    })
    return deleted
  })
  // after the commit: an object left behind by a failure here is unreachable (its key was random)
  const store = useObjectStore()
  const results = await Promise.allSettled([store.remove(row.storageKey), store.remove(row.thumbKey)])
  for (const r of results) {
    if (r.status === 'rejected') console.error('[photos] could not remove a stored object of photo', id, (r.reason as Error)?.message)
  }
  setResponseStatus(event, 204)
  return null
})
