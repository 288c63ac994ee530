import { eq } from 'drizzle-orm'
import { sites } from '../../db/schema'
import { idParam } from '#shared/schemas/common'

/** Remove a site no work names; otherwise 409 saying what holds it (locked and counted as a customer's removal is). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'ledger:write')
  const { id } = await readParamsWith(event, idParam)
  try {
    await withFirm(auth, async (f) => {
      await lockFirmForRemoval(f)
      const [s] = await f.tx.select({ id: sites.id }).from(sites).where(f.where(sites, eq(sites.id, id))).for('update')
      if (!s) notFound()
      const work = await workNaming(f, 'siteId', id)
      if (Object.values(work).some(n => n > 0)) heldByWork('This site', work, 'site')
      await f.tx.delete(sites).where(f.where(sites, eq(sites.id, id)))
      await f.audit('site.deleted', 'site', id)
    })
  }
  catch (err) {
    if (isForeignKeyViolation(err)) heldByNewWork('this site')
    throw err
  }
  setResponseStatus(event, 204)
  return null
})
