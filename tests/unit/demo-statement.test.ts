import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { readStatementRows } from '../../shared/utils/bank-csv'
import { proposeAll, proposeMoneyOut, type OpenInvoice } from '../../shared/utils/bank-match'
import { addDays } from '../../shared/utils/dates'
import { invoiceTotals } from '../../shared/utils/tax'
import { RECENT_INVOICES, RECENT_PURCHASES } from '../../seeds/recent'
import { buildDemoStatement, STATEMENT_DAYS, type StatementFacts } from '../../seeds/statement'

// The demo firm's bank statement (seeds/statement.ts) built from a fixture shaped like what the
// seed writes, read back as the import reads it (shared/utils/bank-csv.ts), and matched by the
// rules the import proposes with (shared/utils/bank-match.ts). Invented customers and figures. The
// CIS figure: a contractor pays the invoice less 20% of its labour (DOMAIN.md, gov.uk "What you
// must do as a CIS contractor"; the invoice's amount due is already net of it). The tests of
// tests/api/demo-statement.test.ts do the same against a freshly seeded database.
const SEEDED_ON = '2026-12-05'
const on = (days: number) => addDays(SEEDED_ON, days)

function fixture(): StatementFacts {
  const invoices: StatementFacts['invoices'] = []
  const payments: StatementFacts['payments'] = []
  // the builder's overdue invoice (seeds/invoices.ts), number 5, and the deposit paid by transfer, number 15
  invoices.push({ id: 'inv-5', reference: 'BP-5', customerName: 'Pribbleworth Scarnholme Builds Ltd', firstLine: 'Hollow Barn: skim the ground-floor walls and ceilings', amountDuePence: 1692_40, cisDeductionPence: 370_00 })
  RECENT_INVOICES.forEach((r, i) => {
    const totals = invoiceTotals(r.lines.map(l => ({ kind: l.kind, quantity: l.quantityX1000 / 1000, unitPence: l.unitPence, vatRatePercent: 20 as const })), { vat: r.vat, cisRatePercent: r.cis })
    const id = `inv-${6 + i}`
    invoices.push({ id, reference: `BP-${6 + i}`, customerName: r.customer, firstLine: r.lines[0]!.description, amountDuePence: totals.amountDuePence, cisDeductionPence: totals.cisDeductionPence })
    if (r.paidByCard !== undefined) payments.push({ id: `pay-${id}`, invoiceId: id, method: 'card', amountPence: totals.amountDuePence, receivedOn: on(r.paidByCard), reference: 'Card payment' })
  })
  invoices.push({ id: 'inv-15', reference: 'BP-15', customerName: 'Millbeck Lettings', firstLine: 'Deposit (25%) for BP-J5', amountDuePence: 437_28, cisDeductionPence: 0 })
  payments.push({ id: 'pay-inv-15', invoiceId: 'inv-15', method: 'transfer', amountPence: 437_28, receivedOn: on(-5), reference: 'MILLBECK FLAT5 DEP' })
  // last quarter's: paid and bought long before the statement starts
  payments.push({ id: 'pay-old', invoiceId: 'inv-old', method: 'transfer', amountPence: 1520_00, receivedOn: on(-100), reference: 'PRIBBLEWORTH PLOT 4' })
  const purchases: StatementFacts['purchases'] = RECENT_PURCHASES.map((p, i) => ({ id: `pur-${i}`, supplier: p.supplier, category: p.category, boughtOn: on(p.day), grossPence: p.netPence + p.vatPence }))
  purchases.push({ id: 'pur-old', supplier: 'Saltmarsh Garage', category: 'vehicle', boughtOn: on(-90), grossPence: 252_00 })
  return { firmId: 'firm', seededOn: SEEDED_ON, invoices, payments, purchases }
}

const statement = buildDemoStatement(fixture())
const kinds = (kind: string) => statement.lines.filter(l => l.is.kind === kind)
const how = (h: string) => statement.lines.find(l => l.is.kind === 'invoices' && l.is.how === h)!

