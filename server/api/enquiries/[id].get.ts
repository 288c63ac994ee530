import { asc, desc, eq } from 'drizzle-orm'
import { customers, enquiries, enquiryEvents, users, visits } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** One enquiry with its customer, site, history (who moved it, when) and visits. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const e = await findOr404(f, enquiries, id)
    const customer = await findOr404(f, customers, e.customerId)
    const site = e.siteId ? await findSite(f, e.siteId) : null
    const history = await f.tx.select({ id: enquiryEvents.id, from: enquiryEvents.fromStatus, to: enquiryEvents.toStatus, reason: enquiryEvents.reason, at: enquiryEvents.at, by: users.name })
      .from(enquiryEvents).leftJoin(users, eq(users.id, enquiryEvents.byUserId))
      .where(f.where(enquiryEvents, eq(enquiryEvents.enquiryId, id))).orderBy(asc(enquiryEvents.at))
    const enquiryVisits = await f.tx.select({ id: visits.id, startsAt: visits.startsAt, status: visits.status })
      .from(visits).where(f.where(visits, eq(visits.enquiryId, id))).orderBy(desc(visits.startsAt))
    return { ...e, customer: { id: customer.id, name: customer.name, phone: customer.phone, email: customer.email }, site, history, visits: enquiryVisits }
  })
})
