// Today as a list of next actions (issue 18): what needs doing, most urgent first, each with its
// one tap and how long it has waited. The server picks and counts the rows in SQL
// (server/utils/next-actions.ts); this file turns each row into the words people read and sorts
// the list. Pure: no Vue, no Nitro, no database.
import { addDays, daysBetween, daysInWords, isIsoDate, londonDay, longIsoDate } from './dates'
import { formatPence } from './money'

export type NextActionKind = 'enquiry-new' | 'visit-not-written-up' | 'visit-not-marked' | 'quote-unanswered'
  | 'quote-not-booked' | 'job-not-invoiced' | 'invoice-overdue' | 'promise-broken' | 'day-no-set-logged'
  | 'purchase-no-receipt' | 'vat-return-due' | 'cis-return-due' | 'setup-missing' | 'bank-lines-open'

export interface NextAction {
  kind: NextActionKind
  /** stable per thing, e.g. `invoice-overdue:<invoiceId>` */
  key: string
  /** what needs doing, in the firm's words: "Answer Tamsin Quillane's enquiry" */
  title: string
  /** one line of facts: "BP-12 · £740.90 · 9 days overdue" */
  detail: string
  /** where the one tap goes */
  href: string
  /** the button's words: "Answer", "Chase", "Make the invoice" */
  actionLabel: string
  /** ISO date (or timestamp) it has waited since, shown as "waiting 3 days" in words */
  since: string
  /** bigger is more urgent: the list is sorted by this, then by since (oldest first) */
  urgency: number
}

/**
 * How urgent each kind is before its wait is counted (our own order, from the issue: money owed
 * and a customer waiting for an answer first; paperwork last). A kind's wait adds at most
 * `MAX_WAIT_BONUS`, less than the gap between two kinds, so the kinds keep this order.
 */
export const KIND_URGENCY: Record<NextActionKind, number> = {
  'promise-broken': 1300,
  'invoice-overdue': 1200,
  // beside the overdue invoices, by age: a transfer still to match may be the payment about to be chased
  'bank-lines-open': 1200,
  'enquiry-new': 1100,
  'visit-not-marked': 1000,
  'quote-not-booked': 900,
  'job-not-invoiced': 800,
  'vat-return-due': 700,
  'cis-return-due': 700,
  'quote-unanswered': 600,
  'visit-not-written-up': 500,
  'day-no-set-logged': 400,
  'purchase-no-receipt': 300,
  'setup-missing': 100,
}
export const MAX_WAIT_BONUS = 90

/** Days after a quote is sent before it is "unanswered" on Today, unless the firm sets its own (common practice: a week). */
export const DEFAULT_QUOTE_CHASE_DAYS = 7
/** Days worked with no set logged are looked for this far back (older ones are history, not a next step). */
export const SET_LOG_LOOKBACK_DAYS = 14
/** Purchases without a receipt are looked for this far back (the quarter the accountant is about to ask for). */
export const RECEIPT_LOOKBACK_DAYS = 92
/** A tax return due date shows this many days ahead of it, and until the day itself. */
export const RETURN_DUE_AHEAD_DAYS = 45
/** How many of each kind the list carries; the rest are counted ("and 12 more"). */
export const ACTIONS_PER_KIND = 5

/** The London day of an ISO date or timestamp. */
export function dayOf(since: string | Date): string {
  if (since instanceof Date) return londonDay(since)
  return isIsoDate(since) ? since : londonDay(new Date(since))
}

/** Whole days from `since` to `today` (0 when it is today; never negative). */
export function daysWaited(since: string | Date, today: string): number {
  return Math.max(0, daysBetween(dayOf(since), today))
}

/** "since today", "waiting 1 day", "waiting 12 days". */
export function waitingWords(since: string | Date, today: string): string {
  const days = daysWaited(since, today)
  return days === 0 ? 'since today' : `waiting ${daysInWords(days)}`
}

/** The kind's urgency plus one a day of waiting, capped. */
export function urgencyOf(kind: NextActionKind, since: string | Date, today: string): number {
  return KIND_URGENCY[kind] + Math.min(MAX_WAIT_BONUS, daysWaited(since, today))
}

/** Most urgent first; the same urgency oldest first; then by key, so the order never wobbles. */
export function sortActions(actions: readonly NextAction[]): NextAction[] {
  return [...actions].sort((a, b) => b.urgency - a.urgency
    || dayOf(a.since).localeCompare(dayOf(b.since))
    || a.since.localeCompare(b.since)
    || a.key.localeCompare(b.key))
}

/** One thing listed once: later copies of a key are dropped (a job on two people's days is one job). */
export function onceEach(actions: readonly NextAction[]): NextAction[] {
  const seen = new Set<string>()
  return actions.filter(a => (seen.has(a.key) ? false : (seen.add(a.key), true)))
}

