import { eq, sql } from 'drizzle-orm'
import { jobs } from '../../db/schema'
import { idParam } from '#shared/schemas/common'
import { jobUpdateSchema } from '#shared/schemas/job'

/** Change a job's title, and its notes and price when given (the price only with money:write). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, jobUpdateSchema)
  checkPriceAllowed(auth, input)
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    const { labourNetPence, materialsNetPence, notes, ...fields } = input
    const price = labourNetPence !== undefined || materialsNetPence !== undefined
      ? await jobPriceTotals(f, job.customerId, labourNetPence ?? job.labourNetPence, materialsNetPence ?? job.materialsNetPence)
      : {}
    await f.tx.update(jobs).set({ ...fields, ...(notes === undefined ? {} : { notes }), ...price, updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, id)))
    await f.audit('job.updated', 'job', id, { fields: Object.keys(input) })
    return jobDetail(f, auth, id)
  })
})
