import { describe, expect, it } from 'vitest'
import type { VatBox, VatPayment, VatPurchase, VatReturnInput, VatSale } from '../../shared/utils/vat-return'
import { vatReturn } from '../../shared/utils/vat-return'

// Sources: the boxes (HMRC VAT Notice 700/12 "How to fill in and submit your VAT Return", section 3,
// box by box: box 1 VAT on sales, box 2 EU acquisitions (Northern Ireland only), box 3 = 1 + 2, box 4
// VAT reclaimed, box 5 the difference of 3 and 4 (section 3.6), box 6 sales and box 7 purchases
// excluding VAT, boxes 8 and 9 Northern Ireland goods; boxes 6 to 9 in whole pounds; credit notes
// reduce the boxes). Domestic reverse charge: the supplier puts the net in box 6 only (gov.uk "How
// to use the VAT domestic reverse charge if you supply building and construction services"; VAT
// Notice 700/12 section 4.6). Cash accounting: output VAT when the customer pays (VAT Notice 731;
// VAT Regulations 1995 reg. 57), and reverse-charge sales kept out of the scheme, counted under the
// reverse charge when invoiced (HMRC manual VATREVCON35200, from memory). Our own rules, as briefed: a payment's
// share is payment / amount due (gross less CIS), rounded once to the penny, halves away from
// zero; pence dropped toward zero for whole pounds; purchases counted when bought.
// Every amount below is an invented input, not an official figure; the working is beside it.
// Rules of thumb for the product, not tax advice: HMRC's guidance and the firm's accountant decide.

const sale = (over: Partial<VatSale> & Pick<VatSale, 'id' | 'issuedOn' | 'netPence' | 'vatPence'>): VatSale =>
  ({ reference: over.id.toUpperCase(), kind: 'invoice', vat: 'standard', amountDuePence: over.netPence + over.vatPence, customerName: 'A customer', ...over })
const paid = (id: string, invoiceId: string, receivedOn: string, amountPence: number): VatPayment => ({ id, invoiceId, receivedOn, amountPence })
const bought = (id: string, boughtOn: string, netPence: number, vatPence: number, supplier = 'A merchant'): VatPurchase => ({ id, reference: id.toUpperCase(), supplier, boughtOn, netPence, vatPence })
const boxes = (b1: number, b4: number, b6: number, b7: number): Record<VatBox, number> =>
  ({ 1: b1, 2: 0, 3: b1, 4: b4, 5: Math.abs(b1 - b4), 6: b6, 7: b7, 8: 0, 9: 0 })
const input = (over: Partial<VatReturnInput>): VatReturnInput => ({ basis: 'invoice', start: '2026-01-01', end: '2026-03-31', sales: [], payments: [], purchases: [], ...over })

