// How the profit table is read: its sort order, each job's day rate against the firm's target,
// and the words that describe the chart to someone who cannot see it. Pure; the figures
// themselves come from shared/utils/profit.ts on the server.
import { formatPence } from './money'

export const PROFIT_SORT_KEYS = [
  'reference', 'lastDay', 'priceNetPence', 'materialsPence', 'otherCostsPence', 'labourPaidPence', 'halfDaysWorked',
  'contributionPence', 'effectiveDayRatePence', 'targetPricePence', 'differencePence', 'marginPercent',
] as const
export type ProfitSortKey = (typeof PROFIT_SORT_KEYS)[number]
export type SortDirection = 'ascending' | 'descending'
export interface ProfitSort { key: ProfitSortKey, dir: SortDirection }
export type SortableProfitRow = { reference: string } & Record<ProfitSortKey, string | number | null>

/** Pressing a column: the same column again reverses it; a new one reads the job A to Z first, every other column largest (or latest) first. */
export function nextProfitSort(current: ProfitSort, key: ProfitSortKey): ProfitSort {
  if (current.key === key) return { key, dir: current.dir === 'ascending' ? 'descending' : 'ascending' }
  return { key, dir: key === 'reference' ? 'ascending' : 'descending' }
}

/** The rows sorted by one column; rows with no figure (null) go last either way, and ties go by job reference. */
export function sortProfitRows<T extends SortableProfitRow>(rows: readonly T[], sort: ProfitSort): T[] {
  const sign = sort.dir === 'ascending' ? 1 : -1
  return [...rows].sort((a, b) => {
    const x = a[sort.key]
    const y = b[sort.key]
    if (x === null || y === null) return x === y ? 0 : x === null ? 1 : -1
    const c = typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y))
    return c * sign || a.reference.localeCompare(b.reference)
  })
}

/** A day rate below the firm's target, or on or above it; null when no target is set or no days were worked. */
export function dayRateAgainst(ratePence: number | null, targetPence: number): 'below' | 'above' | null {
  if (targetPence <= 0 || ratePence === null) return null
  return ratePence < targetPence ? 'below' : 'above'
}

/** The chart in words, for its label and for anyone the canvas says nothing to. */
export function profitChartSummary(jobs: number, targetPence: number, belowCount: number): string {
  const n = jobs === 1 ? '1 job' : `${jobs} jobs`
  if (targetPence <= 0) return `Bar chart of the day rate earned on each of ${n}, oldest first. No target day rate is set. The table below gives every figure.`
  return `Bar chart of the day rate earned on each of ${n}, oldest first, against a line at your target day rate of ${formatPence(targetPence)}: ${belowCount} below it. The table below gives every figure.`
}
