// What can happen to a visit after it is booked: marked done, moved, cancelled. Each send is one
// function here (the page uses them through useVisitStatus). Marking done goes through the outbox:
// at once with a signal, kept on the phone with none (moving and cancelling are the office's, at a desk).
import { visitCancelSchema, type VisitCancelInput, type VisitDoneInput } from '#shared/schemas/visit'
import { londonDay, londonInstant, londonTime, shortDayTime } from '#shared/utils/dates'
import { doneAtProblem, visitStartProblem } from '#shared/utils/visit-status'

/** What the done, cancel and move routes answer: the visit row as it now is. */
export interface VisitRow { id: string, status: 'booked' | 'done' | 'cancelled', startsAt: string, doneAt: string | null, cancelReason: string }

/**
 * Mark a visit done at `at`, through the outbox: the body carries an id made here (clientId), so a
 * resend from the queue is a 200 that changes nothing. Resolves { queued } (true: kept on the phone);
 * throws the server's refusal, for the form to show.
 */
export async function sendVisitDone(visitId: string, at: Date, label = 'A visit') {
  const body: Omit<VisitDoneInput, 'clientId'> = { at: at.toISOString() }
  const outbox = useOutboxStore()
  return outbox.send<VisitRow>({ kind: 'visit-done', label: `${label} marked done (${shortDayTime(at)})`, link: `/visits/${visitId}`, method: 'POST', url: `/api/visits/${visitId}/done`, body })
}

/** Cancel a visit with a reason (owner and office). */
export function sendVisitCancel(visitId: string, reason: string) {
  const body: VisitCancelInput = { reason }
  return $fetch<VisitRow>(`/api/visits/${visitId}/cancel`, { method: 'POST', body })
}

/** Move a visit to a new start (owner and office). */
export function sendVisitMove(visitId: string, startsAt: Date) {
  return $fetch<VisitRow>(`/api/visits/${visitId}`, { method: 'PATCH', body: { startsAt: startsAt.toISOString() } })
}

/** The three as forms for the visit page, each with its busy flag and errors (useSubmit); `changed` runs after each worked. */
export function useVisitStatus(visitId: MaybeRefOrGetter<string>, changed: () => unknown, label: MaybeRefOrGetter<string> = 'A visit') {
  // done: the day and time in Britain, now unless changed
  const doneDay = ref('')
  const doneTime = ref('')
  function startDone() {
    const now = new Date()
    doneDay.value = londonDay(now)
    doneTime.value = londonTime(now)
  }
  /** Marked done with no signal: kept on the phone, sent when the signal is back. */
  const doneQueued = ref(false)
  const done = useSubmit(async () => {
    const { queued } = await sendVisitDone(toValue(visitId), londonInstant(doneDay.value, doneTime.value)!, toValue(label))
    doneQueued.value = queued
    if (!queued) await changed()
  })
  async function markDone() {
    const at = /^\d{4}-\d{2}-\d{2}$/.test(doneDay.value) ? londonInstant(doneDay.value, doneTime.value) : null
    if (!at) return done.fail({ at: 'Enter the day and the time (like 14:30) it was done.' })
    const problem = doneAtProblem(at, new Date())
    if (problem) return done.fail({ at: problem })
    await done.submit()
  }

  // cancel: a reason, in a dialog
  const reason = ref('')
  const cancelling = ref(false)
  const cancel = useSubmit(async () => {
    await sendVisitCancel(toValue(visitId), reason.value.trim())
    cancelling.value = false
    reason.value = ''
    await changed()
  })
  async function sendCancel() {
    const check = visitCancelSchema.safeParse({ reason: reason.value })
    if (!check.success) return cancel.fail({ reason: check.error.issues[0]?.message ?? 'Say why the visit is cancelled.' })
    await cancel.submit()
  }

  // move: a new day and time from the picker
  const moveTo = ref<Date | null>(null)
  const moving = ref(false)
  const move = useSubmit(async () => {
    await sendVisitMove(toValue(visitId), moveTo.value!)
    moving.value = false
    moveTo.value = null
    await changed()
  })
  async function sendMove() {
    if (!moveTo.value) return move.fail({ startsAt: 'Pick the new date and time, then "Use this time".' })
    const problem = visitStartProblem(moveTo.value, new Date(), 'move')
    if (problem) return move.fail({ startsAt: problem })
    await move.submit()
  }

  return { doneDay, doneTime, startDone, done, doneQueued, markDone, reason, cancelling, cancel, sendCancel, moveTo, moving, move, sendMove }
}