// ---------------------------------------------------------------------------------------------
// The quarter 1 January to 31 March 2026 (a stagger 1 quarter), worked by hand.
const SALES: VatSale[] = [
  // a homeowner's skim, issued in the quarter: net 1200.00, VAT 240.00, due 1440.00
  sale({ id: 'inv-101', issuedOn: '2026-01-12', netPence: 120_000, vatPence: 24_000, customerName: 'Mrs A Patel' }),
  // a landlord's ceiling: net 450.00, VAT 90.00, due 540.00
  sale({ id: 'inv-102', issuedOn: '2026-02-03', netPence: 45_000, vatPence: 9_000, customerName: 'Harbour Lettings' }),
  // to a builder under CIS and the reverse charge: labour 500 + materials 200 = net 700.00, no VAT
  // charged (the customer accounts for the 140.00), CIS 20% of 500 = 100.00, so 600.00 due
  sale({ id: 'inv-103', issuedOn: '2026-02-20', vat: 'reverse-charge', netPence: 70_000, vatPence: 0, amountDuePence: 60_000, customerName: 'Brick & Co Builders Ltd' }),
  // a credit note against inv-102 for a patch not done: net 50.00, VAT 10.00
  sale({ id: 'cn-001', issuedOn: '2026-03-02', kind: 'credit-note', netPence: 5_000, vatPence: 1_000, customerName: 'Harbour Lettings' }),
  // issued in the previous quarter, paid in this one
  sale({ id: 'inv-099', issuedOn: '2025-12-18', netPence: 30_000, vatPence: 6_000, customerName: 'Mr B Okafor' }),
  // issued before the firm registered for VAT (registered 1 February 2026, say): no VAT on it
  sale({ id: 'inv-100', issuedOn: '2026-01-20', vat: 'not-registered', netPence: 20_000, vatPence: 0, customerName: 'Mr C Doyle' }),
  // issued the day after the quarter ends
  sale({ id: 'inv-104', issuedOn: '2026-04-01', netPence: 10_000, vatPence: 2_000, customerName: 'Mrs A Patel' }),
]
const PAYMENTS: VatPayment[] = [
  paid('pay-1', 'inv-099', '2026-01-09', 36_000), // the whole of inv-099: share 1
  paid('pay-2', 'inv-101', '2026-01-30', 48_000), // a third of 1440.00
  paid('pay-3', 'inv-101', '2026-03-15', 48_000), // another third
  paid('pay-4', 'inv-101', '2026-04-01', 48_000), // the last third, the day after the quarter
  paid('pay-5', 'inv-102', '2026-02-10', 54_000), // inv-102 in full
  paid('pay-6', 'inv-102', '2026-03-05', -6_000), // the credit note's 60.00 paid back: a refund, -1/9 of 540.00
  paid('pay-7', 'inv-103', '2026-03-10', 60_000), // the builder pays the 600.00 due
  paid('pay-8', 'inv-100', '2026-02-01', 20_000), // the not-registered invoice paid
]
const PURCHASES: VatPurchase[] = [
  bought('pur-0', '2025-12-31', 7_000, 1_400), // the day before the quarter: out
  bought('pur-1', '2026-01-08', 18_500, 3_700, 'Plaster merchant'), // finish plaster and beads
  bought('pur-2', '2026-02-14', 4_250, 850, 'Tool hire'),
  bought('pur-3', '2026-03-31', 999, 199, 'Fuel'), // the last day of the quarter: in
  bought('pur-4', '2026-04-01', 5_000, 1_000), // the day after: out
]
const quarter = (basis: 'invoice' | 'cash') => vatReturn(input({ basis, sales: SALES, payments: PAYMENTS, purchases: PURCHASES }))

/** Boxes 1 and 4 from their entries' VAT, 6 and 7 from their entries' net. */
const fromEntries = (r: ReturnType<typeof vatReturn>, box: 1 | 4 | 6 | 7) =>
  r.entries.filter(e => e.box === box).reduce((s, e) => s + (box === 1 || box === 4 ? e.vatPence : e.netPence), 0)

