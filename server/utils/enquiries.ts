import { eq, sql } from 'drizzle-orm'
import { enquiries, enquiryEvents } from '../db/schema'
import type { EnquiryStatus } from '#shared/utils/ledger'

/** Move an enquiry to a new status and record who moved it, when and why. 409 for a move the rules refuse. */
export async function moveEnquiry(f: FirmScope, id: string, to: EnquiryStatus, reason: string | null) {
  const e = await findOr404(f, enquiries, id, { lock: true })
  if (e.status === to) return e
  if (!canMoveEnquiry(e.status, to)) {
    throw createError({ statusCode: 409, statusMessage: 'Not a move it can make', data: { message: `An enquiry that is ${ENQUIRY_STATUS_LABELS[e.status].toLowerCase()} cannot become ${ENQUIRY_STATUS_LABELS[to].toLowerCase()}.` } })
  }
  const [updated] = await f.tx.update(enquiries)
    .set({ status: to, lostReason: to === 'lost' ? reason : null, updatedAt: sql`now()` })
    .where(f.where(enquiries, eq(enquiries.id, id))).returning()
  await f.tx.insert(enquiryEvents).values(f.values({ enquiryId: id, fromStatus: e.status, toStatus: to, reason: reason || null, byUserId: f.userId }))
  await f.audit('enquiry.moved', 'enquiry', id, { from: e.status, to })
  return updated!
}

/** Record a new enquiry's first status. */
export async function recordNewEnquiry(f: FirmScope, id: string) {
  await f.tx.insert(enquiryEvents).values(f.values({ enquiryId: id, fromStatus: null, toStatus: 'new' as const, byUserId: f.userId }))
}
