import { eq, sql } from 'drizzle-orm'
import { firms } from '../../db/schema'

/** Give the public enquiry form a new link; the old one stops working. Owner only. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  return withFirm(auth, async (f) => {
    const [firm] = await f.tx.update(firms).set({ enquiryFormKey: sql`replace(gen_random_uuid()::text, '-', '')` })
      .where(eq(firms.id, f.firmId)).returning({ enquiryFormKey: firms.enquiryFormKey })
    await f.audit('firm.enquiry-form-reset', 'firm', f.firmId)
    return { enquiryFormKey: publicFormKey(f.firmId, firm!.enquiryFormKey) }
  })
})
