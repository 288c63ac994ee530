import { eq, sql } from 'drizzle-orm'
import { materialUses, setLogs } from '../../../../db/schema'
import { jobLogParam, setLogSchema } from '#shared/schemas/job'

/**
 * Correct a log entry: the same fields as logging it, checked the same way. The bags mixed are
 * replaced: a material already on the entry keeps the cost per pack it was logged at, a material
 * new to it takes today's price. Who: the person who logged it on that London day, or the owner.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id, logId } = await readParamsWith(event, jobLogParam)
  const input = await readBodyWith(event, setLogSchema)
  return withFirm(auth, async (f) => {
    const { job, log } = await logToChange(f, auth, id, logId)
    const { prices } = await checkLogInput(f, job, input)
    const before = await logSnapshot(f, log)
    const kept = new Map(before.materials.map(m => [m.materialId, m.costPencePerPack]))
    const changes = logColumns(input, log.loggedBy ?? auth.userId)
    const [row] = await f.tx.update(setLogs).set({ ...changes, updatedAt: sql`now()` }).where(f.where(setLogs, eq(setLogs.id, logId))).returning()
    await f.tx.delete(materialUses).where(f.where(materialUses, eq(materialUses.logId, logId)))
    await writeMaterialUses(f, id, logId, input.materials, m => kept.get(m) ?? prices.get(m)!)
    await touchJob(f, id)
    await f.audit('job.log-corrected', 'set_log', logId, { jobId: id, before, after: await logSnapshot(f, row!) })
    return { ...await jobDetail(f, auth, id), logId }
  })
})
