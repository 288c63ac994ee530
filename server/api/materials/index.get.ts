import { asc } from 'drizzle-orm'
import { materials } from '../../db/schema'

/** The firm's materials catalogue. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:read')
  return withFirm(auth, f => f.tx.select().from(materials).where(f.where(materials)).orderBy(asc(materials.type), asc(materials.name)))
})
