import { idParam } from '#shared/schemas/common'

/** The statutory claim on a business customer's overdue invoice: interest from the day after it was due, the rate, the days, the fixed sum. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const { claim, asOf, caution } = await claimFor(f, id)
    return { ...claim, asOf, caution }
  })
})
