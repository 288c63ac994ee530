// How the profit table is read: its sort order, which columns show, each job's day rate against
// the firm's target in words and a shape, and the words that describe the chart to someone who
// cannot see it. Pure; the figures themselves come from shared/utils/profit.ts on the server.
// Rules of thumb for the firm, not accounts: the page says so beside them (ProfitCaution).
import { formatPence } from './money'

export const PROFIT_SORT_KEYS = [
  'reference', 'lastDay', 'priceNetPence', 'costsPence', 'materialsPence', 'otherCostsPence', 'labourPaidPence', 'halfDaysWorked',
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

// ---------------------------------------------------------------------------------------------
// What each figure is, in the firm's words

export interface ProfitFigure {
  /** The column's heading and the card's label. */
  label: string
  /** What the figure is, for the heading's note and the page's key. */
  hint: string
}

export const PROFIT_FIGURES: Record<ProfitSortKey, ProfitFigure> = {
  reference: { label: 'Job', hint: 'The job and its customer.' },
  lastDay: { label: 'Last day worked', hint: 'The last booked day marked worked: the job is in the period when this day is.' },
  priceNetPence: { label: 'Price before VAT', hint: 'What you invoiced on the job before VAT, less credit notes; until something is invoiced, the price you won it at.' },
  costsPence: { label: 'Costs', hint: 'Materials, other costs and labour paid to others, together.' },
  materialsPence: { label: 'Materials', hint: 'The receipts put against the job; without any, the bags and packs logged with each set at the cost recorded then.' },
  otherCostsPence: { label: 'Other costs', hint: 'Fuel, tools, the van and anything else bought for the job.' },
  labourPaidPence: { label: 'Labour paid to others', hint: 'What you paid a labourer or another plasterer for the job.' },
  halfDaysWorked: { label: 'Days worked', hint: 'Each person\'s booked days marked worked: a day counts 1, half a day 0.5, two people on a day 2.' },
  contributionPence: { label: 'Left after costs', hint: 'The price less the costs.' },
  effectiveDayRatePence: { label: 'Day rate earned', hint: 'What was left after costs, divided by the days worked: what the job paid you a day.' },
  targetPricePence: { label: 'Price at your day rate', hint: 'The costs plus the days worked at your target day rate: what the job needed to be priced at.' },
  differencePence: { label: 'Over or under that price', hint: 'The price less the price at your day rate: over it (+) or under it (−).' },
  marginPercent: { label: 'Margin on the price', hint: 'What was left after costs as a share of the price. It says nothing of the days: a job can have a high margin and still earn below your day rate.' },
}

/** The columns a laptop shows first: they fit 1366 px beside the side bar. */
export const PROFIT_CHOSEN_COLUMNS: readonly ProfitSortKey[] = ['reference', 'lastDay', 'priceNetPence', 'costsPence', 'halfDaysWorked', 'contributionPence', 'effectiveDayRatePence']
/** Every figure, behind the "Show every figure" toggle: the costs apart, the price at your day rate and the margin on the price. */
export const PROFIT_EVERY_COLUMN: readonly ProfitSortKey[] = [
  'reference', 'lastDay', 'priceNetPence', 'materialsPence', 'otherCostsPence', 'labourPaidPence', 'halfDaysWorked',
  'contributionPence', 'effectiveDayRatePence', 'targetPricePence', 'differencePence', 'marginPercent',
]

/** The table's columns: the chosen few, or every figure. */
export function profitColumns(every: boolean): readonly ProfitSortKey[] {
  return every ? PROFIT_EVERY_COLUMN : PROFIT_CHOSEN_COLUMNS
}

/** The sort kept when the columns change: a sort on a column no longer shown goes back to the last day worked, latest first. */
export function sortWithin(sort: ProfitSort, columns: readonly ProfitSortKey[]): ProfitSort {
  return columns.includes(sort.key) ? sort : { key: 'lastDay', dir: 'descending' }
}

// ---------------------------------------------------------------------------------------------
// A day rate against the firm's target

/** A day rate against the firm's target, or on or above it; null when no target is set or no days were worked. */
export function dayRateAgainst(ratePence: number | null, targetPence: number): 'below' | 'above' | null {
  if (targetPence <= 0 || ratePence === null) return null
  return ratePence < targetPence ? 'below' : 'above'
}

export type DayRateStanding = 'above' | 'on' | 'below' | 'on-site' | 'no-target' | 'no-days'
/** The colour a standing is shown in; never the only sign (each has its shape and its words). */
export type DayRateTone = 'good' | 'bad' | 'pending' | 'plain'
export interface DayRateVerdict {
  standing: DayRateStanding
  /** ▲ above, ● on, ▼ below, ◐ still on site, ○ nothing to set against. */
  shape: '▲' | '●' | '▼' | '◐' | '○'
  /** "£40.00 a day above your target" */
  words: string
  tone: DayRateTone
  /** The day rate earned less the target, a day; null when it is not set against the target. */
  differencePence: number | null
}

/**
 * A job's (or the totals') day rate earned against the firm's target day rate, in words, a shape
 * and a tone (our rule). A job still on site is never judged: its price and days are so far only
 * (a deposit may be all that is invoiced), so it says so instead of a red "below".
 */
export function dayRateVerdict(ratePence: number | null, targetPence: number, stillOnSite = false): DayRateVerdict {
  if (stillOnSite) return { standing: 'on-site', shape: '◐', words: 'Still on site: figures so far, not set against your target until it is finished', tone: 'pending', differencePence: null }
  if (ratePence === null) return { standing: 'no-days', shape: '○', words: 'No days worked to divide by', tone: 'plain', differencePence: null }
  if (targetPence <= 0) return { standing: 'no-target', shape: '○', words: 'No target day rate set to compare with', tone: 'plain', differencePence: null }
  const differencePence = ratePence - targetPence
  if (differencePence > 0) return { standing: 'above', shape: '▲', words: `${formatPence(differencePence)} a day above your target`, tone: 'good', differencePence }
  if (differencePence < 0) return { standing: 'below', shape: '▼', words: `${formatPence(-differencePence)} a day below your target`, tone: 'bad', differencePence }
  return { standing: 'on', shape: '●', words: 'On your target day rate', tone: 'good', differencePence }
}

/** Where a job's materials figure came from, in words. */
export const MATERIALS_FROM_NOTE = { 'purchases': 'from receipts', 'set-log': 'from the set log', 'none': 'none recorded' } as const

/**
 * A job's costs in words, only the parts it had: "materials £100.00 from receipts, labour paid
 * £90.00"; "none recorded" when it had none (worth a look: were the receipts put against the job?).
 */
export function costsInWords(r: { materialsPence: number, materialsFrom: keyof typeof MATERIALS_FROM_NOTE, otherCostsPence: number, labourPaidPence: number }): string {
  const parts = [
    r.materialsPence ? `materials ${formatPence(r.materialsPence)} ${MATERIALS_FROM_NOTE[r.materialsFrom]}` : '',
    r.otherCostsPence ? `other costs ${formatPence(r.otherCostsPence)}` : '',
    r.labourPaidPence ? `labour paid ${formatPence(r.labourPaidPence)}` : '',
  ].filter(Boolean)
  return parts.length ? parts.join(', ') : 'none recorded'
}

/** The rows the totals count (finished jobs, and the ones still on site when asked for) and the ones kept apart. */
export function splitProfitRows<T extends { provisional: boolean }>(rows: readonly T[], countOnSite: boolean): { counted: T[], apart: T[] } {
  const counted: T[] = []
  const apart: T[] = []
  for (const r of rows) (r.provisional && !countOnSite ? apart : counted).push(r)
  return { counted, apart }
}

/** The chart in words, for its label and for anyone the canvas says nothing to. `onSite`: jobs still on site among the bars. */
export function profitChartSummary(jobs: number, targetPenceOrZero: number, belowCount: number, onSite = 0): string {
  const n = jobs === 1 ? '1 job' : `${jobs} jobs`
  const site = onSite === 0 ? '' : ` ${onSite === 1 ? '1 of them is' : `${onSite} of them are`} still on site: figures so far, not set against the target.`
  if (targetPenceOrZero <= 0) return `Bar chart of the day rate earned on each of ${n}, oldest first. No target day rate is set.${site} Every figure is in the list above.`
  return `Bar chart of the day rate earned on each of ${n}, oldest first, against a line at your target day rate of ${formatPence(targetPenceOrZero)}: ${belowCount} below it.${site} Every figure is in the list above.`
}
