// A quote's first draft from a measured visit: the take-off (shared/utils/takeoff.ts) priced from
// the firm's price book, and the materials estimate (shared/utils/materials.ts) at cost plus the
// firm's mark-up. Every line keeps its derivation, so the plasterer can check it by hand.
import { estimateMaterials } from '#shared/utils/materials'
import { takeoffRooms, type TakeoffKey, type TakeoffLine } from '#shared/utils/takeoff'
import { ASBESTOS_CAUTION } from '#shared/utils/ledger'
import { formatSquareMetres } from '#shared/utils/measure'

type PriceBook = Awaited<ReturnType<typeof usePriceBook>>

const LABOUR: Partial<Record<TakeoffKey, { description: string, rate: (p: PriceBook) => number }>> = {
  'skim-walls': { description: 'Skim walls', rate: p => p.skimWallsPerM2Pence },
  'skim-ceilings': { description: 'Skim ceilings', rate: p => p.skimCeilingsPerM2Pence },
  'reveals-area': { description: 'Skim wide reveals and strips', rate: p => p.skimWallsPerM2Pence },
  'undercoat': { description: 'Undercoat, back to the background', rate: p => p.undercoatPerM2Pence },
  'fill-patches': { description: 'Fill patches in undercoat', rate: p => p.undercoatPerM2Pence },
  'reveals-lm': { description: 'Reveals and narrow strips', rate: p => p.revealsPerLmPence },
  'beads': { description: 'Fit beads', rate: p => p.beadsPerLmPence },
  'scrim': { description: 'Scrim and fill gaps round frames', rate: p => p.scrimPerLmPence },
}

/** A take-off quantity as thousandths of its unit (cm² -> thousandths of m²; mm -> thousandths of m). */
function quantityX1000(line: TakeoffLine): number {
  if (line.unit === 'm2') return Math.round(line.quantity / 10)
  if (line.unit === 'lm') return line.quantity
  return line.quantity * 1000
}

const UNIT_LABEL = { m2: 'm²', lm: 'm', lengths: 'lengths', item: 'item' } as const

/** The materials estimate of a measured visit at cost (no mark-up), with the catalogue row each comes from. */
export async function materialsEstimateForVisit(f: FirmScope, visitId: string) {
  const book = await usePriceBook(f)
  const rooms = await loadRooms(f, visitId)
  const lines = takeoffRooms(rooms, { minDeductCm2: book.minDeductCm2, narrowMaxMm: book.narrowMaxMm, beadStockLengthsMm: book.beadStockLengthsMm, beadWastePercent: book.beadWastePercent })
  const rows = await catalogueRows(f)
  return estimateMaterials(lines, await catalogue(f), { wastePercent: book.materialsWastePercent })
    .filter(m => m.packs > 0)
    .map(m => ({ materialId: rows.find(r => r.key === m.materialKey)?.id ?? null, name: m.name, packs: m.packs, costPence: m.costPence, derivation: m.derivation }))
}

export async function draftFromVisit(f: FirmScope, visitId: string) {
  const book = await usePriceBook(f)
  const rooms = await loadRooms(f, visitId)
  const lines = takeoffRooms(rooms, {
    minDeductCm2: book.minDeductCm2,
    narrowMaxMm: book.narrowMaxMm,
    beadStockLengthsMm: book.beadStockLengthsMm,
    beadWastePercent: book.beadWastePercent,
  })
  const labour: NewLine[] = []
  for (const line of lines) {
    const price = LABOUR[line.key]
    if (!price) continue
    labour.push({
      kind: 'labour',
      description: `${price.description}: ${line.roomName}`,
      quantityX1000: quantityX1000(line),
      unit: UNIT_LABEL[line.unit],
      unitPence: price.rate(book),
      vatRatePercent: 20,
      derivation: line.derivation,
    })
  }
  const markup = book.materialsMarkupPercent
  const materialLines: NewLine[] = estimateMaterials(lines, await catalogue(f), { wastePercent: book.materialsWastePercent })
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
  const skimCm2 = lines.filter(l => l.unit === 'm2').reduce((s, l) => s + l.quantity, 0)
  const estimatedDaysX100 = book.m2PerDay > 0 ? Math.ceil((skimCm2 / 10_000 / book.m2PerDay) * 4) * 25 : 0
  const textured = rooms.some(r => r.surfaces.some(s => s.conditions.some(c => c.kind === 'textured-coating')))
  return {
    lines: [...labour, ...materialLines],
    estimatedDaysX100,
    cautions: textured ? [ASBESTOS_CAUTION] : [],
    rules: {
      voids: book.minDeductCm2 > 0
        ? `Openings of ${formatSquareMetres(book.minDeductCm2)} m² or less are not deducted (the older UK measurement rule); larger ones are.`
        : 'Every opening is deducted from the area.',
      narrow: `Reveals and strips up to ${book.narrowMaxMm} mm wide are priced by the metre; wider ones by the square metre.`,
      days: `Days estimated at ${book.m2PerDay} m² a day, rounded up to the quarter day (a rule of thumb).`,
    },
  }
}
