// Uploads: a streamed multipart reader with hard limits (busboy), content sniffing (file-type),
// and re-encoding of photos (sharp); then the photo helpers the /api/photos routes share.
//
// Limits and answers (DEVELOPERS.md has the table):
// - the file may be at most uploadMaxBytes (15 MiB unless NUXT_UPLOAD_MAX_BYTES says otherwise);
//   the whole request that plus 64 KiB for the form's other parts. A Content-Length over that is
//   refused before a byte is read; a body without one (chunked) is counted as it arrives and
//   refused the moment it passes. Either way 413, and never more than the limit held in memory.
// - not multipart/form-data: 415. Content that does not sniff as JPEG, PNG, WebP or HEIC/HEIF
//   (whatever the name or declared type says; SVG and HTML never): 415.
// - more than 40 megapixels: 422 (the bytes were within the limit; the picture is what is too
//   big). sharp's limitInputPixels refuses it from the header, before decoding any pixel.
import type { H3Event } from 'h3'
import busboy from 'busboy'
import { and, asc, eq, getTableColumns } from 'drizzle-orm'
import { fileTypeFromBuffer } from 'file-type'
import sharp from 'sharp'
import { conditions, enquiries, photos, rooms, setLogPhotos, setLogs, surfaces, visits } from '../db/schema'
import type { FirmScope } from './db'
import { fieldErrors } from '#shared/schemas/common'
import { PHOTO_TARGET_KEYS, photoUploadSchema, type PhotoTarget, type PhotoTargetKey } from '#shared/schemas/photo'

export const DEFAULT_UPLOAD_MAX_BYTES = 15 * 1024 * 1024
/** Room for the multipart boundaries, part headers and the small text fields beside the file. */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024
export const MAX_INPUT_PIXELS = 40_000_000
export const FULL_EDGE_PX = 2560
export const THUMB_EDGE_PX = 400
/** After a refusal, how long the client may go on sending (discarded) before the connection is cut. */
const DISCARD_GRACE_MS = 10_000

// Each upload is decoded once; libvips' operation cache would only keep pixels nobody asks for again.
sharp.cache(false)

/** The largest file accepted, in bytes: runtime config `uploadMaxBytes`, else NUXT_UPLOAD_MAX_BYTES, else 15 MiB. */
export function uploadMaxBytes(): number {
  const fromConfig = (useRuntimeConfig() as { uploadMaxBytes?: unknown }).uploadMaxBytes
  for (const value of [fromConfig, process.env.NUXT_UPLOAD_MAX_BYTES]) {
    const n = Number(value)
    if (Number.isSafeInteger(n) && n > 0) return n
  }
  return DEFAULT_UPLOAD_MAX_BYTES
}

function megabytes(bytes: number) {
  return `${Math.floor(bytes / (1024 * 1024))} MB`
}

export function uploadTooLarge(maxFileBytes: number) {
  return fieldError({ file: `That file is too large: the limit is ${megabytes(maxFileBytes)}. Take the photo again at a lower size, or send a smaller copy.` }, 413, 'Upload too large')
}

export function notAPhoto(detail = 'That file is not a photo. Send a JPEG, PNG, WebP or HEIC picture.') {
  return fieldError({ file: detail }, 415, 'Unsupported file type')
}

/**
 * Once the answer is sent, a client that is still sending may go on for a while (its bytes are
 * read and dropped, so it sees our answer rather than a reset), but not for ever: past
 * `capBytes` or DISCARD_GRACE_MS the connection is closed. Call at the start of an upload route.
 */
export function limitUnreadBody(event: H3Event, capBytes: number) {
  const { req, res } = event.node
  res.once('finish', () => {
    if (req.complete || req.destroyed) return
    let dropped = 0
    const stop = () => {
      if (!req.complete) req.socket?.destroy()
    }
    const timer = setTimeout(stop, DISCARD_GRACE_MS)
    timer.unref()
    req.on('data', (chunk: Buffer) => {
      dropped += chunk.length
      if (dropped > capBytes) stop()
    })
    req.once('end', () => clearTimeout(timer))
    req.once('close', () => clearTimeout(timer))
    req.resume()
  })
}

