// The set log form's sums, kept out of the page so a table can check them: which coat a set on
// the plan is logged as, and the two times typed on site as instants.
import { addDays, londonDay, londonInstant, londonTime, shortDay } from './dates'
import type { LogCoat } from './jobs'
import type { PlanAction } from './plan-actions'

/**
 * The coat a set on the plan is logged as. A set is both coats laid on and trowelled up in one go,
 * so a set with a skim is logged as its second (final) coat (the room's "ready to decorate" date
 * waits for every surface's second coat); a set of fills or undercoats is a fill (both are
 * undercoat, and dry as one: the firm's undercoat days); the rest a tight coat.
 */
export function coatForSet(tasks: readonly { action: PlanAction }[]): LogCoat {
  if (tasks.some(t => t.action === 'skim')) return 'second'
  if (tasks.some(t => t.action === 'fill' || t.action === 'undercoat')) return 'fill'
  return 'tight-coat'
}

export interface SetTimes {
  startedAt: string | null
  endedAt: string | null
  /** startedAt / endedAt: the time typed is not a time of day. */
  fields: Partial<Record<'startedAt' | 'endedAt', string>>
}

const isTime = (s: string) => /^\d{2}:\d{2}$/.test(s)

/**
 * A set's start and finish typed as London times ("08:30") on `day`, as ISO instants. An empty
 * time is null (not given); one that is not a time is named in `fields`. A set that finishes
 * earlier in the day than it started ran past midnight: it began the day before.
 */
export function setLogTimes(day: string, start: string, end: string): SetTimes {
  const pastMidnight = isTime(start) && isTime(end) && end < start
  const at = (d: string, time: string) => (isTime(time) ? londonInstant(d, time)?.toISOString() ?? null : null)
  const startedAt = start ? at(pastMidnight ? addDays(day, -1) : day, start) : null
  const endedAt = end ? at(day, end) : null
  const fields: SetTimes['fields'] = {}
  if (start && !startedAt) fields.startedAt = 'Enter the time like 08:30.'
  if (end && !endedAt) fields.endedAt = 'Enter the time like 10:15.'
  return { startedAt, endedAt, fields }
}

/**
 * The longest a set may run, start to finish: 12 hours. A set is mixed, laid on and trowelled up in
 * a working day; a finish "before" the start is a set that ran past midnight only within that
 * (common practice: a plasterer's day, even a long one, is not 12 hours on one set).
 */
export const MAX_SET_HOURS = 12

/** The most of one material a set log may record, in thousandths of a pack: 100 bags (common practice; a room takes a handful). */
export const MAX_PACKS_X1000 = 100_000

/** Why a set's times cannot be right, or null: longer than MAX_SET_HOURS, in words with London's times. */
export function setTooLong(startedAt: string, endedAt: string): string | null {
  const ms = Date.parse(endedAt) - Date.parse(startedAt)
  if (!(ms > MAX_SET_HOURS * 3_600_000)) return null
  const hours = Math.round(ms / 3_600_000)
  return `A set from ${londonTime(new Date(startedAt))} to ${londonTime(new Date(endedAt))} would run ${hours} hours: check the times.`
}

/**
 * The set log form's errors from the API, on the fields the page shows: the bags of the
 * n-th material sent are the bags box of that material (`bags.<materialId>`).
 */
export function setLogFieldErrors(fields: Record<string, string>, sent: readonly { materialId: string }[]): Record<string, string> {
  const out: Record<string, string> = {}
  for (const [key, message] of Object.entries(fields)) {
    const m = /^materials\.(\d+)\.(packsX1000|materialId)$/.exec(key)
    const material = m ? sent[Number(m[1])] : undefined
    out[material ? `bags.${material.materialId}` : key] = message
  }
  return out
}

type Action = PlanAction
/** One task of a set on the plan, as a log entry records it: a surface and what was done to it. */
export interface LogTask { surfaceId: string, action: Action }
interface PlannedSet { number: number, tasks: readonly { surfaceId?: string, action: Action }[] }
interface LoggedEntry { id?: string, kind: string, setNumber: number | null, coat: LogCoat | null, tasks?: readonly LogTask[] | null }

