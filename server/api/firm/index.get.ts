import { eq } from 'drizzle-orm'
import { firms } from '../../db/schema'

/** The current firm's details. Roles that never see money (crew) get them without the day rate. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:read')
  const [firm] = await withFirm(auth, f => f.tx.select().from(firms).where(eq(firms.id, f.firmId)))
  if (!firm) notFound()
  if (can(auth.role, 'money:read')) return firm
  const { dayRatePence: _hidden, ...rest } = firm
  return rest
})
