import { photos, setLogPhotos } from '../../db/schema'
import { PHOTO_TARGET_KEYS, photoListQuery } from '#shared/schemas/photo'

/**
 * Upload one photo: multipart/form-data with the picture in `file`, what it belongs to in exactly
 * one of `enquiryId`, `visitId`, `surfaceId`, `conditionId`, `setLogId`, and an optional `caption` (each as
 * a form field or in the query string). At /api/photos/uploads because the request guard leaves
 * `/uploads` paths' bodies to the route (it still refuses cross-site requests).
 *
 * An optional `clientId` (a uuid made on the phone) makes a resend harmless: a photo already stored
 * with it is answered 200 with the same body, and nothing new is kept.
 *
 * 201 { id, width, height, url, thumbUrl }. 401, 403 (accountant), 404 (no such target in this
 * firm), 400 (no file, no or two targets), 413 (over the size limit, with or without
 * Content-Length), 415 (not multipart, or not a JPEG/PNG/WebP/HEIC photo), 422 (over 40
 * megapixels, or unreadable). Limits and reasons: server/utils/multipart.ts and images.ts.
 */
export default defineEventHandler(async (event) => {
  const maxFileBytes = uploadMaxBytes()
  const maxRequestBytes = maxFileBytes + MULTIPART_OVERHEAD_BYTES
  // whatever the answer (401 included), a client still sending is not read from for ever
  limitUnreadBody(event, 2 * maxRequestBytes)
  const auth = await requireAuth(event)
  if (!can(auth.role, 'work:log') && !can(auth.role, 'ledger:write')) {
    throw createError({ statusCode: 403, statusMessage: 'Your role does not allow this' })
  }
  assertMultipartRequest(event, maxRequestBytes, maxFileBytes)

  // a target named in the query is checked before the body is read
  const query = getQuery(event)
  if (PHOTO_TARGET_KEYS.some(k => query[k])) {
    const early = photoListQuery.safeParse(query)
    if (early.success) await withFirm(auth, f => resolvePhotoTarget(f, auth, early.data))
  }

  const upload = await readMultipartUpload(event, {
    fileField: 'file',
    fields: [...PHOTO_TARGET_KEYS, 'caption', 'clientId'],
    maxFileBytes,
    maxRequestBytes,
  })
  const input = mergeUploadInputs(query, upload.fields)
  if (!upload.file || upload.file.data.length === 0) throw fieldError({ file: 'Choose a photo to upload.' })

  // sent again from the phone's queue (its first answer was lost): the photo it already is
  if (input.clientId) {
    const already = await withFirm(auth, f => keptPhoto(f, input.clientId!))
    if (already) return already
  }

  const type = await sniffPhoto(upload.file)
  const { full, thumb } = await encodePhoto(upload.file.data, type)
  const originalName = cleanFilename(upload.file.filename)
  upload.file.data = Buffer.alloc(0) // the original (with its metadata) is not kept anywhere

  const store = useObjectStore()
  const storageKey = newObjectKey('photos', auth.firmId, '.jpg')
  const thumbKey = newObjectKey('photos', auth.firmId, '.jpg')
  await store.put(storageKey, full.data)
  await store.put(thumbKey, thumb.data)

  let row: PhotoRow | null
  try {
    row = await withFirm(auth, async (f) => {
      const { setLogId, ...target } = await resolvePhotoTarget(f, auth, input)
      const [inserted] = await f.tx.insert(photos).values(f.values({
        clientId: input.clientId ?? null,
        storageKey,
        thumbKey,
        contentType: full.contentType,
        width: full.width,
        height: full.height,
        bytes: full.data.length,
        originalName,
        caption: input.caption,
        ...target,
        uploadedBy: auth.userId,
      })).onConflictDoNothing({ target: [photos.firmId, photos.clientId] }).returning()
      // the same phone-made id arrived twice at once: the other one stored it
      if (!inserted) return null
      if (setLogId) await f.tx.insert(setLogPhotos).values(f.values({ photoId: inserted!.id, setLogId }))
      await f.audit('photo.uploaded', 'photo', inserted!.id, {
        ...target,
        setLogId,
        width: full.width,
        height: full.height,
        bytes: full.data.length,
        sniffedType: type,
      })
      return inserted!
    })
  }
  catch (err) {
    // no row, so no one can reach these objects: take them away again
    await Promise.allSettled([store.remove(storageKey), store.remove(thumbKey)])
    throw err
  }

  if (!row) {
    await Promise.allSettled([store.remove(storageKey), store.remove(thumbKey)])
    const already = await withFirm(auth, f => keptPhoto(f, input.clientId!))
    if (already) return already
    throw createError({ statusCode: 409, statusMessage: 'Sent twice', data: { message: 'This photo was sent twice at once. Try again.' } })
  }
  setResponseStatus(event, 201)
  return { id: row.id, width: row.width, height: row.height, ...photoUrls(row.id) }
})
