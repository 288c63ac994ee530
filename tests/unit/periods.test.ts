import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { cisTaxMonth, vatQuarter } from '../../shared/utils/periods'

// Sources: VAT staggers (stagger 1 quarters end Mar/Jun/Sep/Dec, 2 Apr/Jul/Oct/Jan, 3 May/Aug/Nov/Feb)
// and the return and payment due one calendar month and seven days after the quarter ends: gov.uk
// "VAT Returns", as briefed (DOMAIN.md does not give either). CIS tax month from the 6th to the 5th,
// return due on the 19th: DOMAIN.md ("Money rules", CIS) and gov.uk "What you must do as a CIS
// contractor"; payment due on the 22nd: the same gov.uk guide (electronic payment), as briefed.
// Reading "one calendar month after" a month end as the end of the next month is our own rule.
// Rules of thumb for the product: HMRC's own dates for the business and its accountant decide.

const DAY_MS = 86_400_000
const addDays = (iso: string, days: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + days * DAY_MS).toISOString().slice(0, 10)

describe('vatQuarter: each stagger\'s four quarters and their return dates (gov.uk "VAT Returns": end + 1 month + 7 days)', () => {
  it.each<[1 | 2 | 3, string, string, string, string]>([
    [1, '2026-01-01', '2026-03-31', '2026-05-07', '31 Mar -> 30 Apr -> 7 May'],
    [1, '2026-04-01', '2026-06-30', '2026-08-07', '30 Jun -> 31 Jul -> 7 Aug'],
    [1, '2026-07-01', '2026-09-30', '2026-11-07', '30 Sep -> 31 Oct -> 7 Nov'],
    [1, '2026-10-01', '2026-12-31', '2027-02-07', '31 Dec -> 31 Jan -> 7 Feb, into the next year'],
    [2, '2025-11-01', '2026-01-31', '2026-03-07', 'across the year end; 31 Jan -> 28 Feb (2026 not a leap year) -> 7 Mar'],
    [2, '2026-02-01', '2026-04-30', '2026-06-07', '30 Apr -> 31 May -> 7 Jun'],
    [2, '2026-05-01', '2026-07-31', '2026-09-07', '31 Jul -> 31 Aug -> 7 Sep'],
    [2, '2026-08-01', '2026-10-31', '2026-12-07', '31 Oct -> 30 Nov -> 7 Dec'],
    [3, '2025-12-01', '2026-02-28', '2026-04-07', 'across the year end; 28 Feb -> 31 Mar -> 7 Apr'],
    [3, '2026-03-01', '2026-05-31', '2026-07-07', '31 May -> 30 Jun -> 7 Jul'],
    [3, '2026-06-01', '2026-08-31', '2026-10-07', '31 Aug -> 30 Sep -> 7 Oct'],
    [3, '2026-09-01', '2026-11-30', '2027-01-07', '30 Nov -> 31 Dec -> 7 Jan, into the next year'],
    // leap years
    [3, '2027-12-01', '2028-02-29', '2028-04-07', 'ends on the leap day: 29 Feb 2028 -> 31 Mar -> 7 Apr'],
    [2, '2027-11-01', '2028-01-31', '2028-03-07', '31 Jan 2028 -> 29 Feb (leap year) -> 7 Mar'],
    [2, '2028-02-01', '2028-04-30', '2028-06-07', 'holds the leap day'],
    [1, '2028-01-01', '2028-03-31', '2028-05-07', 'holds the leap day'],
  ])('stagger %i: %s to %s, return due %s (%s)', (stagger, start, end, returnDue) => {
    const quarter = { start, end, returnDue }
    // its first day, its last day and a day in its middle month all fall in it
    expect(vatQuarter(start, stagger)).toEqual(quarter)
    expect(vatQuarter(end, stagger)).toEqual(quarter)
    expect(vatQuarter(`${addDays(start, 40).slice(0, 8)}15`, stagger)).toEqual(quarter)
    // the day before it ends the previous quarter; the day after it starts the next
    expect(vatQuarter(addDays(start, -1), stagger).end).toBe(addDays(start, -1))
    expect(vatQuarter(addDays(end, 1), stagger).start).toBe(addDays(end, 1))
  })

  it.each<[string, 1 | 2 | 3, string, string, string]>([
    // the brief's examples of the due date (gov.uk "VAT Returns")
    ['2026-03-31', 1, '2026-01-01', '2026-03-31', '2026-05-07'],
    ['2026-04-30', 2, '2026-02-01', '2026-04-30', '2026-06-07'],
    ['2027-02-28', 3, '2026-12-01', '2027-02-28', '2027-04-07'],
    ['2028-02-29', 3, '2027-12-01', '2028-02-29', '2028-04-07'],
    ['2027-01-31', 2, '2026-11-01', '2027-01-31', '2027-03-07'],
    // one date, three staggers: a different quarter for each
    ['2026-01-15', 1, '2026-01-01', '2026-03-31', '2026-05-07'],
    ['2026-01-15', 2, '2025-11-01', '2026-01-31', '2026-03-07'],
    ['2026-01-15', 3, '2025-12-01', '2026-02-28', '2026-04-07'],
    ['2028-02-29', 1, '2028-01-01', '2028-03-31', '2028-05-07'],
    ['2028-02-29', 2, '2028-02-01', '2028-04-30', '2028-06-07'],
  ])('%s on stagger %i -> %s to %s, due %s', (date, stagger, start, end, returnDue) => {
    expect(vatQuarter(date, stagger)).toEqual({ start, end, returnDue })
  })
})

