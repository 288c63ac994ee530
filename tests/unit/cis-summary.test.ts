import { describe, expect, it } from 'vitest'
import type { CisInvoice, CisMonthRow, CisPayment, CisStatementIn, CisSummaryInput } from '../../shared/utils/cis-summary'
import { cisSummary } from '../../shared/utils/cis-summary'

// Sources (../shared/DOMAIN.md, "Money rules", CIS; gov.uk "What you must do as a CIS contractor:
// make deductions and pay subcontractors"; HMRC manual CISR): the contractor deducts 20% (or 30%, or
// 0%) of the labour part when it pays; the CIS tax month runs from the 6th to the 5th; the monthly
// statement to the subcontractor shows the gross amount paid excluding VAT, the cost of materials
// and the amount deducted. Worked example (DOMAIN.md, a common accountants' example): labour 500,
// materials 200, VAT 140 -> deduction 100. Our own rules, as briefed: a payment carries its share
// (payment / amount due) of the gross, the materials and the deduction, each rounded once to the
// penny, halves away from zero; rows by customer and tax month; the statement matched on customer
// and month. Every other amount below is an invented input; the working is beside it.
// Rules of thumb for the product, not tax advice: the statements, HMRC and the accountant decide.

const BRICK = { customerId: 'c-brick', customerName: 'Brick & Co Builders Ltd' }
const NORTH = { customerId: 'c-north', customerName: 'Northgate Construction' }

/** DOMAIN.md's worked example: labour 500, materials 200, VAT 140, CIS 20% of 500 = 100; due 840 - 100 = 740. */
const example = (id: string, who = BRICK, over: Partial<CisInvoice> = {}): CisInvoice => ({
  id, reference: id.toUpperCase(), ...who, cisRatePercent: 20,
  labourNetPence: 50_000, materialsNetPence: 20_000, vatPence: 14_000, cisDeductionPence: 10_000, amountDuePence: 74_000, ...over,
})
const paid = (id: string, invoiceId: string, receivedOn: string, amountPence: number): CisPayment => ({ id, invoiceId, receivedOn, amountPence })
const statement = (id: string, customerId: string, taxMonthStart: string, grossPence: number, materialsPence: number, deductionPence: number): CisStatementIn =>
  ({ id, customerId, taxMonthStart, grossPence, materialsPence, deductionPence })
const run = (over: Partial<CisSummaryInput>) => cisSummary({ invoices: [], payments: [], statements: [], ...over })
/** The figures of each row, to compare without the statement and invoice lists. */
const figures = (rows: CisMonthRow[]) => rows.map(r => [r.customerId, r.taxMonthStart, r.taxMonthEnd, r.grossPence, r.materialsPence, r.deductionPence])

describe('cisSummary: the worked example (DOMAIN.md: labour 500, materials 200, VAT 140 -> deduction 100)', () => {
  it('paid in full: gross 700 excluding VAT, materials 200, deducted 100 (gov.uk CIS guide: the statement shows gross excl. VAT, materials, deduction)', () => {
    const rows = run({ invoices: [example('inv-1')], payments: [paid('p1', 'inv-1', '2026-01-20', 74_000)] })
    expect(rows).toEqual([{
      ...BRICK, taxMonthStart: '2026-01-06', taxMonthEnd: '2026-02-05',
      grossPence: 70_000, materialsPence: 20_000, deductionPence: 10_000,
      invoices: ['INV-1'], statement: null, status: 'no-statement', differencePence: 0,
    }])
  })

  it('under the reverse charge the same invoice charges no VAT, due 600; paid in full the CIS figures are the same (gov.uk reverse-charge guide; CIS excludes VAT)', () => {
    const rows = run({ invoices: [example('inv-1', BRICK, { vatPence: 0, amountDuePence: 60_000 })], payments: [paid('p1', 'inv-1', '2026-01-20', 60_000)] })
    expect(figures(rows)).toEqual([['c-brick', '2026-01-06', '2026-02-05', 70_000, 20_000, 10_000]])
  })

  it('CIS at 30% (not registered; gov.uk CIS guide): 150 deducted, due 840 - 150 = 690', () => {
    const rows = run({ invoices: [example('inv-1', BRICK, { cisRatePercent: 30, cisDeductionPence: 15_000, amountDuePence: 69_000 })], payments: [paid('p1', 'inv-1', '2026-01-20', 69_000)] })
    expect(figures(rows)).toEqual([['c-brick', '2026-01-06', '2026-02-05', 70_000, 20_000, 15_000]])
  })

  it('gross payment status, 0% (gov.uk CIS guide): nothing deducted, still on the statement', () => {
    const rows = run({ invoices: [example('inv-1', BRICK, { cisRatePercent: 0, cisDeductionPence: 0, amountDuePence: 84_000 })], payments: [paid('p1', 'inv-1', '2026-01-20', 84_000)] })
    expect(figures(rows)).toEqual([['c-brick', '2026-01-06', '2026-02-05', 70_000, 20_000, 0]])
  })
})

