import { setLogs } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { setLogSchema } from '#shared/schemas/job'

/**
 * Log a set as done (the plan's tasks ticked, surfaces, coat, times, who, bags mixed of each
 * material) or a problem found. The first set logged puts a booked job on site. An entry sent with
 * the phone's `clientId` is stored once: a resend answers 200 with the same job and `logId`.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, setLogSchema)
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    // a resend of an entry already stored (the answer was lost, or the phone's queue sent it again)
    const sent = input.clientId ? await logByClientId(f, input.clientId) : undefined
    if (sent) return resent(sent)
    if (['invoiced', 'paid', 'cancelled'].includes(job.status)) {
      throw createError({ statusCode: 409, statusMessage: 'Job closed', data: { message: `The job is ${JOB_STATUS_LABELS[job.status].toLowerCase()}: nothing more is logged on it.` } })
    }
    const { prices } = await checkLogInput(f, job, input)
    // the job's lock puts two sends of one entry to this job one after the other; the same id sent
    // to another job at the same moment meets the unique (firm, client id) and stores nothing
    const [log] = await f.tx.insert(setLogs).values(f.values({ ...logColumns(input, auth.userId), clientId: input.clientId, jobId: id, loggedBy: auth.userId }))
      .onConflictDoNothing({ target: [setLogs.firmId, setLogs.clientId] }).returning()
    if (!log) return resent((await logByClientId(f, input.clientId!))!)
    await writeMaterialUses(f, id, log.id, input.materials, m => prices.get(m)!)
    if (job.status === 'booked' && input.kind === 'set') await moveJob(f, job, 'in-progress', 'First set logged')
    else await touchJob(f, id)
    await f.audit('job.logged', 'job', id, { logId: log.id, kind: input.kind, setNumber: input.setNumber, tasks: input.tasks })
    setResponseStatus(event, 201)
    return { ...await jobDetail(f, auth, id), logId: log.id }

    async function resent(row: { id: string, jobId: string }) {
      if (row.jobId !== id) throw createError({ statusCode: 409, statusMessage: 'Already logged', data: { message: 'This entry was already saved on another job.' } })
      setResponseStatus(event, 200)
      return { ...await jobDetail(f, auth, id), logId: row.id }
    }
  })
})
