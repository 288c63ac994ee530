// A visit's life after it is booked: marked done (with a time), moved, or cancelled (with a
// reason). The rules the server applies and the forms show, in one place. Pure.
import { addDays, londonToday } from './dates'
import type { EnquiryStatus, VisitStatus } from './ledger'

/** How far ahead a visit may be booked or moved to: a year (days), the last day the date picker offers. */
export const VISIT_AHEAD_DAYS = 365
/** A phone's clock may run a little ahead of the server's: a done time this far in the future is still taken. */
export const DONE_SLACK_MS = 5 * 60_000
/** A move may be to a time a few minutes gone (the form was open a while). */
export const MOVE_SLACK_MS = 15 * 60_000

const DAY_MS = 86_400_000

/** The days a visit may be booked on or moved to, as the date picker offers them (YYYY-MM-DD, in Britain). */
export function visitDayLimits(now: Date = new Date()): { first: string, last: string } {
  const today = londonToday(now)
  return { first: today, last: addDays(today, VISIT_AHEAD_DAYS) }
}

/**
 * Why a visit may not start at `startsAt`, or null. Any time of the last day the picker offers is
 * taken (the limit is a day past it, as an instant), and a move may not be to a time gone by
 * (a booking may: the office records a visit made before Setwell had it).
 */
export function visitStartProblem(startsAt: Date, now: Date, kind: 'book' | 'move'): string | null {
  if (startsAt.getTime() > now.getTime() + (VISIT_AHEAD_DAYS + 1) * DAY_MS) return `Pick a day within a year (by ${visitDayLimits(now).last}).`
  if (kind === 'move' && startsAt.getTime() < now.getTime() - MOVE_SLACK_MS) return 'Pick a time from now on: a visit cannot be moved into the past.'
  return null
}

/** Why a visit cannot be marked done at `at`, or null. */
export function doneAtProblem(at: Date, now: Date): string | null {
  if (at.getTime() > now.getTime() + DONE_SLACK_MS) return 'The time it was done cannot be in the future.'
  return null
}

/** What a change asks of a visit in `status`: go ahead, nothing to do (a resend), or refused (409) with why. */
export type VisitStep = { ok: true, same: boolean } | { ok: false, message: string }

/** May a visit in `status` be marked done? A second "done" (a phone resending) is harmless and changes nothing. */
export function canMarkDone(status: VisitStatus): VisitStep {
  if (status === 'done') return { ok: true, same: true }
  if (status === 'cancelled') return { ok: false, message: 'This visit was cancelled, so it cannot be marked done.' }
  return { ok: true, same: false }
}

/** May a visit in `status` be cancelled? A second cancel changes nothing (the first reason stays). */
export function canCancel(status: VisitStatus): VisitStep {
  if (status === 'cancelled') return { ok: true, same: true }
  if (status === 'done') return { ok: false, message: 'This visit is done, so it cannot be cancelled.' }
  return { ok: true, same: false }
}

/** May a visit in `status` be moved, given another visitor or made longer? Only while booked. */
export function canReschedule(status: VisitStatus): VisitStep {
  if (status === 'done') return { ok: false, message: 'This visit is done, so it cannot be moved.' }
  if (status === 'cancelled') return { ok: false, message: 'This visit was cancelled, so it cannot be moved. Book a new one.' }
  return { ok: true, same: false }
}

/**
 * Where the enquiry a visit came from goes when the visit is cancelled: back to what it was
 * before the visit was booked (`before`, from its history; "new" when none is recorded), but only
 * while it still says "visit booked" and no other visit for it is still booked. Null: it stays.
 * Moving a visit leaves the enquiry as it is; so does marking one done, as there is no "visited"
 * status yet ("visit booked" stays until a quote is sent).
 */
export function enquiryAfterCancel(current: EnquiryStatus, before: EnquiryStatus | null, otherBooked: number): EnquiryStatus | null {
  if (current !== 'visit-booked' || otherBooked > 0) return null
  return before && before !== 'visit-booked' ? before : 'new'
}

/** Still to do: what Today and the visit list show by default. */
export function isStillToDo(v: { status: VisitStatus }): boolean {
  return v.status === 'booked'
}
