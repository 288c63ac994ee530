// What can happen to a visit after it is booked: marked done, moved, cancelled. Each send is one
// function here (the page uses them through useVisitStatus; the phone's queue will send the same).
import { visitCancelSchema, type VisitCancelInput, type VisitDoneInput } from '#shared/schemas/visit'
import { londonDay, londonInstant, londonTime } from '#shared/utils/dates'
import { doneAtProblem, visitStartProblem } from '#shared/utils/visit-status'
import { newId } from '~/stores/visitDraft'

/** What the done, cancel and move routes answer: the visit row as it now is. */
export interface VisitRow { id: string, status: 'booked' | 'done' | 'cancelled', startsAt: string, doneAt: string | null, cancelReason: string }

/**
 * Mark a visit done at `at` (default: now, on the server). The body carries an id made here
 * (clientId): a queue that sends it when the signal comes back keeps that id, and a resend is a
 * 200 that changes nothing.
 */
export function sendVisitDone(visitId: string, at?: Date, clientId: string = newId()) {
  const body: VisitDoneInput = { clientId, ...(at ? { at: at.toISOString() } : {}) }
  return $fetch<VisitRow>(`/api/visits/${visitId}/done`, { method: 'POST', body })
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
export function useVisitStatus(visitId: MaybeRefOrGetter<string>, changed: () => unknown) {
  // done: the day and time in Britain, now unless changed
  const doneDay = ref('')
  const doneTime = ref('')
  function startDone() {
    const now = new Date()
    doneDay.value = londonDay(now)
    doneTime.value = londonTime(now)
  }
  const done = useSubmit(async () => {
    await sendVisitDone(toValue(visitId), londonInstant(doneDay.value, doneTime.value)!)
    await changed()
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

  return { doneDay, doneTime, startDone, done, markDone, reason, cancelling, cancel, sendCancel, moveTo, moving, move, sendMove }
}
