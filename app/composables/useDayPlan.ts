// The job's days with their sets and timelines (shared/utils/day-plan.ts, set-timeline.ts), the
// one place the day sheet and the job page work them out, so both show the same. A set counts as
// done once every task of it is logged (setProgress), on the day its last part was, in Britain.
import { londonDay } from '#shared/utils/dates'
import { planDays } from '#shared/utils/day-plan'
import { setProgress } from '#shared/utils/set-log'
import { clockTime, DEFAULT_TIMING, setWaits } from '#shared/utils/set-timeline'

type Job = ApiResponse<'/api/jobs/:id'>

export function useDayPlan(job: Ref<Job | null | undefined>) {
  // today in Britain, on the server and in the browser alike
  const today = londonDay(new Date())
  const plan = computed(() => {
    const j = job.value
    if (!j) return null
    const dayOf = (l: (typeof j.logs)[number]) => londonDay(new Date(l.endedAt ?? l.startedAt ?? l.createdAt))
    const logged = j.plan.plan.sets.filter(s => setProgress(s, j.logs) === 'done').map(s => ({
      setNumber: s.number,
      day: j.logs.filter(l => l.kind === 'set' && l.setNumber === s.number).map(dayOf).sort().at(-1)!,
    }))
    const waits = setWaits(j.plan.plan.sets, j.plan.inputs.corners, j.plan.labels)
    const sets = j.plan.plan.sets.map(s => ({ number: s.number, bags: s.bags, waits: waits.get(s.number) ?? [] }))
    const each = j.planOptions.bagsPerPersonPerSet
    try {
      return planDays(j.days, sets, { bagsPerPersonPerSet: each, timing: j.timing }, logged, today)
    }
    catch (err) {
      // the firm's figures out of range (the settings page checks them, but a sheet must still open)
      if (!(err instanceof RangeError) || !/^timing\./.test(err.message)) throw err
      const plan = planDays(j.days, sets, { bagsPerPersonPerSet: each, timing: DEFAULT_TIMING }, logged, today)
      plan.warnings.unshift(`The firm's figures for the working day do not add up: the times below use ${clockTime(DEFAULT_TIMING.dayStartMinutes)} to ${clockTime(DEFAULT_TIMING.dayEndMinutes)}, ${DEFAULT_TIMING.mixMinutes} minutes a mix and ${DEFAULT_TIMING.goOffMinutes} to go off. Check them in Settings.`)
      return plan
    }
  })
  return { plan, today }
}
