// What a phone keeps for use with no signal (app/utils/offline-cache.ts asks the service worker to
// keep these paths): the signed-in person's jobs on the next days with their pages and data, and
// the visits booked for them in the same days. Pure: the days and visits are read with a signal.

export interface KeepDay { jobId: string, userId: string, day: string }
export interface KeepVisit { id: string, status: string, startsAt: string, visitor: { id: string | null } | null }
export interface KeepWho { userId: string, canLog: boolean }

/** Today and the next six days. */
export const KEEP_DAYS = 7

/**
 * The paths to keep: Today (its page and its one request) and who is signed in; each job the person is booked on between `from`
 * and `to` (ISO days) with its page, day sheet, set log page (if they may log) and its data; each
 * visit still booked for them that starts before the end of `to` (London's day, taken as UTC's
 * end of day: an hour's leeway in summer keeps a little more, never less) with its page, data and rooms.
 */
export function pathsToKeep(who: KeepWho, days: readonly KeepDay[], visits: readonly KeepVisit[], from: string, to: string): string[] {
  const paths = ['/', '/api/me', '/api/today']
  const jobIds = [...new Set(days.filter(d => d.userId === who.userId && d.day >= from && d.day <= to).map(d => d.jobId))]
  for (const id of jobIds) {
    paths.push(`/jobs/${id}`, `/jobs/${id}/sheet`, `/api/jobs/${id}`)
    if (who.canLog) paths.push(`/jobs/${id}/log`)
  }
  const end = Date.parse(`${to}T23:59:59.999Z`) + 3600_000
  for (const v of visits) {
    if (v.status !== 'booked' || v.visitor?.id !== who.userId || Date.parse(v.startsAt) > end) continue
    paths.push(`/visits/${v.id}`, `/api/visits/${v.id}`, `/api/visits/${v.id}/rooms`)
  }
  return paths
}
