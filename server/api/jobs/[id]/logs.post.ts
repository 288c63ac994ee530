import { eq, inArray, sql } from 'drizzle-orm'
import { jobs, materials, materialUses, setLogs } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { setLogSchema } from '#shared/schemas/job'

/**
 * Log a set as done (surfaces, coat, times, who, bags mixed of each material) or a problem found.
 * The first set logged puts a booked job on site.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, setLogSchema)
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    if (['invoiced', 'paid', 'cancelled'].includes(job.status)) {
      throw createError({ statusCode: 409, statusMessage: 'Job closed', data: { message: `The job is ${JOB_STATUS_LABELS[job.status].toLowerCase()}: nothing more is logged on it.` } })
    }
    const { plan } = await jobPlan(f, job)
    const known = new Set(plan.sets.flatMap(s => s.tasks.map(t => t.surfaceId)))
    const unknown = input.surfaceIds.findIndex(s => !known.has(s))
    if (unknown >= 0) throw fieldError({ [`surfaceIds.${unknown}`]: 'That surface is not on this job.' })
    if (input.setNumber !== null && input.setNumber > plan.sets.length) throw fieldError({ setNumber: `The plan has ${plan.sets.length} sets.` })
    await checkMembers(f, input.userIds, 'userIds.#')
    const ids = input.materials.map(m => m.materialId)
    const rows = ids.length ? await f.tx.select({ id: materials.id, costPence: materials.costPence }).from(materials).where(f.where(materials, inArray(materials.id, ids))) : []
    const missing = input.materials.findIndex(m => !rows.some(r => r.id === m.materialId))
    if (missing >= 0) throw fieldError({ [`materials.${missing}.materialId`]: 'Choose one of the firm\'s materials.' })

    const { materials: used, startedAt, endedAt, ...rest } = input
    const [log] = await f.tx.insert(setLogs).values(f.values({
      ...rest, jobId: id, userIds: rest.userIds.length ? rest.userIds : [auth.userId], loggedBy: auth.userId,
      startedAt: startedAt ? new Date(startedAt) : null, endedAt: endedAt ? new Date(endedAt) : null,
    })).returning()
    if (used.length) {
      await f.tx.insert(materialUses).values(used.map(m => f.values({ jobId: id, logId: log!.id, materialId: m.materialId, packsX1000: m.packsX1000, costPencePerPack: rows.find(r => r.id === m.materialId)!.costPence })))
    }
    if (job.status === 'booked' && input.kind === 'set') await moveJob(f, job, 'in-progress', 'First set logged')
    else await f.tx.update(jobs).set({ updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, id)))
    await f.audit('job.logged', 'job', id, { kind: input.kind, setNumber: input.setNumber })
    setResponseStatus(event, 201)
    return jobDetail(f, auth, id)
  })
})
