import { idParam } from '#shared/schemas/common'
import { jobMoveSchema } from '#shared/schemas/job'

/**
 * Move a job: booked -> on site -> finished, or cancelled with a reason. The office and owner
 * make any move by hand; crew on the job can start it and finish it.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const { to, reason } = await readBodyWith(event, jobMoveSchema)
  if (!can(auth.role, 'ledger:write') && !['in-progress', 'finished'].includes(to)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', data: { message: 'The office or the owner makes that change.' } })
  }
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    await moveJob(f, job, to, reason)
    return jobDetail(f, auth, id)
  })
})
