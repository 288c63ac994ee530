import { customers, enquiries } from '../../db/schema'
import { enquirySchema } from '#shared/schemas/enquiry'

/** Record an enquiry for a customer (and one of their sites). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const input = await readBodyWith(event, enquirySchema)
  const created = await withFirm(auth, async (f) => {
    await findOr404(f, customers, input.customerId).catch(() => badReference('customerId', 'Choose a customer of this firm.'))
    if (input.siteId) await findSite(f, input.siteId, input.customerId).catch(() => badReference('siteId', 'Choose one of this customer\'s sites.'))
    const [e] = await f.tx.insert(enquiries).values(f.values(input)).returning()
    await recordNewEnquiry(f, e!.id)
    await f.audit('enquiry.created', 'enquiry', e!.id, { source: input.source })
    return e!
  })
  setResponseStatus(event, 201)
  return created
})