describe('cisSummary: the tax month is the payment\'s, the 6th to the 5th (gov.uk CIS guide; DOMAIN.md)', () => {
  it.each([
    ['2026-02-05', '2026-01-06', '2026-02-05', 'the 5th ends the month that began 6 January'],
    ['2026-02-06', '2026-02-06', '2026-03-05', 'the 6th starts the next'],
    ['2026-01-05', '2025-12-06', '2026-01-05', 'across the year end'],
    ['2026-04-05', '2026-03-06', '2026-04-05', 'the last tax month of the tax year'],
    ['2026-04-06', '2026-04-06', '2026-05-05', 'the first of the next tax year'],
  ])('paid %s -> %s to %s (%s)', (receivedOn, start, end) => {
    const [row] = run({ invoices: [example('inv-1')], payments: [paid('p1', 'inv-1', receivedOn, 74_000)] })
    expect([row!.taxMonthStart, row!.taxMonthEnd]).toEqual([start, end])
  })

  it('two invoices, one paid on the 5th and one on the 6th: two months', () => {
    const rows = run({ invoices: [example('inv-1'), example('inv-2')], payments: [paid('p1', 'inv-1', '2026-02-05', 74_000), paid('p2', 'inv-2', '2026-02-06', 74_000)] })
    expect(figures(rows)).toEqual([
      ['c-brick', '2026-01-06', '2026-02-05', 70_000, 20_000, 10_000],
      ['c-brick', '2026-02-06', '2026-03-05', 70_000, 20_000, 10_000],
    ])
    expect(rows.map(r => r.invoices)).toEqual([['INV-1'], ['INV-2']])
  })

  it('the invoice date does not matter, only the payment\'s: an invoice paid in a later month counts there', () => {
    // no invoice date in the input at all: the row follows the payment on 2026-03-10
    const rows = run({ invoices: [example('inv-1')], payments: [paid('p1', 'inv-1', '2026-03-10', 74_000)] })
    expect(rows[0]!.taxMonthStart).toBe('2026-03-06')
  })
})

