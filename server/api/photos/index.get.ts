import { photoListQuery } from '#shared/schemas/photo'
/** The photos of one enquiry, visit (with its surfaces' and conditions'), surface or condition. Any member of the firm. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const filter = await readQueryWith(event, photoListQuery)
  const rows = await withFirm(auth, async (f) => {
    await resolvePhotoTarget(f, auth, filter) // 404 for a target that is not this firm's
    return listPhotos(f, filter)
  })
  return { photos: rows.map(photoJson) }
})