/**
 * An invoice is chased once: where a customer broke a promise to pay, that is the action, and the
 * same invoice is not also listed as merely overdue (both would send the office to one invoice).
 */
export function promiseOverOverdue(actions: readonly NextAction[]): NextAction[] {
  const broken = new Set(actions.filter(a => a.kind === 'promise-broken').map(a => a.href))
  return actions.filter(a => !(a.kind === 'invoice-overdue' && broken.has(a.href)))
}

const iso = (v: string | Date) => (v instanceof Date ? v.toISOString() : v)
const possessive = (name: string) => (name.endsWith('s') ? `${name}'` : `${name}'s`)
const short = (text: string, max = 60) => {
  const one = text.replace(/\s+/g, ' ').trim()
  return one.length > max ? `${one.slice(0, max - 1)}…` : one
}
const join = (...parts: (string | false | null | undefined)[]) => parts.filter(Boolean).join(' · ')

function make(kind: NextActionKind, id: string, since: string | Date, today: string, rest: Pick<NextAction, 'title' | 'detail' | 'href' | 'actionLabel'>): NextAction {
  return { kind, key: `${kind}:${id}`, since: iso(since), urgency: urgencyOf(kind, since, today), ...rest }
}

// ---------------------------------------------------------------------------------------------
// One builder per kind: the row the server chose, in the words people read

export function enquiryAction(r: { id: string, customer: string, description: string, phone: string, createdAt: string | Date }, today: string): NextAction {
  return make('enquiry-new', r.id, r.createdAt, today, {
    title: `Answer ${possessive(r.customer)} enquiry`,
    detail: join(short(r.description), r.phone),
    href: `/enquiries/${r.id}`,
    actionLabel: 'Answer',
  })
}

export function visitNotMarkedAction(r: { id: string, customer: string, startsAt: string | Date, place: string }, today: string): NextAction {
  return make('visit-not-marked', r.id, r.startsAt, today, {
    title: `Mark the visit to ${r.customer} done, or move it`,
    detail: join(`was booked for ${longIsoDate(dayOf(r.startsAt))}`, r.place),
    href: `/visits/${r.id}`,
    actionLabel: 'Mark it',
  })
}

export function visitNotWrittenUpAction(r: { id: string, customer: string, doneAt: string | Date, rooms: number }, today: string): NextAction {
  return make('visit-not-written-up', r.id, r.doneAt, today, {
    title: `Write up the visit to ${r.customer} as a quote`,
    detail: join(`visited ${longIsoDate(dayOf(r.doneAt))}`, r.rooms ? `${r.rooms} ${r.rooms === 1 ? 'room' : 'rooms'} measured` : 'no rooms measured yet'),
    href: `/visits/${r.id}`,
    actionLabel: 'Write it up',
  })
}

export function quoteUnansweredAction(r: { id: string, reference: string, customer: string, sentAt: string | Date, grossPence: number }, today: string): NextAction {
  return make('quote-unanswered', r.id, r.sentAt, today, {
    title: `Ask ${r.customer} about quote ${r.reference}`,
    detail: join(r.reference, formatPence(r.grossPence), `sent ${longIsoDate(dayOf(r.sentAt))}, no answer`),
    href: `/quotes/${r.id}`,
    actionLabel: 'Follow up',
  })
}

export function quoteNotBookedAction(r: { id: string, reference: string, customer: string, acceptedAt: string | Date, jobId: string | null, jobReference: string | null }, today: string): NextAction {
  return make('quote-not-booked', r.id, r.acceptedAt, today, r.jobId
    ? {
        title: `Book the days for ${r.customer}'s job`,
        detail: join(r.jobReference, `quote ${r.reference} accepted ${longIsoDate(dayOf(r.acceptedAt))}`, 'no days booked'),
        href: `/jobs/${r.jobId}`,
        actionLabel: 'Book the days',
      }
    : {
        title: `Make ${possessive(r.customer)} accepted quote a job`,
        detail: join(r.reference, `accepted ${longIsoDate(dayOf(r.acceptedAt))}`),
        href: `/quotes/${r.id}`,
        actionLabel: 'Make the job',
      })
}

export function jobNotInvoicedAction(r: { id: string, reference: string, customer: string, finishedAt: string | Date, grossPence: number, invoicedPence: number }, today: string): NextAction {
  return make('job-not-invoiced', r.id, r.finishedAt, today, {
    title: `Invoice ${possessive(r.customer)} finished job`,
    detail: join(r.reference, `finished ${longIsoDate(dayOf(r.finishedAt))}`, r.invoicedPence > 0 ? `${formatPence(r.invoicedPence)} of ${formatPence(r.grossPence)} invoiced` : `${formatPence(r.grossPence)} not invoiced`),
    href: `/jobs/${r.id}`,
    actionLabel: 'Make the invoice',
  })
}