describe('cisSummary: part payments carry their share (as briefed: payment / amount due, each rounded half up)', () => {
  it.each<[string, CisInvoice[], CisPayment[], [string, string, number, number, number][]]>([
    // 370 of 740 is half: gross 350, materials 100, deduction 50 in each month
    ['half now, half next month', [example('inv-1')], [paid('p1', 'inv-1', '2026-01-20', 37_000), paid('p2', 'inv-1', '2026-02-20', 37_000)],
      [['c-brick', '2026-01-06', 35_000, 10_000, 5_000], ['c-brick', '2026-02-06', 35_000, 10_000, 5_000]]],
    // two halves in one month sum to the whole
    ['two halves in the same month', [example('inv-1')], [paid('p1', 'inv-1', '2026-01-07', 37_000), paid('p2', 'inv-1', '2026-02-05', 37_000)],
      [['c-brick', '2026-01-06', 70_000, 20_000, 10_000]]],
    // labour 10.00, VAT 2.00, CIS 2.00, due 10.00: 3.33 paid -> gross 3.33, deduction 2.00 x 0.333 = 0.666 -> 0.67
    ['a third: each figure rounded', [{ ...example('inv-1'), labourNetPence: 1_000, materialsNetPence: 0, vatPence: 200, cisDeductionPence: 200, amountDuePence: 1_000 }], [paid('p1', 'inv-1', '2026-01-20', 333)],
      [['c-brick', '2026-01-06', 333, 0, 67]]],
    // labour 5.00, materials 2.00, VAT 1.40, CIS 1.00, due 7.40: 3.70 paid -> gross 3.50, materials 1.00, deduction 0.50;
    // 0.37 paid -> gross 700 x 37/740 = 35, materials 10, deduction 5; 0.01 paid -> 0.946 -> 1, 0.27 -> 0, 0.135 -> 0
    ['small part payments', [example('inv-1', BRICK, { labourNetPence: 500, materialsNetPence: 200, vatPence: 140, cisDeductionPence: 100, amountDuePence: 740 })], [paid('p1', 'inv-1', '2026-01-20', 370), paid('p2', 'inv-1', '2026-02-20', 37), paid('p3', 'inv-1', '2026-03-20', 1)],
      [['c-brick', '2026-01-06', 350, 100, 50], ['c-brick', '2026-02-06', 35, 10, 5], ['c-brick', '2026-03-06', 1, 0, 0]]],
    // half a penny: labour 1.01, no materials, VAT 0.20, CIS 0.21 (our own figure), due 1.00: 0.50 paid ->
    // gross 101 x 0.5 = 50.5 -> 51; deduction 21 x 0.5 = 10.5 -> 11
    ['half a penny rounds up', [example('inv-1', BRICK, { labourNetPence: 101, materialsNetPence: 0, vatPence: 20, cisDeductionPence: 21, amountDuePence: 100 })], [paid('p1', 'inv-1', '2026-01-20', 50)],
      [['c-brick', '2026-01-06', 51, 0, 11]]],
  ])('%s', (_what, invoices, payments, expected) => {
    expect(run({ invoices, payments }).map(r => [r.customerId, r.taxMonthStart, r.grossPence, r.materialsPence, r.deductionPence])).toEqual(expected)
  })
})

describe('cisSummary: refunds are negative payments (as briefed; a refund takes back its share)', () => {
  it.each<[string, CisPayment[], [string, number, number, number][]]>([
    // 740 paid, then 74 (a tenth) refunded the next month: -70 gross, -20 materials, -10 deduction there
    ['a refund in a later month shows as negative figures there', [paid('p1', 'inv-1', '2026-01-20', 74_000), paid('r1', 'inv-1', '2026-02-10', -7_400)],
      [['2026-01-06', 70_000, 20_000, 10_000], ['2026-02-06', -7_000, -2_000, -1_000]]],
    // in the same month the refund nets off: 700 - 70 = 630, 200 - 20 = 180, 100 - 10 = 90
    ['a refund in the same month nets off', [paid('p1', 'inv-1', '2026-01-20', 74_000), paid('r1', 'inv-1', '2026-02-01', -7_400)],
      [['2026-01-06', 63_000, 18_000, 9_000]]],
    // the whole payment refunded in the month: a row of noughts (the payments are still behind it)
    ['refunded in full in the month', [paid('p1', 'inv-1', '2026-01-20', 74_000), paid('r1', 'inv-1', '2026-01-21', -74_000)],
      [['2026-01-06', 0, 0, 0]]],
    // halves away from zero: 50 of 1.00 due adds 50.5 -> 51 and the refund of 50 takes back -50.5 -> -51
    ['a refund takes back exactly what the payment added', [paid('p1', 'inv-2', '2026-01-20', 50), paid('r1', 'inv-2', '2026-01-22', -50)],
      [['2026-01-06', 0, 0, 0]]],
  ])('%s', (_what, payments, expected) => {
    const invoices = [example('inv-1'), example('inv-2', BRICK, { labourNetPence: 101, materialsNetPence: 0, vatPence: 20, cisDeductionPence: 21, amountDuePence: 100 })]
    expect(run({ invoices, payments }).map(r => [r.taxMonthStart, r.grossPence, r.materialsPence, r.deductionPence])).toEqual(expected)
  })
})

