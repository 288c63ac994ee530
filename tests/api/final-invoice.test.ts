import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { queryAsFirm } from '../support/db'
import { Client, signUpFirm, uniqueEmail } from '../support/client'

// The final invoice of a job made from an accepted quote carries the quote's lines and wording,
// and, for exactly the quoted price, equals the quote's totals to the penny: both are totalled by
// one computation over the same lines (shared/utils/money-lines.ts linesTotals). A customer was
// once invoiced a penny under the quote's VAT (issue 17). Firms, customers and prices invented.

let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Quarrel Lane Plastering'))
  // an invented, VAT-registered firm (999 9999 73 is a made-up number that passes the check)
  const firm = await owner.patch('/api/firm', {
    tradingName: 'Quarrel Lane Plastering', addressLine1: '8 Quarrel Lane', addressLine2: '', town: 'Oxwell', postcode: 'OX9 4QL',
    email: 'office@quarrel.example', phone: '01632 960 418', vatRegistered: true, vatNumber: 'GB 999 9999 73', cisStatus: 'not-registered',
    utr: '', dayRatePence: 200_00, paymentTermsDays: 30, invoicePrefix: 'QL-',
  })
  expect(firm.status, JSON.stringify(firm.body)).toBe(200)
  // the firm's bank account (invented), so an invoice offering payment by transfer can be issued
  await queryAsFirm(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, `update firms set bank_account_name = 'Quarrel Lane Plastering', bank_sort_code = '608371', bank_account_number = '31926819' where id = $1`, [firmId])
})
afterAll(async () => {
  await app?.stop()
})

type Kind = 'labour' | 'materials'
interface QuoteLine { kind: Kind, description: string, quantityX1000: number, unit: string, unitPence: number, vatRatePercent: 0 | 5 | 20 }
const line = (kind: Kind, description: string, unitPence: number, vatRatePercent: 0 | 5 | 20 = 20, quantityX1000 = 1000, unit = 'item'): QuoteLine =>
  ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent })

const HOMEOWNER = { kind: 'homeowner', name: 'Petra Olumide' }
// a VAT-registered builder paying under CIS: the reverse charge applies
const CIS_BUILDER = { kind: 'builder', name: 'Tamsin Orrell Builds', vatRegistered: true, vatNumber: 'GB 999 9999 73', paysUnderCis: true, cisRatePercent: 20 }
// a builder paying under CIS who has said it is an end user: standard rate, CIS still deducted
const END_USER = { kind: 'builder', name: 'Corvin Ashby Homes', vatRegistered: true, vatNumber: 'GB 999 9999 73', paysUnderCis: true, cisRatePercent: 30, endUserNotified: true }

/** A quote with these lines and this treatment, sent and accepted at its link, and its job; returns the quote's detail and the job's id. */
async function acceptedJob(customer: Record<string, unknown>, lines: QuoteLine[], treatment: { vat: string, cisRatePercent: number | null }) {
  const email = uniqueEmail('final')
  const c = await owner.post('/api/customers', { customer: { ...customer, email }, site: { line1: '9 Wicket Row', postcode: 'OX9 2WR' } })
  expect(c.status, JSON.stringify(c.body)).toBe(201)
  const q = await owner.post('/api/quotes', { customerId: c.body.id, siteId: c.body.sites[0].id })
  expect(q.status, JSON.stringify(q.body)).toBe(201)
  const saved = await owner.put(`/api/quotes/${q.body.id}/draft`, { pricing: 'measure', estimatedDaysX100: 100, validUntil: '2027-03-01', ...treatment, lines: lines.map(l => ({ ...l, derivation: '' })) })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  expect((await owner.post(`/api/quotes/${q.body.id}/send`)).status).toBe(200)
  const mail = await app.waitForMail(email, /quote/i)
  const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
  expect((await new Client(app.url).post(`/api/public/quotes/${token}/accept`, { name: 'Petra Olumide' })).status).toBe(200)
  const job = await owner.post(`/api/quotes/${q.body.id}/job`)
  expect(job.status, JSON.stringify(job.body)).toBe(201)
  const quote = (await owner.get(`/api/quotes/${q.body.id}`)).body
  return { quote, jobId: job.body.id as string }
}

const MONEY = ['labourNetPence', 'materialsNetPence', 'netPence', 'vatPence', 'reverseChargeVatPence', 'grossPence', 'cisDeductionPence', 'amountDuePence'] as const
const money = (t: Record<string, number>) => Object.fromEntries(MONEY.map(k => [k, t[k]]))

