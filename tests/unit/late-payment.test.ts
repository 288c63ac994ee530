import { describe, expect, it } from 'vitest'
import type { BankRateChange } from '../../shared/utils/late-payment'
import { DEFAULT_BANK_RATES, defaultDueDate, latePaymentClaim, referenceDate } from '../../shared/utils/late-payment'

// Sources (../shared/DOMAIN.md, "Money rules", "Late payment"): Late Payment of Commercial Debts
// (Interest) Act 1998 s.1 (simple interest), s.4(5) as enacted (due date with none agreed: the last
// of the 30 days beginning with the later date), s.4(2) (interest from the day after), s.5A (fixed
// sum 40/70/100); SI 2002/1675 art. 4 (8% over the Bank Rate in force on the 31 December or 30 June
// before interest starts, fixed for the debt); daily interest = debt x rate / 365 (DOMAIN.md).
// Bank Rates in DEFAULT_BANK_RATES: DOMAIN.md, from memory of the Bank of England's history (check
// against the Bank's published table before relying). DOMAIN.md has no worked
// late-payment example, so the figures below are invented inputs with the arithmetic beside them.
// Half-up rounding to the penny, once at the end, is our rule.

// Invented table (not real rates), to put each change on or around a reference day.
const SYNTHETIC: BankRateChange[] = [
  { from: '2025-01-01', ratePercent: 4 }, // in force on 2025-12-31 -> 12% for interest starting Jan to Jun 2026
  { from: '2026-03-01', ratePercent: 4.25 }, // after that reference day: never used for Jan to Jun 2026
  { from: '2026-06-30', ratePercent: 5.25 }, // on the reference day itself: in force on 30 June -> 13.25%
  { from: '2026-07-01', ratePercent: 3 }, // the day after: too late for Jul to Dec 2026, in force on 2026-12-31 -> 11%
  { from: '2027-01-01', ratePercent: 2 },
]
const flat = (ratePercent: number): BankRateChange[] => [{ from: '2000-01-01', ratePercent }]

describe('defaultDueDate: the last day of the 30 days beginning with the later date (Act s.4(5) as enacted)', () => {
  it.each([
    ['2026-03-01', '2026-03-01', '2026-03-30', 'same day: day 1 is 1 March, day 30 is 30 March'],
    ['2026-03-01', '2026-03-10', '2026-04-08', 'invoice received later: counts from the invoice'],
    ['2026-03-10', '2026-03-01', '2026-04-08', 'work done later: counts from the work'],
    ['2026-04-01', '2026-03-20', '2026-04-30', 'due on a month end (30-day month)'],
    ['2026-01-31', '2026-01-02', '2026-03-01', 'from 31 January, 2026 not a leap year: over a 28-day February'],
    ['2026-12-02', '2026-11-20', '2026-12-31', 'due on the year end'],
    ['2026-12-15', '2026-12-15', '2027-01-13', 'across the year end'],
    ['2028-01-31', '2028-01-31', '2028-02-29', 'due on the leap day (2028 is a leap year)'],
    ['2028-02-01', '2028-01-20', '2028-03-01', 'across 29 February 2028'],
    ['2027-02-01', '2027-01-20', '2027-03-02', 'the same in 2027, no leap day: one day later'],
  ])('work %s, invoice %s -> due %s (%s)', (workDone, invoiceReceived, due) => expect(defaultDueDate(workDone, invoiceReceived)).toBe(due))
})

describe('referenceDate: 31 December before for interest starting 1 Jan to 30 Jun, else 30 June (SI 2002/1675 art. 4)', () => {
  it.each([
    ['2026-01-01', '2025-12-31'],
    ['2026-06-30', '2025-12-31'],
    ['2026-07-01', '2026-06-30'],
    ['2026-12-31', '2026-06-30'],
    ['2028-02-29', '2027-12-31'],
    ['2000-03-15', '1999-12-31'],
  ])('interest starting %s -> rate in force on %s', (start, ref) => expect(referenceDate(start)).toBe(ref))
})

