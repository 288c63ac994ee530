// Between the price book form (figures as typed) and the API (pence, whole numbers, bead lengths in
// millimetres): read the book into the form, and the form back into a body, naming each figure that
// is not right beside its field (the server checks again). Pure.
import { parsePounds, penceToDecimal } from './money'
import { formatStockLength, parseStockLengths } from './takeoff'

/** The labour rates, per m² or per metre, with their labels. */
export const PRICE_BOOK_RATES = [
  ['skimWallsPerM2Pence', 'Skim walls, per m²'],
  ['skimCeilingsPerM2Pence', 'Skim ceilings, per m²'],
  ['undercoatPerM2Pence', 'Undercoat, per m²'],
  ['revealsPerLmPence', 'Reveals and narrow strips, per metre'],
  ['beadsPerLmPence', 'Beads, per metre'],
  ['scrimPerLmPence', 'Scrim round frames, per metre'],
] as const
export type PriceBookRateKey = (typeof PRICE_BOOK_RATES)[number][0]

/** The site rules: label, and the hint that says where the figure comes from. */
export const PRICE_BOOK_SITE_RULES = [
  ['drySkimDays', 'Days after a skim before decorating', 'Common practice: about a week (7). A rule of thumb: drying varies'],
  ['dryUndercoatDays', 'Days after undercoat or filling, when it is the last coat', 'Longer than a skim; 14 is from memory, not a published figure'],
  ['dryColdOrDampExtraDays', 'Extra days when the room is cold or damp', 'More in cold or damp rooms (common practice); 7 is from memory'],
  ['cornerTrowelMm', 'Your corner trowel\'s width (mm)', 'A return narrower than this makes a difficult corner'],
  ['outOfTrueToleranceMm', 'Out of true by more than this makes a difficult corner (mm)', ''],
  ['bagsPerPersonPerSet', 'Bags one person lays on and trowels up in a set', 'Starts each new job\'s plan'],
] as const
/** The whole numbers of the book (percentages, millimetres, days, bags). */
const WHOLE_NUMBERS = ['materialsMarkupPercent', 'narrowMaxMm', 'beadWastePercent', 'materialsWastePercent', 'm2PerDay', ...PRICE_BOOK_SITE_RULES.map(r => r[0])] as const
type WholeKey = (typeof WHOLE_NUMBERS)[number]

export type PriceBook = Record<PriceBookRateKey | WholeKey, number> & {
  minDeductCm2: number
  beadStockLengthsMm: number[]
  makingGoodItems?: { name: string, unit: string, pricePence: number }[] | null
}

export type PriceBookForm = Record<WholeKey, string> & {
  rates: Record<PriceBookRateKey, string>
  minDeductCm2: 0 | 5000
  beadStockLengths: string
  makingGood: { name: string, unit: string, price: string }[]
}

export function priceBookFormFrom(b: PriceBook): PriceBookForm {
  const rates = Object.fromEntries(PRICE_BOOK_RATES.map(([k]) => [k, penceToDecimal(b[k])])) as Record<PriceBookRateKey, string>
  const whole = Object.fromEntries(WHOLE_NUMBERS.map(k => [k, String(b[k])])) as Record<WholeKey, string>
  return {
    ...whole,
    rates,
    minDeductCm2: b.minDeductCm2 === 5000 ? 5000 : 0,
    beadStockLengths: b.beadStockLengthsMm.map(formatStockLength).join(', '),
    makingGood: (b.makingGoodItems ?? []).map(m => ({ name: m.name, unit: m.unit, price: penceToDecimal(m.pricePence) })),
  }
}

const whole = (s: string) => (/^\d+$/.test(s.trim()) ? Number(s.trim()) : null)

/** The body for PUT /api/price-book, or the fields that are wrong (keyed as the server keys them). */
export function priceBookBody(form: PriceBookForm): { body: Record<string, unknown> } | { errors: Record<string, string> } {
  const errors: Record<string, string> = {}
  const rates: Record<string, number> = {}
  for (const [key] of PRICE_BOOK_RATES) {
    const p = parsePounds(form.rates[key] ?? '')
    if (p === null) errors[key] = 'Enter a price in pounds, like 18.00.'
    else rates[key] = p
  }
  const numbers: Record<string, number> = {}
  for (const key of WHOLE_NUMBERS) {
    const n = whole(form[key])
    if (n === null) errors[key] = 'Enter a whole number.'
    else numbers[key] = n
  }
  const stock = parseStockLengths(form.beadStockLengths)
  if (!stock.ok) errors.beadStockLengthsMm = stock.message
  const makingGoodItems = form.makingGood.map((m, i) => {
    const pricePence = parsePounds(m.price)
    if (pricePence === null) errors[`makingGoodItems.${i}.pricePence`] = 'Enter a price in pounds, like 35.00.'
    return { name: m.name, unit: m.unit, pricePence: pricePence ?? 0 }
  })
  if (Object.keys(errors).length) return { errors }
  return { body: { ...rates, ...numbers, minDeductCm2: form.minDeductCm2, beadStockLengthsMm: stock.ok ? stock.mm : [], makingGoodItems } }
}
