// The set log form's state: what is typed (a set done or a problem found), the set's tasks from the
// plan ticked (all but those logged already), who was there, the bags mixed (the plan's bags of
// the ticked tasks to start with), and the send. Nothing typed is lost on an error; once saved,
// back to the job. Opened with ?entry=<logId>, it corrects that entry instead (PATCH).
import { londonDay, londonTime, londonToday } from '#shared/utils/dates'
import type { LogCoat } from '#shared/utils/jobs'
import {
  coatForSet, inTheFuture, loggedTasks, MAX_PACKS_X1000, plannedBags, setLogFieldErrors, setLogTimes, setProgress, setToLog,
  setTooLong, taskKey, tasksToTick, type LogTask,
} from '#shared/utils/set-log'
import { PLAN_ACTION_WORDS } from '#shared/utils/plan-actions'

type Job = ApiResponse<'/api/jobs/:id'>
type Entry = Job['logs'][number]

const ACTION_WORDS: Record<LogTask['action'], string> = PLAN_ACTION_WORDS

/** The form as an entry already logged fills it, to correct it. */
function formFromEntry(entry: Entry) {
  const at = (t: string | null) => (t ? londonTime(new Date(t)) : '')
  return {
    kind: entry.kind,
    setNumber: entry.setNumber === null ? '' : String(entry.setNumber),
    coat: (entry.coat ?? 'first') as LogCoat,
    surfaceIds: [...entry.surfaceIds],
    tasks: entry.tasks.map(taskKey),
    day: londonDay(new Date(entry.endedAt ?? entry.startedAt ?? entry.createdAt)),
    start: at(entry.startedAt),
    end: at(entry.endedAt),
    userIds: [...entry.userIds],
    bags: Object.fromEntries(entry.materials.map(m => [m.materialId, formatCount(m.packsX1000)])) as Record<string, string>,
    coldOrDamp: entry.coldOrDamp,
    notes: entry.notes,
    clientId: '',
    photos: [] as { id: string, file: File }[],
  }
}

export function setLogForm(job: Job | null | undefined, me: { id: string } | undefined, askedSet?: unknown, entry?: Entry) {
  if (entry) return formFromEntry(entry)
  const now = new Date()
  return {
    kind: 'set' as 'set' | 'problem',
    setNumber: String(setToLog(job?.plan.plan.sets ?? [], job?.logs ?? [], askedSet)),
    coat: 'first' as LogCoat,
    surfaceIds: [] as string[],
    /** The plan's tasks ticked (taskKey: surface and action). */
    tasks: [] as string[],
    // the times are London's, as the job page shows them; a set is taken to have started two hours ago
    day: londonToday(now),
    start: londonTime(new Date(now.getTime() - 2 * 3600_000)),
    end: londonTime(now),
    userIds: [me?.id ?? ''] as string[],
    bags: {} as Record<string, string>,
    coldOrDamp: false,
    notes: '',
    /** Made when the form opens: a resend of this entry (a lost answer, the offline queue) is stored once. */
    clientId: newId(),
    /** Photos taken with the set: sent after it, through the outbox (kept on the phone with no signal). */
    photos: [] as { id: string, file: File }[],
  }
}
export type SetLogForm = ReturnType<typeof setLogForm>

