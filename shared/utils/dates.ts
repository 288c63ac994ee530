// Dates, in one place: Britain's calendar day for an instant, arithmetic on ISO calendar dates
// (YYYY-MM-DD), week and month bounds, and the words people read. Built on date-fns 4 and
// @date-fns/tz, so the clock changes come from the time zone database, not from our own sums.
//
// - An instant (a Date, a timestamp from the database) belongs to a day in Europe/London: GMT in
//   winter, BST (UTC+1) from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last Sunday
//   of October (The Summer Time Act 1972 / Summer Time Order 2002). "Today" is London's day,
//   on the server as in the browser: the server's clock is UTC, and an invoice issued at half past
//   midnight in summer belongs to the new day.
// - An ISO date is a calendar day with no time and no zone: it is worked on as UTC midnight, where
//   every day is 24 hours long, and written back as YYYY-MM-DD (files, the database, URLs).
// - A date that is not a real YYYY-MM-DD date is a RangeError (naming the field where one is given).
import { addDays as dfAddDays, addMonths as dfAddMonths, differenceInCalendarDays, endOfMonth, format, getDaysInMonth, startOfISOWeek, startOfMonth } from 'date-fns'
import { TZDate, tz } from '@date-fns/tz'

/** Britain's time zone (GMT in winter, BST in summer). */
export const LONDON_TZ = 'Europe/London'
const inLondon = tz(LONDON_TZ)
const inUtc = tz('UTC')

/** One day of 24 hours in milliseconds: for instants only (a calendar day is not always 24 hours in London). */
const DAY_MS = 86_400_000

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/

function notIso(iso: unknown, field?: string): RangeError {
  return new RangeError(field ? `${field} must be an ISO date (YYYY-MM-DD), got ${String(iso)}` : `not an ISO date: ${String(iso)}`)
}

/** Whether a value is a real calendar date written YYYY-MM-DD (years 0000 to 9999). */
export function isIsoDate(iso: unknown): iso is string {
  try {
    isoDay(iso)
    return true
  }
  catch {
    return false
  }
}

/**
 * An ISO date as UTC midnight of that day (a Date). RangeError, naming `field` when given, for a
 * value that is not a real YYYY-MM-DD date (29 February 2027, 31 April, month 13...).
 */
export function isoDay(iso: unknown, field?: string): Date {
  const m = typeof iso === 'string' ? ISO_DATE.exec(iso) : null
  if (!m) throw notIso(iso, field)
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])]
  // setUTCFullYear, not Date.UTC or a Date constructor, which read years 0 to 99 as 1900 to 1999
  const date = new Date(0)
  date.setUTCFullYear(y, mo - 1, d)
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== mo - 1 || date.getUTCDate() !== d) {
    throw new RangeError(field ? `${field} is not a real date: ${iso as string}` : `not a real date: ${iso as string}`)
  }
  return date
}

/** A Date's UTC calendar day as YYYY-MM-DD; RangeError when it falls outside the years 0000 to 9999. */
function isoOfUtc(date: Date, what: string): string {
  const out = Number.isNaN(date.getTime()) ? '' : format(date, 'uuuu-MM-dd', { in: inUtc })
  if (!ISO_DATE.test(out) || date.getUTCFullYear() < 0 || date.getUTCFullYear() > 9999) throw new RangeError(`${what} is outside the years 0000 to 9999`)
  return out
}

// ---------------------------------------------------------------------------------------------
// Instants to days

/** The calendar day of an instant in Britain (Europe/London, so BST in summer), as YYYY-MM-DD. Throws for an invalid date. */
export function londonDay(at: Date): string {
  if (!(at instanceof Date) || Number.isNaN(at.getTime())) throw new RangeError(`not a date: ${String(at)}`)
  return format(at, 'uuuu-MM-dd', { in: inLondon })
}

/** Today in Britain as YYYY-MM-DD: the day invoices are issued and payments received on. */
export function londonToday(now: Date = new Date()): string {
  return londonDay(now)
}

/** The instant `days` whole 24-hour days before `at` (for expiries and "since" limits, not calendar days). */
export function daysBefore(at: Date, days: number): Date {
  return new Date(at.getTime() - days * DAY_MS)
}

// ---------------------------------------------------------------------------------------------
// Arithmetic on ISO dates