describe('vatReturn: the quarter on the invoice basis (VAT Notice 700/12 section 3; gov.uk reverse-charge guide)', () => {
  const r = quarter('invoice')

  it('fills the boxes as worked by hand', () => {
    // box 1: inv-101 240.00 + inv-102 90.00 - cn-001 10.00 = 320.00; inv-103 reverse charge adds nothing;
    //        inv-099 (December) and inv-104 (April) are outside; inv-100 not registered
    // box 4: pur-1 37.00 + pur-2 8.50 + pur-3 1.99 = 47.49 (pur-0 and pur-4 outside)
    // box 5: 320.00 - 47.49 = 272.51 to pay
    // box 6: 1200.00 + 450.00 + 700.00 (reverse charge, box 6 only) - 50.00 = 2300.00
    // box 7: 185.00 + 42.50 + 9.99 = 237.49
    expect(r.boxes).toEqual({ 1: 32_000, 2: 0, 3: 32_000, 4: 4_749, 5: 27_251, 6: 230_000, 7: 23_749, 8: 0, 9: 0 })
    expect(r.toPay).toBe(true)
    // boxes 6 to 9 in whole pounds (VAT Notice 700/12): 2300.00 -> 2300; 237.49 -> 237
    expect(r.wholePounds).toEqual({ 6: 2300, 7: 237, 8: 0, 9: 0 })
    expect(r).toMatchObject({ basis: 'invoice', start: '2026-01-01', end: '2026-03-31' })
  })

  it('lists each document once per box it feeds, credit notes negative', () => {
    const perBox = (box: number) => r.entries.filter(e => e.box === box).map(e => [e.id, e.netPence, e.vatPence])
    expect(perBox(1)).toEqual([['inv-101', 120_000, 24_000], ['inv-102', 45_000, 9_000], ['cn-001', -5_000, -1_000]])
    // the reverse-charge sale feeds box 6 only (gov.uk reverse-charge guide)
    expect(perBox(6)).toEqual([['inv-101', 120_000, 24_000], ['inv-102', 45_000, 9_000], ['inv-103', 70_000, 0], ['cn-001', -5_000, -1_000]])
    expect(perBox(4)).toEqual([['pur-1', 18_500, 3_700], ['pur-2', 4_250, 850], ['pur-3', 999, 199]])
    expect(perBox(7)).toEqual(perBox(4))
    expect(r.entries.find(e => e.id === 'inv-103')).toMatchObject({ source: 'invoice', reference: 'INV-103', date: '2026-02-20', party: 'Brick & Co Builders Ltd' })
    expect(r.entries.find(e => e.id === 'cn-001')).toMatchObject({ source: 'credit-note' })
    expect(r.entries.find(e => e.id === 'pur-2')).toMatchObject({ source: 'purchase', party: 'Tool hire', date: '2026-02-14' })
    expect(r.entries.every(e => e.note.length > 0)).toBe(true)
  })

  it('leaves out the invoice issued when not registered, and says why', () => {
    expect(r.excluded).toHaveLength(1)
    expect(r.excluded[0]).toMatchObject({ id: 'inv-100', reference: 'INV-100' })
    expect(r.excluded[0]!.reason).toMatch(/not VAT registered/)
  })

  it.each([1, 4, 6, 7] as const)('box %i is the sum of its entries', box => expect(fromEntries(r, box)).toBe(r.boxes[box]))
})

describe('vatReturn: the same quarter on the cash basis (VAT Notice 731; VATREVCON35200)', () => {
  const r = quarter('cash')

  it('fills the boxes as worked by hand', () => {
    // box 1 (VAT on payments received in the quarter, Notice 731):
    //   pay-1 inv-099 in full: 60.00; pay-2 and pay-3 a third each of 240.00: 80.00 + 80.00;
    //   pay-5 inv-102 in full: 90.00; pay-6 refund -1/9 of 90.00: -10.00  -> 300.00
    //   (pay-4 in April; pay-7 reverse charge; pay-8 not registered; cn-001 does not count on the cash basis)
    // box 4 and box 7: purchases as on the invoice basis, 47.49 and 237.49
    // box 5: 300.00 - 47.49 = 252.51 to pay
    // box 6: 300.00 + 400.00 + 400.00 + 450.00 - 50.00 (the payments' net shares)
    //        + 700.00 inv-103, issued in the quarter (reverse charge counted when invoiced, VATREVCON35200) = 2200.00
    expect(r.boxes).toEqual({ 1: 30_000, 2: 0, 3: 30_000, 4: 4_749, 5: 25_251, 6: 220_000, 7: 23_749, 8: 0, 9: 0 })
    expect(r.wholePounds).toEqual({ 6: 2200, 7: 237, 8: 0, 9: 0 })
    expect(r.toPay).toBe(true)
  })

  it('credits each payment with its share of the invoice', () => {
    const perBox = (box: number) => r.entries.filter(e => e.box === box).map(e => [e.source, e.id, e.reference, e.date, e.netPence, e.vatPence])
    expect(perBox(1)).toEqual([
      ['payment', 'pay-1', 'INV-099', '2026-01-09', 30_000, 6_000],
      ['payment', 'pay-2', 'INV-101', '2026-01-30', 40_000, 8_000],
      ['payment', 'pay-5', 'INV-102', '2026-02-10', 45_000, 9_000],
      ['payment', 'pay-6', 'INV-102', '2026-03-05', -5_000, -1_000],
      ['payment', 'pay-3', 'INV-101', '2026-03-15', 40_000, 8_000],
    ])
    expect(perBox(6)).toContainEqual(['invoice', 'inv-103', 'INV-103', '2026-02-20', 70_000, 0])
    expect(perBox(6)).toHaveLength(6)
    expect(r.entries.find(e => e.id === 'pay-2')).toMatchObject({ party: 'Mrs A Patel' })
  })

  it('lists what it left out: the not-registered invoice, the credit note and the reverse-charge payment', () => {
    expect(r.excluded.map(e => [e.id, e.reference]).sort()).toEqual([['cn-001', 'CN-001'], ['inv-100', 'INV-100'], ['pay-7', 'INV-103']])
    expect(r.excluded.find(e => e.id === 'cn-001')!.reason).toMatch(/cash basis/)
    expect(r.excluded.find(e => e.id === 'pay-7')!.reason).toMatch(/reverse-charge/)
  })

  it.each([1, 4, 6, 7] as const)('box %i is the sum of its entries', box => expect(fromEntries(r, box)).toBe(r.boxes[box]))
})

