import { describe, expect, it } from 'vitest'
import { dayRateAgainst, nextProfitSort, profitChartSummary, sortProfitRows, type ProfitSort, type SortableProfitRow } from '../../shared/utils/profit-view'

// Our own rules for reading the profit table (the figures themselves: tests/unit/profit.test.ts).

const row = (reference: string, effectiveDayRatePence: number | null, lastDay: string): SortableProfitRow => ({
  reference, lastDay, effectiveDayRatePence, priceNetPence: 0, materialsPence: 0, otherCostsPence: 0, labourPaidPence: 0, halfDaysWorked: 2,
  contributionPence: 0, targetPricePence: 0, differencePence: 0, marginPercent: null,
})
const rows = [row('J-0002', 12_500, '2026-11-20'), row('J-0001', 50_000, '2026-11-25'), row('J-0003', null, '2026-11-25'), row('J-0004', 12_500, '2026-11-01')]
const refs = (sort: ProfitSort) => sortProfitRows(rows, sort).map(r => r.reference)

describe('sortProfitRows', () => {
  it.each<[ProfitSort, string[]]>([
    [{ key: 'effectiveDayRatePence', dir: 'descending' }, ['J-0001', 'J-0002', 'J-0004', 'J-0003']],
    [{ key: 'effectiveDayRatePence', dir: 'ascending' }, ['J-0002', 'J-0004', 'J-0001', 'J-0003']],
    [{ key: 'lastDay', dir: 'descending' }, ['J-0001', 'J-0003', 'J-0002', 'J-0004']],
    [{ key: 'reference', dir: 'ascending' }, ['J-0001', 'J-0002', 'J-0003', 'J-0004']],
    [{ key: 'marginPercent', dir: 'descending' }, ['J-0002', 'J-0001', 'J-0003', 'J-0004']],
  ])('%o: no figure last either way, ties by job', (sort, want) => expect(refs(sort)).toEqual(want))
})

describe('nextProfitSort: a second press reverses; a new column starts largest first, the job A to Z', () => {
  it.each<[ProfitSort, ProfitSort['key'], ProfitSort]>([
    [{ key: 'lastDay', dir: 'descending' }, 'lastDay', { key: 'lastDay', dir: 'ascending' }],
    [{ key: 'lastDay', dir: 'ascending' }, 'lastDay', { key: 'lastDay', dir: 'descending' }],
    [{ key: 'lastDay', dir: 'descending' }, 'effectiveDayRatePence', { key: 'effectiveDayRatePence', dir: 'descending' }],
    [{ key: 'lastDay', dir: 'descending' }, 'reference', { key: 'reference', dir: 'ascending' }],
  ])('%o then %s', (from, key, want) => expect(nextProfitSort(from, key)).toEqual(want))
})

describe('dayRateAgainst', () => {
  it.each<[number | null, number, 'below' | 'above' | null]>([
    [19_999, 20_000, 'below'],
    [20_000, 20_000, 'above'],
    [-500, 20_000, 'below'],
    [null, 20_000, null],
    [50_000, 0, null],
  ])('%s against %i: %s', (rate, target, want) => expect(dayRateAgainst(rate, target)).toBe(want))
})

describe('profitChartSummary', () => {
  it.each([
    [2, 20_000, 1, 'Bar chart of the day rate earned on each of 2 jobs, oldest first, against a line at your target day rate of £200.00: 1 below it. The table below gives every figure.'],
    [1, 0, 0, 'Bar chart of the day rate earned on each of 1 job, oldest first. No target day rate is set. The table below gives every figure.'],
  ])('%i jobs, target %i', (jobs, target, below, want) => expect(profitChartSummary(jobs, target, below)).toBe(want))
})