describe('the demo statement: a UK bank\'s CSV', () => {
  it('has the header, dd/mm/yyyy dates, and a running balance the import reads back line for line', () => {
    const rows = Papa.parse<string[]>(statement.text, { skipEmptyLines: false }).data
    expect(rows[0]).toEqual(['Date', 'Description', 'Amount', 'Balance'])
    expect(rows.slice(1).filter(r => r.length > 1).every(r => /^\d{2}\/\d{2}\/\d{4}$/.test(r[0]!))).toBe(true)
    const read = readStatementRows(rows)
    if (!read.ok) throw new Error(read.message)
    expect(read.lines.map(l => [l.date, l.description, l.amountPence, l.balancePence])).toEqual(statement.lines.map(l => [l.date, l.description, l.amountPence, l.balancePence]))
    let balance = statement.openingBalancePence
    for (const l of statement.lines) expect(l.balancePence).toBe(balance += l.amountPence)
  })

  it('covers the six weeks before the seed ran, oldest first', () => {
    expect([statement.from, statement.to]).toEqual([on(-STATEMENT_DAYS), on(-1)])
    const dates = statement.lines.map(l => l.date)
    expect(dates).toEqual([...dates].sort())
    expect(dates.every(d => d >= statement.from && d <= statement.to)).toBe(true)
    expect(statement.lines.find(l => l.description.includes('PLOT 4'))).toBeUndefined()
    expect(statement.lines.find(l => l.description.includes('SALTMARSH'))).toBeUndefined()
  })

  it('holds each kind of line the demo needs (worked by hand)', () => {
    // Millbeck's two: 240.00 + 126.00, both references
    expect(how('two-at-once')).toMatchObject({ date: on(-16), description: 'FASTER PAYMENT MILLBECK LETTINGS BP10 BP11', amountPence: 366_00 })
    // the builder: 1,350.00 less 20% of the 1,200.00 labour = 1,110.00, naming itself
    expect(how('contractor-net-of-cis')).toMatchObject({ amountPence: 1110_00, description: expect.stringContaining('PRIBBLEWORTH SCARNHOLME BUILDS') })
    expect(how('part-payment')).toMatchObject({ amountPence: 500_00, description: 'FASTER PAYMENT E QUARRENDON BP-12 PART' })
    expect(how('odd-reference')).toMatchObject({ amountPence: 288_00, description: 'FASTER PAYMENT FERNHILL HOMES bp 14' })
    // 384.00: Alys Dunmore's landing and Morwenna Tilsley's hall owe it alike
    expect(how('ambiguous')).toMatchObject({ amountPence: 384_00, description: 'FASTER PAYMENT DUNMORE' })
    // card payments of 96.00 and 198.00, less 1.64 and 3.17 (1.5% + 20p, invented), three days after the second
    expect(kinds('stripe-payout')).toEqual([expect.objectContaining({ date: on(-35), description: 'STRIPE PAYMENTS UK PAYOUT', amountPence: 289_19 })])
    expect(kinds('recorded-transfer').map(l => l.description)).toEqual(['FASTER PAYMENT MILLBECK FLAT5 DEP'])
    expect(kinds('purchase').map(l => l.description)).toEqual([
      'CARD PAYMENT TO WEIR VALLEY PLASTER SU ON 01 NOV',
      'CARD PAYMENT TO KETTLEBURY BUILDERS ME ON 16 NOV',
      'CARD PAYMENT TO TROWEL & HAWK TOOL HIR ON 27 NOV',
    ])
    expect(kinds('no-purchase')).toEqual([expect.objectContaining({ description: 'CARD PAYMENT TO HOBBLECOTE FUEL STOP ON 30 NOV', amountPence: -68_40 })])
    // 24 October to 4 December: the van on 20 November, interest on 31 October and 30 November
    expect(kinds('standing-order').map(l => l.date)).toEqual(['2026-11-20'])
    expect(kinds('interest').map(l => l.date)).toEqual(['2026-10-31', '2026-11-30'])
  })

  it('leaves two invoices unpaid and one part paid, so what is owed still has something', () => {
    const paid = new Set(statement.lines.flatMap(l => (l.is.kind === 'invoices' ? l.is.invoiceIds : [])))
    const unpaid = fixture().invoices.filter(i => !paid.has(i.id) && !fixture().payments.some(p => p.invoiceId === i.id)).map(i => i.customerName)
    expect(unpaid).toEqual(['Pribbleworth Scarnholme Builds Ltd', 'Morwenna Tilsley'])
  })

  it('names only the demo\'s invented payers and merchants', () => {
    const words = statement.lines.map(l => l.description).join('\n')
    for (const name of ['MILLBECK', 'PRIBBLEWORTH', 'QUARRENDON', 'FERNHILL', 'DUNMORE', 'HOBBLECOTE', 'HOLLINBRAKE', 'WEIR VALLEY', 'KETTLEBURY', 'TROWEL & HAWK']) expect(words).toContain(name)
  })
})