describe('vatReturn: box 5 and who pays (VAT Notice 700/12 section 3.6)', () => {
  it.each<[string, VatReturnInput, Record<VatBox, number>, boolean]>([
    // sales VAT 20.00, purchases VAT 100.00: box 5 = |20.00 - 100.00| = 80.00 reclaimed
    ['a reclaim: more VAT on purchases than on sales', input({ sales: [sale({ id: 's1', issuedOn: '2026-02-01', netPence: 10_000, vatPence: 2_000 })], purchases: [bought('p1', '2026-02-02', 50_000, 10_000)] }), boxes(2_000, 10_000, 10_000, 50_000), false],
    // 100.00 each side: box 5 = 0, nothing to pay but nothing to reclaim (toPay, as box 3 >= box 4)
    ['level: box 5 is 0', input({ sales: [sale({ id: 's1', issuedOn: '2026-02-01', netPence: 50_000, vatPence: 10_000 })], purchases: [bought('p1', '2026-02-02', 50_000, 10_000)] }), boxes(10_000, 10_000, 50_000, 50_000), true],
    // only a reverse-charge sale and a purchase: box 1 = 0, box 5 = 8.00 reclaimed, box 6 = 700.00 (gov.uk reverse-charge guide)
    ['reverse charge only: a reclaim', input({ sales: [sale({ id: 's1', issuedOn: '2026-02-01', vat: 'reverse-charge', netPence: 70_000, vatPence: 0, amountDuePence: 60_000 })], purchases: [bought('p1', '2026-02-02', 4_000, 800)] }), boxes(0, 800, 70_000, 4_000), false],
    // a credit note bigger than the quarter's sales: box 1 = 20.00 - 30.00 = -10.00; box 5 = |-10.00 - 0| = 10.00 reclaimed; box 6 = -50.00
    ['credit notes over the sales: negative box 1 and box 6', input({ sales: [sale({ id: 's1', issuedOn: '2026-02-01', netPence: 10_000, vatPence: 2_000 }), sale({ id: 'c1', kind: 'credit-note', issuedOn: '2026-02-05', netPence: 15_000, vatPence: 3_000 })] }), boxes(-1_000, 0, -5_000, 0), false],
    ['an empty quarter: all nought, nothing to pay', input({}), boxes(0, 0, 0, 0), true],
  ])('%s', (_what, given, expected, toPay) => {
    const r = vatReturn(given)
    expect(r.boxes).toEqual(expected)
    expect(r.toPay).toBe(toPay)
  })
})