/** An ISO date as whole days since 1970-01-01 (for sums over many days); RangeError naming the field when it is not a real date. */
export function dayNumber(iso: unknown, field?: string): number {
  return Math.round(isoDay(iso, field).getTime() / DAY_MS)
}

/** The ISO date `n` days after 1970-01-01; RangeError naming `what` when it falls outside the years 0000 to 9999. */
export function isoFromDayNumber(n: number, what = 'the date'): string {
  if (!Number.isSafeInteger(n)) throw new RangeError(`${what}: ${String(n)} is not a whole number of days`)
  return isoOfUtc(new Date(n * DAY_MS), what)
}

/** An ISO date plus whole days (calendar days, no time zone shifts). Throws for a date that is not a real one or days that are not whole. */
export function addDays(isoDate: string, days: number): string {
  const date = isoDay(isoDate)
  if (!Number.isSafeInteger(days)) throw new RangeError(`days must be a whole number, got ${String(days)}`)
  return isoOfUtc(dfAddDays(date, days, { in: inUtc }), `${isoDate} plus ${days} days`)
}

/** An ISO date plus whole calendar months; a day past the new month's end is its last day (31 January + 1 month is 28 or 29 February). */
export function addMonths(isoDate: string, months: number): string {
  const date = isoDay(isoDate)
  if (!Number.isSafeInteger(months)) throw new RangeError(`months must be a whole number, got ${String(months)}`)
  return isoOfUtc(dfAddMonths(date, months, { in: inUtc }), `${isoDate} plus ${months} months`)
}

/**
 * Whole calendar days from a to b (b - a); NaN when either is not a real date, so a schema's
 * length check written `!(daysBetween(from, to) > max)` passes and leaves the bad field to its own message.
 */
export function daysBetween(a: string, b: string): number {
  if (!isIsoDate(a) || !isIsoDate(b)) return Number.NaN
  return differenceInCalendarDays(isoDay(b), isoDay(a), { in: inUtc })
}

/** -1, 0 or 1 as ISO date a is before, on or after b (YYYY-MM-DD sorts as text). */
export function compareDays(a: string, b: string): -1 | 0 | 1 {
  return a < b ? -1 : a > b ? 1 : 0
}

/** Days in month `month` (1 to 12) of year `year` (0 to 9999): 28, 29, 30 or 31. */
export function daysInMonth(year: number, month: number): number {
  const date = new Date(0)
  date.setUTCFullYear(year, month - 1, 1)
  return getDaysInMonth(date, { in: inUtc })
}

/** Monday to Sunday of the week holding an ISO date (weeks start on Monday in Britain: ISO 8601). */
export function weekBounds(isoDate: string): { start: string, end: string } {
  const start = isoOfUtc(startOfISOWeek(isoDay(isoDate), { in: inUtc }), 'the week')
  return { start, end: addDays(start, 6) }
}

/** First and last day of the month holding an ISO date. */
export function monthBounds(isoDate: string): { start: string, end: string } {
  const date = isoDay(isoDate)
  return { start: isoOfUtc(startOfMonth(date, { in: inUtc }), 'the month'), end: isoOfUtc(endOfMonth(date, { in: inUtc }), 'the month') }
}

// ---------------------------------------------------------------------------------------------
// Words for people (en-GB). An ISO date reads as that calendar day; an instant as its day and
// time in London. Whole month names come from date-fns; the short forms ("Fri 4 Dec") from the
// platform's en-GB (Intl), as the pages have always shown them: Intl writes September "Sept"
// where date-fns writes "Sep".

const dayOf = (value: string | Date) => (typeof value === 'string' ? isoDay(value) : value)
const zoneOf = (value: string | Date) => (typeof value === 'string' ? inUtc : inLondon)
const intlZone = (value: string | Date) => (typeof value === 'string' ? 'UTC' : LONDON_TZ)
const shortDayIn = { UTC: new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }), [LONDON_TZ]: new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: LONDON_TZ }) }
const shortMonthDate = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })

/** "Fri 4 Dec" ("Thu 3 Sept" in September). */
export function shortDay(value: string | Date): string {
  return shortDayIn[intlZone(value)]!.format(dayOf(value))
}

const shortDayYear = new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })

