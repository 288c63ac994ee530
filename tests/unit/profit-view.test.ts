import { describe, expect, it } from 'vitest'
import {
  costsInWords, dayRateAgainst, dayRateVerdict, nextProfitSort, PROFIT_CHOSEN_COLUMNS, PROFIT_EVERY_COLUMN, PROFIT_FIGURES, PROFIT_SORT_KEYS, profitChartSummary, profitColumns,
  sortProfitRows, sortWithin, splitProfitRows, type DayRateVerdict, type ProfitSort, type SortableProfitRow,
} from '../../shared/utils/profit-view'

// Our own rules for reading the profit table (the figures themselves: tests/unit/profit.test.ts).

const row = (reference: string, effectiveDayRatePence: number | null, lastDay: string): SortableProfitRow => ({
  reference, lastDay, effectiveDayRatePence, priceNetPence: 0, costsPence: 0, materialsPence: 0, otherCostsPence: 0, labourPaidPence: 0, halfDaysWorked: 2,
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
    [2, 20_000, 1, 0, 'Bar chart of the day rate earned on each of 2 jobs, oldest first, against a line at your target day rate of £200.00: 1 below it. Every figure is in the list above.'],
    [1, 0, 0, 0, 'Bar chart of the day rate earned on each of 1 job, oldest first. No target day rate is set. Every figure is in the list above.'],
    [3, 20_000, 1, 1, 'Bar chart of the day rate earned on each of 3 jobs, oldest first, against a line at your target day rate of £200.00: 1 below it. 1 of them is still on site: figures so far, not set against the target. Every figure is in the list above.'],
    [3, 0, 0, 2, 'Bar chart of the day rate earned on each of 3 jobs, oldest first. No target day rate is set. 2 of them are still on site: figures so far, not set against the target. Every figure is in the list above.'],
  ])('%i jobs, target %i, %i below, %i on site', (jobs, target, below, onSite, want) => expect(profitChartSummary(jobs, target, below, onSite)).toBe(want))
})

// Our own rule (issue 18): the day rate earned set against the firm's target, in words, a shape
// and a tone; a job still on site is never judged (its figures are so far: issue 18 saw one with
// only a deposit invoiced counted at £100.64 a day in red). The difference is a day's: rate - target.
describe('dayRateVerdict', () => {
  const v = (standing: DayRateVerdict['standing'], shape: DayRateVerdict['shape'], words: string, tone: DayRateVerdict['tone'], differencePence: number | null): DayRateVerdict =>
    ({ standing, shape, words, tone, differencePence })
  it.each<[string, number | null, number, boolean, DayRateVerdict]>([
    ['£40 a day above', 24_000, 20_000, false, v('above', '▲', '£40.00 a day above your target', 'good', 4_000)],
    ['a penny above', 20_001, 20_000, false, v('above', '▲', '£0.01 a day above your target', 'good', 1)],
    ['on the target to the penny', 20_000, 20_000, false, v('on', '●', 'On your target day rate', 'good', 0)],
    ['a penny below', 19_999, 20_000, false, v('below', '▼', '£0.01 a day below your target', 'bad', -1)],
    ['£99.36 below', 10_064, 20_000, false, v('below', '▼', '£99.36 a day below your target', 'bad', -9_936)],
    ['a loss: more below than the target itself', -5_000, 20_000, false, v('below', '▼', '£250.00 a day below your target', 'bad', -25_000)],
    ['a big job: thousands a day', 1_234_567, 20_000, false, v('above', '▲', '£12,145.67 a day above your target', 'good', 1_214_567)],
    ['no target set', 25_000, 0, false, v('no-target', '○', 'No target day rate set to compare with', 'plain', null)],
    ['no days worked', null, 20_000, false, v('no-days', '○', 'No days worked to divide by', 'plain', null)],
    ['still on site with a deposit only: not judged', 10_064, 20_000, true, v('on-site', '◐', 'Still on site: figures so far, not set against your target until it is finished', 'pending', null)],
    ['still on site and above: not judged either', 30_000, 20_000, true, v('on-site', '◐', 'Still on site: figures so far, not set against your target until it is finished', 'pending', null)],
    ['still on site, no target: still says on site', 30_000, 0, true, v('on-site', '◐', 'Still on site: figures so far, not set against your target until it is finished', 'pending', null)],
  ])('%s', (_what, rate, target, onSite, want) => expect(dayRateVerdict(rate, target, onSite)).toEqual(want))

  it('never shows a standing by colour alone: each has its own shape, and below never shares one with above', () => {
    const shapes = new Map<string, string>()
    for (const [rate, target, onSite] of [[30_000, 20_000, false], [20_000, 20_000, false], [10_000, 20_000, false], [1, 20_000, true], [1, 0, false]] as const) {
      const x = dayRateVerdict(rate, target, onSite)
      shapes.set(x.standing, x.shape)
    }
    expect(new Set(shapes.values()).size).toBe(shapes.size)
  })
})

