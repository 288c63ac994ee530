import { count, eq } from 'drizzle-orm'
import { enquiries, sites, visits } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Remove a site that has no enquiries or visits (409 otherwise). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  await withFirm(auth, async (f) => {
    await findSite(f, id)
    const [v] = await f.tx.select({ n: count() }).from(visits).where(f.where(visits, eq(visits.siteId, id)))
    const [e] = await f.tx.select({ n: count() }).from(enquiries).where(f.where(enquiries, eq(enquiries.siteId, id)))
    if ((v?.n ?? 0) + (e?.n ?? 0) > 0) throw createError({ statusCode: 409, statusMessage: 'Site in use', data: { message: 'This site has enquiries or visits, so it stays.' } })
    await f.tx.delete(sites).where(f.where(sites, eq(sites.id, id)))
    await f.audit('site.deleted', 'site', id)
  })
  setResponseStatus(event, 204)
  return null
})
