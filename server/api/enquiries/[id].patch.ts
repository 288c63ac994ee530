import { eq, sql } from 'drizzle-orm'
import { enquiries } from '../../db/schema'
import { enquiryUpdateSchema } from '#shared/schemas/enquiry'
import { idParam } from '#shared/schemas/common'

/** Change what was asked, where, when and the follow-up date (the status moves through /status). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, enquiryUpdateSchema)
  return withFirm(auth, async (f) => {
    const e = await findOr404(f, enquiries, id, { lock: true })
    if (input.siteId) await findSite(f, input.siteId, e.customerId).catch(() => badReference('siteId', 'Choose one of this customer\'s sites.'))
    const [updated] = await f.tx.update(enquiries).set({ ...input, updatedAt: sql`now()` }).where(f.where(enquiries, eq(enquiries.id, id))).returning()
    await f.audit('enquiry.updated', 'enquiry', id)
    return updated
  })
})
