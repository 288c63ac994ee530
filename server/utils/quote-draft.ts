// A quote's first draft from a measured visit: the take-off (shared/utils/takeoff.ts) priced from
// the firm's price book, and the materials estimate (shared/utils/materials.ts) at cost plus the
// firm's mark-up. Every line keeps its derivation, so the plasterer can check it by hand.
import { estimateMaterials, estimateMaterialsByRoom } from '#shared/utils/materials'
import { takeoffRoom, takeoffRooms } from '#shared/utils/takeoff'
import { draftLines } from '#shared/utils/quote-draft'
import { ASBESTOS_CAUTION } from '#shared/utils/ledger'
import { formatSquareMetres } from '#shared/utils/measure'

/** The price book's take-off rules, as the take-off reads them (the corner trowel decides a narrow return). */
function takeoffOptions(book: Awaited<ReturnType<typeof usePriceBook>>) {
  return { minDeductCm2: book.minDeductCm2, narrowMaxMm: book.narrowMaxMm, beadStockLengthsMm: book.beadStockLengthsMm, beadWastePercent: book.beadWastePercent, cornerTrowelMm: book.cornerTrowelMm }
}

/** The materials estimate of a measured visit at cost (no mark-up), with the catalogue row each comes from. */
export async function materialsEstimateForVisit(f: FirmScope, visitId: string) {
  const book = await usePriceBook(f)
  const rooms = await loadRooms(f, visitId)
  const lines = takeoffRooms(rooms, takeoffOptions(book))
  const rows = await catalogueRows(f)
  return estimateMaterials(lines, await catalogue(f), { wastePercent: book.materialsWastePercent })
    .filter(m => m.packs > 0)
    .map(m => ({ materialId: rows.find(r => r.key === m.materialKey)?.id ?? null, name: m.name, packs: m.packs, costPence: m.costPence, derivation: m.derivation }))
}

export async function draftFromVisit(f: FirmScope, visitId: string) {
  const book = await usePriceBook(f)
  const rooms = await loadRooms(f, visitId)
  const options = takeoffOptions(book)
  const lines = takeoffRooms(rooms, options)
  const materials = await catalogue(f)
  const { lines: drafted, estimatedDaysX100 } = draftLines(lines, book, materials)
  // the same estimate room by room, at cost (each room rounded up on its own), for the quote page's breakdown
  const roomEstimates = estimateMaterialsByRoom(rooms.map(r => ({ roomName: r.name, lines: takeoffRoom(r, options) })), materials, { wastePercent: book.materialsWastePercent })
    .map(r => ({ roomName: r.roomName, materials: r.materials.map(({ name, packs, packLabel, costPence, derivation }) => ({ name, packs, packLabel, costPence, derivation })) }))
  const textured = rooms.some(r => r.surfaces.some(s => s.conditions.some(c => c.kind === 'textured-coating')))
  const narrowReturns = lines.some(l => l.key === 'narrow-return')
  return {
    lines: drafted as NewLine[],
    estimatedDaysX100,
    roomEstimates,
    cautions: textured ? [ASBESTOS_CAUTION] : [],
    rules: {
      voids: book.minDeductCm2 > 0
        ? `Openings of ${formatSquareMetres(book.minDeductCm2)} m² or less are measured as if plastered (the small-voids rule of SMM7, the older standard method of measurement); larger ones are taken off.`
        : 'Every opening is deducted from the area.',
      narrow: `Reveals and strips up to ${book.narrowMaxMm} mm wide are priced by the metre; wider ones by the square metre.`,
      days: `Days estimated at ${book.m2PerDay} m² a day, rounded up to the quarter day (a rule of thumb).`,
      ...(narrowReturns ? { corners: `An internal corner with a return narrower than ${book.cornerTrowelMm} mm (the corner trowel) is made good by hand, priced by the metre.` } : {}),
    },
  }
}