/** '2026-12-04' -> "Fri, 4 Dec 2026": a day in a list that spans years (the profit table). */
export function shortDayWithYear(iso: string): string {
  return shortDayYear.format(isoDay(iso))
}

/** '2026-09-30' -> '30 Sept 2026' (the tax periods' dates on the dashboard, the VAT quarter and CIS pages). */
export function longIsoDate(iso: string): string {
  return shortMonthDate.format(isoDay(iso))
}

/** "Thursday 3 December" */
export function dayAndMonth(value: string | Date): string {
  return format(dayOf(value), 'EEEE d MMMM', { in: zoneOf(value) })
}

/** "December 2026" */
export function monthAndYear(value: string | Date): string {
  return format(dayOf(value), 'MMMM yyyy', { in: zoneOf(value) })
}

/** "4 December 2026" */
export function longDate(value: string | Date): string {
  return format(dayOf(value), 'd MMMM yyyy', { in: zoneOf(value) })
}

/** "Thursday 3 December 2026" */
export function fullDate(value: string | Date): string {
  return format(dayOf(value), 'EEEE d MMMM yyyy', { in: zoneOf(value) })
}

/** "14:22": the time of an instant in London (BST in summer). */
export function londonTime(at: Date): string {
  return format(at, 'HH:mm', { in: inLondon })
}

const dayMonthIn = { UTC: new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' }), [LONDON_TZ]: new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', timeZone: LONDON_TZ }) }

/** "4 Dec" (a diary week's bounds). */
export function dayMonth(value: string | Date): string {
  return dayMonthIn[intlZone(value)]!.format(dayOf(value))
}

/** "Fri 4 Dec, 14:22": when something happened, in London (an enquiry arriving, a visit booked). */
export function shortDayTime(at: Date): string {
  return `${shortDay(at)}, ${londonTime(at)}`
}

/** "4 Dec, 14:22": the same without the weekday (a reminder sent, a log entry). */
export function dayMonthTime(at: Date): string {
  return `${dayMonth(at)}, ${londonTime(at)}`
}

const HH_MM = /^([01]\d|2[0-3]):([0-5]\d)$/

/**
 * The instant London's clocks read `hhmm` ("08:30") on the ISO day: what a plasterer types on site.
 * A time the clocks skip (01:30 on the last Sunday of March) is taken an hour on (02:30 BST); a time
 * they show twice (01:30 on the last Sunday of October) is the second one (GMT). Null when the time
 * is not HH:MM; a RangeError when the day is not an ISO date.
 */
export function londonInstant(isoDate: string, hhmm: string): Date | null {
  const time = HH_MM.exec(hhmm)
  if (!time) return null
  const day = isoDay(isoDate)
  const at = new TZDate(day.getUTCFullYear(), day.getUTCMonth(), day.getUTCDate(), Number(time[1]), Number(time[2]), 0, LONDON_TZ)
  return new Date(at.getTime())
}

/**
 * When something was kept or last seen, in London, in words for a phone's banner: "at 07:42 today",
 * "at 16:10 yesterday", "at 07:42 on Thursday 3 December" (with the year when not this year's).
 */
export function whenSaid(at: Date, now: Date = new Date()): string {
  const day = londonDay(at)
  const today = londonDay(now)
  const time = londonTime(at)
  if (day === today) return `at ${time} today`
  if (day === addDays(today, -1)) return `at ${time} yesterday`
  return `at ${time} on ${day.slice(0, 4) === today.slice(0, 4) ? dayAndMonth(at) : fullDate(at)}`
}

// ---------------------------------------------------------------------------------------------
// Words for e-mails and letters (helper A, issue 17): no ISO date or timestamp reaches a person.

/** "at 14:22": the London time of an instant, as a sentence says it. */
export function atLondonTime(at: Date): string {
  return `at ${londonTime(at)}`
}

/** "Thursday 3 December 2026 at 14:22": an instant as its London day and time (a quote accepted, a payment received). */
export function fullDateAtTime(at: Date): string {
  return `${fullDate(at)} ${atLondonTime(at)}`
}

/** "1 day", "40 days": a count of days in words for a sentence. */
export function daysInWords(days: number): string {
  return `${days} ${Math.abs(days) === 1 ? 'day' : 'days'}`
}
