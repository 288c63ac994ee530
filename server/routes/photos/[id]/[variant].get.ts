import { photoVariantParams } from '#shared/schemas/photo'

/**
 * The bytes of a photo (`full`) or its thumbnail (`thumb`), to a signed-in member of its firm
 * only; another firm's photo is the same 404 as a missing one. Served as an image that a browser
 * must not sniff into anything else, under a name of ours (never the uploader's file name).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const { id, variant } = await readParamsWith(event, photoVariantParams)
  const row = await withFirm(auth, f => findPhoto(f, auth, id))
  const data = await useObjectStore().get(variant === 'thumb' ? row.thumbKey : row.storageKey)
  if (!data) {
    console.error('[photos] stored object missing for photo', id, variant)
    notFound()
  }
  setResponseHeaders(event, {
    'content-type': row.contentType,
    'content-length': data.length,
    'x-content-type-options': 'nosniff',
    'content-disposition': `inline; filename="photo-${row.id}${variant === 'thumb' ? '-thumb' : ''}.jpg"`,
    'cache-control': 'private, max-age=3600',
    'content-security-policy': 'default-src \'none\'; sandbox',
    'cross-origin-resource-policy': 'same-origin',
  })
  return data
})
