import { eq, sql } from 'drizzle-orm'
import { jobs } from '../../../db/schema'
import { idParam } from '#shared/schemas/common'
import { planSettingsSchema } from '#shared/schemas/job'
import { replayMoves } from '#shared/utils/pending-moves'

/**
 * Change what the plan works from (people laying on, bags each a set, a bag's coverage) and the
 * surfaces moved by hand. The plan is worked out again and checked: each rule a move breaks
 * comes back as a warning in words; the move is kept (the plasterer decides).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'work:log')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, planSettingsSchema)
  return withFirm(auth, async (f) => {
    const job = await findJob(f, auth, id, true)
    const planOptions = { people: input.people, bagsPerPersonPerSet: input.bagsPerPersonPerSet, coverageM2PerBag: input.coverageM2PerBagX10 / 10 }
    // the new moves name sets as seen; keep them in the planner's numbering with the earlier ones
    let planMoves = input.resetMoves ? {} : { ...job.planMoves }
    if (Object.keys(input.moves).length) {
      const { planner } = await jobPlan(f, { ...job, planOptions, planMoves: {} })
      // the same replay the phone shows before saving (shared/utils/pending-moves.ts)
      planMoves = replayMoves(planner, planMoves, Object.entries(input.moves).map(([surfaceId, shown]) => ({ surfaceId, shown })))
    }
    await f.tx.update(jobs).set({ planOptions, planMoves, updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, job.id)))
    await f.audit('job.plan-changed', 'job', id, { moves: Object.keys(planMoves).length, ...planOptions })
    return jobDetail(f, auth, id)
  })
})
