// Between the price book form (figures as typed) and the API (pence, whole numbers, bead lengths in
// millimetres): read the book into the form, and the form back into a body, naming each figure that
// is not right beside its field (the server checks again). Pure.
import { clockTime } from './set-timeline'
import { parsePounds, penceToDecimal } from './money'
import { formatStockLength, parseStockLengths } from './takeoff'

/** A figure of the book as a field: its key (as the API names it), label and hint. */
export interface PriceBookField<K extends string = string> { key: K, label: string, hint: string }

/** The labour rates in pounds, per m² or per metre. */
export const PRICE_BOOK_RATES = [
  { key: 'skimWallsPerM2Pence', label: 'Skim walls, per m²', hint: '' },
  { key: 'skimCeilingsPerM2Pence', label: 'Skim ceilings, per m²', hint: '' },
  { key: 'undercoatPerM2Pence', label: 'Undercoat, per m²', hint: '' },
  { key: 'revealsPerLmPence', label: 'Reveals and narrow strips, per metre', hint: '' },
  { key: 'beadsPerLmPence', label: 'Beads, per metre', hint: '' },
  { key: 'scrimPerLmPence', label: 'Scrim round frames, per metre', hint: '' },
  { key: 'packedBeadPerLmPence', label: 'Packing out a bead, per metre', hint: 'On top of fitting it, per metre of bead packed out. Left at 0, the quote still lists the work for you to price' },
  { key: 'narrowReturnPerLmPence', label: 'Making good a narrow return, per metre', hint: 'An internal corner narrower than your corner trowel, made good by hand. Left at 0, the quote still lists it for you to price' },
] as const satisfies readonly PriceBookField[]

/** The whole numbers of the take-off: widths, pace, mark-up and waste. */
export const PRICE_BOOK_TAKE_OFF = [
  { key: 'narrowMaxMm', label: 'Reveals and strips up to this width go by the metre (mm)', hint: '' },
  { key: 'm2PerDay', label: 'Square metres of skim in a day (for the days estimate)', hint: 'Rule of thumb: your own pace' },
  { key: 'materialsMarkupPercent', label: 'Mark-up on materials (%)', hint: '' },
  { key: 'materialsWastePercent', label: 'Waste on plaster and scrim (%)', hint: '' },
  { key: 'beadWastePercent', label: 'Waste on beads (%)', hint: '' },
] as const satisfies readonly PriceBookField[]

/** The site rules, each hint saying where the figure comes from. */
export const PRICE_BOOK_SITE_RULES = [
  { key: 'drySkimDays', label: 'Days after a skim before decorating', hint: 'Common practice: about a week (7). A rule of thumb: drying varies' },
  { key: 'dryUndercoatDays', label: 'Days after undercoat or filling, when it is the last coat', hint: 'Longer than a skim; 14 is a starting figure: set your own' },
  { key: 'dryColdOrDampExtraDays', label: 'Extra days when the room is cold or damp', hint: 'More in cold or damp rooms (common practice); 7 is a starting figure: set your own' },
  { key: 'cornerTrowelMm', label: 'Your corner trowel\'s width (mm)', hint: 'A return narrower than this makes a difficult corner' },
  { key: 'outOfTrueToleranceMm', label: 'Out of true by more than this makes a difficult corner (mm)', hint: '' },
  { key: 'bagsPerPersonPerSet', label: 'Bags one person lays on and trowels up in a set', hint: 'Starts each new job\'s plan' },
] as const satisfies readonly PriceBookField[]

/** The planner's order of work: a firm rule (on by default), with why it is common practice. */
export const CEILINGS_FIRST_FIELD = {
  key: 'ceilingsFirst', label: 'Ceilings before walls',
  hint: 'Common practice: plaster dropped from a ceiling spoils walls already skimmed, so each room\'s ceiling goes in a set no later than its walls',
} as const

/** Whether the quote's PDF shows each measured room drawn set by set. */
export const QUOTE_WORK_PAGE_FIELD = {
  key: 'quoteWorkPage', label: 'Show "How we\'ll do the work" on quotes',
  hint: 'A page on the quote\'s PDF with each measured room drawn set by set, as the planner would do it',
} as const

/** The day's timeline: minutes, whole numbers (rules of thumb the firm sets). */
export const PRICE_BOOK_TIMELINE = [
  { key: 'mixMinutes', label: 'Mixing a set (minutes)', hint: 'From the water in the bucket to ready to lay on: your own pace' },
  { key: 'goOffMinutes', label: 'Finish plaster goes off in (minutes)', hint: 'About 90 to 120 minutes is common; it depends on the product, the background and the weather: follow the maker\'s instructions' },
] as const satisfies readonly PriceBookField[]

/** The working day's two ends, typed as times (08:00) and kept as minutes after midnight. */
export const PRICE_BOOK_DAY = [
  { key: 'dayStartMinutes', label: 'Working day starts', hint: 'When the first set can be mixed' },
  { key: 'dayEndMinutes', label: 'Working day ends', hint: 'Everything trowelled up and cleaned down by then' },
] as const satisfies readonly PriceBookField[]

type RateKey = (typeof PRICE_BOOK_RATES)[number]['key']
type TimelineKey = (typeof PRICE_BOOK_TIMELINE)[number]['key']
type DayKey = (typeof PRICE_BOOK_DAY)[number]['key']
type TakeOffKey = (typeof PRICE_BOOK_TAKE_OFF)[number]['key']
type SiteRuleKey = (typeof PRICE_BOOK_SITE_RULES)[number]['key']

