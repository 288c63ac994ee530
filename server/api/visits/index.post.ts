import { customers, enquiries, visits } from '../../db/schema'
import { visitSchema } from '#shared/schemas/visit'

/** Book a site visit. Booking one for a new enquiry moves it to "visit booked". */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const input = await readBodyWith(event, visitSchema)
  const visit = await withFirm(auth, async (f) => {
    await findOr404(f, customers, input.customerId).catch(() => badReference('customerId', 'Choose a customer of this firm.'))
    await findSite(f, input.siteId, input.customerId).catch(() => badReference('siteId', 'Choose one of this customer\'s sites.'))
    if (input.visitorUserId && !(await isMember(f, input.visitorUserId))) badReference('visitorUserId', 'Choose someone in the firm.')
    if (input.enquiryId) {
      const e = await findOr404(f, enquiries, input.enquiryId).catch(() => badReference('enquiryId', 'That enquiry is not in this firm.'))
      if (e.customerId !== input.customerId) badReference('enquiryId', 'That enquiry is for another customer.')
      if (e.status === 'new') await moveEnquiry(f, e.id, 'visit-booked', null)
    }
    const [v] = await f.tx.insert(visits).values(f.values({ ...input, startsAt: new Date(input.startsAt) })).returning()
    await f.audit('visit.booked', 'visit', v!.id, { startsAt: input.startsAt })
    return v!
  })
  setResponseStatus(event, 201)
  return visit
})