describe('cisTaxMonth: the 6th to the 5th, return on the 19th (DOMAIN.md; gov.uk "What you must do as a CIS contractor"), payment on the 22nd (same guide, as briefed)', () => {
  it.each([
    // 5/6 January, across the year end
    ['2026-01-05', '2025-12-06', '2026-01-05', '2026-01-19', '2026-01-22', 'the 5th ends the month that began 6 December'],
    ['2026-01-06', '2026-01-06', '2026-02-05', '2026-02-19', '2026-02-22', 'the 6th starts a new one'],
    ['2026-01-01', '2025-12-06', '2026-01-05', '2026-01-19', '2026-01-22', 'New Year\'s Day is still in the December tax month'],
    ['2025-12-31', '2025-12-06', '2026-01-05', '2026-01-19', '2026-01-22', ''],
    ['2025-12-06', '2025-12-06', '2026-01-05', '2026-01-19', '2026-01-22', ''],
    ['2025-12-05', '2025-11-06', '2025-12-05', '2025-12-19', '2025-12-22', ''],
    // 5/6 April, the tax-year start
    ['2026-04-05', '2026-03-06', '2026-04-05', '2026-04-19', '2026-04-22', 'the last tax month of 2025-26'],
    ['2026-04-06', '2026-04-06', '2026-05-05', '2026-05-19', '2026-05-22', 'the first tax month of 2026-27'],
    // gov.uk's own example: the tax month 6 May to 5 June, return by 19 June
    ['2026-05-06', '2026-05-06', '2026-06-05', '2026-06-19', '2026-06-22', 'gov.uk example'],
    ['2026-06-05', '2026-05-06', '2026-06-05', '2026-06-19', '2026-06-22', 'gov.uk example'],
    // February and leap years
    ['2028-02-29', '2028-02-06', '2028-03-05', '2028-03-19', '2028-03-22', 'the leap day'],
    ['2028-03-05', '2028-02-06', '2028-03-05', '2028-03-19', '2028-03-22', 'across 29 February 2028'],
    ['2027-02-28', '2027-02-06', '2027-03-05', '2027-03-19', '2027-03-22', 'no leap day in 2027'],
    ['2027-03-06', '2027-03-06', '2027-04-05', '2027-04-19', '2027-04-22', ''],
    ['2026-10-31', '2026-10-06', '2026-11-05', '2026-11-19', '2026-11-22', 'a 31st'],
  ])('%s -> %s to %s, return %s, payment %s %s', (date, start, end, returnDue, paymentDue) => {
    expect(cisTaxMonth(date)).toEqual({ start, end, returnDue, paymentDue })
  })
})

