// Chasing an invoice by hand: what an entry in the chase log is (a call, a message or a letter,
// how it went, and a promise to pay when there was one), who may take one back out, and when a
// promise counts as broken. Pure: the routes, the form and the server's list of broken promises
// all read these.
import { compareDays, londonDay, shortDay } from './dates'
import { formatPence } from './money'

/** How the firm chased: the partner's own entries. The schedule's e-mails are `reminder` rows. */
export const CHASE_KINDS = ['call', 'message', 'letter'] as const
export type ChaseKind = (typeof CHASE_KINDS)[number]

export const CHASE_KIND_LABELS: Record<ChaseKind | 'reminder', string> = {
  call: 'Call',
  message: 'Message',
  letter: 'Letter',
  reminder: 'Reminder',
}

/** How it went. "Promised to pay" carries the promise (an amount and a date); the others none. */
export const CHASE_OUTCOMES = ['promised', 'no-reply', 'disputed', 'says-paid', 'other'] as const
export type ChaseOutcome = (typeof CHASE_OUTCOMES)[number]

export const CHASE_OUTCOME_LABELS: Record<ChaseOutcome, string> = {
  'promised': 'Promised to pay',
  'no-reply': 'No answer or no reply yet',
  'disputed': 'They question the invoice',
  'says-paid': 'They say it is paid',
  'other': 'Something else (say what in the note)',
}

/** How it went, as the log reads it afterwards ("other" says nothing: its note says what happened). */
export const CHASE_OUTCOME_IN_LOG: Record<ChaseOutcome, string> = {
  'promised': 'Promised to pay',
  'no-reply': 'No answer',
  'disputed': 'Invoice questioned',
  'says-paid': 'Says it is paid',
  'other': '',
}

export const PROMISE_DATE_PAST = 'A promise to pay is for today or a later day: pick the day they said.'

/** The promise's day against today (both London days, YYYY-MM-DD): the problem in words, or null. */
export function promiseDateProblem(promisedOn: string, today: string): string | null {
  return compareDays(promisedOn, today) < 0 ? PROMISE_DATE_PAST : null
}

export type ChaseRemoval = 'ok' | 'reminder' | 'not-today' | 'not-yours'

/**
 * May this person take this entry out of the log? The owner any time; the person who wrote it on
 * the London day they wrote it; a reminder the schedule (or a person) sent never: the e-mail went.
 */
export function chaseRemoval(who: { userId: string, role: string }, entry: { kind: string, byUserId: string | null, at: Date | string }, now: Date = new Date()): ChaseRemoval {
  if (entry.kind === 'reminder') return 'reminder'
  if (who.role === 'owner') return 'ok'
  if (entry.byUserId !== who.userId) return 'not-yours'
  return londonDay(new Date(entry.at)) === londonDay(now) ? 'ok' : 'not-today'
}

export const CHASE_REMOVAL_WORDS: Record<Exclude<ChaseRemoval, 'ok'>, string> = {
  'reminder': 'A reminder that was sent stays in the log: the customer has it.',
  'not-today': 'An entry can be removed by the person who wrote it on the day they wrote it; after that, ask the owner.',
  'not-yours': 'Only the person who wrote this entry (on the day) or the owner can remove it.',
}

export interface PromiseState {
  /** The day they promised to pay by (London, YYYY-MM-DD). */
  promisedOn: string
  /** What they promised; null on entries from before amounts were kept: the whole of what is owed. */
  promisedPence: number | null
  /** Money received against the invoice since the day of the promise (refunds taken off). */
  paidSincePence: number
  /** What is still to pay on the invoice now. */
  outstandingPence: number
  /** Someone chased again since the promise (a call, a message or a letter) on a day after the promised one. */
  chasedAfter: boolean
}

/**
 * A promise is broken from the day after its date, while the invoice is still owed and less than
 * the amount promised has come in since it was made. Chasing again after the day answers it (the
 * next promise, if any, is then the one that counts).
 */
export function promiseBroken(p: PromiseState, today: string): boolean {
  if (compareDays(today, p.promisedOn) <= 0) return false
  if (p.outstandingPence <= 0) return false
  if (p.promisedPence !== null && p.paidSincePence >= p.promisedPence) return false
  return !p.chasedAfter
}

/** The words of a broken promise on a list of things to do. */
export function brokenPromiseWords(p: { customerName: string, reference: string | null, promisedOn: string, promisedPence: number | null, outstandingPence: number }) {
  const promised = p.promisedPence === null ? `promised by ${shortDay(p.promisedOn)}` : `${formatPence(p.promisedPence)} promised by ${shortDay(p.promisedOn)}`
  return {
    title: `Chase ${p.customerName}: a promise to pay was not kept`,
    detail: [p.reference, promised, `${formatPence(p.outstandingPence)} still to pay`].filter(Boolean).join(' · '),
  }
}
