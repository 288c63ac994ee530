// The periods a page offers to pick from, newest first, worked from today: the VAT quarters on the
// firm's stagger, the CIS tax months (6th to 5th), and the profit table's quick choices. Pure.
import { addDays } from './dates'
import { cisTaxMonth, vatQuarter, type VatQuarter } from './periods'

/** The VAT quarter holding `today` and the `count - 1` before it, newest first. */
export function recentVatQuarters(today: string, stagger: 1 | 2 | 3, count: number): VatQuarter[] {
  const out: VatQuarter[] = []
  let at = today
  for (let i = 0; i < count; i++) {
    const q = vatQuarter(at, stagger)
    out.push(q)
    at = addDays(q.start, -1)
  }
  return out
}

/** The CIS tax month holding `today` and the `count - 1` before it, newest first (start and end only). */
export function recentTaxMonths(today: string, count: number): { start: string, end: string }[] {
  const out: { start: string, end: string }[] = []
  let at = today
  for (let i = 0; i < count; i++) {
    const m = cisTaxMonth(at)
    out.push({ start: m.start, end: m.end })
    at = addDays(m.start, -1)
  }
  return out
}

export interface PeriodChoice { label: string, from: string, to: string }

/**
 * The profit table's quick choices: the last 90 days (today and the 89 before), this calendar
 * quarter and the last (stagger 1: January to March...), the last 12 months (today and the 364 before).
 */
export function profitPeriodChoices(today: string): PeriodChoice[] {
  const [thisQuarter, lastQuarter] = recentVatQuarters(today, 1, 2) as [VatQuarter, VatQuarter]
  return [
    { label: 'Last 90 days', from: addDays(today, -89), to: today },
    { label: 'This quarter', from: thisQuarter.start, to: thisQuarter.end },
    { label: 'Last quarter', from: lastQuarter.start, to: lastQuarter.end },
    { label: 'Last 12 months', from: addDays(today, -364), to: today },
  ]
}
