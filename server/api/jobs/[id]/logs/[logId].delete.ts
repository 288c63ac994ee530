import { eq } from 'drizzle-orm'
import { setLogs } from '../../../../db/schema'
import { jobLogParam } from '#shared/schemas/job'

/**
 * Remove a log entry, with its bags mixed (material_uses) and its photos' links to it (the photos
 * stay on the firm's record). Who: the person who logged it on that London day, or the owner.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id, logId } = await readParamsWith(event, jobLogParam)
  await withFirm(auth, async (f) => {
    const { log } = await logToChange(f, auth, id, logId)
    const removed = await logSnapshot(f, log)
    await f.tx.delete(setLogs).where(f.where(setLogs, eq(setLogs.id, logId)))
    await touchJob(f, id)
    await f.audit('job.log-removed', 'set_log', logId, { jobId: id, removed })
  })
  setResponseStatus(event, 204)
  return null
})
