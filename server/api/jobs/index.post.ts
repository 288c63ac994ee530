import { eq } from 'drizzle-orm'
import { customers, jobs, sites } from '../../db/schema'
import { newJobSchema } from '#shared/schemas/job'

/** A job made directly, not from a quote (a small repair, a job agreed by phone); its price only from someone with money:write. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const input = await readBodyWith(event, newJobSchema)
  checkPriceAllowed(auth, input)
  return withFirm(auth, async (f) => {
    const [customer] = await f.tx.select({ id: customers.id }).from(customers).where(f.where(customers, eq(customers.id, input.customerId)))
    if (!customer) throw fieldError({ customerId: 'Choose one of your customers.' })
    if (input.siteId) {
      const [site] = await f.tx.select({ customerId: sites.customerId }).from(sites).where(f.where(sites, eq(sites.id, input.siteId)))
      if (!site || site.customerId !== input.customerId) throw fieldError({ siteId: 'Choose one of the customer\'s sites.' })
    }
    if (input.visitId) await findVisit(f, auth, input.visitId).catch(() => {
      throw fieldError({ visitId: 'Choose one of the customer\'s visits.' })
    })
    const { labourNetPence, materialsNetPence, ...fields } = input
    const price = labourNetPence !== undefined || materialsNetPence !== undefined
      ? await jobPriceTotals(f, input.customerId, labourNetPence ?? 0, materialsNetPence ?? 0)
      : {}
    const number = await nextJobNumber(f)
    const [job] = await f.tx.insert(jobs).values(f.values({
      ...fields, ...price, number, planOptions: await defaultPlanOptions(f), createdBy: f.userId,
      materialsEstimate: input.visitId ? await materialsEstimateForVisit(f, input.visitId) : [],
    })).returning()
    await recordJobStatus(f, job!.id, null, 'booked')
    await f.audit('job.created', 'job', job!.id, { priced: 'netPence' in price })
    setResponseStatus(event, 201)
    return { id: job!.id, reference: jobReference(await referenceLettersOf(f), job!.number) }
  })
})
