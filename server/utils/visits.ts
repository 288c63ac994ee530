import { count, desc, eq, ne, sql } from 'drizzle-orm'
import { enquiries, enquiryEvents, visits } from '../db/schema'
import { canCancel, canMarkDone, enquiryAfterCancel, type VisitStep } from '#shared/utils/visit-status'

/**
 * The visit with this id in the current firm, as the signed-in person may see it: owner and
 * office see every visit; crew only the visits they are down to do (later: of the jobs they are
 * put on). 404 otherwise, the same as a visit that does not exist.
 */
export async function findVisit(f: FirmScope, auth: FirmContext, visitId: string, opts: { lock?: boolean } = {}) {
  const crewOnly = !can(auth.role, 'jobs:read-all')
  return findOr404(f, visits, visitId, { lock: opts.lock, where: crewOnly ? eq(visits.visitorUserId, auth.userId) : undefined })
}

/** May this person change what was measured on a visit? (Owner, office; crew on their own visits.) */
export function canMeasure(auth: FirmContext) {
  return can(auth.role, 'ledger:write') || can(auth.role, 'work:log')
}

/** 409 with the rule's words, for a change the visit's status refuses. */
function refuse(step: VisitStep): asserts step is { ok: true, same: boolean } {
  if (!step.ok) throw createError({ statusCode: 409, statusMessage: 'Not a change it can take', data: { message: step.message } })
}

/**
 * Mark a visit done at `at`. The visit row is locked first (FOR UPDATE), so a cancel sent at the
 * same moment waits and then sees "done" (or the other way round): exactly one of them happens.
 * The update also names status 'booked', a second wall should a caller forget the lock. A second
 * "done" (a phone resending) is a 200 that changes nothing and keeps the first time.
 */
export async function markVisitDone(f: FirmScope, auth: FirmContext, id: string, at: Date, clientId: string | null) {
  const v = await findVisit(f, auth, id, { lock: true })
  const step = canMarkDone(v.status)
  refuse(step)
  if (step.same) return v
  const [done] = await f.tx.update(visits).set({ status: 'done', doneAt: at, updatedAt: sql`now()` })
    .where(f.where(visits, eq(visits.id, id), eq(visits.status, 'booked'))).returning()
  if (!done) refuse(canMarkDone('cancelled'))
  await f.audit('visit.done', 'visit', id, { at: at.toISOString(), clientId })
  return done!
}

/** Cancel a booked visit with a reason (locked as above); the enquiry it came from goes back a step when nothing else is booked for it. */
export async function cancelVisit(f: FirmScope, auth: FirmContext, id: string, reason: string) {
  const v = await findVisit(f, auth, id, { lock: true })
  const step = canCancel(v.status)
  refuse(step)
  if (step.same) return v
  const [cancelled] = await f.tx.update(visits).set({ status: 'cancelled', cancelReason: reason, updatedAt: sql`now()` })
    .where(f.where(visits, eq(visits.id, id), eq(visits.status, 'booked'))).returning()
  if (!cancelled) refuse(canCancel('done'))
  await f.audit('visit.cancelled', 'visit', id, { reason })
  if (v.enquiryId) await enquiryFollowsCancel(f, v.enquiryId, id)
  return cancelled!
}

/**
 * The enquiry of a cancelled visit: back to where it was before a visit was booked (its history
 * says), unless another visit for it is still booked. The enquiry row is locked before the other
 * visits are counted, so two of its visits cancelled at once are counted one after the other and
 * the second sees the first gone.
 */
async function enquiryFollowsCancel(f: FirmScope, enquiryId: string, visitId: string) {
  const e = await findOr404(f, enquiries, enquiryId, { lock: true })
  const [others] = await f.tx.select({ n: count() }).from(visits)
    .where(f.where(visits, eq(visits.enquiryId, enquiryId), eq(visits.status, 'booked'), ne(visits.id, visitId)))
  const [booked] = await f.tx.select({ from: enquiryEvents.fromStatus }).from(enquiryEvents)
    .where(f.where(enquiryEvents, eq(enquiryEvents.enquiryId, enquiryId), eq(enquiryEvents.toStatus, 'visit-booked')))
    .orderBy(desc(enquiryEvents.at)).limit(1)
  const to = enquiryAfterCancel(e.status, booked?.from ?? null, others?.n ?? 0)
  if (to) await moveEnquiry(f, enquiryId, to, 'The visit was cancelled.')
}