describe('cisSummary: matched against the contractors\' statements (gov.uk CIS guide: the statement shows gross, materials, deduction)', () => {
  const invoices = [example('inv-1'), example('inv-2', NORTH), example('inv-3', NORTH)]
  const payments = [paid('p1', 'inv-1', '2026-01-20', 74_000), paid('p2', 'inv-2', '2026-01-25', 74_000), paid('p3', 'inv-3', '2026-02-10', 74_000)]

  it.each<[string, CisStatementIn[], Partial<CisMonthRow>]>([
    ['the statement matches', [statement('st-1', 'c-brick', '2026-01-06', 70_000, 20_000, 10_000)],
      { status: 'matches', differencePence: 0, statement: { id: 'st-1', grossPence: 70_000, materialsPence: 20_000, deductionPence: 10_000 } }],
    // the contractor deducted 100.01: 1p more than we make it
    ['the deduction differs by a penny', [statement('st-1', 'c-brick', '2026-01-06', 70_000, 20_000, 10_001)], { status: 'differs', differencePence: 1 }],
    // the contractor deducted 140.00 (20% of 700, materials not taken off): 40.00 more
    ['the contractor took CIS off the materials too', [statement('st-1', 'c-brick', '2026-01-06', 70_000, 0, 14_000)], { status: 'differs', differencePence: 4_000 }],
    // the deduction agrees but the materials do not: differs, with no difference in the deduction
    ['only the materials differ', [statement('st-1', 'c-brick', '2026-01-06', 70_000, 19_000, 10_000)], { status: 'differs', differencePence: 0 }],
    // the gross includes the VAT (840): differs
    ['only the gross differs (VAT included by mistake)', [statement('st-1', 'c-brick', '2026-01-06', 84_000, 20_000, 10_000)], { status: 'differs', differencePence: 0 }],
    // the contractor deducted less: negative difference
    ['the contractor deducted less', [statement('st-1', 'c-brick', '2026-01-06', 70_000, 20_000, 9_000)], { status: 'differs', differencePence: -1_000 }],
    ['no statement recorded', [], { status: 'no-statement', differencePence: 0, statement: null }],
    // a statement for another month does not match this one
    ['a statement for the next month is not this month\'s', [statement('st-1', 'c-brick', '2026-02-06', 70_000, 20_000, 10_000)], { status: 'no-statement', statement: null }],
    // a statement from another customer does not match this one
    ['a statement from another customer is not this customer\'s', [statement('st-1', 'c-north', '2026-02-06', 70_000, 20_000, 10_000)], { status: 'no-statement', statement: null }],
  ])('%s', (_what, statements, expected) => {
    const row = run({ invoices, payments, statements }).find(r => r.customerId === 'c-brick' && r.taxMonthStart === '2026-01-06')
    expect(row).toMatchObject(expected)
  })

  it('a statement with no payments behind it is a row of its own, our figures 0, the name from the customer\'s invoices', () => {
    const rows = run({ invoices, payments, statements: [statement('st-9', 'c-north', '2026-03-06', 30_000, 5_000, 5_000)] })
    expect(rows.find(r => r.taxMonthStart === '2026-03-06')).toEqual({
      ...NORTH, taxMonthStart: '2026-03-06', taxMonthEnd: '2026-04-05', grossPence: 0, materialsPence: 0, deductionPence: 0,
      invoices: [], statement: { id: 'st-9', grossPence: 30_000, materialsPence: 5_000, deductionPence: 5_000 }, status: 'statement-only', differencePence: 5_000,
    })
  })

  it('a statement from a customer with no invoices here shows its customerId as the name', () => {
    const [row] = run({ statements: [statement('st-9', 'c-unknown', '2026-03-06', 30_000, 5_000, 5_000)] })
    expect(row).toMatchObject({ customerId: 'c-unknown', customerName: 'c-unknown', status: 'statement-only' })
  })

  it('sorts by tax month, then customer name', () => {
    const rows = run({
      invoices: [...invoices, example('inv-4', { customerId: 'c-ash', customerName: 'Ash Groundworks' })],
      payments: [...payments, paid('p4', 'inv-4', '2026-02-20', 74_000)],
      statements: [statement('st-0', 'c-north', '2025-12-06', 1_000, 0, 200)],
    })
    expect(rows.map(r => [r.taxMonthStart, r.customerName])).toEqual([
      ['2025-12-06', 'Northgate Construction'],
      ['2026-01-06', 'Brick & Co Builders Ltd'],
      ['2026-01-06', 'Northgate Construction'],
      ['2026-02-06', 'Ash Groundworks'],
      ['2026-02-06', 'Northgate Construction'],
    ])
  })

  it('lists the invoices behind a month once each, by reference', () => {
    const rows = run({ invoices, payments: [paid('p2', 'inv-3', '2026-01-25', 37_000), paid('p3', 'inv-2', '2026-01-26', 74_000), paid('p4', 'inv-3', '2026-02-01', 37_000)] })
    expect(rows.map(r => r.invoices)).toEqual([['INV-2', 'INV-3']])
  })
})

