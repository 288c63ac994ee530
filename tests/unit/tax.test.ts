import { describe, expect, it } from 'vitest'
import type { InvoiceTotals, TaxContext, TaxLine } from '../../shared/utils/tax'
import { invoiceTotals, lineNetPence } from '../../shared/utils/tax'

// Sources (../shared/DOMAIN.md, "Money rules"): VAT total rounded down to a whole penny (HMRC VAT
// Notice 700 para 17.5; VATREC12010); domestic reverse charge (gov.uk "How to use the VAT domestic
// reverse charge if you supply building and construction services"); CIS 0/20/30% on labour only
// (gov.uk "What you must do as a CIS contractor"; HMRC COG909250). Prices are invented inputs.

const labour = (quantity: number, unitPence: number, vatRatePercent: 0 | 5 | 20 = 20): TaxLine => ({ kind: 'labour', quantity, unitPence, vatRatePercent })
const materials = (quantity: number, unitPence: number, vatRatePercent: 0 | 5 | 20 = 20): TaxLine => ({ kind: 'materials', quantity, unitPence, vatRatePercent })
const std: TaxContext = { vat: 'standard', cisRatePercent: null }

function totals(t: Partial<InvoiceTotals> & Pick<InvoiceTotals, 'labourNetPence' | 'materialsNetPence'>): InvoiceTotals {
  const netPence = t.labourNetPence + t.materialsNetPence
  const vatPence = t.vatPence ?? 0
  const grossPence = netPence + vatPence
  const cisDeductionPence = t.cisDeductionPence ?? 0
  return { netPence, vatPence, reverseChargeVatPence: 0, grossPence, cisDeductionPence, amountDuePence: grossPence - cisDeductionPence, ...t }
}

describe('lineNetPence: quantity x unit price, half up to the penny, no float error (arithmetic beside each case)', () => {
  it.each([
    [1, 1099, 1099],
    [12.345, 1800, 22221], // 12.345 m² x £18.00 = £222.21
    [12.345, 1799, 22209], // 22208.655 -> 22209
    [1.005, 100, 101], // 100.5 -> 101 half up (a float gives 1.005 * 100 = 100.4999...)
    [2.5, 1, 3], // 2.5 -> 3 (half up, not to even)
    [1.005, -100, -101], // a line taking off: -100.5 -> -101, exactly what the same line adds
    [0.001, 499, 0], // 0.499 -> 0
    [0.001, 500, 1], // 0.5 -> 1
    [0, 5000, 0],
    [3, 0, 0],
  ])('%s x %ip = %ip', (quantity, unitPence, net) => expect(lineNetPence({ quantity, unitPence })).toBe(net))
})