/** Before reading: 415 unless multipart/form-data, 413 when the declared length is over the limit. */
export function assertMultipartRequest(event: H3Event, maxRequestBytes: number, maxFileBytes: number) {
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  if (type !== 'multipart/form-data') {
    throw createError({ statusCode: 415, statusMessage: 'Send the file as multipart/form-data, in the field "file"' })
  }
  const declared = getRequestHeader(event, 'content-length')
  if (declared !== undefined && Number(declared) > maxRequestBytes) throw uploadTooLarge(maxFileBytes)
}

export interface UploadedFile {
  data: Buffer
  /** As the client named it: for display only, never trusted, never put in a header. */
  filename: string
  /** As the client declared it: never trusted (the content is sniffed). */
  declaredType: string
}

export interface MultipartUpload {
  fields: Record<string, string>
  file: UploadedFile | null
}

export interface MultipartOptions {
  /** The one file part accepted. */
  fileField: string
  /** The text fields accepted; others are ignored. */
  fields: readonly string[]
  maxFileBytes: number
  maxRequestBytes: number
  maxFieldBytes?: number
}

/**
 * Stream a multipart body through busboy: one file (held in memory up to maxFileBytes, no more)
 * and a few short text fields. Rejects with 413 past a limit, 400 for a malformed body or
 * unexpected parts.
 */
export function readMultipartUpload(event: H3Event, opts: MultipartOptions): Promise<MultipartUpload> {
  const req = event.node.req
  let parser: busboy.Busboy
  try {
    parser = busboy({
      headers: req.headers,
      defParamCharset: 'utf8',
      limits: {
        fileSize: opts.maxFileBytes,
        files: 1,
        fields: opts.fields.length + 2,
        parts: opts.fields.length + 3,
        fieldNameSize: 100,
        fieldSize: opts.maxFieldBytes ?? 4096,
        headerPairs: 20,
      },
    })
  }
  catch {
    // no boundary, or a content type busboy does not read
    throw createError({ statusCode: 415, statusMessage: 'Send the file as multipart/form-data, in the field "file"' })
  }

  return new Promise<MultipartUpload>((resolve, reject) => {
    let settled = false
    let received = 0
    const fields: Record<string, string> = {}
    let file: UploadedFile | null = null
    let chunks: Buffer[] = []
    let fileBytes = 0

    const finish = (err: unknown, value?: MultipartUpload) => {
      if (settled) return
      settled = true
      req.off('data', count)
      if (err) {
        req.unpipe(parser)
        parser.removeAllListeners()
        parser.on('error', () => {}) // the parser may still complain about the cut-off body
        chunks = []
        reject(err)
      }
      else resolve(value!)
    }
    const count = (chunk: Buffer) => {
      received += chunk.length
      if (received > opts.maxRequestBytes) finish(uploadTooLarge(opts.maxFileBytes))
    }
    const badRequest = (message: string, field = opts.fileField) => fieldError({ [field]: message })

    req.on('data', count)
    req.once('error', () => finish(createError({ statusCode: 400, statusMessage: 'The upload was interrupted' })))
    req.once('close', () => {
      if (!req.complete) finish(createError({ statusCode: 400, statusMessage: 'The upload was interrupted' }))
    })

    parser.on('file', (name, stream, info) => {
      if (settled || name !== opts.fileField || file) {
        stream.resume()
        finish(badRequest(`Send one photo, in the field "${opts.fileField}".`))
        return
      }
      file = { data: Buffer.alloc(0), filename: info.filename ?? '', declaredType: info.mimeType ?? '' }
      stream.on('data', (chunk: Buffer) => {
        if (settled) return
        fileBytes += chunk.length
        chunks.push(chunk)
      })
      stream.once('limit', () => finish(uploadTooLarge(opts.maxFileBytes)))
    })
    parser.on('field', (name, value, info) => {
      if (settled || !opts.fields.includes(name)) return
      if (info.valueTruncated) {
        finish(badRequest('That is too long.', name))
        return
      }
      fields[name] = value
    })
    for (const limit of ['partsLimit', 'filesLimit', 'fieldsLimit'] as const) {
      parser.once(limit, () => finish(badRequest('Send one photo at a time, with only its caption and what it belongs to.')))
    }
    parser.once('error', () => finish(badRequest('That upload could not be read. Send it again.')))
    parser.once('close', () => {
      if (file) file.data = Buffer.concat(chunks, fileBytes)
      chunks = []
      finish(null, { fields, file })
    })
    req.pipe(parser)
  })
}

