import { periodQuery } from '#shared/schemas/quarter'

/**
 * CIS deducted by contractor customers from payments received in the period, per contractor and
 * tax month (6th to 5th), reconciled against the statements recorded. Owner, office, accountant.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  const q = await readQueryWith(event, periodQuery)
  return withFirm(auth, async f => cisDeductions(f, await periodOf(f, q)))
})
