import { eq } from 'drizzle-orm'
import { customers, users } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** One visit with its customer, site and visitor. Crew: their own visits only, and no billing details. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event)
  const { id } = await readParamsWith(event, idParam)
  return withFirm(auth, async (f) => {
    const v = await findVisit(f, auth, id)
    const customer = await findOr404(f, customers, v.customerId)
    const site = await findSite(f, v.siteId)
    const [visitor] = v.visitorUserId ? await f.tx.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, v.visitorUserId)) : []
    const seesBilling = can(auth.role, 'customers:read')
    return {
      id: v.id,
      startsAt: v.startsAt,
      durationMinutes: v.durationMinutes,
      status: v.status,
      doneAt: v.doneAt,
      cancelReason: v.cancelReason,
      notes: v.notes,
      enquiryId: v.enquiryId,
      customer: seesBilling
        ? { id: customer.id, name: customer.name, phone: customer.phone, email: customer.email }
        : { id: customer.id, name: customer.name },
      site: { id: site.id, label: site.label, line1: site.line1, line2: site.line2, town: site.town, postcode: site.postcode, accessNotes: site.accessNotes },
      visitor: visitor ?? null,
    }
  })
})
