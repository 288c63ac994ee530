import { eq, sql } from 'drizzle-orm'
import { jobs } from '../../db/schema'
import { idParam } from '#shared/schemas/common'
import { jobUpdateSchema } from '#shared/schemas/job'

/** Change a job's title and notes. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, jobUpdateSchema)
  return withFirm(auth, async (f) => {
    await findJob(f, auth, id, true)
    await f.tx.update(jobs).set({ ...input, updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, id)))
    await f.audit('job.updated', 'job', id, { fields: Object.keys(input) })
    return jobDetail(f, auth, id)
  })
})
