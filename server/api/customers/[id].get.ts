import { asc, desc, eq } from 'drizzle-orm'
import { customers, enquiries, sites, visits } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** One customer with their sites, enquiries and visits. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'customers:read')
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const customer = await findOr404(f, customers, id)
    const customerSites = await f.tx.select().from(sites).where(f.where(sites, eq(sites.customerId, id))).orderBy(asc(sites.createdAt))
    const customerEnquiries = await f.tx.select({ id: enquiries.id, status: enquiries.status, source: enquiries.source, description: enquiries.description, createdAt: enquiries.createdAt })
      .from(enquiries).where(f.where(enquiries, eq(enquiries.customerId, id))).orderBy(desc(enquiries.createdAt))
    const customerVisits = await f.tx.select({ id: visits.id, startsAt: visits.startsAt, status: visits.status, siteId: visits.siteId })
      .from(visits).where(f.where(visits, eq(visits.customerId, id))).orderBy(desc(visits.startsAt))
    return { ...customer, sites: customerSites, enquiries: customerEnquiries, visits: customerVisits }
  })
})
