// How a quote is priced. The plasterer's working lines (the take-off priced by measure, and the
// materials at cost plus mark-up) are always kept; the lines the customer sees, and the totals,
// follow from the pricing chosen:
// - by measure: the working lines as they are;
// - by days: the materials lines, and one labour line of the estimated days at the firm's day rate;
// - fixed price: the materials lines, and one labour line of the fixed price less the materials,
//   so the net total is the fixed price and labour stays apart from materials (CIS is worked on
//   the labour only, and the profit table needs the split).
// The estimated days are shown whichever way it is priced.
import { lineNetPence } from './tax'
import { formatPence } from './money'

export type Pricing = 'measure' | 'days' | 'fixed'

export interface PricedLine {
  kind: 'labour' | 'materials'
  description: string
  /** Thousandths of the unit. */
  quantityX1000: number
  unit: string
  unitPence: number
  vatRatePercent: number
  derivation: string
}

export interface PricingChoice {
  pricing: Pricing
  /** Hundredths of a day (2.5 days = 250). */
  estimatedDaysX100: number
  dayRatePence: number
  fixedPricePence: number | null
}

export type PricingResult
  = | { ok: true, lines: PricedLine[], labourByMeasurePence: number, materialsPence: number }
    | { ok: false, field: 'fixedPricePence' | 'estimatedDaysX100' | 'dayRatePence', message: string }

function netOf(lines: readonly PricedLine[]): number {
  return lines.reduce((sum, l) => sum + lineNetPence({ quantity: l.quantityX1000 / 1000, unitPence: l.unitPence }), 0)
}

/** The labour lines' VAT rate when they agree; 20% (the standard rate) otherwise. */
function labourRate(labour: readonly PricedLine[]): number {
  const rates = new Set(labour.map(l => l.vatRatePercent))
  return rates.size === 1 ? [...rates][0]! : 20
}

/** Hundredths of a day as people write them: 150 -> '1.5', 225 -> '2.25', 300 -> '3'. */
export function formatDayCount(daysX100: number): string {
  const whole = Math.floor(daysX100 / 100)
  const frac = daysX100 % 100
  return frac === 0 ? String(whole) : `${whole}.${String(frac).padStart(2, '0').replace(/0$/, '')}`
}

/** 100 -> '1 day', 50 -> '0.5 days'. */
export function formatDays(daysX100: number): string {
  return `${formatDayCount(daysX100)} ${daysX100 === 100 ? 'day' : 'days'}`
}

/** The lines the customer sees, from the working lines and the pricing chosen. */
export function pricedLines(working: readonly PricedLine[], choice: PricingChoice): PricingResult {
  const labour = working.filter(l => l.kind === 'labour')
  const materials = working.filter(l => l.kind === 'materials')
  const labourByMeasurePence = netOf(labour)
  const materialsPence = netOf(materials)
  const byMeasure = labour.length ? `; priced by measure the labour would be ${formatPence(labourByMeasurePence)}` : ''
  if (choice.pricing === 'measure') return { ok: true, lines: [...working], labourByMeasurePence, materialsPence }
  if (choice.pricing === 'days') {
    if (!(choice.estimatedDaysX100 > 0)) return { ok: false, field: 'estimatedDaysX100', message: 'Enter the days it will take.' }
    if (!(choice.dayRatePence > 0)) return { ok: false, field: 'dayRatePence', message: 'Set the firm\'s day rate (Settings, Firm) before pricing by days.' }
    const line: PricedLine = {
      kind: 'labour',
      description: `Labour: ${formatDays(choice.estimatedDaysX100)} at ${formatPence(choice.dayRatePence)} a day`,
      quantityX1000: choice.estimatedDaysX100 * 10,
      unit: 'days',
      unitPence: choice.dayRatePence,
      vatRatePercent: labourRate(labour),
      derivation: `${formatDayCount(choice.estimatedDaysX100)} days x ${formatPence(choice.dayRatePence)} day rate${byMeasure}`,
    }
    return { ok: true, lines: [line, ...materials], labourByMeasurePence, materialsPence }
  }
  const fixed = choice.fixedPricePence
  if (fixed === null || !(fixed > 0)) return { ok: false, field: 'fixedPricePence', message: 'Enter the fixed price.' }
  if (fixed < materialsPence) {
    return { ok: false, field: 'fixedPricePence', message: `The fixed price is less than the materials on the quote (${formatPence(materialsPence)}).` }
  }
  const line: PricedLine = {
    kind: 'labour',
    description: 'Labour, at the fixed price',
    quantityX1000: 1000,
    unit: 'item',
    unitPence: fixed - materialsPence,
    vatRatePercent: labourRate(labour),
    derivation: `Fixed price ${formatPence(fixed)} less materials ${formatPence(materialsPence)} = ${formatPence(fixed - materialsPence)}${byMeasure}`,
  }
  return { ok: true, lines: [line, ...materials], labourByMeasurePence, materialsPence }
}
