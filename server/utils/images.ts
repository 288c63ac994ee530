// Photos' bytes: content sniffing (file-type) and re-encoding (sharp).
//
// - Content that does not sniff as JPEG, PNG, WebP or HEIC/HEIF (whatever the name or declared
//   type says; SVG and HTML never): 415.
// - more than 40 megapixels: 422 (the bytes were within the limit; the picture is what is too
//   big). sharp's limitInputPixels refuses it from the header, before decoding any pixel.
import { fileTypeFromBuffer } from 'file-type'
import sharp from 'sharp'
import type { UploadedFile } from './multipart'
import { PHOTO_FULL_EDGE_PX } from '#shared/schemas/photo'

export const MAX_INPUT_PIXELS = 40_000_000
export const FULL_EDGE_PX = PHOTO_FULL_EDGE_PX
export const THUMB_EDGE_PX = 400

// Each upload is decoded once; libvips' operation cache would only keep pixels nobody asks for again.
sharp.cache(false)

export function notAPhoto(detail = 'That file is not a photo. Send a JPEG, PNG, WebP or HEIC picture.') {
  return fieldError({ file: detail }, 415, 'Unsupported file type')
}

export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'] as const
export type PhotoType = (typeof PHOTO_TYPES)[number]

/** What the bytes are, from their first bytes: 415 unless an allowed photo type. */
export async function sniffPhoto(file: UploadedFile): Promise<PhotoType> {
  const head = file.data.subarray(0, 4100)
  const text = head.subarray(0, 512).toString('latin1').trimStart().toLowerCase()
  // markup is never a photo, whatever it is called: refuse it by name, not just by not matching
  if (text.startsWith('<') || /svg|html|xml/i.test(file.declaredType) || /\.(svgz?|html?|xhtml|xml)$/i.test(file.filename)) {
    throw notAPhoto('SVG and web pages cannot be uploaded as photos. Send a JPEG, PNG, WebP or HEIC picture.')
  }
  const sniffed = await fileTypeFromBuffer(head)
  if (!sniffed || !(PHOTO_TYPES as readonly string[]).includes(sniffed.mime)) throw notAPhoto()
  return sniffed.mime as PhotoType
}

export interface EncodedImage {
  data: Buffer
  width: number
  height: number
  contentType: 'image/jpeg'
}

function tooManyPixels() {
  return fieldError({ file: `That picture has too many pixels (the limit is ${MAX_INPUT_PIXELS / 1_000_000} megapixels). Send a smaller copy.` }, 422, 'Picture too big')
}

const SHARP_INPUT = { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' } as const

/**
 * Decode once the header says the size is safe, turn it upright from its EXIF orientation, and
 * re-encode as JPEG with no metadata at all (no EXIF, GPS, XMP or ICC: sharp keeps none unless
 * asked) at most FULL_EDGE_PX on the long edge, plus a THUMB_EDGE_PX thumbnail.
 */
export async function encodePhoto(data: Buffer, type: PhotoType): Promise<{ full: EncodedImage, thumb: EncodedImage }> {
  const unreadable = () => type === 'image/heic' || type === 'image/heif'
    ? notAPhoto('This HEIC photo cannot be read here. On an iPhone, share it as JPEG, or set Camera > Formats to Most Compatible.')
    : fieldError({ file: 'That picture could not be read: it may be damaged. Take it again or send another copy.' }, 422, 'Unreadable picture')
  const isPixelLimit = (err: unknown) => /pixel limit/i.test(String((err as Error)?.message))

  let meta: sharp.Metadata
  try {
    meta = await sharp(data, SHARP_INPUT).metadata()
  }
  catch (err) {
    throw isPixelLimit(err) ? tooManyPixels() : unreadable()
  }
  if (!meta.width || !meta.height) throw unreadable()
  if (meta.width * meta.height > MAX_INPUT_PIXELS) throw tooManyPixels()

  try {
    const full = await sharp(data, SHARP_INPUT)
      .rotate()
      .resize({ width: FULL_EDGE_PX, height: FULL_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .flatten({ background: '#ffffff' })
      .jpeg({ quality: 82, progressive: true })
      .timeout({ seconds: 30 })
      .toBuffer({ resolveWithObject: true })
    const thumb = await sharp(full.data, SHARP_INPUT)
      .resize({ width: THUMB_EDGE_PX, height: THUMB_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 75 })
      .timeout({ seconds: 30 })
      .toBuffer({ resolveWithObject: true })
    return {
      full: { data: full.data, width: full.info.width, height: full.info.height, contentType: 'image/jpeg' },
      thumb: { data: thumb.data, width: thumb.info.width, height: thumb.info.height, contentType: 'image/jpeg' },
    }
  }
  catch (err) {
    throw isPixelLimit(err) ? tooManyPixels() : unreadable()
  }
}
