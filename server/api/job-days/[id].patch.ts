import { and, eq, sql } from 'drizzle-orm'
import { jobDays } from '../../db/schema'
import { idParam } from '#shared/schemas/common'
import { dayWorkedSchema } from '#shared/schemas/job'

/** Mark a booked day as worked (or not), whole or half. Crew mark only their own days. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, dayWorkedSchema)
  return withFirm(auth, async (f) => {
    const own = can(auth.role, 'jobs:read-all') ? undefined : eq(jobDays.userId, auth.userId)
    const [day] = await f.tx.update(jobDays).set({ worked: input.worked, ...(input.portion ? { portion: input.portion } : {}), updatedAt: sql`now()` })
      .where(f.where(jobDays, and(eq(jobDays.id, id), own))).returning()
    if (!day) notFound()
    await f.audit('job.day-worked', 'job', day.jobId, { day: day.day, worked: day.worked })
    return day
  })
})
