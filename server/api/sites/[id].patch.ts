import { eq, sql } from 'drizzle-orm'
import { sites } from '../../db/schema'
import { siteSchema } from '#shared/schemas/customer'
import { idParam } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, siteSchema)
  return withFirm(auth, async (f) => {
    const [s] = await f.tx.update(sites).set({ ...input, updatedAt: sql`now()` }).where(f.where(sites, eq(sites.id, id))).returning()
    if (!s) notFound()
    await f.audit('site.updated', 'site', id)
    return s
  })
})
