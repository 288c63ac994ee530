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
    if ('netPence' in price) {
      // the price never drops under what the job's invoices already claim of it (the job is locked)
      const claimed = await invoicedForJob(f, id)
      const total = claimed.labourNetPence + claimed.materialsNetPence
      const next = (labourNetPence ?? job.labourNetPence) + (materialsNetPence ?? job.materialsNetPence)
      if (total > next) {
        const words = `Its invoices already come to ${formatPence(total)} before VAT: the price cannot be less than that. Correct an invoice with a credit note first.`
        throw createError({ statusCode: 409, statusMessage: 'Less than invoiced', data: { fields: { labourNetPence: words } } })
      }
    }
    await f.tx.update(jobs).set({ ...fields, ...(notes === undefined ? {} : { notes }), ...price, updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, id)))
    await f.audit('job.updated', 'job', id, { fields: Object.keys(input) })
    return jobDetail(f, auth, id)
  })
})