describe('latePaymentClaim: the rate is fixed by the reference day (SI 2002/1675 art. 4), on the invented SYNTHETIC table', () => {
  // 100000p (GBP 1,000) 10 days overdue: interest = rate(hundredths) x 100 / 365; fixed sum 7000 (s.5A)
  it.each([
    ['2026-06-29', '2026-06-30', 12, 329, 'starts 30 June: rate on 31 Dec 2025 (4%); 24000/73 = 328.77 -> 329'],
    ['2026-06-30', '2026-07-01', 13.25, 363, 'starts 1 July: rate on 30 June 2026 (5.25%, changed that day); 26500/73 = 363.01 -> 363'],
    ['2026-12-30', '2026-12-31', 13.25, 363, 'starts 31 December: still the 30 June rate'],
    ['2026-12-31', '2027-01-01', 11, 301, 'starts 1 January: rate on 31 Dec 2026 (3%; the 1 Jan 2027 change is too late); 22000/73 = 301.37 -> 301'],
    ['2026-03-14', '2026-03-15', 12, 329, 'the 1 March 2026 change came after the reference day: still 4% + 8%'],
  ])('due %s, interest from %s -> %s per cent, %ip (%s)', (dueDate, interestStart, ratePercent, interestPence) => {
    const asOf = new Date(Date.parse(`${dueDate}T00:00:00Z`) + 10 * 86_400_000).toISOString().slice(0, 10)
    expect(latePaymentClaim({ debtPence: 100_000, dueDate, asOf, bankRates: SYNTHETIC }))
      .toEqual({ interestStart, ratePercent, days: 10, interestPence, fixedSumPence: 7_000, totalPence: 100_000 + interestPence + 7_000 })
  })

  it('keeps the rate for the life of the debt however often Bank Rate changes later (SI 2002/1675 art. 4)', () => {
    // 2026-01-09 to 2027-03-01 = 416 days at 12% across four later changes: 250000 x 0.12 x 416 / 365 = 34191.78 -> 34192
    const claim = latePaymentClaim({ debtPence: 250_000, dueDate: '2026-01-09', asOf: '2027-03-01', bankRates: SYNTHETIC })
    expect(claim).toEqual({ interestStart: '2026-01-10', ratePercent: 12, days: 416, interestPence: 34_192, fixedSumPence: 7_000, totalPence: 291_192 })
  })

  it('sorts an unsorted table itself (our rule)', () => {
    const input = { debtPence: 250_000, dueDate: '2026-06-30', asOf: '2026-07-10' }
    expect(latePaymentClaim({ ...input, bankRates: [...SYNTHETIC].reverse() })).toEqual(latePaymentClaim({ ...input, bankRates: SYNTHETIC }))
  })
})

describe('latePaymentClaim on DEFAULT_BANK_RATES (DOMAIN.md Bank Rate history; SI 2002/1675 art. 4)', () => {
  it.each([
    ['2025-01-01', 12.75, 'rate on 31 Dec 2024: 4.75% (DOMAIN.md "from Nov 2024")'],
    ['2025-06-30', 12.75, 'still 31 Dec 2024: the 6 Feb and 8 May 2025 cuts came after it'],
    ['2025-07-01', 12.25, 'rate on 30 Jun 2025: 4.25% (DOMAIN.md "from 8 May 2025")'],
    ['2026-01-01', 11.75, 'rate on 31 Dec 2025: 3.75% (DOMAIN.md "from Dec 2025")'],
    ['2026-07-01', 11.75, 'rate on 30 Jun 2026: 3.75%, the latest in the table'],
  ])('interest starting %s -> %s per cent (%s)', (interestStart, ratePercent) => {
    const dueDate = new Date(Date.parse(`${interestStart}T00:00:00Z`) - 86_400_000).toISOString().slice(0, 10)
    expect(latePaymentClaim({ debtPence: 100_000, dueDate, asOf: dueDate, bankRates: DEFAULT_BANK_RATES })).toMatchObject({ interestStart, ratePercent })
  })

  it('a GBP 2,400 invoice 60 days late (Act s.4(5), s.5A; SI 2002/1675 art. 4; daily interest debt x rate / 365, DOMAIN.md)', () => {
    // work 5 Jan, invoice received 9 Jan 2026 -> due 7 Feb (9 Jan + 29); interest from 8 Feb at 3.75% + 8% = 11.75%
    // 7 Feb to 8 Apr 2026 = 60 days; 240000 x 0.1175 x 60 / 365 = 4635.62 -> 4636; fixed sum GBP 70 (1,000 to under 10,000)
    const dueDate = defaultDueDate('2026-01-05', '2026-01-09')
    expect(dueDate).toBe('2026-02-07')
    expect(latePaymentClaim({ debtPence: 240_000, dueDate, asOf: '2026-04-08', bankRates: DEFAULT_BANK_RATES }))
      .toEqual({ interestStart: '2026-02-08', ratePercent: 11.75, days: 60, interestPence: 4_636, fixedSumPence: 7_000, totalPence: 251_636 })
  })
})