export type PriceBookFigures = Record<RateKey | TakeOffKey | SiteRuleKey | TimelineKey | DayKey, number> & {
  ceilingsFirst: boolean
  quoteWorkPage: boolean
  minDeductCm2: number
  beadStockLengthsMm: number[]
  makingGoodItems?: { name: string, unit: string, pricePence: number }[] | null
}

export interface PriceBookForm {
  rates: Record<RateKey, string>
  takeOff: Record<TakeOffKey, string>
  site: Record<SiteRuleKey, string>
  ceilingsFirst: boolean
  quoteWorkPage: boolean
  timeline: Record<TimelineKey, string>
  /** The day's ends as typed in a time field, 'HH:MM'. */
  day: Record<DayKey, string>
  minDeductCm2: 0 | 5000
  beadStockLengths: string
  makingGood: { name: string, unit: string, price: string }[]
}

function typed<K extends string>(fields: readonly { key: K }[], show: (key: K) => string): Record<K, string> {
  return Object.fromEntries(fields.map(f => [f.key, show(f.key)])) as Record<K, string>
}

export function priceBookFormFrom(b: PriceBookFigures): PriceBookForm {
  return {
    rates: typed(PRICE_BOOK_RATES, k => penceToDecimal(b[k])),
    takeOff: typed(PRICE_BOOK_TAKE_OFF, k => String(b[k])),
    site: typed(PRICE_BOOK_SITE_RULES, k => String(b[k])),
    ceilingsFirst: b.ceilingsFirst,
    quoteWorkPage: b.quoteWorkPage,
    timeline: typed(PRICE_BOOK_TIMELINE, k => String(b[k])),
    day: typed(PRICE_BOOK_DAY, k => timeOfDay(b[k])),
    minDeductCm2: b.minDeductCm2 === 5000 ? 5000 : 0,
    beadStockLengths: b.beadStockLengthsMm.map(formatStockLength).join(', '),
    makingGood: (b.makingGoodItems ?? []).map(m => ({ name: m.name, unit: m.unit, price: penceToDecimal(m.pricePence) })),
  }
}

const whole = (s: string) => (/^\d+$/.test(s.trim()) ? Number(s.trim()) : null)

/** Minutes after midnight as a time field shows it: 480 -> '08:00', 990 -> '16:30'. */
export function timeOfDay(minutes: number): string {
  return clockTime(minutes)
}

/** A time as typed ('08:00', '8:00', '16.30') to minutes after midnight, or null when it is not one. */
export function minutesOfDay(typedIn: string): number | null {
  const m = /^(\d{1,2})[:.](\d{2})$/.exec(typedIn.trim())
  if (!m) return null
  const h = Number(m[1])
  const min = Number(m[2])
  return h < 24 && min < 60 ? h * 60 + min : null
}

/** The body for PUT /api/price-book, or the fields that are wrong (keyed as the server keys them). */
export function priceBookBody(form: PriceBookForm): { body: Record<string, unknown> } | { errors: Record<string, string> } {
  const errors: Record<string, string> = {}
  const figures: Record<string, number> = {}
  const read = (key: string, typedIn: string | undefined, parse: (s: string) => number | null, problem: string) => {
    const n = parse(typedIn ?? '')
    if (n === null) errors[key] = problem
    else figures[key] = n
  }
  for (const { key } of PRICE_BOOK_RATES) read(key, form.rates[key], parsePounds, 'Enter a price in pounds, like 18.00.')
  for (const { key } of PRICE_BOOK_TAKE_OFF) read(key, form.takeOff[key], whole, 'Enter a whole number.')
  for (const { key } of PRICE_BOOK_SITE_RULES) read(key, form.site[key], whole, 'Enter a whole number.')
  for (const { key } of PRICE_BOOK_TIMELINE) read(key, form.timeline[key], whole, 'Enter whole minutes.')
  read('dayStartMinutes', form.day.dayStartMinutes, minutesOfDay, 'Enter a time, like 08:00.')
  read('dayEndMinutes', form.day.dayEndMinutes, minutesOfDay, 'Enter a time, like 16:30.')
  if (figures.dayStartMinutes !== undefined && figures.dayEndMinutes !== undefined && figures.dayEndMinutes <= figures.dayStartMinutes) {
    errors.dayEndMinutes = 'The working day must end after it starts.'
  }
  const stock = parseStockLengths(form.beadStockLengths)
  if (!stock.ok) errors.beadStockLengthsMm = stock.message
  const makingGoodItems = form.makingGood.map((m, i) => {
    const pricePence = parsePounds(m.price)
    if (pricePence === null) errors[`makingGoodItems.${i}.pricePence`] = 'Enter a price in pounds, like 35.00.'
    return { name: m.name, unit: m.unit, pricePence: pricePence ?? 0 }
  })
  if (Object.keys(errors).length) return { errors }
  return { body: { ...figures, ceilingsFirst: form.ceilingsFirst, quoteWorkPage: form.quoteWorkPage, minDeductCm2: form.minDeductCm2, beadStockLengthsMm: stock.ok ? stock.mm : [], makingGoodItems } }
}
