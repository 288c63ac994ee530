import { eq } from 'drizzle-orm'
import { firms } from '../../db/schema'

/** The current firm's details, less what the role may not see. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:read')
  const [firm] = await withFirm(auth, f => f.tx.select().from(firms).where(eq(firms.id, f.firmId)))
  if (!firm) notFound()
  // crew see the firm, but not its money (its day rate and bank account); the enquiry form link is
  // for those who run the ledger.
  const { dayRatePence, bankAccountName, bankSortCode, bankAccountNumber, enquiryFormKey, ...rest } = firm
  return {
    ...rest,
    ...(can(auth.role, 'money:read') ? { dayRatePence, bankAccountName, bankSortCode, bankAccountNumber } : {}),
    ...(can(auth.role, 'ledger:write') ? { enquiryFormKey: publicFormKey(firm.id, enquiryFormKey) } : {}),
  }
})