// ---------------------------------------------------------------------------------------------
// Photos: sniffing and re-encoding

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

/** A client's file name, kept for display: no path, no control characters, at most 200 characters. */
export function cleanFilename(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? ''
  // eslint-disable-next-line no-control-regex
  return base.replace(/[\u0000-\u001f\u007f-\u009f]/g, '').trim().slice(0, 200)
}

// ---------------------------------------------------------------------------------------------
// Photos: what they attach to, and how a row is answered

/** The upload's inputs, query string and form fields together; the same name twice with two values is a 400. */
export function mergeUploadInputs(query: Record<string, unknown>, fields: Record<string, string>) {
  const merged: Record<string, unknown> = {}
  for (const key of [...PHOTO_TARGET_KEYS, 'caption']) {
    const q = typeof query[key] === 'string' ? query[key] as string : undefined
    const b = fields[key]
    if (q !== undefined && b !== undefined && q !== b) throw fieldError({ [key]: 'Given twice with two values.' })
    merged[key] = b ?? q
  }
  const result = photoUploadSchema.safeParse(merged)
  if (!result.success) throw fieldError(fieldErrors(result.error.issues))
  return result.data
}

function targetMissing(key: PhotoTargetKey): never {
  const what = { enquiryId: 'enquiry', visitId: 'visit', surfaceId: 'surface', conditionId: 'condition', setLogId: 'logged set' }[key]
  throw createError({ statusCode: 404, statusMessage: 'Not found', data: { fields: { [key]: `There is no such ${what} in this firm.` } } })
}

/**
 * Check the target exists in this firm (404 otherwise, the same for another firm's id) and fill
 * in the visit a surface or condition belongs to, so a visit's photos list them all.
 */
export async function resolvePhotoTarget(f: FirmScope, auth: FirmContext, target: PhotoTarget) {
  const out = { enquiryId: null as string | null, visitId: null as string | null, surfaceId: null as string | null, conditionId: null as string | null, setLogId: null as string | null }
  if (target.enquiryId) {
    const [row] = await f.tx.select({ id: enquiries.id }).from(enquiries).where(f.where(enquiries, eq(enquiries.id, target.enquiryId)))
    if (!row) targetMissing('enquiryId')
    out.enquiryId = row.id
  }
  else if (target.visitId) {
    const [row] = await f.tx.select({ id: visits.id }).from(visits).where(f.where(visits, eq(visits.id, target.visitId)))
    if (!row) targetMissing('visitId')
    out.visitId = row.id
  }
  else if (target.surfaceId) {
    const [row] = await f.tx.select({ id: surfaces.id, visitId: rooms.visitId }).from(surfaces)
      .innerJoin(rooms, and(eq(rooms.firmId, surfaces.firmId), eq(rooms.id, surfaces.roomId)))
      .where(f.where(surfaces, eq(surfaces.id, target.surfaceId)))
    if (!row) targetMissing('surfaceId')
    out.surfaceId = row.id
    out.visitId = row.visitId
  }
  else if (target.conditionId) {
    const [row] = await f.tx.select({ id: conditions.id, surfaceId: surfaces.id, visitId: rooms.visitId }).from(conditions)
      .innerJoin(surfaces, and(eq(surfaces.firmId, conditions.firmId), eq(surfaces.id, conditions.surfaceId)))
      .innerJoin(rooms, and(eq(rooms.firmId, surfaces.firmId), eq(rooms.id, surfaces.roomId)))
      .where(f.where(conditions, eq(conditions.id, target.conditionId)))
    if (!row) targetMissing('conditionId')
    out.conditionId = row.id
    out.visitId = row.visitId
  }
  else if (target.setLogId) {
    const [row] = await f.tx.select({ id: setLogs.id }).from(setLogs).where(f.where(setLogs, eq(setLogs.id, target.setLogId)))
    if (!row) targetMissing('setLogId')
    out.setLogId = row.id
  }
  await assertPhotoAccess(f, auth, out)
  return out
}