describe('vatReturn: boxes 6 and 7 in whole pounds, pence dropped toward zero (VAT Notice 700/12: whole pounds; toward zero is our rule)', () => {
  it.each<[string, VatSale[], VatPurchase[], { 6: number, 7: number, 8: number, 9: number }]>([
    // 123.99 -> 123 (not rounded to 124); 0.99 -> 0
    ['pence dropped, never rounded up', [sale({ id: 's1', issuedOn: '2026-01-05', netPence: 12_399, vatPence: 2_480 })], [bought('p1', '2026-01-05', 99, 20)], { 6: 123, 7: 0, 8: 0, 9: 0 }],
    // a credit note only: -123.45 -> -123 (toward zero, not -124)
    ['a negative box 6 drops toward zero', [sale({ id: 'c1', kind: 'credit-note', issuedOn: '2026-01-05', netPence: 12_345, vatPence: 2_469 })], [], { 6: -123, 7: 0, 8: 0, 9: 0 }],
    // -0.50 -> 0, and a plain 0, not -0
    ['under a pound negative gives 0', [sale({ id: 'c1', kind: 'credit-note', issuedOn: '2026-01-05', netPence: 50, vatPence: 10 })], [], { 6: 0, 7: 0, 8: 0, 9: 0 }],
    ['exact pounds', [sale({ id: 's1', issuedOn: '2026-01-05', netPence: 100_000, vatPence: 20_000 })], [bought('p1', '2026-01-05', 2_500_00, 500_00)], { 6: 1000, 7: 2500, 8: 0, 9: 0 }],
  ])('%s', (_what, sales, purchases, expected) => {
    const pounds = vatReturn(input({ sales, purchases })).wholePounds
    expect(pounds).toEqual(expected)
    expect(Object.is(pounds[6], -0)).toBe(false)
  })
})

