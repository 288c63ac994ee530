import { afterEach, describe, expect, it, vi } from 'vitest'
import { addDays, addMonths, compareDays, dayAndMonth, dayMonth, dayMonthTime, daysBetween, daysBefore, daysInMonth, fullDate, isIsoDate, londonDay, londonInstant, londonTime, londonToday, longDate, longIsoDate, monthAndYear, monthBounds, shortDay, shortDayTime, weekBounds, whenSaid } from '../../shared/utils/dates'
import { todayIso } from '../../server/utils/invoices'

// Sources, beside each case:
// - CLOCKS: The Summer Time Act 1972 / Summer Time Order 2002: British Summer Time runs from 01:00
//   GMT on the last Sunday in March to 01:00 GMT on the last Sunday in October (so in 2026 from
//   29 March to 25 October, in 2027 from 28 March to 31 October); Europe/London is UTC+1 then.
// - CALENDAR: common practice (the Gregorian calendar: 29 February in years divisible by 4, not by
//   100 unless by 400; months of 28 to 31 days; the week from Monday, ISO 8601 as in Britain).
const CLOCKS = 'The Summer Time Act 1972 / Summer Time Order 2002'
const CALENDAR = 'common practice'

describe('the server\'s today (issue dates, payments received today) is London\'s day', () => {
  afterEach(() => vi.useRealTimers())
  it.each<[string, string, string, string]>([
    ['half past midnight BST on 2 July 2026 is 2 July, not UTC\'s 1 July', '2026-07-01T23:30:00Z', '2026-07-02', CLOCKS],
    ['22:59 UTC in summer is still the same day', '2026-07-01T22:59:00Z', '2026-07-01', CLOCKS],
    ['winter: GMT, the UTC day', '2026-12-04T23:30:00Z', '2026-12-04', CLOCKS],
  ])('%s (%s -> %s; %s)', (_what, at, day) => {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(new Date(at))
    expect(todayIso()).toBe(day)
    expect(londonToday()).toBe(day)
  })
})

describe('londonToday: the calendar day of an instant in London', () => {
  it.each<[string, string, string, string]>([
    // the clocks go forward on Sunday 29 March 2026 at 01:00 UTC (01:00 GMT becomes 02:00 BST)
    ['29 March 2026, 00:59 UTC: still GMT', '2026-03-29T00:59:59Z', '2026-03-29', CLOCKS],
    ['29 March 2026, 01:00 UTC: BST from here', '2026-03-29T01:00:00Z', '2026-03-29', CLOCKS],
    ['28 March 2026, 23:30 UTC: GMT, still 28 March', '2026-03-28T23:30:00Z', '2026-03-28', CLOCKS],
    ['29 March 2026, 23:30 UTC: BST, already 30 March', '2026-03-29T23:30:00Z', '2026-03-30', CLOCKS],
    ['29 March 2026, 22:59 UTC: BST, still 29 March', '2026-03-29T22:59:00Z', '2026-03-29', CLOCKS],
    // the clocks go back on Sunday 25 October 2026 at 01:00 UTC (02:00 BST becomes 01:00 GMT)
    ['24 October 2026, 23:30 UTC: BST, already 25 October', '2026-10-24T23:30:00Z', '2026-10-25', CLOCKS],
    ['25 October 2026, 00:59 UTC: 01:59 BST, 25 October', '2026-10-25T00:59:59Z', '2026-10-25', CLOCKS],
    ['25 October 2026, 01:00 UTC: 01:00 GMT, 25 October', '2026-10-25T01:00:00Z', '2026-10-25', CLOCKS],
    ['25 October 2026, 23:30 UTC: GMT again, still 25 October', '2026-10-25T23:30:00Z', '2026-10-25', CLOCKS],
    // the leap day and the year end fall in GMT
    ['29 February 2028, 23:59 UTC', '2028-02-29T23:59:59Z', '2028-02-29', CALENDAR],
    ['1 March 2028, 00:00 UTC', '2028-03-01T00:00:00Z', '2028-03-01', CALENDAR],
    ['31 December 2026, 23:59:59 UTC: no summer time in winter', '2026-12-31T23:59:59Z', '2026-12-31', CLOCKS],
    ['1 January 2027, 00:00 UTC', '2027-01-01T00:00:00Z', '2027-01-01', CALENDAR],
  ])('%s (%s -> %s; %s)', (_what, at, day) => {
    expect(londonToday(new Date(at))).toBe(day)
    expect(londonDay(new Date(at))).toBe(day)
  })

  it('an invalid instant is a RangeError', () => {
    expect(() => londonToday(new Date('not a date'))).toThrow(RangeError)
  })
})