describe('properties over 1990 to 2100 (the rules above, checked on any day)', () => {
  const isoDate = fc.integer({ min: Date.UTC(1990, 0, 1) / DAY_MS, max: Date.UTC(2100, 11, 31) / DAY_MS }).map(n => new Date(n * DAY_MS).toISOString().slice(0, 10))
  const stagger = fc.constantFrom<1 | 2 | 3>(1, 2, 3)
  const endMonths = { 1: [3, 6, 9, 12], 2: [4, 7, 10, 1], 3: [5, 8, 11, 2] } // gov.uk "VAT Returns", as briefed

  it('a VAT quarter holds the date, starts on a 1st, ends on a stagger month end, runs three months, and is due on the 7th two months on', () => {
    fc.assert(fc.property(isoDate, stagger, (date, s) => {
      const q = vatQuarter(date, s)
      expect(q.start <= date && date <= q.end).toBe(true)
      expect(q.start.slice(8)).toBe('01')
      expect(addDays(q.end, 1).slice(8)).toBe('01')
      expect(endMonths[s]).toContain(Number(q.end.slice(5, 7)))
      const months = (Number(q.end.slice(0, 4)) - Number(q.start.slice(0, 4))) * 12 + Number(q.end.slice(5, 7)) - Number(q.start.slice(5, 7))
      expect(months).toBe(2)
      // end + 1 calendar month (to the end of the next month) + 7 days
      const nextMonthEnd = addDays(`${addDays(addDays(q.end, 1), 31).slice(0, 8)}01`, -1)
      expect(q.returnDue).toBe(addDays(nextMonthEnd, 7))
    }))
  })

  it('a CIS tax month holds the date, runs from a 6th to the next 5th, and the next one starts the day after', () => {
    fc.assert(fc.property(isoDate, (date) => {
      const t = cisTaxMonth(date)
      expect(t.start <= date && date <= t.end).toBe(true)
      expect(t.start.slice(8)).toBe('06')
      expect(t.end.slice(8)).toBe('05')
      expect(cisTaxMonth(addDays(t.end, 1)).start).toBe(addDays(t.end, 1))
      expect(t.returnDue).toBe(`${t.end.slice(0, 8)}19`)
      expect(t.paymentDue).toBe(`${t.end.slice(0, 8)}22`)
    }))
  })
})

describe('bad input is a RangeError naming the field (our rules)', () => {
  it.each<[string, () => unknown, RegExp]>([
    ['29 February in a common year', () => vatQuarter('2027-02-29', 3), /date/],
    ['31 April', () => cisTaxMonth('2026-04-31'), /date/],
    ['month 13', () => vatQuarter('2026-13-01', 1), /date/],
    ['day 0', () => cisTaxMonth('2026-01-00'), /date/],
    ['a UK-style date', () => cisTaxMonth('05/01/2026'), /date/],
    ['no leading zeros', () => vatQuarter('2026-1-5', 1), /date/],
    ['a date with a time', () => cisTaxMonth('2026-01-05T00:00:00Z'), /date/],
    ['an empty string', () => vatQuarter('', 2), /date/],
    ['no date at all', () => cisTaxMonth(undefined as unknown as string), /date/],
    ['stagger 0', () => vatQuarter('2026-01-05', 0 as 1), /stagger/],
    ['stagger 4', () => vatQuarter('2026-01-05', 4 as 1), /stagger/],
    ['stagger as a string', () => vatQuarter('2026-01-05', '1' as unknown as 1), /stagger/],
    ['a CIS month ending after 9999', () => cisTaxMonth('9999-12-06'), /date/],
    ['a VAT return due after 9999', () => vatQuarter('9999-12-01', 1), /date/],
  ])('%s', (_what, call, field) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(field)
  })
})
