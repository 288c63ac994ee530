import { count, desc, eq } from 'drizzle-orm'
import { customers, enquiries, sites } from '../../db/schema'
import { enquiryListQuery } from '#shared/schemas/enquiry'

/** Enquiries, newest first, optionally of one status, with who and where. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { status, page, pageSize } = await readQueryWith(event, enquiryListQuery)
  return withFirm(auth, async (f) => {
    const where = f.where(enquiries, status ? eq(enquiries.status, status) : undefined)
    const [total] = await f.tx.select({ n: count() }).from(enquiries).where(where)
    const rows = await f.tx.select({
      id: enquiries.id,
      status: enquiries.status,
      source: enquiries.source,
      description: enquiries.description,
      followUpOn: enquiries.followUpOn,
      createdAt: enquiries.createdAt,
      customer: { id: customers.id, name: customers.name },
      site: { id: sites.id, line1: sites.line1, postcode: sites.postcode },
    }).from(enquiries)
      .innerJoin(customers, f.where(customers, eq(customers.id, enquiries.customerId)))
      .leftJoin(sites, f.where(sites, eq(sites.id, enquiries.siteId)))
      .where(where).orderBy(desc(enquiries.createdAt)).limit(pageSize).offset((page - 1) * pageSize)
    return { rows, total: total?.n ?? 0, page, pageSize }
  })
})
