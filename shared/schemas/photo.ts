import { z } from 'zod'
import { text } from './common'

// the longest edge kept (shared/utils/photo-size.ts, apart so the phone's shrinking does not load zod)
export { PHOTO_FULL_EDGE_PX } from '../utils/photo-size'

export const PHOTO_TARGET_KEYS = ['enquiryId', 'visitId', 'surfaceId', 'conditionId', 'setLogId'] as const
export type PhotoTargetKey = (typeof PHOTO_TARGET_KEYS)[number]
export type PhotoTarget = Partial<Record<PhotoTargetKey, string>>

/** An id a form may leave empty ('' is none). */
export const optionalId = z.preprocess(
  v => (v === '' ? undefined : v),
  z.uuid({ error: 'That is not an id from Setwell.' }).optional(),
)

const targetShape = {
  enquiryId: optionalId,
  visitId: optionalId,
  surfaceId: optionalId,
  conditionId: optionalId,
  setLogId: optionalId,
}

function exactlyOneTarget(value: PhotoTarget, ctx: z.RefinementCtx) {
  const named = PHOTO_TARGET_KEYS.filter(k => value[k])
  if (named.length !== 1) {
    ctx.addIssue({ code: 'custom', path: ['target'], message: 'Say what the photo belongs to: one enquiry, visit, surface, condition or logged set.' })
  }
}

/** The target (exactly one id), caption and phone-made id of an upload, from its query or form fields. */
export const photoUploadSchema = z.object({
  ...targetShape,
  /** Made on the phone: the same photo sent twice (a lost answer, the offline queue) is stored once. */
  clientId: optionalId,
  caption: text().trim().max(500, { error: 'Keep the caption under 500 characters.' }).default(''),
}).superRefine(exactlyOneTarget)

/** The list route's filter: exactly one of the ids. */
export const photoListQuery = z.object(targetShape).superRefine(exactlyOneTarget)

/** A photo's file route: its id and which size. */
export const photoVariantParams = z.object({ id: z.uuid(), variant: z.enum(['full', 'thumb']) })

export const DOCUMENT_TARGET_KEYS = ['purchaseId', 'cisStatementId'] as const
export type DocumentTarget = Partial<Record<(typeof DOCUMENT_TARGET_KEYS)[number], string>>

/** What an uploaded receipt or CIS statement belongs to: exactly one purchase or statement. */
export const documentTargetSchema = z.object({ purchaseId: optionalId, cisStatementId: optionalId })
  .superRefine((v, ctx) => {
    if ([v.purchaseId, v.cisStatementId].filter(Boolean).length !== 1) {
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'Say what the file belongs to: one purchase or one CIS statement.' })
    }
  })
