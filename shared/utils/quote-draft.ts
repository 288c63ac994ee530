// A quote's first lines from a take-off: each labour quantity priced from the firm's price book,
// and the materials estimate (./materials.ts) at cost plus the firm's mark-up, every line keeping
// its derivation so the plasterer can check it by hand; and the days estimate. Pure: the server
// (server/utils/quote-draft.ts) and the demo seed both use it.
import { estimateMaterials, type Material } from './materials'
import type { TakeoffKey, TakeoffLine } from './takeoff'
import { formatPence } from './money'

export interface DraftPriceBook {
  skimWallsPerM2Pence: number
  skimCeilingsPerM2Pence: number
  undercoatPerM2Pence: number
  revealsPerLmPence: number
  beadsPerLmPence: number
  scrimPerLmPence: number
  /** Packing out a bead, per metre of bead packed (on top of fitting it). */
  packedBeadPerLmPence: number
  /** Making good an internal corner narrower than the corner trowel, per metre of corner. */
  narrowReturnPerLmPence: number
  materialsMarkupPercent: number
  materialsWastePercent: number
  m2PerDay: number
}

export interface DraftLine {
  kind: 'labour' | 'materials'
  description: string
  quantityX1000: number
  unit: string
  unitPence: number
  vatRatePercent: number
  derivation: string
}

/**
 * How each labour quantity is priced. `unset`, on the rates a firm may not have filled in yet, is
 * what the line's working says when the rate is 0: the line is still drafted, so the plasterer sees
 * the work and prices it on the quote.
 */
const LABOUR: Partial<Record<TakeoffKey, { description: string, rate: (p: DraftPriceBook) => number, unset?: string }>> = {
  'skim-walls': { description: 'Skim walls', rate: p => p.skimWallsPerM2Pence },
  'skim-ceilings': { description: 'Skim ceilings', rate: p => p.skimCeilingsPerM2Pence },
  'reveals-area': { description: 'Skim wide reveals and strips', rate: p => p.skimWallsPerM2Pence },
  'undercoat': { description: 'Undercoat where the old plaster is off', rate: p => p.undercoatPerM2Pence },
  'fill-patches': { description: 'Fill patches in undercoat', rate: p => p.undercoatPerM2Pence },
  'reveals-lm': { description: 'Reveals and narrow strips', rate: p => p.revealsPerLmPence },
  'beads': { description: 'Fit beads', rate: p => p.beadsPerLmPence },
  'scrim': { description: 'Scrim and fill gaps round frames', rate: p => p.scrimPerLmPence },
  'packed-bead': { description: 'Pack out beads', rate: p => p.packedBeadPerLmPence, unset: 'packing out a bead' },
  'narrow-return': { description: 'Make good narrow returns', rate: p => p.narrowReturnPerLmPence, unset: 'making good a narrow return' },
}

/** A take-off quantity as thousandths of its unit (cm² -> thousandths of m²; mm -> thousandths of m). */
function quantityX1000(line: TakeoffLine): number {
  if (line.unit === 'm2') return Math.round(line.quantity / 10)
  if (line.unit === 'lm') return line.quantity
  return line.quantity * 1000
}

const UNIT_LABEL = { m2: 'm²', lm: 'm', lengths: 'lengths', item: 'item' } as const

/** The labour and materials lines of a first draft, and the days it is estimated to take (hundredths). */
export function draftLines(takeoff: readonly TakeoffLine[], book: DraftPriceBook, catalogue: readonly Material[]): { lines: DraftLine[], estimatedDaysX100: number } {
  const labour: DraftLine[] = []
  for (const line of takeoff) {
    const price = LABOUR[line.key]
    if (!price) continue
    const unitPence = price.rate(book)
    labour.push({
      kind: 'labour',
      description: `${price.description}: ${line.roomName}`,
      quantityX1000: quantityX1000(line),
      unit: UNIT_LABEL[line.unit],
      unitPence,
      vatRatePercent: 20,
      derivation: price.unset && unitPence === 0
        ? `${line.derivation}. No rate for ${price.unset} is set in Rates and rules: enter the price here`
        : line.derivation,
    })
  }
  const markup = book.materialsMarkupPercent
  const materialLines: DraftLine[] = estimateMaterials(takeoff, catalogue, { wastePercent: book.materialsWastePercent })
    .filter(m => m.packs > 0)
    .map(m => ({
      kind: 'materials' as const,
      description: `${m.name} (${m.packLabel})`,
      quantityX1000: m.packs * 1000,
      unit: 'packs',
      unitPence: Math.round((m.costPence / m.packs) * (100 + markup) / 100),
      vatRatePercent: 20,
      derivation: markup ? `${m.derivation}; at cost plus ${markup}%` : m.derivation,
    }))
  const skimCm2 = takeoff.filter(l => l.unit === 'm2').reduce((s, l) => s + l.quantity, 0)
  const estimatedDaysX100 = book.m2PerDay > 0 ? Math.ceil((skimCm2 / 10_000 / book.m2PerDay) * 4) * 25 : 0
  return { lines: [...labour, ...materialLines], estimatedDaysX100 }
}

/** A making-good item of the price book (a switch box, a patch round a new pipe): priced by its own unit. */
export interface MakingGoodItem { name: string, unit: string, pricePence: number }

/** A making-good item as a labour line of one unit, its price from the price book (the plasterer changes the quantity). */
export function makingGoodLine(item: MakingGoodItem): DraftLine {
  return {
    kind: 'labour',
    description: item.name,
    quantityX1000: 1000,
    unit: item.unit,
    unitPence: item.pricePence,
    vatRatePercent: 20,
    derivation: `Making good from Rates and rules: ${formatPence(item.pricePence)} per ${item.unit}`,
  }
}
