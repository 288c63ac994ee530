import { extractText, getDocumentProxy } from 'unpdf'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { fullDate, londonToday } from '../../shared/utils/dates'
import { formatPence } from '../../shared/utils/money'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { queryAsFirm } from '../support/db'
import { Client, signUpFirm, uniqueEmail } from '../support/client'

// What the customer reads on the quote's and the invoice's PDFs and pages: lines grouped by room
// and kind of work with identical lines merged ("Skim walls, front room: 4 walls, …"), areas to 2
// decimals, whole packs with the right plural, dates in UK words, the firm's bank account on the
// invoice when it takes transfers, and no internal status. The firm, people and rooms are invented.

let app: TestApp
let owner: Client
let firmId: string
const ownerDb = () => requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL')

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Tallow Yard Plastering'))
  const firm = await owner.patch('/api/firm', {
    tradingName: 'Tallow Yard Plastering', addressLine1: '3 Tallow Yard', addressLine2: '', town: 'Oxwell', postcode: 'OX9 7TY',
    email: 'office@tallowyard.example', phone: '01632 960 733', vatRegistered: true, vatNumber: 'GB 999 9999 73', cisStatus: 'not-registered',
    utr: '', dayRatePence: 200_00, paymentTermsDays: 30, invoicePrefix: 'TY-',
  })
  expect(firm.status, JSON.stringify(firm.body)).toBe(200)
  // the firm's bank account (invented; the settings form sets these through the API)
  await queryAsFirm(ownerDb(), firmId, `update firms set takes_transfer = true, bank_account_name = 'Tallow Yard Plastering', bank_sort_code = '608371', bank_account_number = '31926819' where id = $1`, [firmId])
  // invented rates, no mark-up, every opening deducted
  const book = (await owner.get('/api/price-book')).body
  const put = await owner.put('/api/price-book', {
    ...Object.fromEntries(Object.entries(book).filter(([k]) => !['firmId', 'createdAt', 'updatedAt'].includes(k))),
    skimWallsPerM2Pence: 18_00, skimCeilingsPerM2Pence: 21_00, undercoatPerM2Pence: 14_00, revealsPerLmPence: 9_00, beadsPerLmPence: 6_00, scrimPerLmPence: 2_00, materialsMarkupPercent: 0, minDeductCm2: 0,
  })
  expect(put.status, JSON.stringify(put.body)).toBe(200)
})
afterAll(async () => {
  await app?.stop()
})

async function pdfText(path: string, client?: Client) {
  const res = await fetch(app.url + path, { headers: client ? { cookie: client.cookieHeader() } : {} })
  expect(res.status).toBe(200)
  expect(res.headers.get('content-type')).toBe('application/pdf')
  const doc = await getDocumentProxy(new Uint8Array(await res.arrayBuffer()))
  // extraction may break a long line anywhere: runs of white space made one
  return (await extractText(doc, { mergePages: true })).text.replace(/\s+/g, ' ')
}

const wall = (lengthMm: number) => ({ id: crypto.randomUUID(), kind: 'wall', lengthMm, secondMm: 2400 })

/**
 * A quote from a measured visit: a front room of four walls (2.907 m and 3 m long, 2.4 m high:
 * four "Skim walls: Front room" lines) and a box room whose ceiling is 2.907 m x 2.4 m (6.977 m²),
 * plus one roll of scrim tape (one pack); sent and accepted, and made a job.
 */
async function acceptedQuote() {
  const email = uniqueEmail('docs')
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Idris Penhaligon', email, billingLine1: '40 Sorrel Street', billingTown: 'Oxwell', billingPostcode: 'OX9 1SS' }, site: { line1: '40 Sorrel Street', postcode: 'OX9 1SS' } })).body
  const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-12-02T09:00:00Z' })).body
  for (const [name, surfaces] of [['Front room', [wall(2907), wall(3000), wall(2907), wall(3000)]], ['Box room', [{ id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 2907, secondMm: 2400 }]]] as const) {
    const room = await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, { revision: 0, name, surfaces })
    expect(room.status, JSON.stringify(room.body)).toBe(200)
  }
  const made = await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })
  expect(made.status, JSON.stringify(made.body)).toBe(201)
  const q = (await owner.get(`/api/quotes/${made.body.id}`)).body
  // four lines the customer was shown one by one before
  expect(q.current.lines.filter((l: { description: string }) => l.description === 'Skim walls: Front room')).toHaveLength(4)
  const { pricing, estimatedDaysX100, fixedPricePence, vat, cisRatePercent, validUntil, terms, notes, cautions } = q.current
  const lines = [...q.current.lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation }: Record<string, unknown>) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation })),
    { kind: 'materials', description: 'Scrim tape (90 m roll)', quantityX1000: 1000, unit: 'packs', unitPence: 4_20, vatRatePercent: 20, derivation: '' }]
  const saved = await owner.put(`/api/quotes/${made.body.id}/draft`, { pricing, estimatedDaysX100, fixedPricePence, vat, cisRatePercent, validUntil, terms, notes, cautions, lines })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  expect((await owner.post(`/api/quotes/${made.body.id}/send`)).status).toBe(200)
  const mail = await app.waitForMail(email, /quote/i)
  const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
  return { quoteId: made.body.id as string, token, email, validUntil: validUntil as string, customer: c }
}

