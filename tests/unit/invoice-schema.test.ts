import { describe, expect, it } from 'vitest'
import { fieldErrors } from '../../shared/schemas/common'
import { invoiceDraftSchema, MAX_INVOICE_PENCE } from '../../shared/schemas/invoice'

// The draft invoice schema keeps every line and the invoice total within what the database holds
// (32-bit whole pence, at most £21,474,836.47): at most £20,000,000.00 (our own limit), beside the
// field that is too much. VAT at 20% (DOMAIN.md, standard rate).

const line = (quantityX1000: number, unitPence: number, vatRatePercent: 0 | 5 | 20 = 20) => ({ kind: 'labour', description: 'Skim', quantityX1000, unitPence, vatRatePercent })
const errors = (body: unknown) => {
  const r = invoiceDraftSchema.safeParse(body)
  return r.success ? {} : fieldErrors(r.error.issues)
}

describe('invoice draft limits', () => {
  it('the limit is under the 32-bit column\'s largest value', () => {
    expect(MAX_INVOICE_PENCE).toBeLessThan(2 ** 31)
  })

  it.each([
    // [what, vat, lines, the fields named]
    ['22 x £1,000,000: the line is too much', 'standard', [line(22_000, 1_000_000_00)], ['lines.0.unitPence']],
    ['20 x £1,000,000 with no VAT: exactly the limit, accepted', 'not-registered', [line(20_000, 1_000_000_00, 0)], []],
    ['20 x £1,000,000 plus 20% VAT: the total is too much', 'standard', [line(20_000, 1_000_000_00)], ['lines']],
    ['two lines of £10,000,000 and one of 1p, no VAT: a penny too much', 'not-registered', [line(10_000, 1_000_000_00, 0), line(10_000, 1_000_000_00, 0), line(1_000, 1, 0)], ['lines']],
    ['an ordinary invoice', 'standard', [line(1_500, 180_00)], []],
  ] as const)('%s', (_what, vat, lines, fields) => {
    expect(Object.keys(errors({ vat, lines }))).toEqual(fields)
  })

  it('says what is wrong in pounds', () => {
    expect(errors({ vat: 'standard', lines: [line(20_000, 1_000_000_00)] }).lines).toMatch(/£24,000,000\.00.*at most £20,000,000\.00/)
  })
})

describe('invoice draft limits with other mistakes', () => {
  it('names the bad fields of a line and does not trip over them', () => {
    expect(Object.keys(errors({ vat: 'standard', lines: [{ kind: 'labour', description: '', quantityX1000: 0, unitPence: 1.5 }] })).sort())
      .toEqual(['lines.0.description', 'lines.0.quantityX1000', 'lines.0.unitPence'])
    // a negative price is a line taking off what was invoiced before: refused when it takes off more than the invoice charges
    expect(Object.keys(errors({ vat: 'standard', lines: [{ kind: 'labour', description: '', quantityX1000: 1000, unitPence: -1 }] })).sort())
      .toEqual(['lines.0.description', 'lines.0.unitPence'])
    expect(Object.keys(errors({ vat: 'reverse-charge', lines: [line(22_000, 1_000_000_00)] })).sort()).toEqual(['cisRatePercent', 'lines.0.unitPence'])
  })
})
