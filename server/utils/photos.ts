// The photo rules: what a photo attaches to (exactly one enquiry, visit, surface, condition or
// logged set), who may see it, and how a row is answered. The bytes are images.ts's job.
import { and, asc, eq, getTableColumns } from 'drizzle-orm'
import { conditions, enquiries, photos, rooms, setLogPhotos, setLogs, surfaces, visits } from '../db/schema'
import type { FirmScope } from './db'
import { fieldErrors } from '#shared/schemas/common'
import { PHOTO_TARGET_KEYS, photoUploadSchema, type PhotoTarget, type PhotoTargetKey } from '#shared/schemas/photo'

/** The upload's inputs, query string and form fields together; the same name twice with two values is a 400. */
export function mergeUploadInputs(query: Record<string, unknown>, fields: Record<string, string>) {
  const merged: Record<string, unknown> = {}
  for (const key of [...PHOTO_TARGET_KEYS, 'caption', 'clientId']) {
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

/** The photo already stored with this phone-made id, as the upload answers it (null if none). */
export async function keptPhoto(f: FirmScope, clientId: string) {
  const [row] = await f.tx.select({ id: photos.id, width: photos.width, height: photos.height }).from(photos)
    .where(f.where(photos, eq(photos.clientId, clientId)))
  return row ? { ...row, ...photoUrls(row.id) } : null
}
