import { and, eq, inArray } from 'drizzle-orm'
import { jobDays } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { jobDaysSchema } from '#shared/schemas/job'

/** Book a job's days and who works them: the whole list at once. A day already worked keeps its mark. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const { days } = await readBodyWith(event, jobDaysSchema)
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    if (['invoiced', 'paid', 'cancelled'].includes(job.status)) {
      throw createError({ statusCode: 409, statusMessage: 'Job closed', data: { message: `The job is ${JOB_STATUS_LABELS[job.status].toLowerCase()}: its days can no longer be booked.` } })
    }
    await checkMembers(f, days.map(d => d.userId), 'days.#.userId')
    const keys = days.map(d => `${d.day}|${d.userId}`)
    const existing = await f.tx.select().from(jobDays).where(f.where(jobDays, eq(jobDays.jobId, id)))
    const gone = existing.filter(e => !keys.includes(`${e.day}|${e.userId}`)).map(e => e.id)
    if (gone.length) await f.tx.delete(jobDays).where(f.where(jobDays, and(eq(jobDays.jobId, id), inArray(jobDays.id, gone))))
    for (const d of days) {
      await f.tx.insert(jobDays).values(f.values({ jobId: id, ...d }))
        .onConflictDoUpdate({ target: [jobDays.firmId, jobDays.jobId, jobDays.day, jobDays.userId], set: { portion: d.portion } })
    }
    await f.audit('job.days-booked', 'job', id, { days: days.length })
    return jobDetail(f, auth, id)
  })
})