export function invoiceOverdueAction(r: { id: string, reference: string, customer: string, dueOn: string, outstandingPence: number }, today: string): NextAction {
  const late = daysWaited(r.dueOn, today)
  return make('invoice-overdue', r.id, r.dueOn, today, {
    title: `Chase ${r.customer} for ${r.reference}`,
    detail: join(r.reference, formatPence(r.outstandingPence), `${daysInWords(late)} overdue`),
    href: `/invoices/${r.id}`,
    actionLabel: 'Chase',
  })
}

export function dayNoSetAction(r: { jobId: string, reference: string, customer: string, day: string, people: readonly string[] }, today: string): NextAction {
  return make('day-no-set-logged', `${r.jobId}:${r.day}`, r.day, today, {
    title: `Log the sets done on ${r.reference} on ${longIsoDate(r.day)}`,
    detail: join(r.customer, r.people.join(', ')),
    href: `/jobs/${r.jobId}/log`,
    actionLabel: 'Log a set',
  })
}

/** An account's statement lines still to match: one action for them all, waiting since the oldest. */
export function bankLinesAction(r: { accountId: string, account: string, open: number, oldest: string }, today: string): NextAction {
  return make('bank-lines-open', r.accountId, r.oldest, today, {
    title: `Match ${r.open === 1 ? 'a line' : `${r.open.toLocaleString('en-GB')} lines`} of the bank statement`,
    detail: join(r.account, `${r.open === 1 ? 'from' : 'the oldest from'} ${longIsoDate(r.oldest)}`),
    href: '/bank',
    actionLabel: 'Match them',
  })
}

export function purchaseNoReceiptAction(r: { id: string, supplier: string, boughtOn: string, grossPence: number }, today: string): NextAction {
  return make('purchase-no-receipt', r.id, r.boughtOn, today, {
    title: `Add the receipt for ${r.supplier}`,
    detail: join(formatPence(r.grossPence), `bought ${longIsoDate(r.boughtOn)}`),
    href: `/purchases/${r.id}`,
    actionLabel: 'Add the receipt',
  })
}

/**
 * The VAT return of the quarter ended last, while its due date is ahead (or today). A firm that is
 * not VAT-registered gets none: the server does not ask for one. A rule of thumb from gov.uk
 * ("VAT Returns": one calendar month and seven days after the quarter), deferring to HMRC.
 */
export function vatReturnAction(q: { start: string, end: string, returnDue: string }, today: string): NextAction | null {
  if (today <= q.end || today > q.returnDue) return null
  const left = daysBetween(today, q.returnDue)
  return {
    kind: 'vat-return-due',
    key: `vat-return-due:${q.start}`,
    title: `VAT return for ${longIsoDate(q.start)} to ${longIsoDate(q.end)}`,
    detail: join(`due by ${longIsoDate(q.returnDue)}`, left === 0 ? 'today' : `in ${daysInWords(left)}`, 'as HMRC\'s guidance says: check with your accountant'),
    href: `/quarter?quarterOf=${q.start}`,
    actionLabel: 'See the quarter',
    since: addDays(q.end, 1),
    urgency: KIND_URGENCY['vat-return-due'] + Math.min(MAX_WAIT_BONUS, Math.max(0, RETURN_DUE_AHEAD_DAYS - left)),
  }
}

/**
 * The monthly CIS return of the tax month ended last, due on the 19th, for a firm registered for
 * CIS that paid labour to others that month (then it is a contractor too). Rule of thumb from
 * gov.uk ("What you must do as a CIS contractor"), deferring to HMRC.
 */
export function cisReturnAction(m: { start: string, end: string, returnDue: string }, today: string): NextAction | null {
  if (today <= m.end || today > m.returnDue) return null
  const left = daysBetween(today, m.returnDue)
  return {
    kind: 'cis-return-due',
    key: `cis-return-due:${m.start}`,
    title: `CIS monthly return for ${longIsoDate(m.start)} to ${longIsoDate(m.end)}`,
    detail: join(`due by ${longIsoDate(m.returnDue)}`, left === 0 ? 'today' : `in ${daysInWords(left)}`, 'you paid labour to others that month: check with HMRC\'s guidance'),
    href: '/cis',
    actionLabel: 'See CIS',
    since: addDays(m.end, 1),
    urgency: KIND_URGENCY['cis-return-due'] + Math.min(MAX_WAIT_BONUS, Math.max(0, 14 - left) * 6),
  }
}

/** What the owner's "set the firm up" prompts check, as the server counted it. */
export interface FirmSetup {
  createdAt: string | Date
  hasAddress: boolean
  hasPhoneOrEmail: boolean
  /** takes transfers but the account is not filled in */
  bankMissing: boolean
  dayRateSet: boolean
  /** roles with a member or an invitation still open */
  rolesIn: readonly string[]
}

