import { eq, sql } from 'drizzle-orm'
import { visits } from '../../db/schema'
import { visitUpdateSchema } from '#shared/schemas/visit'
import { idParam } from '#shared/schemas/common'
import { canReschedule } from '#shared/utils/visit-status'

/**
 * Move a visit (a new start, not in the past), change how long it is or who goes, or its notes.
 * Only a booked visit is moved or reassigned (409 for a done or cancelled one); notes may change
 * on any. Done and cancelled have routes of their own (done.post.ts, cancel.post.ts).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, visitUpdateSchema)
  return withFirm(auth, async (f) => {
    const before = await findVisit(f, auth, id, { lock: true })
    const { startsAt, notes, ...plan } = input
    const moved = startsAt !== undefined && new Date(startsAt).getTime() !== before.startsAt.getTime()
    const replanned = moved || Object.entries(plan).some(([k, v]) => v !== undefined && v !== before[k as keyof typeof plan])
    if (replanned) {
      const step = canReschedule(before.status)
      if (!step.ok) throw createError({ statusCode: 409, statusMessage: 'Not a change it can take', data: { message: step.message } })
    }
    if (input.visitorUserId && !(await isMember(f, input.visitorUserId))) badReference('visitorUserId', 'Choose someone in the firm.')
    const [v] = await f.tx.update(visits).set({ ...plan, ...(notes !== undefined ? { notes } : {}), ...(startsAt ? { startsAt: new Date(startsAt) } : {}), updatedAt: sql`now()` })
      .where(f.where(visits, eq(visits.id, id))).returning()
    if (moved) await f.audit('visit.moved', 'visit', id, { from: before.startsAt.toISOString(), to: new Date(startsAt).toISOString(), fields: Object.keys(input) })
    else await f.audit('visit.updated', 'visit', id, { fields: Object.keys(input) })
    return v
  })
})
