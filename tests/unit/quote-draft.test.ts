import { describe, expect, it } from 'vitest'
import { DEFAULT_MATERIALS } from '../../shared/utils/materials'
import { type DraftPriceBook, draftLines, makingGoodLine } from '../../shared/utils/quote-draft'
import type { TakeoffLine } from '../../shared/utils/takeoff'

// Rates are invented test rates (DOMAIN.md gives 15 to 25 a m² of skimming for demo data only);
// coverage and waste are the default catalogue's (DOMAIN.md "Coverage": common practice); the days
// estimate's pace is the firm's own rule of thumb. The arithmetic is written beside each case.

const book: DraftPriceBook = {
  skimWallsPerM2Pence: 18_00, skimCeilingsPerM2Pence: 21_00, undercoatPerM2Pence: 14_00, revealsPerLmPence: 9_00,
  beadsPerLmPence: 6_00, scrimPerLmPence: 2_00, packedBeadPerLmPence: 4_50, narrowReturnPerLmPence: 7_00,
  materialsMarkupPercent: 15, materialsWastePercent: 10, m2PerDay: 30,
}
const line = (key: TakeoffLine['key'], unit: TakeoffLine['unit'], quantity: number, extra: Partial<TakeoffLine> = {}): TakeoffLine =>
  ({ key, unit, quantity, roomName: 'Back bedroom', derivation: `${key} working`, ...extra })

describe('draftLines: labour priced from the price book', () => {
  it.each<[string, TakeoffLine, { description: string, quantityX1000: number, unit: string, unitPence: number }]>([
    // 8.40 m² of wall at the wall rate: 8400 thousandths of a m² at £18.00
    ['walls by the m²', line('skim-walls', 'm2', 84_000), { description: 'Skim walls: Back bedroom', quantityX1000: 8400, unit: 'm²', unitPence: 18_00 }],
    // ceilings at their own (dearer, common practice) rate
    ['ceilings by the m²', line('skim-ceilings', 'm2', 120_000), { description: 'Skim ceilings: Back bedroom', quantityX1000: 12_000, unit: 'm²', unitPence: 21_00 }],
    // a wide reveal by area at the wall rate: 0.3612 m² (3612 cm²) -> 361 thousandths (half up)
    ['a wide reveal at the wall rate', line('reveals-area', 'm2', 3612), { description: 'Skim wide reveals and strips: Back bedroom', quantityX1000: 361, unit: 'm²', unitPence: 18_00 }],
    // 1.20 m of narrow reveal: 1200 mm = 1200 thousandths of a metre
    ['a narrow reveal by the metre', line('reveals-lm', 'lm', 1200, { areaCm2: 3000 }), { description: 'Reveals and narrow strips: Back bedroom', quantityX1000: 1200, unit: 'm', unitPence: 9_00 }],
    ['undercoat by the m²', line('undercoat', 'm2', 72_000), { description: 'Undercoat where the old plaster is off: Back bedroom', quantityX1000: 7200, unit: 'm²', unitPence: 14_00 }],
    ['patches at the undercoat rate', line('fill-patches', 'm2', 6000), { description: 'Fill patches in undercoat: Back bedroom', quantityX1000: 600, unit: 'm²', unitPence: 14_00 }],
    ['beads by the metre', line('beads', 'lm', 2400), { description: 'Fit beads: Back bedroom', quantityX1000: 2400, unit: 'm', unitPence: 6_00 }],
    ['scrim by the metre', line('scrim', 'lm', 3400), { description: 'Scrim and fill gaps round frames: Back bedroom', quantityX1000: 3400, unit: 'm', unitPence: 2_00 }],
  ])('%s', (_what, takeoff, expected) => {
    const labour = draftLines([takeoff], book, DEFAULT_MATERIALS).lines.filter(l => l.kind === 'labour')
    expect(labour).toEqual([{ kind: 'labour', vatRatePercent: 20, derivation: takeoff.derivation, ...expected }])
  })

  it.each<[string, TakeoffLine, Partial<DraftPriceBook>, { description: string, quantityX1000: number, unitPence: number, derivation: string }]>([
    // invented rates: 3.40 m of bead packed out at £4.50 a metre (3400 thousandths of a metre)
    ['a packed-out bead by the metre', line('packed-bead', 'lm', 3400, { derivation: 'Bead packed out along the 3.40 m corner between Wall 1 and Reveal: 3.40 m' }), {},
      { description: 'Pack out beads: Back bedroom', quantityX1000: 3400, unitPence: 4_50, derivation: 'Bead packed out along the 3.40 m corner between Wall 1 and Reveal: 3.40 m' }],
    // invented rates: 2.40 m of narrow return made good at £7.00 a metre
    ['a narrow return by the metre', line('narrow-return', 'lm', 2400, { derivation: 'Return 80 mm wide, narrower than the 100 mm corner trowel: made good by hand along 2.40 m' }), {},
      { description: 'Make good narrow returns: Back bedroom', quantityX1000: 2400, unitPence: 7_00, derivation: 'Return 80 mm wide, narrower than the 100 mm corner trowel: made good by hand along 2.40 m' }],
    // our rule: a rate not set (0) still drafts the line, so the work is seen and priced, and says why it is £0
    ['a packed-out bead with no rate set', line('packed-bead', 'lm', 3400, { derivation: 'Bead packed out along the 3.40 m corner: 3.40 m' }), { packedBeadPerLmPence: 0 },
      { description: 'Pack out beads: Back bedroom', quantityX1000: 3400, unitPence: 0, derivation: 'Bead packed out along the 3.40 m corner: 3.40 m. No rate for packing out a bead is set in Rates and rules: enter the price here' }],
    ['a narrow return with no rate set', line('narrow-return', 'lm', 2400, { derivation: 'Return 80 mm wide, narrower than the 100 mm corner trowel: made good by hand along 2.40 m' }), { narrowReturnPerLmPence: 0 },
      { description: 'Make good narrow returns: Back bedroom', quantityX1000: 2400, unitPence: 0, derivation: 'Return 80 mm wide, narrower than the 100 mm corner trowel: made good by hand along 2.40 m. No rate for making good a narrow return is set in Rates and rules: enter the price here' }],
  ])('corner work: %s', (_what, takeoff, rates, expected) => {
    const { lines } = draftLines([takeoff], { ...book, ...rates }, DEFAULT_MATERIALS)
    expect(lines).toEqual([{ kind: 'labour', unit: 'm', vatRatePercent: 20, ...expected }])
  })

  it('corner work adds no materials and no days (the days go by the m²)', () => {
    const takeoff = [line('packed-bead', 'lm', 3400), line('narrow-return', 'lm', 2400)]
    const { lines, estimatedDaysX100 } = draftLines(takeoff, book, DEFAULT_MATERIALS)
    expect(lines.map(l => l.kind)).toEqual(['labour', 'labour'])
    expect(estimatedDaysX100).toBe(0)
  })

  it('the bead order is materials, not labour', () => {
    const { lines } = draftLines([line('bead-lengths', 'lengths', 3, { stockLengthMm: 2500 })], book, DEFAULT_MATERIALS)
    expect(lines.map(l => l.kind)).toEqual(['materials'])
  })
})

