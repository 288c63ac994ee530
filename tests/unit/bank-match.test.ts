import { describe, expect, it } from 'vitest'
import { alreadyRecorded, keysInDescription, recordedByAmount, nameInDescription, proposeAll, proposeMoneyIn, proposeMoneyOut, referenceKey, type OpenInvoice } from '../../shared/utils/bank-match'

// Statement lines against the firm's unsettled invoices, worked by hand. Invented customers and
// references. The rules are our own ("common practice" for how transfers are referenced); the
// CIS figure: a contractor pays the invoice less the deduction on labour (HMRC's Construction
// Industry Scheme guidance, CISR manual; the invoice's amount due is already net of it).
const inv = (id: string, reference: string, customerName: string, outstandingPence: number, more: Partial<OpenInvoice> = {}): OpenInvoice =>
  ({ id, reference, customerName, outstandingPence, cisDeductionPence: 0, untouched: true, dueOn: `2026-11-${id.slice(-2).padStart(2, '0')}`, ...more })
const OPEN: OpenInvoice[] = [
  inv('i01', 'BRP-0017', 'Harriet Colley', 48000),
  inv('i02', 'BRP-0021', 'Pribbleworth Scarnholme Builds Ltd', 176400, { cisDeductionPence: 29400 }),
  inv('i03', 'BRP-0022', 'Fernhill Homes', 57600),
  inv('i04', 'BRP-0023', 'Fernhill Homes', 31200),
  inv('i05', 'BRP-0024', 'Orchard Row Cafe', 25000),
  inv('i06', 'BRP-0025', 'Alys Dunmore', 25000, { person: true }),
  inv('i07', 'BRP-0026', 'Millbeck Lettings', 120000),
]
const line = (description: string, amountPence: number, id = 'l1') => ({ id, date: '2026-12-04', description, amountPence })

describe('referenceKey and keysInDescription: spaces, dashes, case and leading zeros do not matter', () => {
  const cases: [string, string | null][] = [
    ['BRP-0017', 'BRP#17'], ['brp 17', 'BRP#17'], ['BRP0017', 'BRP#17'], ['Q-12', 'Q#12'], ['17', null], ['BRP-', null],
  ]
  it.each(cases)('%s -> %s', (ref, key) => expect(referenceKey(ref)).toBe(key))
  it('finds every reference in a description, not a longer number\'s start', () => {
    expect([...keysInDescription('FP COLLEY brp 17 and BRP-0021 ref 2026')]).toEqual(['BRP#17', 'BRP#21', 'REF#2026'])
    expect(keysInDescription('BRP 170').has('BRP#17')).toBe(false)
  })
  it('matches a customer\'s name by its words, leaving out Ltd', () => {
    expect(nameInDescription('Pribbleworth Scarnholme Builds Ltd', 'BACS PRIBBLEWORTH SCARNHOLME BUILDS')).toBe(true)
    expect(nameInDescription('Fernhill Homes', 'FERNHILL')).toBe(false)
    expect(nameInDescription('Fernhill Homes', 'FP FERNHILL HOMES LTD')).toBe(true)
  })
})