describe('londonTime: "14:22" in London', () => {
  it.each<[string, string, string]>([
    ['00:59 UTC on 29 March 2026 is 00:59 GMT', '2026-03-29T00:59:00Z', '00:59'],
    ['01:00 UTC on 29 March 2026 is 02:00 BST', '2026-03-29T01:00:00Z', '02:00'],
    ['00:59 UTC on 25 October 2026 is 01:59 BST', '2026-10-25T00:59:00Z', '01:59'],
    ['01:00 UTC on 25 October 2026 is 01:00 GMT', '2026-10-25T01:00:00Z', '01:00'],
    ['13:22 UTC in July is 14:22 BST', '2026-07-01T13:22:00Z', '14:22'],
    ['14:22 UTC in December is 14:22 GMT', '2026-12-04T14:22:00Z', '14:22'],
  ])('%s (%s; ' + CLOCKS + ')', (_what, at, time) => expect(londonTime(new Date(at))).toBe(time))
})

describe('calendar arithmetic on ISO dates (' + CALENDAR + ')', () => {
  it.each<[string, number, string]>([
    ['2026-03-28', 1, '2026-03-29'], // over the clocks going forward: still one day
    ['2026-03-29', 1, '2026-03-30'],
    ['2026-10-24', 2, '2026-10-26'], // over the clocks going back
    ['2028-02-28', 1, '2028-02-29'], // 2028 is a leap year
    ['2028-02-29', 1, '2028-03-01'],
    ['2027-02-28', 1, '2027-03-01'], // 2027 is not
    ['2026-12-31', 1, '2027-01-01'], // the year end
    ['2027-01-01', -1, '2026-12-31'],
  ])('addDays(%s, %i) is %s', (from, days, to) => {
    expect(addDays(from, days)).toBe(to)
    expect(daysBetween(from, to)).toBe(days)
  })

  it.each<[string, string, number]>([
    ['2026-03-28', '2026-03-30', 2], // 47 hours in London, still two calendar days
    ['2026-10-24', '2026-10-26', 2], // 49 hours in London
    ['2028-01-01', '2029-01-01', 366], // a leap year
    ['2027-01-01', '2028-01-01', 365],
    ['2026-12-31', '2026-12-01', -30],
  ])('daysBetween(%s, %s) is %i', (a, b, days) => expect(daysBetween(a, b)).toBe(days))

  it('daysBetween is NaN when either is not a date (schemas refine on it before the shape is checked)', () => {
    expect(daysBetween('2026-02-30', '2026-03-01')).toBeNaN()
    expect(daysBetween('2026-03-01', 'soon')).toBeNaN()
  })

  it.each<[string, number, string]>([
    ['2028-01-31', 1, '2028-02-29'], // past the end of a leap February: its last day
    ['2027-01-31', 1, '2027-02-28'],
    ['2026-12-15', 1, '2027-01-15'], // over the year end
    ['2026-12-01', 1, '2027-01-01'],
    ['2027-01-01', -1, '2026-12-01'],
  ])('addMonths(%s, %i) is %s', (from, months, to) => expect(addMonths(from, months)).toBe(to))

  it.each<[string, string, -1 | 0 | 1]>([
    ['2026-12-31', '2027-01-01', -1],
    ['2028-02-29', '2028-02-29', 0],
    ['2028-03-01', '2028-02-29', 1],
  ])('compareDays(%s, %s) is %i', (a, b, c) => expect(compareDays(a, b)).toBe(c))

  it.each<[number, number, number]>([
    [2028, 2, 29], [2027, 2, 28], [2100, 2, 28], [2000, 2, 29], [2026, 4, 30], [2026, 12, 31], [50, 2, 28], [48, 2, 29],
  ])('daysInMonth(%i, %i) is %i', (y, m, n) => expect(daysInMonth(y, m)).toBe(n))

  it.each<[string, string, string]>([
    ['2026-12-04', '2026-11-30', '2026-12-06'], // a Friday: Monday 30 November to Sunday 6 December
    ['2026-11-30', '2026-11-30', '2026-12-06'], // a Monday is its own week's start
    ['2026-12-06', '2026-11-30', '2026-12-06'], // a Sunday is its week's end
    ['2026-03-29', '2026-03-23', '2026-03-29'], // the Sunday the clocks go forward
    ['2026-10-25', '2026-10-19', '2026-10-25'], // the Sunday they go back
    ['2028-03-01', '2028-02-28', '2028-03-05'], // a week holding the leap day
    ['2027-01-01', '2026-12-28', '2027-01-03'], // a week over the year end
  ])('the week of %s is %s to %s', (day, start, end) => expect(weekBounds(day)).toEqual({ start, end }))

  it.each<[string, string, string]>([
    ['2028-02-10', '2028-02-01', '2028-02-29'],
    ['2027-02-28', '2027-02-01', '2027-02-28'],
    ['2026-12-31', '2026-12-01', '2026-12-31'],
    ['2026-03-29', '2026-03-01', '2026-03-31'],
  ])('the month of %s is %s to %s', (day, start, end) => expect(monthBounds(day)).toEqual({ start, end }))

  it.each<[string, unknown]>([
    ['29 February in a common year', '2027-02-29'],
    ['31 April', '2026-04-31'],
    ['month 13', '2026-13-01'],
    ['a date and time', '2026-12-04T00:00:00Z'],
    ['not a string', 20261204],
  ])('%s is not an ISO date', (_what, value) => {
    expect(isIsoDate(value)).toBe(false)
    expect(() => addDays(value as string, 1)).toThrow(RangeError)
  })

  it('daysBefore counts whole 24-hour days back from an instant (expiries, not calendar days)', () => {
    expect(daysBefore(new Date('2026-03-30T12:00:00Z'), 7).toISOString()).toBe('2026-03-23T12:00:00.000Z')
  })
})

