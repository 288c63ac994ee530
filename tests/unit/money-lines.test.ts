import { describe, expect, it } from 'vitest'
import { fieldErrors } from '../../shared/schemas/common'
import { invoiceDraftSchema } from '../../shared/schemas/invoice'
import { moneyLineSchema, MAX_UNIT_PENCE } from '../../shared/schemas/line'
import { quoteVersionSchema } from '../../shared/schemas/quote'
import { LINE_PRICE_ERROR, LINE_QUANTITY_ERROR, sentLines, typedLine, typedLineNetPence, type TypedLine } from '../../shared/utils/money-lines'

// The priced lines of quotes and invoices as typed and as sent (shared/utils/money-lines.ts), and
// the one line schema both check them with (shared/schemas/line.ts). Our own rules: quantities are
// thousandths of a unit, prices whole pence, a line's net is quantity x price half up to the penny
// (shared/utils/tax.ts lineNetPence).

const typed = (quantity: string, unitPrice: string, more: Partial<TypedLine> = {}): TypedLine =>
  ({ kind: 'labour', description: 'Skim the hall', quantity, unit: 'm²', unitPrice, vatRatePercent: 20, derivation: '', extraWork: false, ...more })

describe('reading typed lines', () => {
  it.each([
    // [quantity, price, sent quantityX1000, sent unitPence, the fields named]
    ['8.40', '18.00', 8_400, 18_00, []],
    ['2,5', '£1,234.5', 2_500, 1_234_50, []],
    ['1', '0', 1_000, 0, []],
    ['eight', '18.00', 0, 18_00, ['lines.0.quantityX1000']],
    ['1.2345', '18', 0, 18_00, ['lines.0.quantityX1000']], // four decimals: not a quantity
    ['-1', '18', 0, 18_00, ['lines.0.quantityX1000']],
    ['2', '18.001', 2_000, 0, ['lines.0.unitPence']], // a tenth of a penny
    ['1', '-120.00', 1_000, -120_00, []], // an invoice's line taking off what was invoiced before
    ['1', '−£40', 1_000, -40_00, []], // the minus sign a phone may type
    ['1', '-0', 1_000, 0, ['lines.0.unitPence']], // nothing taken off is not a line taking off
    ['1', '--5', 1_000, 0, ['lines.0.unitPence']],
    ['', '', 0, 0, ['lines.0.quantityX1000', 'lines.0.unitPence']],
  ] as const)('%s at %s', (quantity, price, quantityX1000, unitPence, fields) => {
    const read = sentLines([typed(quantity, price)])
    expect(read.lines[0]).toMatchObject({ quantityX1000, unitPence })
    expect(Object.keys(read.errors)).toEqual(fields)
  })

  it('names each bad field by its line, worded for the person', () => {
    const read = sentLines([typed('1', '10'), typed('x', 'y')])
    expect(read.errors).toEqual({ 'lines.1.quantityX1000': LINE_QUANTITY_ERROR, 'lines.1.unitPence': LINE_PRICE_ERROR })
  })

  it('keeps the VAT rate, the working and the extra-work flag as they are', () => {
    const [line] = sentLines([typed('1', '10', { vatRatePercent: 5, derivation: '3 x 2 = 6 m²', extraWork: true })]).lines
    expect(line).toMatchObject({ vatRatePercent: 5, derivation: '3 x 2 = 6 m²', extraWork: true })
  })

  it('reads a saved line back as it was typed', () => {
    const saved = { kind: 'materials' as const, description: 'Finish plaster', quantityX1000: 12_345, unit: 'bags', unitPence: 9_50, vatRatePercent: 5 }
    expect(typedLine(saved)).toEqual({ kind: 'materials', description: 'Finish plaster', quantity: '12.345', unit: 'bags', unitPrice: '9.50', vatRatePercent: 5, derivation: '', extraWork: false })
    expect(sentLines([typedLine(saved)]).lines[0]).toMatchObject(saved)
  })

  it('reads a line taking off what was invoiced before back as it was typed', () => {
    const saved = { kind: 'labour' as const, description: 'Less invoiced before: BP-3', quantityX1000: 1000, unit: 'item', unitPence: -120_50, vatRatePercent: 20 }
    expect(typedLine(saved).unitPrice).toBe('-120.50')
    expect(sentLines([typedLine(saved)])).toEqual({ lines: [expect.objectContaining(saved)], errors: {} })
    expect(typedLineNetPence({ quantity: '1', unitPrice: '-120.50' })).toBe(-120_50)
  })

  it.each([
    ['8.4', '18.00', 151_20], // 8.4 x £18.00 = £151.20
    ['0.333', '0.10', 3], // 0.333 x 10p = 3.33p, to 3p
    ['0.5', '0.01', 1], // half a penny, up
    ['x', '18.00', null],
  ] as const)('%s x £%s comes to %s pence', (quantity, price, pence) => {
    expect(typedLineNetPence({ quantity, unitPrice: price })).toBe(pence)
  })
})