const ROLE_WORDS: Record<'office' | 'crew' | 'accountant', string> = { office: 'your office partner', crew: 'your crew', accountant: 'your accountant' }

/** Only what is really missing; an empty list when the firm is set up. */
export function setupActions(s: FirmSetup, today: string): NextAction[] {
  const out: NextAction[] = []
  const add = (id: string, title: string, detail: string, href: string, actionLabel: string) =>
    out.push(make('setup-missing', id, s.createdAt, today, { title, detail, href, actionLabel }))
  if (!s.hasAddress || !s.hasPhoneOrEmail) add('details', 'Fill in the firm\'s address and phone', 'they go on every quote and invoice', '/firm', 'Fill in')
  if (s.bankMissing) add('bank', 'Fill in the firm\'s bank account', 'needed before an invoice offering a transfer is issued', '/firm', 'Fill in')
  if (!s.dayRateSet) add('day-rate', 'Set your target day rate', 'quotes by the day and "is the work paying" use it', '/firm', 'Set it')
  const missing = (['office', 'crew', 'accountant'] as const).filter(r => !s.rolesIn.includes(r))
  if (missing.length) {
    const words = missing.map(r => ROLE_WORDS[r])
    const list = words.length === 1 ? words[0]! : `${words.slice(0, -1).join(', ')} and ${words.at(-1)!}`
    add('team', `Invite ${list}`, 'only if they will use Setwell', '/team', 'Invite')
  }
  return out
}

/** Where the whole of each list is, for "and 4 more": its words and its page. */
export const KIND_LISTS: Record<NextActionKind, { words: string, href: string }> = {
  'enquiry-new': { words: 'new enquiries', href: '/enquiries' },
  'visit-not-written-up': { words: 'visits to write up', href: '/visits?show=finished' },
  'visit-not-marked': { words: 'visits to mark', href: '/visits' },
  'quote-unanswered': { words: 'quotes waiting for an answer', href: '/quotes' },
  'quote-not-booked': { words: 'accepted quotes to book', href: '/quotes' },
  'job-not-invoiced': { words: 'finished jobs to invoice', href: '/jobs' },
  'invoice-overdue': { words: 'overdue invoices', href: '/owed' },
  'promise-broken': { words: 'broken promises to pay', href: '/owed' },
  'day-no-set-logged': { words: 'days with no set logged', href: '/diary' },
  'purchase-no-receipt': { words: 'purchases without a receipt', href: '/purchases' },
  'vat-return-due': { words: 'VAT returns', href: '/quarter' },
  'cis-return-due': { words: 'CIS returns', href: '/cis' },
  'setup-missing': { words: 'things to set up', href: '/firm' },
  'bank-lines-open': { words: 'bank accounts with lines to match', href: '/bank' },
}

/** "and 4 more overdue invoices" lines, in the order of the kinds' urgency. */
export function moreLines(more: Partial<Record<NextActionKind, number>>): { kind: NextActionKind, text: string, href: string }[] {
  return (Object.keys(KIND_URGENCY) as NextActionKind[])
    .filter(k => (more[k] ?? 0) > 0)
    .map(k => ({ kind: k, text: `${more[k]} more ${KIND_LISTS[k].words}`, href: KIND_LISTS[k].href }))
}

// ---------------------------------------------------------------------------------------------
// The whole of Today as GET /api/today sends it

/** A job on site today, once, with everyone on it. */
export interface OnSiteJob { jobId: string, reference: string, customer: string, place: string, setsLoggedToday: number, people: { name: string, halfDay: boolean }[] }
/** A booked visit not yet over. */
export interface VisitToCome { id: string, startsAt: string, customer: string, place: string, visitor: string | null }
/** What is owed and how many quotes wait (owner and office). */
export interface MoneySummary { owedPence: number, overduePence: number, quotesWaiting: number }
/** A quarter (on the firm's VAT stagger) for the accountant; `returnDue` only for a VAT-registered firm, and the boxes only for the firm on screen. */
export interface ServedQuarter { start: string, end: string, returnDue: string | null, vat: { box5: number, box6: number, toPay: boolean } | null }
/** A firm the accountant serves. */
export interface ServedFirm { firmId: string, tradingName: string, current: boolean, vatRegistered: boolean, lastQuarter: ServedQuarter, thisQuarter: ServedQuarter }

export interface TodayView {
  today: string
  role: 'owner' | 'office' | 'crew' | 'accountant'
  actions: NextAction[]
  more: Partial<Record<NextActionKind, number>>
  onSite: OnSiteJob[]
  visits: VisitToCome[]
  money: MoneySummary | null
  firms: ServedFirm[]
}