describe('londonInstant: the instant London\'s clocks read a time on a day', () => {
  it.each<[string, string, string, string | null]>([
    ['a winter time is UTC', '2026-12-04', '08:30', '2026-12-04T08:30:00.000Z'],
    ['a summer time is an hour behind in UTC', '2026-07-01', '23:10', '2026-07-01T22:10:00.000Z'],
    ['00:30 on 29 March 2026 is still GMT', '2026-03-29', '00:30', '2026-03-29T00:30:00.000Z'],
    ['01:30 on 29 March 2026 does not exist: taken as 02:30 BST', '2026-03-29', '01:30', '2026-03-29T01:30:00.000Z'],
    ['02:30 on 29 March 2026 is BST', '2026-03-29', '02:30', '2026-03-29T01:30:00.000Z'],
    ['00:30 on 25 October 2026 is still BST', '2026-10-25', '00:30', '2026-10-24T23:30:00.000Z'],
    ['01:30 on 25 October 2026 happens twice: the second, GMT', '2026-10-25', '01:30', '2026-10-25T01:30:00.000Z'],
    ['midnight on the leap day', '2028-02-29', '00:00', '2028-02-29T00:00:00.000Z'],
    ['the last minute of the year', '2026-12-31', '23:59', '2026-12-31T23:59:00.000Z'],
    ['not a time', '2026-12-04', '8.30', null],
    ['not an hour of the day', '2026-12-04', '24:00', null],
  ])('%s (' + CLOCKS + ')', (_what, day, time, want) => expect(londonInstant(day, time)?.toISOString() ?? null).toBe(want))

  it('a day that is not a real date is a RangeError', () => expect(() => londonInstant('2027-02-29', '08:00')).toThrow(RangeError))
})

