import { eq, sql } from 'drizzle-orm'
import { visits } from '../../db/schema'
import { visitUpdateSchema } from '#shared/schemas/visit'
import { idParam } from '#shared/schemas/common'

/** Move, reassign, finish or cancel a visit. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, visitUpdateSchema)
  return withFirm(auth, async (f) => {
    await findVisit(f, auth, id, { lock: true })
    if (input.visitorUserId && !(await isMember(f, input.visitorUserId))) badReference('visitorUserId', 'Choose someone in the firm.')
    const { startsAt, ...rest } = input
    const [v] = await f.tx.update(visits).set({ ...rest, ...(startsAt ? { startsAt: new Date(startsAt) } : {}), updatedAt: sql`now()` })
      .where(f.where(visits, eq(visits.id, id))).returning()
    await f.audit('visit.updated', 'visit', id, { fields: Object.keys(input) })
    return v
  })
})
