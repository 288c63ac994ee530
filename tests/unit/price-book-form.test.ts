import { describe, expect, it } from 'vitest'
import { minutesOfDay, priceBookBody, priceBookFormFrom, timeOfDay, type PriceBookFigures } from '../../shared/utils/price-book-form'

// Reading the price book form: pounds to pence, whole numbers, bead lengths in metres to
// millimetres (their rules: shared/utils/takeoff.ts). The figures here are invented, not advice.

const book: PriceBookFigures = {
  skimWallsPerM2Pence: 1800, skimCeilingsPerM2Pence: 2000, undercoatPerM2Pence: 1200, revealsPerLmPence: 900, beadsPerLmPence: 350, scrimPerLmPence: 150,
  materialsMarkupPercent: 10, narrowMaxMm: 300, beadWastePercent: 10, materialsWastePercent: 10, m2PerDay: 40,
  drySkimDays: 7, dryUndercoatDays: 14, dryColdOrDampExtraDays: 7, cornerTrowelMm: 100, outOfTrueToleranceMm: 10, bagsPerPersonPerSet: 3,
  packedBeadPerLmPence: 450, narrowReturnPerLmPence: 700, ceilingsFirst: true, quoteWorkPage: true,
  mixMinutes: 15, goOffMinutes: 105, dayStartMinutes: 480, dayEndMinutes: 990,
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
    expect(form.rates.packedBeadPerLmPence).toBe('4.50')
    expect(form.ceilingsFirst).toBe(true)
    expect(form.timeline).toEqual({ mixMinutes: '15', goOffMinutes: '105' })
    // minutes after midnight as the time field shows them: 480 = 08:00, 990 = 16:30
    expect(form.day).toEqual({ dayStartMinutes: '08:00', dayEndMinutes: '16:30' })
  })

  it('sends the ceilings rule as ticked, and the day as typed in the time fields', () => {
    const form = priceBookFormFrom(book)
    form.ceilingsFirst = false
    form.day.dayStartMinutes = '07:30'
    form.day.dayEndMinutes = '17:05'
    // 7 x 60 + 30 = 450; 17 x 60 + 5 = 1025
    expect(priceBookBody(form)).toEqual({ body: { ...book, ceilingsFirst: false, dayStartMinutes: 450, dayEndMinutes: 1025 } })
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
    ['a packed-out bead rate in words', (f) => { f.rates.packedBeadPerLmPence = 'four' }, { packedBeadPerLmPence: 'Enter a price in pounds, like 18.00.' }],
    ['a narrow-return rate below nothing', (f) => { f.rates.narrowReturnPerLmPence = '-3' }, { narrowReturnPerLmPence: 'Enter a price in pounds, like 18.00.' }],
    ['go-off minutes with a decimal', (f) => { f.timeline.goOffMinutes = '90.5' }, { goOffMinutes: 'Enter whole minutes.' }],
    ['mixing minutes left empty', (f) => { f.timeline.mixMinutes = '' }, { mixMinutes: 'Enter whole minutes.' }],
    ['a start that is not a time', (f) => { f.day.dayStartMinutes = '8am' }, { dayStartMinutes: 'Enter a time, like 08:00.' }],
    ['an end at 25:00', (f) => { f.day.dayEndMinutes = '25:00' }, { dayEndMinutes: 'Enter a time, like 16:30.' }],
    ['a day that ends before it starts', f => Object.assign(f.day, { dayStartMinutes: '16:00', dayEndMinutes: '08:00' }), { dayEndMinutes: 'The working day must end after it starts.' }],
    ['a day that ends as it starts', (f) => { f.day.dayEndMinutes = '08:00' }, { dayEndMinutes: 'The working day must end after it starts.' }],
  ])('names the field: %s', (_what, change, errors) => {
    const form = priceBookFormFrom(book)
    change(form)
    expect(priceBookBody(form)).toEqual({ errors })
  })
})

describe('times of the working day', () => {
  it.each<[string, number | null]>([
    // arithmetic: h x 60 + m
    ['08:00', 480], ['8:00', 480], ['16:30', 990], ['16.30', 990], [' 07:05 ', 425], ['00:00', 0], ['23:59', 1439],
    // not a time of day
    ['24:00', null], ['12:60', null], ['8', null], ['', null], ['noon', null], ['8:5', null],
  ])('%s -> %s', (typedIn, minutes) => expect(minutesOfDay(typedIn)).toBe(minutes))

  it.each<[number, string]>([[0, '00:00'], [480, '08:00'], [990, '16:30'], [1439, '23:59']])('%i shows as %s', (minutes, shown) => {
    expect(timeOfDay(minutes)).toBe(shown)
    expect(minutesOfDay(shown)).toBe(minutes)
  })
})
