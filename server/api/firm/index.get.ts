import { eq } from 'drizzle-orm'
import { firms } from '../../db/schema'

/** The current firm's details. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:read')
  const [firm] = await withFirm(auth, f => f.tx.select().from(firms).where(eq(firms.id, f.firmId)))
  if (!firm) notFound()
  return firm
})