// the demo's customers who are people, not businesses (kind 'homeowner' in seeds/demo.ts, quarter.ts, recent.ts)
const HOMEOWNERS = new Set(['Harriet Colley', 'Alys Dunmore', 'Edwin Quarrendon', 'Morwenna Tilsley'])

describe('the demo statement, matched as the import proposes', () => {
  const facts = fixture()
  const paidOn = (id: string) => facts.payments.filter(p => p.invoiceId === id).reduce((n, p) => n + p.amountPence, 0)
  const open: OpenInvoice[] = facts.invoices.filter(i => i.amountDuePence > paidOn(i.id)).map(i => ({
    id: i.id, reference: i.reference, customerName: i.customerName, outstandingPence: i.amountDuePence - paidOn(i.id),
    cisDeductionPence: i.cisDeductionPence, untouched: paidOn(i.id) === 0, dueOn: null, person: HOMEOWNERS.has(i.customerName),
  }))
  const lines = statement.lines.map((l, i) => ({ id: `l${i}`, date: l.date, description: l.description, amountPence: l.amountPence, is: l.is }))
  const proposals = new Map(proposeAll(lines.filter(l => l.amountPence > 0), open).map(p => [p.lineId, p]))

  // the ambiguous one names only a surname: likely, with the other invoice owed as much beside it
  const cases: [string, 'sure' | 'likely'][] = [
    ['two-at-once', 'sure'], ['contractor-net-of-cis', 'sure'], ['part-payment', 'sure'], ['odd-reference', 'sure'], ['ambiguous', 'likely'],
  ]
  it.each(cases)('%s: %s, against the invoices it pays', (h, certainty) => {
    const line = lines.find(l => l.is.kind === 'invoices' && l.is.how === h)!
    const p = proposals.get(line.id)
    expect(p?.certainty).toBe(certainty)
    expect(p?.parts.map(x => x.invoiceId)).toEqual(line.is.kind === 'invoices' ? line.is.invoiceIds : [])
  })

  it('the ambiguous payment names the other invoice that owes as much', () => {
    const line = lines.find(l => l.is.kind === 'invoices' && l.is.how === 'ambiguous')!
    expect(proposals.get(line.id)?.alternatives).toEqual([facts.invoices.find(i => i.firstLine === 'Patch and skim the hall')!.id])
  })

  it('each card payment to a merchant is its purchase, for sure; the fuel with none recorded becomes a new one', () => {
    const purchases = facts.purchases.map(p => ({ id: p.id, supplier: p.supplier, boughtOn: p.boughtOn, grossPence: p.grossPence }))
    for (const line of lines.filter(l => l.is.kind === 'purchase')) {
      expect(proposeMoneyOut(line, purchases), line.description).toMatchObject({ certainty: 'sure', match: { kind: 'purchase', purchaseId: line.is.kind === 'purchase' ? line.is.purchaseId : '' } })
    }
    const fuel = lines.find(l => l.is.kind === 'no-purchase')!
    expect(proposeMoneyOut(fuel, purchases)).toMatchObject({ match: { kind: 'new-purchase', supplier: 'HOBBLECOTE FUEL STOP', grossPence: 68_40 } })
  })

  it('the Stripe payout settles no invoice: its card payments were recorded as they were paid', () => {
    const payout = lines.find(l => l.is.kind === 'stripe-payout')!
    expect(proposals.get(payout.id)).toMatchObject({ certainty: 'sure', payout: true, parts: [] })
  })
})