describe('the final invoice for the whole quoted price is the quote to the penny', () => {
  it.each<[string, Record<string, unknown>, QuoteLine[], { vat: string, cisRatePercent: number | null }]>([
    ['33.33, 0.01 and 19.99 at 20%', HOMEOWNER, [line('labour', 'Skim the hall', 33_33), line('labour', 'Fill a nail hole', 1), line('materials', 'Multi-finish', 19_99)], { vat: 'standard', cisRatePercent: null }],
    // VAT on each rate's lines, rounded down once on the total: 5% and 0% lines are not 20%
    ['the same at 20%, 5% and 0%', HOMEOWNER, [line('labour', 'Skim the hall', 33_33, 20), line('labour', 'Fill a nail hole', 1, 0), line('materials', 'Multi-finish', 19_99, 5)], { vat: 'standard', cisRatePercent: null }],
    ['quantities of three decimals (6.977 m² at £18.07, 2.405 m at £6.33)', HOMEOWNER, [line('labour', 'Skim walls: Front room', 18_07, 20, 6977, 'm²'), line('labour', 'Fit beads: Front room', 6_33, 20, 2405, 'm'), line('materials', 'Bonding (25 kg bag)', 11_11, 5, 3000, 'packs')], { vat: 'standard', cisRatePercent: null }],
    ['the reverse charge under CIS at 20%', CIS_BUILDER, [line('labour', 'Skim the stairwell', 333_33), line('labour', 'Make good round sockets', 19_99, 5), line('materials', 'Board finish', 1)], { vat: 'reverse-charge', cisRatePercent: 20 }],
    // the quote's own CIS rate, not the one on the customer's record now
    ['the reverse charge with the quote\'s CIS rate of 30%', CIS_BUILDER, [line('labour', 'Skim the stairwell', 333_33), line('materials', 'Board finish', 19_99)], { vat: 'reverse-charge', cisRatePercent: 30 }],
    // 1,267.94 at 20% and 1p at 5%: VAT 253.58 (25,358.85 hundredths rounded down); the 1p at 20% would make it 253.59
    ['a penny apart: standard rate with CIS at 30% (an end user)', END_USER, [line('labour', 'Skim the flats\' landings', 1_234_61), line('labour', 'Fill a nail hole', 1, 5), line('materials', 'Multi-finish', 33_33)], { vat: 'standard', cisRatePercent: 30 }],
  ])('%s', async (_what, customer, lines, treatment) => {
    const { quote, jobId } = await acceptedJob(customer, lines, treatment)
    const draft = await owner.post('/api/invoices', { kind: 'final', jobId })
    expect(draft.status, JSON.stringify(draft.body)).toBe(201)
    const detail = (await owner.get(`/api/invoices/${draft.body.id}`)).body
    expect(money(detail.totals)).toEqual(money(quote.current.totals))
    // the quote's lines and wording, not "Labour for J-…", under the quote's VAT treatment
    expect(detail.vat).toBe(treatment.vat)
    expect(detail.lines.map((l: QuoteLine) => [l.kind, l.description, l.quantityX1000, l.unitPence, l.vatRatePercent]))
      .toEqual(lines.map(l => [l.kind, l.description, l.quantityX1000, l.unitPence, l.vatRatePercent]))
    // issued, it stays the quote to the penny
    const issued = await owner.post(`/api/invoices/${draft.body.id}/issue`)
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    const after = (await owner.get(`/api/invoices/${draft.body.id}`)).body
    expect(money(after.totals)).toEqual(money(quote.current.totals))
    expect(after.amountDuePence).toBe(quote.current.totals.amountDuePence)
  })
})

describe('the final invoice after a deposit', () => {
  it('carries the quote\'s lines less the deposit, as a line naming it, and the two come to the quote\'s net', async () => {
    const lines = [line('labour', 'Skim walls: Front room', 18_07, 20, 6977, 'm²'), line('labour', 'Fill a nail hole', 1, 5), line('materials', 'Multi-finish', 33_33)]
    const { quote, jobId } = await acceptedJob(HOMEOWNER, lines, { vat: 'standard', cisRatePercent: null })
    const deposit = await owner.post('/api/invoices', { kind: 'deposit', jobId, percent: 25 })
    expect(deposit.status, JSON.stringify(deposit.body)).toBe(201)
    const issued = await owner.post(`/api/invoices/${deposit.body.id}/issue`)
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    const reference = (await owner.get(`/api/invoices/${deposit.body.id}`)).body.reference as string
    const final = await owner.post('/api/invoices', { kind: 'final', jobId })
    expect(final.status, JSON.stringify(final.body)).toBe(201)
    const detail = (await owner.get(`/api/invoices/${final.body.id}`)).body
    const descriptions = detail.lines.map((l: QuoteLine) => l.description)
    expect(descriptions.slice(0, 3)).toEqual(lines.map(l => l.description))
    expect(descriptions.slice(3)).toEqual([`Less invoiced before: ${reference} (labour)`, `Less invoiced before: ${reference} (materials)`])
    expect(detail.lines.slice(3).every((l: QuoteLine) => l.unitPence < 0)).toBe(true)
    const depositTotals = (await owner.get(`/api/invoices/${deposit.body.id}`)).body.totals
    for (const k of ['labourNetPence', 'materialsNetPence', 'netPence'] as const) expect(depositTotals[k] + detail.totals[k]).toBe(quote.current.totals[k])
    // VAT rounded down on each invoice: together at most a penny under the quote's, never over
    const vat = depositTotals.vatPence + detail.totals.vatPence
    expect(quote.current.totals.vatPence - vat).toBeGreaterThanOrEqual(0)
    expect(quote.current.totals.vatPence - vat).toBeLessThanOrEqual(1)
    // the draft can be saved again as it is (the editor sends the lines back)
    const again = await owner.put(`/api/invoices/${final.body.id}/draft`, { vat: detail.vat, vatReason: detail.vatReason, cisRatePercent: detail.cisRatePercent, notes: '', lines: detail.lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, extraWork }: QuoteLine & { extraWork: boolean }) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, extraWork })) })
    expect(again.status, JSON.stringify(again.body)).toBe(200)
    // a line taking off more than the invoice charges is a 400 on that line, not a 500
    const tooMuch = await owner.put(`/api/invoices/${final.body.id}/draft`, { vat: 'standard', lines: [line('labour', 'Skim', 10_00), line('labour', 'Less invoiced before', -20_00)] })
    expect(tooMuch.status).toBe(400)
    expect(tooMuch.body.data.fields['lines.1.unitPence']).toMatch(/taking off/)
    // and everything is invoiced now: no second final
    expect((await owner.post(`/api/invoices/${final.body.id}/issue`)).status).toBe(200)
    expect((await owner.post('/api/invoices', { kind: 'final', jobId })).status).toBe(409)
  })
})