describe('cisSummary: bad input is a RangeError naming the field (our rules)', () => {
  const inv = example('inv-1')
  it.each<[string, Partial<CisSummaryInput>, RegExp]>([
    ['a payment for an unknown invoice', { invoices: [inv], payments: [paid('p1', 'nope', '2026-01-20', 100)] }, /payments\[0\]\.invoiceId/],
    ['a payment for an invoice with nothing due', { invoices: [{ ...inv, amountDuePence: 0 }], payments: [paid('p1', 'inv-1', '2026-01-20', 100)] }, /payments\[0\]\.invoiceId/],
    ['a payment date that is not real', { invoices: [inv], payments: [paid('p1', 'inv-1', '2026-02-30', 100)] }, /payments\[0\]\.receivedOn/],
    ['a payment date in UK style', { invoices: [inv], payments: [paid('p1', 'inv-1', '20/01/2026', 100)] }, /payments\[0\]\.receivedOn/],
    ['a payment with a fraction of a penny', { invoices: [inv], payments: [paid('p1', 'inv-1', '2026-01-20', 0.5)] }, /payments\[0\]\.amountPence/],
    ['negative labour', { invoices: [{ ...inv, labourNetPence: -1 }] }, /invoices\[0\]\.labourNetPence/],
    ['materials as a string', { invoices: [{ ...inv, materialsNetPence: '200' as unknown as number }] }, /invoices\[0\]\.materialsNetPence/],
    ['a deduction with a fraction', { invoices: [{ ...inv, cisDeductionPence: 99.5 }] }, /invoices\[0\]\.cisDeductionPence/],
    ['negative amount due', { invoices: [{ ...inv, amountDuePence: -1 }] }, /invoices\[0\]\.amountDuePence/],
    ['negative VAT', { invoices: [{ ...inv, vatPence: -1 }] }, /invoices\[0\]\.vatPence/],
    // gov.uk CIS guide: 0, 20 or 30
    ['a CIS rate of 25%', { invoices: [{ ...inv, cisRatePercent: 25 }] }, /invoices\[0\]\.cisRatePercent/],
    ['an invoice id given twice', { invoices: [inv, { ...inv, reference: 'AGAIN' }] }, /invoices\[1\]\.id/],
    // a CIS tax month starts on the 6th (gov.uk CIS guide)
    ['a statement month starting on the 1st', { statements: [statement('s1', 'c-brick', '2026-01-01', 0, 0, 0)] }, /statements\[0\]\.taxMonthStart/],
    ['a statement month that is not a date', { statements: [statement('s1', 'c-brick', '2026-13-06', 0, 0, 0)] }, /statements\[0\]\.taxMonthStart/],
    ['a negative statement deduction', { statements: [statement('s1', 'c-brick', '2026-01-06', 0, 0, -1)] }, /statements\[0\]\.deductionPence/],
    ['statement gross with a fraction', { statements: [statement('s1', 'c-brick', '2026-01-06', 0.1, 0, 0)] }, /statements\[0\]\.grossPence/],
    ['two statements for one customer and month', { statements: [statement('s1', 'c-brick', '2026-01-06', 0, 0, 0), statement('s2', 'c-brick', '2026-01-06', 0, 0, 0)] }, /statements\[1\]/],
  ])('%s', (_what, given, field) => {
    expect(() => run(given)).toThrow(RangeError)
    expect(() => run(given)).toThrow(field)
  })
})