describe('vatReturn: the cash basis, shares of an invoice rounded once to the penny (VAT Notice 731: VAT when paid; rounding is our rule)', () => {
  // net 100.00 + VAT 20.00 = 120.00 due
  const inv = sale({ id: 'i1', issuedOn: '2025-11-20', netPence: 10_000, vatPence: 2_000 })
  // net 1.00 + VAT 0.20 = 1.20 due: 0.69 paid is a share of 69/120
  const small = sale({ id: 'i2', issuedOn: '2025-11-20', netPence: 100, vatPence: 20 })
  // with CIS: labour 500 + materials 200 = 700.00 net, VAT 140.00 (a builder not VAT registered, so no
  // reverse charge), CIS 100.00: due 740.00 (DOMAIN.md's worked example, common accountants' example)
  const cis = sale({ id: 'i3', issuedOn: '2025-11-20', netPence: 70_000, vatPence: 14_000, amountDuePence: 74_000 })
  // net 8.33 + VAT 1.67 = 10.00 due
  const half = sale({ id: 'i4', issuedOn: '2025-11-20', netPence: 833, vatPence: 167 })
  const cash = (sales: VatSale[], payments: VatPayment[]) => vatReturn(input({ basis: 'cash', sales, payments }))

  it.each<[string, VatSale[], VatPayment[], number, number]>([
    // 40.00 of 120.00 is a third: 10000 / 3 = 3333.33 -> 3333; 2000 / 3 = 666.67 -> 667
    ['a third paid', [inv], [paid('p1', 'i1', '2026-01-10', 4_000)], 667, 3_333],
    // three thirds, each rounded on its own: 3 x 3333 = 9999 and 3 x 667 = 2001 (a penny each way off the invoice)
    ['three thirds, each rounded', [inv], [paid('p1', 'i1', '2026-01-10', 4_000), paid('p2', 'i1', '2026-02-10', 4_000), paid('p3', 'i1', '2026-03-10', 4_000)], 2_001, 9_999],
    // 100 x 69 / 120 = 57.5 -> 58 and 20 x 69 / 120 = 11.5 -> 12 exactly; a float share (69 / 120 = 0.575) x 100 gives 57.49999... -> 57
    ['exact halves where a float share would round down', [small], [paid('p1', 'i2', '2026-01-10', 69)], 12, 58],
    // 833 x 500 / 1000 = 416.5 -> 417; 167 x 0.5 = 83.5 -> 84 (both half up, so 501p from a 500p payment)
    ['half a penny rounds up', [half], [paid('p1', 'i4', '2026-01-10', 500)], 84, 417],
    // the refund takes back exactly what the payment added: -416.5 -> -417, -83.5 -> -84 (halves away from zero)
    ['a refund of the same amount takes back the same pence', [half], [paid('p1', 'i4', '2026-01-10', 500), paid('r1', 'i4', '2026-01-20', -500)], 0, 0],
    // the CIS deduction is paid along with the payment: 740.00 received is the whole invoice -> 700.00 and 140.00
    ['CIS: the amount due received is the whole invoice', [cis], [paid('p1', 'i3', '2026-01-10', 74_000)], 14_000, 70_000],
    // 370.00 of 740.00 is half: 350.00 and 70.00
    ['CIS: half the amount due is half the net and VAT', [cis], [paid('p1', 'i3', '2026-01-10', 37_000)], 7_000, 35_000],
    // an overpayment of 130.00 on 120.00: 10000 x 13/12 = 10833.33 -> 10833; 2000 x 13/12 = 2166.67 -> 2167
    ['an overpayment counts as paid', [inv], [paid('p1', 'i1', '2026-01-10', 13_000)], 2_167, 10_833],
    // a refund alone in the quarter (the payment was in the last one): -40.00 of 120.00 -> -3333 and -667
    ['a refund alone takes VAT off', [inv], [paid('r1', 'i1', '2026-01-10', -4_000)], -667, -3_333],
    // paid on the last day of the quarter (in) and the first day of the next (out)
    ['the quarter\'s last day is in, the next day is out', [inv], [paid('p1', 'i1', '2026-03-31', 12_000), paid('p2', 'i1', '2026-04-01', 12_000)], 2_000, 10_000],
    // paid on the day before the quarter starts: out
    ['the day before the quarter is out', [inv], [paid('p1', 'i1', '2025-12-31', 12_000)], 0, 0],
  ])('%s: box 1 %ip, box 6 %ip', (_what, sales, payments, box1, box6) => {
    const r = cash(sales, payments)
    expect([r.boxes[1], r.boxes[6]]).toEqual([box1, box6])
    expect([fromEntries(r, 1), fromEntries(r, 6)]).toEqual([box1, box6])
  })

  it('a payment on the cash basis does not count on the invoice basis, nor an invoice from last quarter (VAT Notice 731)', () => {
    const r = vatReturn(input({ basis: 'invoice', sales: [inv], payments: [paid('p1', 'i1', '2026-01-10', 12_000)] }))
    expect(r.boxes).toEqual(boxes(0, 0, 0, 0))
    expect(r.entries).toEqual([])
  })

  it('on the invoice basis, payments are not looked at, so one for an invoice not given is no error', () => {
    expect(vatReturn(input({ payments: [paid('p1', 'elsewhere', '2026-01-10', 100)] })).boxes[1]).toBe(0)
  })

  it('on the cash basis, a payment outside the quarter is not looked up (only the payments that count must match a sale)', () => {
    expect(cash([], [paid('p1', 'elsewhere', '2025-12-31', 100)]).boxes[1]).toBe(0)
  })

  it('a reverse-charge credit note on the cash basis reduces box 6 when issued (VATREVCON35200)', () => {
    const r = cash([sale({ id: 'c1', kind: 'credit-note', vat: 'reverse-charge', issuedOn: '2026-02-01', netPence: 10_000, vatPence: 0 })], [])
    expect(r.boxes).toEqual(boxes(0, 0, -10_000, 0))
    expect(r.excluded).toEqual([])
  })

  it('a not-registered invoice paid twice in the quarter is listed once', () => {
    const r = cash([sale({ id: 'n1', issuedOn: '2025-12-01', vat: 'not-registered', netPence: 10_000, vatPence: 0 })], [paid('p1', 'n1', '2026-01-10', 5_000), paid('p2', 'n1', '2026-02-10', 5_000)])
    expect(r.excluded.map(e => e.id)).toEqual(['n1'])
    expect(r.boxes).toEqual(boxes(0, 0, 0, 0))
  })
})