describe('invoiceTotals', () => {
  it.each<[string, TaxLine[], TaxContext, InvoiceTotals]>([
    // VAT Notice 700 para 17.5 / VATREC12010 (DOMAIN.md example): net 10.99 at 20% is 2.198 -> 2.19 rounded down
    ['net 10.99 at 20%: VAT 2.19', [labour(1, 1099)], std, totals({ labourNetPence: 1099, materialsNetPence: 0, vatPence: 219 })],
    // VAT Notice 700 para 17.5: the invoice total is rounded down (4.396 -> 4.39), not each line to the nearest (2.20 + 2.20)
    ['two lines of 10.99: the total VAT is rounded, not each line', [labour(1, 1099), materials(1, 1099)], std, totals({ labourNetPence: 1099, materialsNetPence: 1099, vatPence: 439 })],
    // VAT Notice 700 para 17.5, rates per line: 1099 x 20% = 219.80 + 1099 x 5% = 54.95 = 274.75 -> 274; 0% adds nothing
    ['mixed 20%, 5% and 0% lines', [labour(1, 1099, 20), materials(1, 1099, 5), materials(2, 500, 0)], std, totals({ labourNetPence: 1099, materialsNetPence: 2099, vatPence: 274 })],
    // arithmetic: 12.345 x 1800 = 22221; VAT 4444.2 -> 4444 (VAT Notice 700 para 17.5)
    ['3-decimal quantity: 12.345 m² at £18.00', [labour(12.345, 1800)], std, totals({ labourNetPence: 22221, materialsNetPence: 0, vatPence: 4444 })],
    // common accountants' example (DOMAIN.md): labour 500, materials 200, VAT 140 -> CIS deduction 100 (20% of labour only; gov.uk CIS guidance, COG909250)
    ['CIS 20%: labour 500, materials 200, VAT 140 -> 100', [labour(1, 50000), materials(1, 20000)], { vat: 'standard', cisRatePercent: 20 }, totals({ labourNetPence: 50000, materialsNetPence: 20000, vatPence: 14000, cisDeductionPence: 10000 })],
    // gov.uk CIS guidance: 30% for a subcontractor not registered for CIS, on labour only: 500 x 30% = 150
    ['CIS 30% on the same invoice -> 150', [labour(1, 50000), materials(1, 20000)], { vat: 'standard', cisRatePercent: 30 }, totals({ labourNetPence: 50000, materialsNetPence: 20000, vatPence: 14000, cisDeductionPence: 15000 })],
    // gov.uk CIS guidance: 0% with gross payment status
    ['CIS 0% (gross payment status)', [labour(1, 50000), materials(1, 20000)], { vat: 'standard', cisRatePercent: 0 }, totals({ labourNetPence: 50000, materialsNetPence: 20000, vatPence: 14000, cisDeductionPence: 0 })],
    // CIS rounded down to the penny (our rule, as briefed): 333 x 20% = 66.6 -> 66
    ['CIS rounded down', [labour(1, 333, 0)], { vat: 'not-registered', cisRatePercent: 20 }, totals({ labourNetPence: 333, materialsNetPence: 0, cisDeductionPence: 66 })],
    // gov.uk reverse-charge guidance: no VAT charged; the VAT the customer accounts for is stated (140); CIS still on labour (100)
    ['reverse charge with CIS 20%', [labour(1, 50000), materials(1, 20000)], { vat: 'reverse-charge', cisRatePercent: 20 }, totals({ labourNetPence: 50000, materialsNetPence: 20000, reverseChargeVatPence: 14000, cisDeductionPence: 10000 })],
    // reverse-charge VAT rounded down like any invoice total (VAT Notice 700 para 17.5): 2.198 -> 2.19
    ['reverse charge rounds the stated VAT down', [labour(1, 1099)], { vat: 'reverse-charge', cisRatePercent: 0 }, totals({ labourNetPence: 1099, materialsNetPence: 0, reverseChargeVatPence: 219 })],
    // not VAT-registered (below the threshold, gov.uk): no VAT at all, whatever rate a line carries
    ['not registered: no VAT', [labour(1, 50000), materials(1, 20000)], { vat: 'not-registered', cisRatePercent: null }, totals({ labourNetPence: 50000, materialsNetPence: 20000 })],
    ['not registered, CIS 20%', [labour(1, 50000), materials(1, 20000)], { vat: 'not-registered', cisRatePercent: 20 }, totals({ labourNetPence: 50000, materialsNetPence: 20000, cisDeductionPence: 10000 })],
    ['an empty invoice', [], std, totals({ labourNetPence: 0, materialsNetPence: 0 })],
    // a final invoice: the quote's lines, less a deposit invoiced before (500.00 + 33.33 - 100.00 labour; 19.99 - 4.00 materials): VAT on what is left
    ['the quote\'s lines less what was invoiced before', [labour(1, 500_00), labour(1, 33_33), labour(1, -100_00), materials(1, 19_99), materials(1, -4_00)], std, totals({ labourNetPence: 433_33, materialsNetPence: 15_99, vatPence: 89_86 })],
    ['an empty invoice under CIS', [], { vat: 'reverse-charge', cisRatePercent: 30 }, totals({ labourNetPence: 0, materialsNetPence: 0 })],
  ])('%s', (_what, lines, context, expected) => expect(invoiceTotals(lines, context)).toEqual(expected))

  it('fills the reverse-charge figure only under the reverse charge (gov.uk reverse-charge guidance)', () => {
    const lines = [labour(1, 50000)]
    expect(invoiceTotals(lines, { vat: 'standard', cisRatePercent: 20 })).toMatchObject({ vatPence: 10000, reverseChargeVatPence: 0, grossPence: 60000, amountDuePence: 50000 })
    expect(invoiceTotals(lines, { vat: 'reverse-charge', cisRatePercent: 20 })).toMatchObject({ vatPence: 0, reverseChargeVatPence: 10000, grossPence: 50000, amountDuePence: 40000 })
  })
})

describe('invoiceTotals refuses what it cannot total exactly (our rules, see shared/utils/tax.ts)', () => {
  it.each<[string, TaxLine[], TaxContext]>([
    ['a quantity with 4 decimals', [labour(1.2345, 100)], std],
    ['a negative quantity (a credit is its own document)', [labour(-1, 100)], std],
    ['a quantity that is not a number', [labour(Number.NaN, 100)], std],
    ['an infinite quantity', [labour(Number.POSITIVE_INFINITY, 100)], std],
    ['a tiny quantity written with an exponent', [labour(1e-7, 100)], std],
    ['pence with a fraction', [labour(1, 12.5)], std],
    ['a line taking off with nothing to take it from', [labour(1, -100)], std],
    ['a line taking off more labour than the invoice charges', [labour(1, 500), materials(1, 900), labour(1, -600)], std],
    ['a VAT rate that is not 0, 5 or 20', [{ kind: 'labour', quantity: 1, unitPence: 100, vatRatePercent: 17.5 as 20 }], std],
    ['a line that is neither labour nor materials', [{ kind: 'plant' as 'labour', quantity: 1, unitPence: 100, vatRatePercent: 20 }], std],
    ['a CIS rate that is not 0, 20 or 30', [labour(1, 100)], { vat: 'standard', cisRatePercent: 10 as 20 }],
    // gov.uk reverse-charge guidance: the reverse charge applies only to payments reported under CIS
    ['the reverse charge without CIS', [labour(1, 100)], { vat: 'reverse-charge', cisRatePercent: null }],
  ])('%s is a RangeError', (_what, lines, context) => expect(() => invoiceTotals(lines, context)).toThrow(RangeError))
})