/** A task's key, to compare the plan's tasks with those an entry ticked. */
export const taskKey = (t: { surfaceId?: string, action: Action }) => `${t.surfaceId ?? ''}|${t.action}`

/**
 * The tasks of a set already logged, as taskKeys: those ticked in any entry of that set; an entry
 * made before entries carried their tasks counts the old way (its final coat, coatForSet, covers
 * every task of the set; an earlier coat, none). `except` leaves one entry out (the one corrected).
 */
export function loggedTasks(set: PlannedSet, logs: readonly LoggedEntry[], except?: string): Set<string> {
  const done = new Set<string>()
  for (const l of logs) {
    if (l.kind !== 'set' || l.setNumber !== set.number || (except && l.id === except)) continue
    if (l.tasks?.length) for (const t of l.tasks) done.add(taskKey(t))
    else if (l.coat === coatForSet(set.tasks)) for (const t of set.tasks) done.add(taskKey(t))
  }
  return done
}

/**
 * How far a set on the plan has been logged: done once every task of the set is in some entry
 * (loggedTasks), partly once anything is logged against it (a fill now, the skim later), else to do.
 */
export function setProgress(set: PlannedSet, logs: readonly LoggedEntry[]): 'to-do' | 'partly' | 'done' {
  const mine = logs.filter(l => l.kind === 'set' && l.setNumber === set.number)
  if (!mine.length) return 'to-do'
  const done = loggedTasks(set, logs)
  return set.tasks.length > 0 && set.tasks.every(t => done.has(taskKey(t))) ? 'done' : 'partly'
}

/**
 * The tasks ticked when the log form opens on a set: every task not yet logged in another entry
 * (the crew untick what was not done).
 */
export function tasksToTick(set: PlannedSet, logs: readonly LoggedEntry[]): string[] {
  const done = loggedTasks(set, logs)
  return set.tasks.map(taskKey).filter(k => !done.has(k))
}

/**
 * The bags the plan gives the ticked tasks (taskKeys), to a tenth, as typed in the "Bags mixed"
 * box ("4.5"), or '' when none are ticked.
 */
export function plannedBags(tasks: readonly { surfaceId: string, action: Action, bags: number }[], ticked: readonly string[]): string {
  const keys = new Set(ticked)
  const tenths = tasks.filter(t => keys.has(taskKey(t))).reduce((sum, t) => sum + Math.round(t.bags * 10), 0)
  return tenths ? String(tenths / 10) : ''
}

/** Minutes a set's times may run ahead of the server's clock: a phone's clock may be a few minutes out (common practice). */
export const FUTURE_SLACK_MINUTES = 5

/** Why a time typed for a set cannot be right because it is still to come (beyond the slack), or null. */
export function inTheFuture(at: string, now: Date = new Date()): string | null {
  const t = Date.parse(at)
  if (!(t > now.getTime() + FUTURE_SLACK_MINUTES * 60_000)) return null
  return `${londonTime(new Date(t))} on ${shortDay(new Date(t))} is still to come: log a set once it is done.`
}

/**
 * Whether a person may correct or remove a log entry: the owner any time; the person who logged
 * it on the same London day it was logged (createdAt); nobody on a closed job.
 */
export function mayChangeLog(who: { userId: string, role: string }, log: { loggedBy: string | null, createdAt: Date | string }, jobStatus: string, now: Date = new Date()): boolean {
  if (['invoiced', 'paid', 'cancelled'].includes(jobStatus)) return false
  if (who.role === 'owner') return true
  return log.loggedBy === who.userId && londonDay(new Date(log.createdAt)) === londonDay(now)
}

/**
 * The set the log form opens on: the one asked for (the job page's "Log set 2", as ?set=2) when
 * the plan has it, else the first not yet done. It never moves on because a set was logged in
 * part: three coats of set 1 are all set 1.
 */
export function setToLog(sets: readonly PlannedSet[], logs: readonly LoggedEntry[], asked?: unknown): number {
  const n = Number(asked)
  if (typeof asked === 'string' && /^\d+$/.test(asked) && sets.some(s => s.number === n)) return n
  return sets.find(s => setProgress(s, logs) !== 'done')?.number ?? sets[0]?.number ?? 1
}
