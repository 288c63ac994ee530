import { idParam } from '#shared/schemas/common'

/** The accepted quote becomes a job in one step: customer, site, rooms, estimate and price carried over. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const job = await jobFromQuote(f, id)
    setResponseStatus(event, 201)
    return { id: job.id, reference: jobReference(await referenceLettersOf(f), job.number) }
  })
})