describe('one line schema for quotes and invoices', () => {
  const line = { kind: 'labour', description: 'Skim', quantityX1000: 1_000, unitPence: 100_00 }
  const quote = (lines: unknown[]) => quoteVersionSchema.safeParse({ pricing: 'measure', estimatedDaysX100: 0, vat: 'standard', validUntil: '2026-12-31', lines })
  const invoice = (lines: unknown[]) => invoiceDraftSchema.safeParse({ vat: 'standard', lines })
  const fields = (r: { success: boolean, error?: { issues: Parameters<typeof fieldErrors>[0] } }) => r.success ? [] : Object.keys(fieldErrors(r.error!.issues))

  it('names the same bad fields, with the same words, on both', () => {
    const bad = { kind: 'paint', description: ' ', quantityX1000: 0, unitPence: 1.5, vatRatePercent: 17 }
    const q = quote([bad])
    const i = invoice([bad])
    expect(fields(q).sort()).toEqual(['lines.0.description', 'lines.0.kind', 'lines.0.quantityX1000', 'lines.0.unitPence', 'lines.0.vatRatePercent'])
    expect(fields(i).sort()).toEqual(fields(q).sort())
    expect(fieldErrors(i.error!.issues)).toEqual(fieldErrors(q.error!.issues))
  })

  it('fills in the unit and the VAT rate the same way on both', () => {
    expect(quote([line]).data!.lines[0]).toMatchObject({ unit: 'item', vatRatePercent: 20, derivation: '' })
    expect(invoice([line]).data!.lines[0]).toMatchObject({ unit: 'item', vatRatePercent: 20, extraWork: false })
  })

  it('keeps the working on a quote\'s line and the extra-work flag on an invoice\'s, and only there', () => {
    const both = { ...line, derivation: '3 x 2 = 6 m²', extraWork: true }
    expect(quote([both]).data!.lines[0]).not.toHaveProperty('extraWork')
    expect(quote([both]).data!.lines[0]!.derivation).toBe('3 x 2 = 6 m²')
    expect(invoice([both]).data!.lines[0]).not.toHaveProperty('derivation')
    expect(invoice([both]).data!.lines[0]!.extraWork).toBe(true)
  })

  it('takes a negative unit price only on an invoice, on a line taking off no more than the invoice charges', () => {
    const less = { ...line, description: 'Less invoiced before: BP-3', unitPence: -40_00 }
    expect(fields(quote([line, less]))).toEqual(['lines.1.unitPence'])
    expect(invoice([line, less]).success).toBe(true)
    const tooMuch = invoice([line, { ...less, unitPence: -100_01 }])
    expect(fieldErrors(tooMuch.error!.issues)).toEqual({ 'lines.1.unitPence': expect.stringMatching(/taking off/) })
    // labour and materials are each taken off their own: materials cannot take off labour
    expect(fields(invoice([line, { ...less, kind: 'materials' }]))).toEqual(['lines.1.unitPence'])
  })

  it('takes a unit price up to £1,000,000.00 and not a penny more', () => {
    expect(moneyLineSchema.safeParse({ ...line, unitPence: MAX_UNIT_PENCE }).success).toBe(true)
    expect(moneyLineSchema.safeParse({ ...line, unitPence: MAX_UNIT_PENCE + 1 }).success).toBe(false)
  })
})