describe('proposeMoneyIn', () => {
  const cases: [string, ReturnType<typeof line>, { certainty: string, parts: [string, number][], reasons?: RegExp } | null][] = [
    ['reference with other spacing and case, amount equal: sure', line('FASTER PAYMENT brp 17 COLLEY', 48000), { certainty: 'sure', parts: [['i01', 48000]], reasons: /reference BRP-0017 in the description; amount equal/ }],
    ['a contractor pays net of the CIS deduction (the amount due already is): sure', line('PRIBBLEWORTH INV BRP 21', 176400), { certainty: 'sure', parts: [['i02', 176400]] }],
    ['a contractor paid the whole before the deduction: likely, never sure', line('PRIBBLEWORTH BRP21', 205800), { certainty: 'likely', parts: [['i02', 176400]], reasons: /CIS deduction/ }],
    ['two invoices in one transfer, both referenced', line('FERNHILL BRP-22 BRP-23', 88800), { certainty: 'sure', parts: [['i03', 57600], ['i04', 31200]], reasons: /references BRP-0022 and BRP-0023.*amounts add up/ }],
    ['a part payment of a referenced invoice', line('MILLBECK BRP0026 PART', 50000), { certainty: 'sure', parts: [['i07', 50000]], reasons: /part payment: £500.00 of £1200.00/ }],
    ['more than is owed on the reference: possible', line('COLLEY BRP 17', 50000), { certainty: 'possible', parts: [['i01', 48000]], reasons: /£20.00 more than is owed/ }],
    ['no reference, amount owed by one invoice only: likely', line('FASTER PAYMENT', 120000), { certainty: 'likely', parts: [['i07', 120000]] }],
    ['no reference, amount equal and the name: sure', line('FP MILLBECK LETTINGS', 120000), { certainty: 'sure', parts: [['i07', 120000]] }],
    ['an amount two invoices are owed, no name: possible, never chosen for the partner', line('TRANSFER', 25000), { certainty: 'possible', parts: [['i05', 25000]], reasons: /amount equal to 2 invoices: choose which/ }],
    ['the same amount, with the name deciding: sure', line('DUNMORE ALYS', 25000), { certainty: 'sure', parts: [['i06', 25000]] }],
    ['the same amount, the surname only: likely, never sure', line('FASTER PAYMENT DUNMORE', 25000), { certainty: 'likely', parts: [['i06', 25000]], reasons: /Dunmore in the description \(the surname only\)/ }],
    ['a business\'s last word alone is no surname: still choose', line('FASTER PAYMENT CAFE', 25000), { certainty: 'possible', parts: [['i05', 25000]] }],
    ['no reference, two of the named customer\'s invoices add up: likely', line('FERNHILL HOMES', 88800), { certainty: 'likely', parts: [['i03', 57600], ['i04', 31200]] }],
    ['no reference, less than the named customer owes: their oldest first, possible', line('FERNHILL HOMES', 10000), { certainty: 'possible', parts: [['i03', 10000]] }],
    ['nothing fits: left for later', line('INTEREST', 123), null],
    ['a refund going out is not a payment in', line('REFUND BRP 17 COLLEY', -48000), null],
    // Stripe pays card takings out in one transfer; Setwell records each card payment as it is paid,
    // so the payout must settle nothing, even when its amount equals an invoice (common practice)
    ['a Stripe payout equal to an invoice: settles nothing, card payments already recorded', line('STRIPE PAYMENTS UK LTD PAYOUT', 48000), { certainty: 'sure', parts: [], reasons: /Stripe payout.*already|recorded as each was paid/ }],
    ['stripe in lower case, with a reference in it: still a payout', line('stripe payout po_1 BRP 17', 48000), { certainty: 'sure', parts: [] }],
  ]
  it.each(cases)('%s', (_name, l, want) => {
    const got = proposeMoneyIn(l, OPEN)
    if (!want) return expect(got).toBeNull()
    expect(got?.certainty).toBe(want.certainty)
    expect(got?.parts.map(p => [p.invoiceId, p.amountPence])).toEqual(want.parts)
    if (want.reasons) expect(got!.reasons.join('; ')).toMatch(want.reasons)
  })

  it('lists the other invoices an ambiguous amount could be', () => {
    expect(proposeMoneyIn(line('TRANSFER', 25000), OPEN)?.alternatives).toEqual(['i06'])
  })
})

describe('proposeAll: two transfers never settle the same invoice', () => {
  it('gives the second transfer of the same amount nothing once the first took the invoice', () => {
    const got = proposeAll([line('FP MILLBECK LETTINGS', 120000, 'l1'), line('FP MILLBECK LETTINGS', 120000, 'l2')], OPEN)
    expect(got.map(p => [p.lineId, p.parts])).toEqual([['l1', [{ invoiceId: 'i07', amountPence: 120000 }]]])
  })
  it('leaves the invoice to the transfer that pays it when a Stripe payout of the same amount came first', () => {
    const got = proposeAll([{ ...line('STRIPE PAYOUT', 120000, 'l1'), date: '2026-12-01' }, line('FP MILLBECK LETTINGS', 120000, 'l2')], OPEN)
    expect(got.map(p => [p.lineId, p.payout ?? false, p.parts])).toEqual([['l1', true, []], ['l2', false, [{ invoiceId: 'i07', amountPence: 120000 }]]])
  })
  // a transfer the partner typed in by hand before the statement came is that payment, not a second
  // one (common practice: record once, reconcile against the bank)
  const RECORDED = [{ id: 'r1', reference: 'BRP-0030', customerName: 'Millbeck Lettings', typed: 'MILLBECK FLAT5 DEP', receivedOn: '2026-12-02', amountPence: 27363 }]
  it.each([
    ['the same amount two days later, naming the customer: sure, records nothing', line('FP MILLBECK FLAT5 DEP', 27363), 'sure'],
    ['the same amount, nothing named: not taken for it (many payments are of one amount)', line('FASTER PAYMENT', 27363), null],
    ['the same amount, the invoice\'s reference: sure', line('FP BRP 30', 27363), 'sure'],
    ['the same amount ten days later: not that payment', { ...line('FP MILLBECK', 27363), date: '2026-12-12' }, null],
    ['another amount: not that payment', line('FP MILLBECK', 27300), null],
    ['its invoice still owes as much again: likely, it may be the next payment', line('FP BRP 30', 27363), 'likely', 27363],
  ] as const)('a payment recorded by hand: %s', (_what, l, want, owing = 0) => {
    expect(alreadyRecorded(l, recordedByAmount(RECORDED.map(r => ({ ...r, invoiceOwingPence: owing }))))?.certainty ?? null).toBe(want)
  })
  it('gives a line already recorded by hand no invoice, even one it would fit, and the next line of that amount the invoice', () => {
    const got = proposeAll([line('FP MILLBECK LETTINGS', 120000, 'l1'), { ...line('FP MILLBECK LETTINGS', 120000, 'l2'), date: '2026-12-05' }], OPEN, [{ ...RECORDED[0]!, amountPence: 120000 }])
    expect(got.map(p => [p.lineId, p.recordedPaymentId ?? null, p.parts.map(x => x.invoiceId)])).toEqual([['l1', 'r1', []], ['l2', null, ['i07']]])
  })
  it('lets a later line that names an invoice have it before an earlier guess on amount and name', () => {
    // i05 and i06 are both owed £250: the earlier line names no reference, the later one names BRP-0024 (i05)
    const got = proposeAll([line('TRANSFER', 25000, 'l1'), { ...line('FP BRP-24', 25000, 'l2'), date: '2026-12-06' }], OPEN)
    expect(Object.fromEntries(got.map(p => [p.lineId, p.parts.map(x => x.invoiceId)]))).toEqual({ l2: ['i05'], l1: ['i06'] })
  })
  it('gives a line naming an owing invoice that invoice, not a payment of the same customer recorded by hand', () => {
    const got = proposeAll([line('FP MILLBECK LETTINGS BRP-26', 120000, 'l1')], OPEN, [{ ...RECORDED[0]!, amountPence: 120000 }])
    expect(got.map(p => [p.recordedPaymentId ?? null, p.parts.map(x => x.invoiceId)])).toEqual([[null, ['i07']]])
  })
  it('takes two part payments of one invoice in date order', () => {
    const got = proposeAll([{ ...line('BRP 26', 70000, 'l2'), date: '2026-12-05' }, line('BRP 26', 50000, 'l1')], OPEN)
    expect(got.map(p => [p.lineId, p.certainty, p.parts[0]!.amountPence])).toEqual([['l1', 'sure', 50000], ['l2', 'sure', 70000]])
  })
})

