// What the Today screen shows, worked out from the lists the API sends. Pure.
import type { VisitStatus } from './ledger'
import { isStillToDo } from './visit-status'

/** A booked day as the diary sends it (the parts Today reads). */
export interface WeekEntry { jobId: string, reference: string, customer: string, day: string, person: string }

/** A job booked this week: the days it is booked on (in the diary's order, once each) and who is on it. */
export interface WeekJob { jobId: string, reference: string, customer: string, days: string[], people: string[] }

/**
 * The week's booked days gathered by job, in the order each job first appears (the diary sends
 * them by day, then job number): each day once, each person once.
 */
export function jobsOfTheWeek(entries: readonly WeekEntry[]): WeekJob[] {
  const byJob = new Map<string, WeekJob>()
  for (const e of entries) {
    const j = byJob.get(e.jobId) ?? { jobId: e.jobId, reference: e.reference, customer: e.customer, days: [], people: [] }
    if (!j.days.includes(e.day)) j.days.push(e.day)
    if (!j.people.includes(e.person)) j.people.push(e.person)
    byJob.set(e.jobId, j)
  }
  return [...byJob.values()]
}

/** The `n` jobs whose last day worked is latest, latest first (the sort is stable: a tie keeps the list's order). */
export function latestJobsWorked<T extends { lastDay: string }>(rows: readonly T[], n: number): T[] {
  return [...rows].sort((a, b) => b.lastDay.localeCompare(a.lastDay)).slice(0, n)
}

/**
 * The visits Today lists: still to do (booked; not done, not cancelled), soonest first, at most
 * `n`. The API already sends only these; a visit changed on this screen since is dropped too.
 */
export function visitsStillToDo<T extends { status: VisitStatus, startsAt: string | Date }>(rows: readonly T[], n: number): T[] {
  return rows.filter(isStillToDo).sort((a, b) => new Date(a.startsAt).getTime() - new Date(b.startsAt).getTime()).slice(0, n)
}
