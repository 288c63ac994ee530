// The set log form's state: what is typed (a set done or a problem found), the set's surfaces and
// coat filled in from the plan, who was there, the bags mixed, and the send. Nothing typed is lost
// on an error; once saved, back to the job.
import { londonTime, londonToday } from '#shared/utils/dates'
import type { LogCoat } from '#shared/utils/jobs'
import { coatForSet, MAX_PACKS_X1000, setLogFieldErrors, setLogTimes, setProgress, setToLog, setTooLong } from '#shared/utils/set-log'

type Job = ApiResponse<'/api/jobs/:id'>

export function setLogForm(job: Job | null | undefined, me: { id: string } | undefined, askedSet?: unknown) {
  const now = new Date()
  return {
    kind: 'set' as 'set' | 'problem',
    setNumber: String(setToLog(job?.plan.plan.sets ?? [], job?.logs ?? [], askedSet)),
    coat: 'first' as LogCoat,
    surfaceIds: [] as string[],
    // the times are London's, as the job page shows them; a set is taken to have started two hours ago
    day: londonToday(now),
    start: londonTime(new Date(now.getTime() - 2 * 3600_000)),
    end: londonTime(now),
    userIds: [me?.id ?? ''] as string[],
    bags: {} as Record<string, string>,
    coldOrDamp: false,
    notes: '',
  }
}
export type SetLogForm = ReturnType<typeof setLogForm>

export function useSetLogForm(job: Ref<Job | null | undefined>) {
  const shell = useShellStore()
  const route = useRoute()
  const form = ref(setLogForm(job.value, shell.me?.user, route.query.set))
  // each set's progress, for the Set box: done once its final coat is logged, part logged before
  const logged = computed(() => new Map((job.value?.plan.plan.sets ?? []).map(s => [s.number, setProgress(s, job.value?.logs ?? [])])))

  function fillFromSet() {
    const set = job.value?.plan.plan.sets.find(s => String(s.number) === form.value.setNumber)
    if (!set) return
    form.value.surfaceIds = [...new Set(set.tasks.map(t => t.surfaceId))]
    form.value.coat = coatForSet(set.tasks)
  }
  fillFromSet()
  watch(() => form.value.setNumber, fillFromSet)
  // a time changed after an error about the times puts that error away until the next save
  watch(() => [form.value.day, form.value.start, form.value.end], () => {
    const { startedAt: _s, endedAt: _e, ...rest } = save.errors.value.fields
    if (_s || _e) save.errors.value = { ...save.errors.value, fields: rest }
  })

  const people = computed(() => {
    const seen = new Map<string, string>()
    if (shell.me) seen.set(shell.me.user.id, shell.me.user.name)
    for (const d of job.value?.days ?? []) seen.set(d.userId, d.name)
    return [...seen].map(([value, label]) => ({ value, label }))
  })
  const surfaces = computed(() => (job.value?.plan.surfaces ?? []).map(s => ({ value: s.id, label: job.value?.plan.labels[s.id] ?? s.id })))
  const mixable = computed(() => (job.value?.materials ?? []).filter(m => m.materialId))

  let body: Record<string, unknown> = {}
  const save = useSubmit(async () => {
    await $fetch(`/api/jobs/${job.value!.id}/logs`, { method: 'POST', body })
    await navigateTo(`/jobs/${job.value!.id}`)
  })

  async function submit() {
    const f = form.value
    const local: Record<string, string> = {}
    const materials: { materialId: string, packsX1000: number }[] = []
    for (const m of mixable.value) {
      const typed = (f.bags[m.materialId!] ?? '').trim()
      if (!typed) continue
      const x = parseQuantity(typed)
      if (x === null || x === 0) local[`bags.${m.materialId}`] = 'Enter the bags mixed, like 1.5.'
      else if (x > MAX_PACKS_X1000) local[`bags.${m.materialId}`] = `More than ${MAX_PACKS_X1000 / 1000} in one set? Check the figure.`
      else materials.push({ materialId: m.materialId!, packsX1000: x })
    }
    const times = f.kind === 'set' ? setLogTimes(f.day, f.start, f.end) : { startedAt: null, endedAt: null, fields: {} }
    Object.assign(local, times.fields)
    const tooLong = times.startedAt && times.endedAt ? setTooLong(times.startedAt, times.endedAt) : null
    if (tooLong) local.endedAt = tooLong
    if (Object.keys(local).length) return save.fail(local)
    body = f.kind === 'problem'
      ? { kind: 'problem', notes: f.notes, userIds: f.userIds, surfaceIds: f.surfaceIds }
      : { kind: 'set', setNumber: Number(f.setNumber) || null, coat: f.coat, surfaceIds: f.surfaceIds, startedAt: times.startedAt, endedAt: times.endedAt, userIds: f.userIds, coldOrDamp: f.coldOrDamp, notes: f.notes, materials }
    if (await save.submit()) return
    // the API names a material's bags by its place in what was sent; the page by the material
    save.errors.value = { ...save.errors.value, fields: setLogFieldErrors(save.errors.value.fields, materials) }
  }

  return { form, logged, people, surfaces, mixable, save, submit, errs: computed(() => save.errors.value.fields) }
}