describe('proposeMoneyOut: purchases by amount, date within days and the supplier\'s name', () => {
  const PURCHASES = [
    { id: 'p1', supplier: 'Trade Plaster Supplies', boughtOn: '2026-12-02', grossPence: 6420 },
    { id: 'p2', supplier: 'Kettlebury Builders Merchants', boughtOn: '2026-11-20', grossPence: 6420 },
    { id: 'p3', supplier: 'Kettlebury Builders Merchants', boughtOn: '2026-12-03', grossPence: 9900 },
    { id: 'p4', supplier: 'Hawk and Trowel Tools', boughtOn: '2026-12-03', grossPence: 9900 },
  ]
  const REFUNDS = [{ id: 'r1', reference: 'BRP-0017', refundedOn: '2026-12-03', amountPence: 4800 }]
  // "within a few days" is the issue's; 4 is our choice (card payments clear in one to three working days: common practice)
  const cases: [string, ReturnType<typeof line>, { kind: string, id?: string, certainty: string, supplier?: string } | null][] = [
    ['amount, date and supplier: sure', line('CARD PAYMENT TO TRADE PLASTER SUP ON 02 DEC', -6420), { kind: 'purchase', id: 'p1', certainty: 'sure' }],
    ['amount and date, no name: likely (the other purchase of that amount is weeks away)', line('CARD PAYMENT 4471', -6420), { kind: 'purchase', id: 'p1', certainty: 'likely' }],
    ['two purchases of the amount that week, the name decides: sure', line('CARD PAYMENT HAWK AND TROWEL', -9900), { kind: 'purchase', id: 'p4', certainty: 'sure' }],
    ['two purchases of the amount that week, no name: possible', line('CARD PAYMENT 8812', -9900), { kind: 'purchase', certainty: 'possible' }],
    ['a card payment with nothing recorded: a new purchase waiting for its receipt', line('CARD PAYMENT TO SKIP HIRE KETTLEBURY ON 03 DEC', -18000), { kind: 'new-purchase', certainty: 'possible', supplier: 'SKIP HIRE KETTLEBURY' }],
    ['a refund going out to a customer, its reference in the description: the recorded refund, not a purchase', line('REFUND BRP 17 COLLEY', -4800), { kind: 'refund', id: 'r1', certainty: 'sure' }],
    ['a standing order with nothing recorded: left for later', line('SO VAN LEASE', -32000), null],
    ['money in is not money out', line('CARD PAYMENT REFUND', 6420), null],
  ]
  it.each(cases)('%s', (_name, l, want) => {
    const got = proposeMoneyOut(l, PURCHASES, REFUNDS)
    if (!want) return expect(got).toBeNull()
    expect(got?.match.kind).toBe(want.kind)
    expect(got?.certainty).toBe(want.certainty)
    if (want.id) expect(got?.match).toMatchObject(want.kind === 'refund' ? { refundId: want.id } : { purchaseId: want.id })
    if (want.supplier) expect(got?.match).toMatchObject({ supplier: want.supplier, grossPence: -l.amountPence, boughtOn: l.date })
  })
})
