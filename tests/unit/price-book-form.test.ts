import { describe, expect, it } from 'vitest'
import { priceBookBody, priceBookFormFrom, type PriceBookFigures } from '../../shared/utils/price-book-form'

// Reading the price book form: pounds to pence, whole numbers, bead lengths in metres to
// millimetres (their rules: shared/utils/takeoff.ts). The figures here are invented, not advice.

const book: PriceBookFigures = {
  skimWallsPerM2Pence: 1800, skimCeilingsPerM2Pence: 2000, undercoatPerM2Pence: 1200, revealsPerLmPence: 900, beadsPerLmPence: 350, scrimPerLmPence: 150,
  materialsMarkupPercent: 10, narrowMaxMm: 300, beadWastePercent: 10, materialsWastePercent: 10, m2PerDay: 40,
  drySkimDays: 7, dryUndercoatDays: 14, dryColdOrDampExtraDays: 7, cornerTrowelMm: 100, outOfTrueToleranceMm: 10, bagsPerPersonPerSet: 3,
  minDeductCm2: 5000, beadStockLengthsMm: [2500, 3000], makingGoodItems: [{ name: 'Make good round a socket', unit: 'item', pricePence: 3500 }],
}

describe('priceBookFormFrom and priceBookBody', () => {
  it('reads the book into the form as typed figures', () => {
    const form = priceBookFormFrom(book)
    expect(form.rates.skimWallsPerM2Pence).toBe('18.00')
    expect(form.takeOff.m2PerDay).toBe('40')
    expect(form.beadStockLengths).toBe('2.5, 3.0')
    expect(form.makingGood).toEqual([{ name: 'Make good round a socket', unit: 'item', price: '35.00' }])
    expect(form.minDeductCm2).toBe(5000)
  })

  it('sends back what it read, unchanged', () => {
    const r = priceBookBody(priceBookFormFrom(book))
    expect(r).toEqual({ body: book })
  })

  it.each<[string, (f: ReturnType<typeof priceBookFormFrom>) => void, Record<string, string>]>([
    ['a rate in words', (f) => { f.rates.skimCeilingsPerM2Pence = 'twenty' }, { skimCeilingsPerM2Pence: 'Enter a price in pounds, like 18.00.' }],
    ['a part-number of days', (f) => { f.site.drySkimDays = '7.5' }, { drySkimDays: 'Enter a whole number.' }],
    ['an empty mark-up', (f) => { f.takeOff.materialsMarkupPercent = ' ' }, { materialsMarkupPercent: 'Enter a whole number.' }],
    ['a bead length of 30 m', (f) => { f.beadStockLengths = '2.5, 30' }, { beadStockLengthsMm: '30.0 m? A bead length is from 0.5 m to 6 m.' }],
    ['a making-good price in words', (f) => { f.makingGood[0]!.price = 'a lot' }, { 'makingGoodItems.0.pricePence': 'Enter a price in pounds, like 35.00.' }],
  ])('names the field: %s', (_what, change, errors) => {
    const form = priceBookFormFrom(book)
    change(form)
    expect(priceBookBody(form)).toEqual({ errors })
  })
})
