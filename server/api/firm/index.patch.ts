import { eq } from 'drizzle-orm'
import { firms } from '../../db/schema'
import { firmSettingsSchema } from '#shared/schemas/firm'

/** Firm settings: the owner only. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  const input = await readBodyWith(event, firmSettingsSchema)
  return withFirm(auth, async (f) => {
    const [firm] = await f.tx.update(firms).set(input).where(eq(firms.id, f.firmId)).returning()
    if (!firm) notFound()
    await f.audit('firm.updated', 'firm', f.firmId, { fields: Object.keys(input) })
    return firm
  })
})