// Every reference day of SI 2002/1675 art. 4 (each 30 June and 31 December) from 30 June 2009 to
// today: the default table must have a Bank Rate in force on each, or a claim starting in the half
// year after it cannot be worked out.
function referenceDaysSince2009(today = new Date().toISOString().slice(0, 10)): string[] {
  const out: string[] = []
  for (let y = 2009; `${y}-06-30` <= today; y++) {
    out.push(`${y}-06-30`)
    if (`${y}-12-31` <= today) out.push(`${y}-12-31`)
  }
  return out
}
/** The day after the reference day: the first day of interest that the reference day fixes the rate for. */
const dayAfter = (iso: string) => new Date(Date.parse(`${iso}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10)
/** A claim whose interest starts the day after `reference` (due on the reference day itself). */
const claimFrom = (reference: string) => latePaymentClaim({ debtPence: 100_000, dueDate: reference, asOf: reference, bankRates: DEFAULT_BANK_RATES })

describe('DEFAULT_BANK_RATES covers every reference day since 2009 (SI 2002/1675 art. 4)', () => {
  it('lists the reference days it checks (SI 2002/1675 art. 4: 30 June and 31 December)', () => {
    const days = referenceDaysSince2009('2026-12-04')
    expect(days[0]).toBe('2009-06-30')
    expect(days.at(-1)).toBe('2026-06-30')
    expect(days).toHaveLength(35)
  })

  it.each(referenceDaysSince2009().map(d => [d, 'SI 2002/1675 art. 4']))('has a rate in force on %s (%s)', (reference) => {
    expect(referenceDate(dayAfter(reference))).toBe(reference)
    expect(() => claimFrom(reference)).not.toThrow()
  })

  it.each([
    ['2009-06-30', 0.5, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.5% from 5 Mar 2009'],
    ['2009-12-31', 0.5, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.5% from 5 Mar 2009'],
    ['2016-06-30', 0.5, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.25% only from 4 Aug 2016'],
    ['2016-12-31', 0.25, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.25% 4 Aug 2016'],
    ['2017-12-31', 0.5, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.5% 2 Nov 2017'],
    ['2018-12-31', 0.75, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.75% 2 Aug 2018'],
    ['2020-06-30', 0.1, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.1% 19 Mar 2020'],
    ['2020-12-31', 0.1, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.1% 19 Mar 2020'],
    ['2021-12-31', 0.25, 'DOMAIN.md, from memory of the Bank of England\'s history: 0.25% 16 Dec 2021'],
    ['2022-06-30', 1.25, 'DOMAIN.md, from memory of the Bank of England\'s history: 1.25% 16 Jun 2022'],
    ['2022-12-31', 3.5, 'DOMAIN.md, from memory of the Bank of England\'s history: 3.5% 15 Dec 2022'],
    ['2023-06-30', 5, 'DOMAIN.md, from memory of the Bank of England\'s history: 5% 22 Jun 2023'],
    ['2023-12-31', 5.25, 'DOMAIN.md, from memory of the Bank of England\'s history: 5.25% 3 Aug 2023'],
    ['2024-06-30', 5.25, 'DOMAIN.md, from memory of the Bank of England\'s history: "The reference rate on 30 June 2024 was therefore 5.25%"'],
    ['2024-12-31', 4.75, 'DOMAIN.md, from memory of the Bank of England\'s history: 4.75% 7 Nov 2024'],
    ['2025-06-30', 4.25, 'DOMAIN.md, from memory of the Bank of England\'s history: 4.25% 8 May 2025'],
    ['2025-12-31', 3.75, 'DOMAIN.md, from memory of the Bank of England\'s history: 3.75% 18 Dec 2025'],
  ])('Bank Rate on %s was %s%% (%s), so 8 points more for interest starting the day after (SI 2002/1675 art. 4)', (reference, bankRate) => {
    expect(claimFrom(reference)).toMatchObject({ interestStart: dayAfter(reference), ratePercent: bankRate + 8 })
  })

  it('a claim whose interest starts in the second half of 2024 is worked out (it failed when the table began in August 2024)', () => {
    // due 14 Aug 2024, interest from 15 Aug; 30 June 2024: 5.25% + 8% = 13.25%; 100,000 x 0.1325 x 30 / 365 = 1089.04 -> 1089
    expect(latePaymentClaim({ debtPence: 100_000, dueDate: '2024-08-14', asOf: '2024-09-13', bankRates: DEFAULT_BANK_RATES }))
      .toEqual({ interestStart: '2024-08-15', ratePercent: 13.25, days: 30, interestPence: 1_089, fixedSumPence: 7_000, totalPence: 108_089 })
  })

  it('has each change once, in date order, each a real date (our rule for the seed table)', () => {
    const froms = DEFAULT_BANK_RATES.map(r => r.from)
    expect([...froms].sort()).toEqual(froms)
    expect(new Set(froms).size).toBe(froms.length)
    expect(froms[0]! <= '2009-06-30').toBe(true)
  })
})

describe('latePaymentClaim: overdue or not (Act s.4(2): interest runs from the day after the due date)', () => {
  const base = { debtPence: 240_000, dueDate: '2026-02-07', bankRates: DEFAULT_BANK_RATES }
  it.each([
    ['2026-01-20', 0, 0, 0, 'before the due date: nothing but the debt'],
    ['2026-02-07', 0, 0, 0, 'on the due date: not yet overdue'],
    ['2026-02-08', 1, 77, 7_000, 'one day overdue: 240000 x 0.1175 / 365 = 77.26 -> 77, plus the fixed sum (s.5A)'],
  ])('as of %s: %i days, %ip interest, %ip fixed (%s)', (asOf, days, interestPence, fixedSumPence) => {
    expect(latePaymentClaim({ ...base, asOf }))
      .toEqual({ interestStart: '2026-02-08', ratePercent: 11.75, days, interestPence, fixedSumPence, totalPence: 240_000 + interestPence + fixedSumPence })
  })

  it.each([
    ['2028-02-28', '2028-03-01', 2, 'across 29 February 2028'],
    ['2027-02-28', '2027-03-01', 1, 'no leap day in 2027'],
    ['2026-12-31', '2027-01-01', 1, 'across the year end'],
  ])('due %s, as of %s: %i days (%s)', (dueDate, asOf, days) => {
    expect(latePaymentClaim({ debtPence: 100_000, dueDate, asOf, bankRates: DEFAULT_BANK_RATES }).days).toBe(days)
  })

  it('a debt of 0 claims nothing (our rule)', () => {
    expect(latePaymentClaim({ debtPence: 0, dueDate: '2026-02-07', asOf: '2026-05-01', bankRates: DEFAULT_BANK_RATES }))
      .toMatchObject({ days: 83, interestPence: 0, fixedSumPence: 0, totalPence: 0 })
  })
})

describe('latePaymentClaim: the fixed sum by the size of the debt (Act s.5A; DOMAIN.md)', () => {
  // one day overdue at 11.75%: debt x 1175 / 3650000, half up
  it.each([
    [1, 0, 4_000, 'any debt under GBP 1,000 -> GBP 40'],
    [99_999, 32, 4_000, 'GBP 999.99 -> GBP 40 (32.19p interest)'],
    [100_000, 32, 7_000, 'GBP 1,000 -> GBP 70 (32.19p)'],
    [999_999, 322, 7_000, 'GBP 9,999.99 -> GBP 70 (321.92p)'],
    [1_000_000, 322, 10_000, 'GBP 10,000 -> GBP 100 (321.92p)'],
  ])('%ip: %ip interest, %ip fixed sum (%s)', (debtPence, interestPence, fixedSumPence) => {
    expect(latePaymentClaim({ debtPence, dueDate: '2026-03-31', asOf: '2026-04-01', bankRates: DEFAULT_BANK_RATES }))
      .toEqual({ interestStart: '2026-04-01', ratePercent: 11.75, days: 1, interestPence, fixedSumPence, totalPence: debtPence + interestPence + fixedSumPence })
  })
})

describe('latePaymentClaim: exact interest, rounded half up once (s.1 simple interest; our rounding rule)', () => {
  it.each([
    // 12.5%: debt x days / 2920
    ['exactly .5: 100020 x 73 / 2920 = 2500.5 -> 2501', flat(4.5), 100_020, '2026-01-01', '2026-03-15', 12.5, 73, 2_501],
    ['just under: 2500.475 -> 2500', flat(4.5), 100_019, '2026-01-01', '2026-03-15', 12.5, 73, 2_500],
    // x.25 rates from DEFAULT_BANK_RATES: 4.25% on 30 Jun 2025 -> 12.25%
    ['12.25%: 1000 x 0.1225 x 73 / 365 = 24.5 -> 25', DEFAULT_BANK_RATES, 1_000, '2025-07-01', '2025-09-12', 12.25, 73, 25],
    ['12.25%: 6200 x 0.1225 = 759.5 -> 760 (a float formula gives 759)', DEFAULT_BANK_RATES, 6_200, '2025-07-01', '2026-07-01', 12.25, 365, 760],
    ['13.25%: 200 x 0.1325 = 26.5 -> 27 (a float formula gives 26)', flat(5.25), 200, '2026-01-01', '2027-01-01', 13.25, 365, 27],
    ['11.75%: 8600 x 0.1175 = 1010.5 -> 1011 (a float formula gives 1010)', DEFAULT_BANK_RATES, 8_600, '2026-01-01', '2027-01-01', 11.75, 365, 1_011],
  ])('%s', (_what, bankRates, debtPence, dueDate, asOf, ratePercent, days, interestPence) => {
    expect(latePaymentClaim({ debtPence, dueDate, asOf, bankRates })).toMatchObject({ ratePercent, days, interestPence })
  })
})

describe('bad input is a RangeError naming the field (our rules)', () => {
  const ok = { debtPence: 100_000, dueDate: '2026-02-07', asOf: '2026-03-01', bankRates: DEFAULT_BANK_RATES }
  it.each<[string, () => unknown, RegExp]>([
    ['an impossible workDone', () => defaultDueDate('2027-02-30', '2027-01-01'), /workDone/],
    ['29 February in a common year', () => defaultDueDate('2027-01-01', '2027-02-29'), /invoiceReceived/],
    ['a UK-style invoice date', () => defaultDueDate('2027-01-01', '01/02/2027'), /invoiceReceived/],
    ['a date with a time', () => defaultDueDate('2027-01-01T10:00:00Z', '2027-01-01'), /workDone/],
    ['interestStart not a date', () => referenceDate('2026-13-01'), /interestStart/],
    ['a negative debt', () => latePaymentClaim({ ...ok, debtPence: -1 }), /debtPence/],
    ['a debt with a fraction of a penny', () => latePaymentClaim({ ...ok, debtPence: 100.5 }), /debtPence/],
    ['a debt that is not a number', () => latePaymentClaim({ ...ok, debtPence: Number.NaN }), /debtPence/],
    ['dueDate not a real date', () => latePaymentClaim({ ...ok, dueDate: '2026-04-31' }), /dueDate/],
    ['asOf without leading zeros', () => latePaymentClaim({ ...ok, asOf: '2026-3-1' }), /asOf/],
    ['asOf missing', () => latePaymentClaim({ ...ok, asOf: undefined as unknown as string }), /asOf/],
    ['an empty bankRates table', () => latePaymentClaim({ ...ok, bankRates: [] }), /bankRates/],
    ['no rate in force on the reference day', () => latePaymentClaim({ ...ok, bankRates: [{ from: '2026-01-01', ratePercent: 3.75 }] }), /bankRates.*2025-12-31/],
    ['a table that starts after the reference day has no rate for it', () => latePaymentClaim({ ...ok, dueDate: '2024-08-15', bankRates: [{ from: '2024-08-01', ratePercent: 5 }] }), /bankRates.*2024-06-30/],
    ['a bad date in bankRates', () => latePaymentClaim({ ...ok, bankRates: [{ from: '2025-02-30', ratePercent: 4 }] }), /bankRates\[0\]\.from/],
    ['a rate with 3 decimals', () => latePaymentClaim({ ...ok, bankRates: [{ from: '2025-01-01', ratePercent: 4.125 }] }), /bankRates\[0\]\.ratePercent/],
    ['a negative rate', () => latePaymentClaim({ ...ok, bankRates: [{ from: '2025-01-01', ratePercent: -0.5 }] }), /bankRates\[0\]\.ratePercent/],
    ['two different rates from one day', () => latePaymentClaim({ ...ok, bankRates: [{ from: '2025-01-01', ratePercent: 4 }, { from: '2025-01-01', ratePercent: 4.25 }] }), /bankRates.*2025-01-01/],
    ['a due date with no day after it', () => latePaymentClaim({ ...ok, dueDate: '9999-12-31' }), /interestStart/],
  ])('%s', (_what, call, field) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(field)
  })

  it('accepts a repeated row with the same rate (our rule)', () => {
    const bankRates = [{ from: '2025-01-01', ratePercent: 4 }, { from: '2025-01-01', ratePercent: 4 }]
    expect(latePaymentClaim({ ...ok, bankRates }).ratePercent).toBe(12)
  })
})