describe('vatReturn: the period\'s first and last days both count (VAT Notice 700/12: the return covers the period; inclusive is as briefed)', () => {
  it.each([
    ['2025-12-31', 0],
    ['2026-01-01', 2_000],
    ['2026-02-15', 2_000],
    ['2026-03-31', 2_000],
    ['2026-04-01', 0],
  ])('a sale issued %s adds %ip to box 1', (issuedOn, box1) => {
    expect(vatReturn(input({ sales: [sale({ id: 's1', issuedOn, netPence: 10_000, vatPence: 2_000 })] })).boxes[1]).toBe(box1)
  })

  it('a one-day period', () => {
    const r = vatReturn(input({ start: '2026-02-28', end: '2026-02-28', sales: [sale({ id: 's1', issuedOn: '2026-02-28', netPence: 100, vatPence: 20 })] }))
    expect(r.boxes[6]).toBe(100)
  })
})

describe('vatReturn: bad input is a RangeError naming the field (our rules)', () => {
  const good = sale({ id: 's1', issuedOn: '2026-01-10', netPence: 100, vatPence: 20 })
  const withSale = (over: Partial<VatSale>) => input({ sales: [{ ...good, ...over }] })
  it.each<[string, VatReturnInput, RegExp]>([
    ['a start that is not a date', input({ start: '2026-02-30' }), /start/],
    ['an end in UK style', input({ end: '31/03/2026' }), /end/],
    ['start after end', input({ start: '2026-04-01', end: '2026-03-31' }), /start/],
    ['an unknown basis', input({ basis: 'accrual' as 'cash' }), /basis/],
    ['a sale date with a time', withSale({ issuedOn: '2026-01-10T09:00:00Z' }), /sales\[0\]\.issuedOn/],
    ['29 February in a common year', withSale({ issuedOn: '2027-02-29' }), /sales\[0\]\.issuedOn/],
    ['pence with a fraction', withSale({ netPence: 10.5 }), /sales\[0\]\.netPence/],
    ['negative VAT (a credit is its own document)', withSale({ vatPence: -20 }), /sales\[0\]\.vatPence/],
    ['negative amount due', withSale({ amountDuePence: -1 }), /sales\[0\]\.amountDuePence/],
    ['pence that are not a number', withSale({ netPence: Number.NaN }), /sales\[0\]\.netPence/],
    ['an unknown VAT treatment', withSale({ vat: 'zero' as 'standard' }), /sales\[0\]\.vat/],
    ['an unknown kind', withSale({ kind: 'receipt' as 'invoice' }), /sales\[0\]\.kind/],
    ['a sale id given twice', input({ sales: [good, { ...good, reference: 'S1-AGAIN' }] }), /sales\[1\]\.id/],
    ['a payment date that is not real', input({ basis: 'cash', sales: [good], payments: [paid('p1', 's1', '2026-01-32', 120)] }), /payments\[0\]\.receivedOn/],
    ['a payment with a fraction of a penny', input({ basis: 'cash', sales: [good], payments: [paid('p1', 's1', '2026-01-20', 1.5)] }), /payments\[0\]\.amountPence/],
    ['a payment for an unknown invoice', input({ basis: 'cash', sales: [good], payments: [paid('p1', 'nope', '2026-01-20', 120)] }), /payments\[0\]\.invoiceId/],
    ['a payment for an invoice with nothing due', input({ basis: 'cash', sales: [{ ...good, netPence: 0, vatPence: 0, amountDuePence: 0 }], payments: [paid('p1', 's1', '2026-01-20', 120)] }), /payments\[0\]\.invoiceId/],
    ['a payment against a credit note', input({ basis: 'cash', sales: [{ ...good, kind: 'credit-note' }], payments: [paid('p1', 's1', '2026-01-20', -120)] }), /payments\[0\]\.invoiceId/],
    ['a purchase date that is not real', input({ purchases: [bought('p1', '2026-13-01', 100, 20)] }), /purchases\[0\]\.boughtOn/],
    ['negative purchase VAT', input({ purchases: [bought('p1', '2026-01-10', 100, -20)] }), /purchases\[0\]\.vatPence/],
    ['purchase pence as a string', input({ purchases: [bought('p1', '2026-01-10', '100' as unknown as number, 20)] }), /purchases\[0\]\.netPence/],
  ])('%s', (_what, given, field) => {
    expect(() => vatReturn(given)).toThrow(RangeError)
    expect(() => vatReturn(given)).toThrow(field)
  })
})