describe('words for people (en-GB)', () => {
  it.each<[string, string, string]>([
    ['shortDay', shortDay('2026-12-04'), 'Fri 4 Dec'],
    ['shortDay of the leap day', shortDay('2028-02-29'), 'Tue 29 Feb'],
    ['shortDay of an instant after midnight BST', shortDay(new Date('2026-07-01T23:30:00Z')), 'Thu 2 Jul'],
    ['longDate', longDate('2026-12-04'), '4 December 2026'],
    ['longDate of an instant on New Year\'s Eve', longDate(new Date('2026-12-31T23:59:00Z')), '31 December 2026'],
    ['fullDate', fullDate('2026-12-03'), 'Thursday 3 December 2026'],
    ['dayAndMonth', dayAndMonth('2026-03-29'), 'Sunday 29 March'],
    ['monthAndYear', monthAndYear('2028-02-29'), 'February 2028'],
    ['longIsoDate (as the tax pages have always shown it)', longIsoDate('2026-12-31'), '31 Dec 2026'],
    ['dayMonth', dayMonth('2027-01-01'), '1 Jan'],
    ['dayMonth of an instant after midnight BST', dayMonth(new Date('2026-07-31T23:30:00Z')), '1 Aug'],
    ['shortDayTime in winter (GMT)', shortDayTime(new Date('2026-12-04T14:22:00Z')), 'Fri 4 Dec, 14:22'],
    ['shortDayTime in summer is BST, an hour on from UTC', shortDayTime(new Date('2026-07-01T23:30:00Z')), 'Thu 2 Jul, 00:30'],
    ['dayMonthTime the hour after the clocks go back', dayMonthTime(new Date('2026-10-25T01:30:00Z')), '25 Oct, 01:30'],
    ['dayMonthTime the hour before the clocks go back (BST)', dayMonthTime(new Date('2026-10-25T00:30:00Z')), '25 Oct, 01:30'],
    ['dayMonthTime in winter', dayMonthTime(new Date('2026-12-04T14:22:00Z')), '4 Dec, 14:22'],
    ['dayMonthTime after midnight BST', dayMonthTime(new Date('2026-07-01T23:30:00Z')), '2 Jul, 00:30'],
  ])('%s: %s', (_what, got, want) => expect(got).toBe(want))
})

describe('whenSaid: when the phone kept a page, in words (London time)', () => {
  // [kept at, now, words]: the clocks of the UK (GMT in winter, BST in summer: the Summer Time Act 1972)
  const cases: [string, string, string][] = [
    ['2026-12-05T07:42:00Z', '2026-12-05T09:00:00Z', 'at 07:42 today'],
    ['2026-12-04T16:10:00Z', '2026-12-05T09:00:00Z', 'at 16:10 yesterday'],
    // 23:30 UTC on 30 June is 00:30 BST on 1 July: London's day, not UTC's
    ['2026-06-30T23:30:00Z', '2026-07-01T08:00:00Z', 'at 00:30 today'],
    ['2026-12-03T07:42:00Z', '2026-12-05T09:00:00Z', 'at 07:42 on Thursday 3 December'],
    ['2025-12-31T10:00:00Z', '2026-01-02T09:00:00Z', 'at 10:00 on Wednesday 31 December 2025'],
  ]
  it.each(cases)('kept %s, now %s: %s', (at, now, words) => {
    expect(whenSaid(new Date(at), new Date(now))).toBe(words)
  })
})