describe('draftLines: materials at cost plus the mark-up', () => {
  it.each<[string, number, TakeoffLine, { quantityX1000: number, unitPence: number, derivation: RegExp }]>([
    // 9.60 m² x 1.1 / 10 = 1.056 -> 2 bags at £12.00 (demo) + 15% = £13.80 a bag
    ['finish with 15%', 15, line('skim-walls', 'm2', 96_000), { quantityX1000: 2000, unitPence: 13_80, derivation: /rounded up to 2 x 25 kg bag; at cost plus 15%$/ }],
    // no mark-up: at cost, and the derivation says nothing of one
    ['finish at cost', 0, line('skim-walls', 'm2', 96_000), { quantityX1000: 2000, unitPence: 12_00, derivation: /rounded up to 2 x 25 kg bag$/ }],
    // 2.5 m bead at £2.50 (demo) + 15% = £2.875, half up to £2.88
    ['a bead length, half a penny rounded up', 15, line('bead-lengths', 'lengths', 3, { stockLengthMm: 2500 }), { quantityX1000: 3000, unitPence: 2_88, derivation: /bead-lengths working: order 3 x 2.5 m length; at cost plus 15%/ }],
  ])('%s', (_what, markup, takeoff, expected) => {
    const [m] = draftLines([takeoff], { ...book, materialsMarkupPercent: markup }, DEFAULT_MATERIALS).lines.filter(l => l.kind === 'materials')
    expect(m).toMatchObject({ kind: 'materials', unit: 'packs', quantityX1000: expected.quantityX1000, unitPence: expected.unitPence })
    expect(m!.derivation).toMatch(expected.derivation)
  })

  it('leaves out what the catalogue lacks instead of pricing it at nothing', () => {
    const { lines } = draftLines([line('scrim', 'lm', 3400)], book, DEFAULT_MATERIALS.filter(m => m.type !== 'scrim'))
    expect(lines.map(l => l.kind)).toEqual(['labour'])
  })
})

describe('draftLines: the days estimate (the firm\'s pace, a rule of thumb), rounded up to the quarter day', () => {
  it.each<[string, number, number, number]>([
    // 30 m² at 30 m² a day = 1.00 day exactly
    ['exactly a day', 300_000, 30, 100],
    // 8.40 m² / 30 = 0.28 -> 0.50 (the next quarter)
    ['part of a day rounds up to the quarter', 84_000, 30, 50],
    // 7.50 / 30 = 0.25 exactly: stays 0.25
    ['exactly a quarter', 75_000, 30, 25],
    // 30.01 / 30 = 1.0003 -> 1.25
    ['a hair over a day', 300_100, 30, 125],
    // no pace set: no estimate
    ['no pace, no estimate', 300_000, 0, 0],
  ])('%s', (_what, skimCm2, m2PerDay, days) => {
    expect(draftLines([line('skim-walls', 'm2', skimCm2)], { ...book, m2PerDay }, DEFAULT_MATERIALS).estimatedDaysX100).toBe(days)
  })

  it('counts every m² line (walls, ceilings and undercoat) but not the metres', () => {
    // 9.60 + 12.00 + 7.20 = 28.80 m² / 30 = 0.96 -> 1.00; the 1.20 m of reveal is not an area
    const takeoff = [line('skim-walls', 'm2', 96_000), line('skim-ceilings', 'm2', 120_000), line('undercoat', 'm2', 72_000), line('reveals-lm', 'lm', 1200)]
    expect(draftLines(takeoff, book, DEFAULT_MATERIALS).estimatedDaysX100).toBe(100)
  })
})

describe('makingGoodLine', () => {
  it.each<[string, { name: string, unit: string, pricePence: number }, string]>([
    // invented price book items
    ['an item', { name: 'Make good round a socket', unit: 'item', pricePence: 12_00 }, 'Making good from Rates and rules: £12.00 per item'],
    ['by the metre', { name: 'Make good along a cable run', unit: 'metre', pricePence: 8_50 }, 'Making good from Rates and rules: £8.50 per metre'],
  ])('%s is one unit of labour at its price', (_what, item, derivation) => {
    expect(makingGoodLine(item)).toEqual({ kind: 'labour', description: item.name, quantityX1000: 1000, unit: item.unit, unitPence: item.pricePence, vatRatePercent: 20, derivation })
  })
})