export function useSetLogForm(job: Ref<Job | null | undefined>) {
  const shell = useShellStore()
  const route = useRoute()
  const entry = job.value?.logs.find(l => l.id === route.query.entry)
  const form = ref(setLogForm(job.value, shell.me?.user, route.query.set, entry))
  // each set's progress, for the Set box: done once every task is logged, part logged before
  const logged = computed(() => new Map((job.value?.plan.plan.sets ?? []).map(s => [s.number, setProgress(s, job.value?.logs ?? [])])))
  const set = computed(() => job.value?.plan.plan.sets.find(s => String(s.number) === form.value.setNumber))
  const label = (id: string) => job.value?.plan.labels[id] ?? id
  const bagWords = (n: number) => `${n} ${n === 1 ? 'bag' : 'bags'}`
  /** The set's tasks as lines to tick: surface, action, the plan's bags; those logged in another entry say so. */
  const taskLines = computed(() => {
    if (!set.value) return []
    const done = loggedTasks(set.value, job.value?.logs ?? [], entry?.id)
    return set.value.tasks.map(t => ({
      value: taskKey(t),
      label: `${label(t.surfaceId)} · ${ACTION_WORDS[t.action]} · ${bagWords(t.bags)}${done.has(taskKey(t)) ? ' (logged already)' : ''}`,
    }))
  })

  function fillFromSet() {
    if (!set.value) return
    form.value.tasks = tasksToTick(set.value, (job.value?.logs ?? []).filter(l => l.id !== entry?.id))
  }
  if (!entry) fillFromSet()
  // an entry made before entries carried their tasks: its surfaces' tasks on the set, ticked
  else if (!entry.tasks.length && set.value) form.value.tasks = set.value.tasks.filter(t => entry.surfaceIds.includes(t.surfaceId)).map(taskKey)
  watch(() => form.value.setNumber, fillFromSet)

  const people = computed(() => {
    const seen = new Map<string, string>()
    if (shell.me) seen.set(shell.me.user.id, shell.me.user.name)
    for (const d of job.value?.days ?? []) seen.set(d.userId, d.name)
    return [...seen].map(([value, label]) => ({ value, label }))
  })
  const surfaces = computed(() => (job.value?.plan.surfaces ?? []).map(s => ({ value: s.id, label: label(s.id) })))
  const mixable = computed(() => (job.value?.materials ?? []).filter(m => m.materialId))

  // the bags box of the material the plan counts in (the one mixable material, or the finish the
  // plan's bags are of) starts at the plan's bags of the ticked tasks, and follows the ticks until
  // someone types their own figure
  let prefilled = entry ? null : ''
  const planned = computed(() => (mixable.value.length === 1 ? mixable.value[0]!.materialId : mixable.value.find(m => m.materialId === job.value?.planMaterialId)?.materialId) ?? null)
  watch(() => [form.value.tasks, set.value, planned.value] as const, () => {
    const only = planned.value
    if (!only || !set.value || prefilled === null) return
    const now = form.value.bags[only] ?? ''
    if (now !== prefilled && now !== '') return
    prefilled = plannedBags(set.value.tasks, form.value.tasks)
    form.value.bags[only] = prefilled
  }, { immediate: true, deep: true })

  // a time changed after an error about the times puts that error away until the next save
  watch(() => [form.value.day, form.value.start, form.value.end], () => {
    const { startedAt: _s, endedAt: _e, ...rest } = save.errors.value.fields
    if (_s || _e) save.errors.value = { ...save.errors.value, fields: rest }
  })

  // the one send: a new entry (with its photos) goes through the outbox with its clientId, at once
  // with a signal and kept on the phone with none; a correction is a PATCH of that entry
  let body: Record<string, unknown> = {}
  const sendSetLog = useSetLogSend()
  const save = useSubmit(async () => {
    const j = job.value!
    if (entry) {
      await $fetch(`/api/jobs/${j.id}/logs/${entry.id}`, { method: 'PATCH', body })
    }
    else {
      const what = body.kind === 'problem' ? 'A problem found' : `Set ${form.value.setNumber}`
      await sendSetLog({ jobId: j.id, clientId: form.value.clientId, body, label: `${what} on ${j.reference}`, photos: form.value.photos })
    }
    await navigateTo(`/jobs/${j.id}`)
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
    for (const key of ['startedAt', 'endedAt'] as const) {
      const why = times[key] ? inTheFuture(times[key]!) : null
      if (why && !local[key]) local[key] = why
    }
    const ticked: LogTask[] = f.kind === 'set' && set.value ? set.value.tasks.filter(t => f.tasks.includes(taskKey(t))).map(t => ({ surfaceId: t.surfaceId, action: t.action })) : []
    if (f.kind === 'set' && set.value && !ticked.length) local.tasks = 'Tick the tasks done in this set.'
    if (Object.keys(local).length) return save.fail(local)
    const clientId = f.clientId || undefined
    body = f.kind === 'problem'
      ? { kind: 'problem', notes: f.notes, userIds: f.userIds, surfaceIds: f.surfaceIds, clientId }
      : {
          kind: 'set', setNumber: Number(f.setNumber) || null, tasks: ticked,
          // from the ticks: their surfaces, and the coat as the set's would be (a skim is the final coat)
          surfaceIds: set.value ? [...new Set(ticked.map(t => t.surfaceId))] : f.surfaceIds,
          coat: set.value ? coatForSet(ticked) : f.coat,
          startedAt: times.startedAt, endedAt: times.endedAt, userIds: f.userIds, coldOrDamp: f.coldOrDamp, notes: f.notes, materials, clientId,
        }
    if (await save.submit()) return
    // the API names a material's bags by its place in what was sent, and a task by its place; the page by the material, the tasks as a whole
    const fields = setLogFieldErrors(save.errors.value.fields, materials)
    const onTasks = Object.entries(fields).find(([k]) => k === 'tasks' || k.startsWith('tasks.') || (set.value && k.startsWith('surfaceIds')))
    if (onTasks) fields.tasks = onTasks[1]
    save.errors.value = { ...save.errors.value, fields }
  }

  return { form, entry, set, taskLines, logged, people, surfaces, mixable, save, submit, errs: computed(() => save.errors.value.fields) }
}