/**
 * Photos follow what they are attached to: crew see (and add to) only the visits they are down
 * to do, and never enquiries; owner and office see all. 404 otherwise, as for a missing photo.
 */
export async function assertPhotoAccess(f: FirmScope, auth: FirmContext, target: { enquiryId: string | null, visitId: string | null, setLogId?: string | null }) {
  if (can(auth.role, 'jobs:read-all')) return
  if (target.enquiryId && !can(auth.role, 'ledger:write')) notFound()
  if (target.visitId) await findVisit(f, auth, target.visitId)
  if (target.setLogId) {
    // a set's photos follow its job: crew only on the jobs they are booked on
    const [log] = await f.tx.select({ jobId: setLogs.jobId }).from(setLogs).where(f.where(setLogs, eq(setLogs.id, target.setLogId)))
    if (!log) notFound()
    await findJob(f, auth, log.jobId)
  }
}

/** The logged set a photo was taken with, if any. */
export async function photoSetLog(f: FirmScope, photoId: string): Promise<string | null> {
  const [link] = await f.tx.select({ setLogId: setLogPhotos.setLogId }).from(setLogPhotos).where(f.where(setLogPhotos, eq(setLogPhotos.photoId, photoId)))
  return link?.setLogId ?? null
}

export type PhotoRow = typeof photos.$inferSelect

export function photoUrls(id: string) {
  return { url: `/photos/${id}/full`, thumbUrl: `/photos/${id}/thumb` }
}

/** A photo as the API answers it (never the storage keys). */
export function photoJson(row: PhotoRow) {
  return {
    id: row.id,
    width: row.width,
    height: row.height,
    bytes: row.bytes,
    contentType: row.contentType,
    caption: row.caption,
    originalName: row.originalName,
    enquiryId: row.enquiryId,
    visitId: row.visitId,
    surfaceId: row.surfaceId,
    conditionId: row.conditionId,
    uploadedBy: row.uploadedBy,
    createdAt: row.createdAt,
    ...photoUrls(row.id),
  }
}
export type PhotoJson = ReturnType<typeof photoJson>

/** One photo of this firm, or 404 (another firm's id and a missing one alike). */
export async function findPhoto(f: FirmScope, auth: FirmContext, id: string): Promise<PhotoRow> {
  const row = await findOr404(f, photos, id)
  await assertPhotoAccess(f, auth, { ...row, setLogId: row.enquiryId || row.visitId ? null : await photoSetLog(f, row.id) })
  return row
}

/** The photos of one enquiry, visit, surface or condition, oldest first. */
export async function listPhotos(f: FirmScope, filter: PhotoTarget): Promise<PhotoRow[]> {
  const key = PHOTO_TARGET_KEYS.find(k => filter[k])!
  if (key === 'setLogId') {
    return f.tx.select(getTableColumns(photos)).from(photos)
      .innerJoin(setLogPhotos, and(eq(setLogPhotos.firmId, photos.firmId), eq(setLogPhotos.photoId, photos.id)))
      .where(f.where(photos, eq(setLogPhotos.setLogId, filter.setLogId!)))
      .orderBy(asc(photos.createdAt), asc(photos.id))
  }
  return f.tx.select().from(photos)
    .where(f.where(photos, eq(photos[key], filter[key]!)))
    .orderBy(asc(photos.createdAt), asc(photos.id))
}