describe('splitProfitRows: the jobs still on site apart from the totals unless counted', () => {
  const rows = [{ ref: 'A', provisional: false }, { ref: 'B', provisional: true }, { ref: 'C', provisional: false }]
  it.each<[boolean, string[], string[]]>([
    [false, ['A', 'C'], ['B']],
    [true, ['A', 'B', 'C'], []],
  ])('count on site %s', (count, counted, apart) => {
    const got = splitProfitRows(rows, count)
    expect([got.counted.map(r => r.ref), got.apart.map(r => r.ref)]).toEqual([counted, apart])
  })
})

describe('the columns: chosen for a laptop, every figure behind the toggle', () => {
  it('the chosen columns are the job, its day, the price, the costs together, the days, what was left and the day rate earned', () => {
    expect(profitColumns(false)).toEqual(['reference', 'lastDay', 'priceNetPence', 'costsPence', 'halfDaysWorked', 'contributionPence', 'effectiveDayRatePence'])
    expect(profitColumns(false)).toBe(PROFIT_CHOSEN_COLUMNS)
  })
  it('every figure shows the costs apart (not the sum twice), the price at the day rate and the margin on the price', () => {
    expect(profitColumns(true)).toBe(PROFIT_EVERY_COLUMN)
    expect(PROFIT_EVERY_COLUMN).not.toContain('costsPence')
    expect(PROFIT_EVERY_COLUMN).toEqual(expect.arrayContaining(['materialsPence', 'otherCostsPence', 'labourPaidPence', 'targetPricePence', 'differencePence', 'marginPercent']))
    // every chosen column but the costs together is in every figure
    expect(PROFIT_CHOSEN_COLUMNS.filter(k => k !== 'costsPence').every(k => PROFIT_EVERY_COLUMN.includes(k))).toBe(true)
  })
  it.each<[ProfitSort, boolean, ProfitSort]>([
    [{ key: 'marginPercent', dir: 'ascending' }, false, { key: 'lastDay', dir: 'descending' }],
    [{ key: 'costsPence', dir: 'ascending' }, true, { key: 'lastDay', dir: 'descending' }],
    [{ key: 'effectiveDayRatePence', dir: 'ascending' }, false, { key: 'effectiveDayRatePence', dir: 'ascending' }],
    [{ key: 'marginPercent', dir: 'ascending' }, true, { key: 'marginPercent', dir: 'ascending' }],
  ])('sortWithin %o, every figure %s', (sort, every, want) => expect(sortWithin(sort, profitColumns(every))).toEqual(want))

  it('names each figure for what it is: the margin is on the price, the day rate is earned', () => {
    expect(Object.keys(PROFIT_FIGURES).sort()).toEqual([...PROFIT_SORT_KEYS].sort())
    expect(PROFIT_FIGURES.marginPercent.label).toBe('Margin on the price')
    expect(PROFIT_FIGURES.effectiveDayRatePence.label).toBe('Day rate earned')
    const labels = Object.values(PROFIT_FIGURES).map(f => f.label)
    expect(new Set(labels).size).toBe(labels.length)
    for (const f of Object.values(PROFIT_FIGURES)) expect(f.hint).toMatch(/\.$/)
  })
})

describe('costsInWords: only the costs a job had', () => {
  it.each<[number, 'purchases' | 'set-log' | 'none', number, number, string]>([
    [100_00, 'purchases', 0, 0, 'materials £100.00 from receipts'],
    [21_99, 'set-log', 12_50, 90_00, 'materials £21.99 from the set log, other costs £12.50, labour paid £90.00'],
    [0, 'none', 0, 90_00, 'labour paid £90.00'],
    [0, 'none', 0, 0, 'none recorded'],
  ])('%i %s %i %i', (materialsPence, materialsFrom, otherCostsPence, labourPaidPence, want) =>
    expect(costsInWords({ materialsPence, materialsFrom, otherCostsPence, labourPaidPence })).toBe(want))
})