describe('the quote\'s PDF and page', () => {
  it('shows the lines grouped and merged, areas to 2 decimals, the right plural and UK dates', async () => {
    const { quoteId, token, validUntil } = await acceptedQuote()
    const q = (await owner.get(`/api/quotes/${quoteId}`)).body
    for (const text of [await pdfText(`/quotes/${quoteId}/pdf`, owner), await pdfText(`/q/${token}/pdf`)]) {
      // four walls: 2.907 x 2.4 = 6.9768 -> 6.977 m² twice, 3 x 2.4 = 7.2 m² twice: 28.354 m², at £18.00 each line rounded: 125.59 + 129.60 + 125.59 + 129.60
      expect(text).toContain('Skim walls, front room')
      expect(text).toContain('4 walls, 28.35 m²')
      expect(text).toContain(formatPence(125_59 + 129_60 + 125_59 + 129_60))
      expect(text).not.toContain('Skim walls: Front room')
      // the box room's ceiling, 6.977 m², to 2 decimals
      expect(text).toContain('Skim ceilings, box room')
      expect(text).toContain('6.98 m²')
      expect(text).not.toMatch(/\d\.\d{3} m²/)
      expect(text).toContain('1 pack')
      expect(text).not.toMatch(/\b1 packs\b/)
      // the totals are the quote's, to the penny
      for (const k of ['netPence', 'vatPence', 'grossPence']) expect(text).toContain(formatPence(q.current.totals[k]))
      // dates in UK words, no ISO date
      expect(text).toContain(`Valid until ${fullDate(validUntil)}`)
      expect(text).toContain(`Date ${fullDate(londonToday())}`)
      expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/)
    }
    // the customer's page has the same lines
    const view = (await new Client(app.url).get(`/api/public/quotes/${token}`)).body
    expect(view.groups).toContainEqual(expect.objectContaining({ description: 'Skim walls, front room', quantity: '4 walls, 28.35 m²', netPence: 125_59 + 129_60 + 125_59 + 129_60, count: 4 }))
    expect(view.groups.reduce((s: number, g: { netPence: number }) => s + g.netPence, 0)).toBe(q.current.totals.netPence)
  })
})

describe('the invoice\'s PDF and page', () => {
  it('shows the quote\'s lines grouped, "Invoice to", UK dates, the bank account, and no internal status; paid, a stamp', async () => {
    const { quoteId, token: quoteToken, email } = await acceptedQuote()
    expect((await new Client(app.url).post(`/api/public/quotes/${quoteToken}/accept`, { name: 'Idris Penhaligon' })).status).toBe(200)
    const job = await owner.post(`/api/quotes/${quoteId}/job`)
    expect(job.status, JSON.stringify(job.body)).toBe(201)
    const draft = await owner.post('/api/invoices', { kind: 'final', jobId: job.body.id })
    expect(draft.status, JSON.stringify(draft.body)).toBe(201)
    const issued = await owner.post(`/api/invoices/${draft.body.id}/issue`)
    expect(issued.status, JSON.stringify(issued.body)).toBe(200)
    const inv = (await owner.get(`/api/invoices/${draft.body.id}`)).body
    const mail = await app.waitForMail(email, /invoice/i)
    const token = /\/i\/([\w-]+)/.exec(mail.text!)![1]!

    for (const text of [await pdfText(`/invoices/${inv.id}/pdf`, owner), await pdfText(`/i/${token}/pdf`)]) {
      expect(text).toContain(`Invoice ${inv.reference}`)
      expect(text).toContain('Invoice to')
      expect(text).not.toContain('Bill to')
      expect(text).toContain('Skim walls, front room')
      expect(text).toContain('4 walls, 28.35 m²')
      expect(text).toContain('Skim ceilings, box room')
      expect(text).toContain('6.98 m²')
      expect(text).toContain('1 pack')
      expect(text).not.toMatch(/\b1 packs\b|\d\.\d{3} m²|Labour for/)
      expect(text).toContain(`Date and tax point ${fullDate(inv.issuedOn)}`)
      expect(text).toContain(`Due by ${fullDate(inv.dueOn)}`)
      expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/)
      expect(text).toContain('Account name: Tallow Yard Plastering')
      expect(text).toContain('Sort code: 60-83-71')
      expect(text).toContain('Account number: 31926819')
      expect(text).not.toContain('Status:')
      expect(text).not.toContain('Paid, thank you')
    }
    const page = (await new Client(app.url).get(`/api/public/invoices/${token}`)).body
    expect(page.bank).toEqual(['Account name: Tallow Yard Plastering', 'Sort code: 60-83-71', 'Account number: 31926819'])
    expect(page.firm.bankDetails).toBeUndefined()
    expect(page.groups).toContainEqual(expect.objectContaining({ description: 'Skim walls, front room', quantity: '4 walls, 28.35 m²' }))

    // paid in full: the stamp, still no status line
    const paid = await owner.post(`/api/invoices/${inv.id}/payments`, { method: 'transfer', amountPence: inv.amountDuePence, receivedOn: londonToday(), reference: inv.reference, requestId: crypto.randomUUID() })
    expect(paid.status, JSON.stringify(paid.body)).toBeLessThan(300)
    const after = await pdfText(`/invoices/${inv.id}/pdf`, owner)
    expect(after).toContain('Paid, thank you')
    expect(after).not.toContain('Status:')

    // a firm that does not take transfers prints no account
    await queryAsFirm(ownerDb(), firmId, `update firms set takes_transfer = false where id = $1`, [firmId])
    try {
      const off = await pdfText(`/invoices/${inv.id}/pdf`, owner)
      expect(off).not.toContain('Sort code')
      expect((await new Client(app.url).get(`/api/public/invoices/${token}`)).body.bank).toBeNull()
    }
    finally {
      await queryAsFirm(ownerDb(), firmId, `update firms set takes_transfer = true where id = $1`, [firmId])
    }
  })
})
