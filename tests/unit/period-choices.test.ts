import { describe, expect, it } from 'vitest'
import { profitPeriodChoices, recentTaxMonths, recentVatQuarters } from '../../shared/utils/period-choices'
import { shortDayWithYear } from '../../shared/utils/dates'

// The quarters and tax months come from shared/utils/periods.ts (its own sources: gov.uk "VAT
// Returns" for the staggers, DOMAIN.md and gov.uk for the CIS tax month from the 6th to the 5th);
// these tables check the lists walk back one period at a time across year ends.

describe('recentVatQuarters: this quarter and the ones before, newest first', () => {
  it.each<[string, 1 | 2 | 3, number, [string, string][]]>([
    ['2026-12-05', 1, 3, [['2026-10-01', '2026-12-31'], ['2026-07-01', '2026-09-30'], ['2026-04-01', '2026-06-30']]],
    ['2026-02-10', 1, 2, [['2026-01-01', '2026-03-31'], ['2025-10-01', '2025-12-31']]],
    ['2026-02-10', 2, 2, [['2026-02-01', '2026-04-30'], ['2025-11-01', '2026-01-31']]],
    ['2028-03-01', 3, 2, [['2028-03-01', '2028-05-31'], ['2027-12-01', '2028-02-29']]],
  ])('%s, stagger %i, %i quarters', (today, stagger, count, want) => {
    expect(recentVatQuarters(today, stagger, count).map(q => [q.start, q.end])).toEqual(want)
  })
})

describe('recentTaxMonths: the CIS tax month (6th to 5th) holding today and the ones before', () => {
  it.each<[string, number, [string, string][]]>([
    ['2026-12-05', 2, [['2026-11-06', '2026-12-05'], ['2026-10-06', '2026-11-05']]],
    ['2026-12-06', 1, [['2026-12-06', '2027-01-05']]],
    ['2027-01-03', 2, [['2026-12-06', '2027-01-05'], ['2026-11-06', '2026-12-05']]],
  ])('%s, %i months', (today, count, want) => {
    expect(recentTaxMonths(today, count).map(m => [m.start, m.end])).toEqual(want)
  })
  it('twelve months reach back a year', () => {
    const months = recentTaxMonths('2026-12-05', 12)
    expect(months).toHaveLength(12)
    expect(months[11]).toEqual({ start: '2025-12-06', end: '2026-01-05' })
  })
})

describe('profitPeriodChoices: the profit table\'s quick choices (our own)', () => {
  it.each<[string, [string, string, string][]]>([
    ['2026-12-05', [['Last 90 days', '2026-09-07', '2026-12-05'], ['This quarter', '2026-10-01', '2026-12-31'], ['Last quarter', '2026-07-01', '2026-09-30'], ['Last 12 months', '2025-12-06', '2026-12-05']]],
    ['2028-03-01', [['Last 90 days', '2027-12-03', '2028-03-01'], ['This quarter', '2028-01-01', '2028-03-31'], ['Last quarter', '2027-10-01', '2027-12-31'], ['Last 12 months', '2027-03-03', '2028-03-01']]],
  ])('%s', (today, want) => {
    expect(profitPeriodChoices(today).map(c => [c.label, c.from, c.to])).toEqual(want)
  })
})

describe('shortDayWithYear: a day in a list that spans years (en-GB, as the profit table has always shown it)', () => {
  it.each([
    ['2026-12-04', /^Fri,? 4 Dec 2026$/],
    ['2028-02-29', /^Tue,? 29 Feb 2028$/],
    ['2026-12-31', /^Thu,? 31 Dec 2026$/],
  ])('%s', (iso, want) => expect(shortDayWithYear(iso)).toMatch(want))
})
