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

/**
 * How often the week is kept again while Setwell is on screen: hourly (a week's jobs change by the
 * day, and every page and list looked at with a signal is kept as it is shown). Each keep renders
 * every page kept, and it was most of what a firm asked of the server in a day, every 15 minutes
 * (npm run bench, a firm's day).
 */
export const KEEP_EVERY_MS = 60 * 60_000
/** Even when asked (the signal back), not twice in five minutes: a van in and out of signal would keep the week each time. */
export const KEEP_AT_MOST_EVERY_MS = 5 * 60_000

/**
 * Whether to keep the week now: `lastMs` when it was last kept for this person and firm (0 for
 * never), `asked` when something asks for it (the signal is back, another firm or person), `hidden`
 * when the page is behind others (a tab left open keeps nothing until it is looked at again).
 */
export function keepDue(nowMs: number, lastMs: number, asked: boolean, hidden: boolean): boolean {
  const since = nowMs - lastMs
  // a stamp in the future (the phone's clock was put back) is not trusted
  if (since >= 0 && since < (asked ? KEEP_AT_MOST_EVERY_MS : KEEP_EVERY_MS)) return false
  return asked || !hidden
}
