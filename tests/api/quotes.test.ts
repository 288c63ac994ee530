import { createServer } from 'node:net'
import { simpleParser } from 'mailparser'
import pg from 'pg'
import { SMTPServer } from 'smtp-server'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, signUpFirmAt, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp
let owner: Client
let ownerEmail: string
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId, email: ownerEmail } = await signUpFirm(app.url, 'Quote Firm'))
  // rates for pricing by measure (invented test rates, not trade figures)
  const book = (await owner.get('/api/price-book')).body
  const put = await owner.put('/api/price-book', {
    ...Object.fromEntries(Object.entries(book).filter(([k]) => !['firmId', 'createdAt', 'updatedAt'].includes(k))),
    skimWallsPerM2Pence: 1800, skimCeilingsPerM2Pence: 2100, undercoatPerM2Pence: 1400, revealsPerLmPence: 900, beadsPerLmPence: 600, scrimPerLmPence: 200, materialsMarkupPercent: 0, minDeductCm2: 0,
  })
  expect(put.status, JSON.stringify(put.body)).toBe(200)
})
afterAll(async () => {
  await app?.stop()
})

/** The firm's settings as the PATCH takes them. */
function pickFirm(f: Record<string, unknown>) {
  const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, ...rest } = f
  return rest
}

async function customerWithVisit(email = uniqueEmail('cust'), name = 'Quinn Abara') {
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name, email }, site: { line1: '7 Mill Lade', postcode: 'OX9 4GH' } })).body
  const e = (await owner.post('/api/enquiries', { customerId: c.id, siteId: c.sites[0].id, source: 'phone', description: 'Skim the back bedroom' })).body
  const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, enquiryId: e.id, startsAt: '2026-12-02T09:00:00Z' })).body
  const roomId = crypto.randomUUID()
  const wall = crypto.randomUUID()
  const room = await owner.put(`/api/visits/${v.id}/rooms/${roomId}`, {
    revision: 0,
    name: 'Back bedroom',
    surfaces: [
      // 4.00 x 2.40 - window 1.20 x 1.00 = 9.60 - 1.20 = 8.40 m²
      { id: wall, kind: 'wall', lengthMm: 4000, secondMm: 2400, openings: [{ id: crypto.randomUUID(), kind: 'window', widthMm: 1200, heightMm: 1000 }] },
      // 4.00 x 3.00 = 12.00 m²
      { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 4000, secondMm: 3000 },
    ],
  })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  return { customer: c, enquiry: e, visit: v }
}

describe('quotes', () => {
  it('drafts a quote from a measured visit, priced from the price book, with derivations', async () => {
    const { customer, enquiry, visit } = await customerWithVisit()
    const res = await owner.post('/api/quotes', { customerId: customer.id, siteId: customer.sites[0].id, enquiryId: enquiry.id, visitId: visit.id })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const q = (await owner.get(`/api/quotes/${res.body.id}`)).body
    // the firm's letters (Quote Firm: QF), Q for a quote, the number unpadded
    expect(q.reference).toMatch(/^QF-Q[1-9]\d*$/)
    expect(q.current).toMatchObject({ version: 1, status: 'draft', vat: 'not-registered' })
    const walls = q.current.lines.find((l: any) => l.description.startsWith('Skim walls'))
    const ceilings = q.current.lines.find((l: any) => l.description.startsWith('Skim ceilings'))
    // 8.40 m² at £18.00 = £151.20; 12.00 m² at £21.00 = £252.00
    expect(walls).toMatchObject({ kind: 'labour', quantityX1000: 8400, unitPence: 1800 })
    expect(walls.derivation).toContain('8.40')
    expect(ceilings).toMatchObject({ kind: 'labour', quantityX1000: 12000, unitPence: 2100 })
    const finish = q.current.lines.find((l: any) => l.kind === 'materials' && /finish/i.test(l.description))
    // 20.40 m² skim at 2 mm, 10 m² a bag at 2 mm, +10% waste = 2.244 -> 3 bags (materials.ts defaults)
    expect(finish.quantityX1000).toBe(3000)
    const labour = 151_20 + 252_00
    expect(q.current.totals.labourNetPence).toBe(labour)
    expect(q.current.totals.netPence).toBe(labour + q.current.totals.materialsNetPence)
    expect(q.current.totals.vatPence).toBe(0)
    expect(q.current.cautions.join(' ')).toMatch(/Drying times are estimates/)
    // the same estimate room by room (one room here), at cost
    expect(q.current.roomEstimates).toEqual([{ roomName: 'Back bedroom', materials: [expect.objectContaining({ name: 'Gypsum finish plaster', packs: 3, packLabel: '25 kg bag' })] }])
  })

  it('numbers quotes one after another per firm', async () => {
    const { customer } = await customerWithVisit()
    const a = (await owner.post('/api/quotes', { customerId: customer.id })).body
    const b = (await owner.post('/api/quotes', { customerId: customer.id })).body
    expect(b.number).toBe(a.number + 1)
  })

  it('sends a quote once, refuses to change a sent one, and revises it into version 2', async () => {
    const { customer, enquiry, visit } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id, enquiryId: enquiry.id, visitId: visit.id })).body
    const sent = await owner.post(`/api/quotes/${id}/send`)
    expect(sent.status, JSON.stringify(sent.body)).toBe(200)
    expect(sent.body.current.status).toBe('sent')
    expect(sent.body.current).not.toHaveProperty('tokenHash')
    expect((await owner.get(`/api/enquiries/${enquiry.id}`)).body.status).toBe('quoted')
    const mail = await app.waitForMail(customer.email, /Your quote [A-Z]+-Q[1-9]/)
    expect(mail.text).toMatch(/\/q\/[\w-]{40,}/)

    const q = (await owner.get(`/api/quotes/${id}`)).body
    const body = { pricing: 'measure', estimatedDaysX100: 100, vat: 'not-registered', validUntil: q.current.validUntil, lines: q.current.lines.map(({ position: _p, ...l }: any) => l) }
    expect((await owner.put(`/api/quotes/${id}/draft`, body)).status).toBe(409)
    expect((await owner.post(`/api/quotes/${id}/send`)).status).toBe(409)

    const revised = await owner.post(`/api/quotes/${id}/revise`)
    expect(revised.status).toBe(200)
    expect(revised.body.current).toMatchObject({ version: 2, status: 'draft' })
    // the sent version is withdrawn as the revision starts: its link can no longer accept it (issue 13)
    expect(revised.body.versions.map((v: any) => [v.version, v.status])).toEqual([[2, 'draft'], [1, 'superseded']])
    const changed = await owner.put(`/api/quotes/${id}/draft`, { ...body, lines: [...body.lines, { kind: 'labour', description: 'Make good round the new socket', quantityX1000: 1000, unit: 'item', unitPence: 4500 }] })
    expect(changed.status, JSON.stringify(changed.body)).toBe(200)
    expect(changed.body.current.totals.labourNetPence).toBe(q.current.totals.labourNetPence + 4500)
    // the sent version is as it was: its totals, and what its link shows
    expect((await owner.post(`/api/quotes/${id}/revise`)).status).toBe(409)
    const after = (await owner.get(`/api/quotes/${id}`)).body
    expect(after.versions.find((v: any) => v.version === 1).totals).toEqual(q.current.totals)
    const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
    const v1 = (await new Client(app.url).get(`/api/public/quotes/${token}`)).body
    expect(v1).toMatchObject({ version: 1, totals: q.current.totals })
    expect(v1.lines.map((l: any) => l.description)).not.toContain('Make good round the new socket')
  })

  it('refuses bad drafts with the field named', async () => {
    const { customer } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id })).body
    const res = await owner.put(`/api/quotes/${id}/draft`, { pricing: 'fixed', estimatedDaysX100: 0, vat: 'reverse-charge', validUntil: 'soon', lines: [{ kind: 'labour', description: '', quantityX1000: 0, unit: 'm²', unitPence: -1 }] })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields).sort()).toEqual(['cisRatePercent', 'fixedPricePence', 'lines.0.description', 'lines.0.quantityX1000', 'lines.0.unitPence', 'validUntil'])
    // an empty quote, or a customer with no e-mail, cannot be sent
    expect((await owner.post(`/api/quotes/${id}/send`)).status).toBe(400)
  })

  it('refuses lines that come to more than a job can be priced at, naming the line, and stores nothing (never a 500)', async () => {
    const { customer } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id })).body
    const q = (await owner.get(`/api/quotes/${id}`)).body
    const base = { pricing: 'measure', estimatedDaysX100: 0, vat: q.current.vat, validUntil: q.current.validUntil }
    const line = (quantityX1000: number, unitPence: number) => ({ kind: 'labour', description: 'Skim the warehouse walls', quantityX1000, unit: 'm²', unitPence })
    // one line of 100,000 m² at £1,000,000.00 (each within its own limit)
    const one = await owner.put(`/api/quotes/${q.id}/draft`, { ...base, lines: [line(100_000_000, 1_000_000_00)] })
    expect(one.status).toBe(400)
    expect(Object.keys(one.body.data.fields)).toEqual(['lines.0.unitPence'])
    // two lines of £15,000,000.00: each fits, together with VAT they do not
    const two = await owner.put(`/api/quotes/${q.id}/draft`, { ...base, lines: [line(15_000, 1_000_000_00), line(15_000, 1_000_000_00)] })
    expect(two.status).toBe(400)
    expect(two.body.data.fields.lines).toMatch(/at most £20,000,000\.00/)
    const stored = (await owner.get(`/api/quotes/${q.id}`)).body
    expect(stored.current.lines).toEqual([])
  })

  it('refuses a VAT treatment the firm\'s registration or the customer\'s flags rule out, naming vat', async () => {
    // this firm is not VAT-registered: standard rate is a 400 on vat, and nothing is saved
    const { customer } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id })).body
    const q = (await owner.get(`/api/quotes/${id}`)).body
    const base = { pricing: 'measure', estimatedDaysX100: 0, validUntil: q.current.validUntil, notes: 'Dust sheets down first', lines: [{ kind: 'labour', description: 'Skim walls', quantityX1000: 1000, unit: 'm²', unitPence: 1800 }] }
    const standard = await owner.put(`/api/quotes/${id}/draft`, { ...base, vat: 'standard' })
    expect(standard.status).toBe(400)
    expect(Object.keys(standard.body.data.fields)).toEqual(['vat'])
    expect(standard.body.data.fields.vat).toMatch(/not VAT-registered/)
    expect((await owner.get(`/api/quotes/${id}`)).body.current.notes).toBe('')
    expect((await owner.put(`/api/quotes/${id}/draft`, { ...base, vat: 'not-registered' })).status).toBe(200)

    // a VAT-registered firm: the reverse charge for a homeowner is a 400 on vat; for a builder under CIS it is fine
    const other = (await signUpFirm(app.url, 'Registered Quote Firm')).client
    const firm = (await other.get('/api/firm')).body
    expect((await other.patch('/api/firm', { ...pickFirm(firm), vatRegistered: true, vatNumber: 'GB 999 9999 73' })).status).toBe(200)
    const home = (await other.post('/api/customers', { customer: { kind: 'homeowner', name: 'Ines Okafor', email: uniqueEmail('home') } })).body
    const builder = (await other.post('/api/customers', { customer: { kind: 'builder', name: 'Corbel Build Ltd', email: uniqueEmail('build'), vatRegistered: true, vatNumber: 'GB 999 9999 73', paysUnderCis: true, cisRatePercent: 20 } })).body
    for (const [c, vat, status] of [[home, 'reverse-charge', 400], [home, 'standard', 200], [builder, 'reverse-charge', 200], [builder, 'not-registered', 400]] as const) {
      const made = await other.post('/api/quotes', { customerId: c.id })
      expect(made.status, JSON.stringify(made.body)).toBe(201)
      const res = await other.put(`/api/quotes/${made.body.id}/draft`, { ...base, vat, cisRatePercent: 20 })
      expect(res.status, `${c.name} ${vat}: ${JSON.stringify(res.body)}`).toBe(status)
      if (status === 400) expect(Object.keys(res.body.data.fields)).toEqual(['vat'])
    }
  })
})

describe('the price book', () => {
  async function putBook(change: Record<string, unknown>) {
    const book = (await owner.get('/api/price-book')).body
    const { firmId: _f, createdAt: _c, updatedAt: _u, ...rest } = book
    return owner.put('/api/price-book', { ...rest, ...change })
  }

  it('keeps making-good items and bead stock lengths, and names the field of a bad one', async () => {
    const items = [{ name: 'Make good round a socket', unit: 'item', pricePence: 12_00 }, { name: 'Make good along a cable run', unit: 'metre', pricePence: 8_50 }]
    const ok = await putBook({ makingGoodItems: items, beadStockLengthsMm: [2500, 3000, 2400] })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    const book = (await owner.get('/api/price-book')).body
    expect(book.makingGoodItems).toEqual(items)
    expect(book.beadStockLengthsMm).toEqual([2500, 3000, 2400])

    const bad = await putBook({ makingGoodItems: [{ name: '', unit: 'item', pricePence: -1 }], beadStockLengthsMm: [2500, 2500] })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['beadStockLengthsMm', 'makingGoodItems.0.name', 'makingGoodItems.0.pricePence'])
    expect(bad.body.data.fields.beadStockLengthsMm).toMatch(/once only/)
    const short = await putBook({ beadStockLengthsMm: [100] })
    expect(short.status).toBe(400)
    expect(short.body.data.fields['beadStockLengthsMm.0']).toMatch(/at least 0.5 m/)
    // a client that does not send the items leaves them as they are
    const { makingGoodItems: _m, ...withoutItems } = (await owner.get('/api/price-book')).body
    const { firmId: _f, createdAt: _c, updatedAt: _u, ...rest } = withoutItems
    expect((await owner.put('/api/price-book', { ...rest, beadStockLengthsMm: [2500, 3000] })).status).toBe(200)
    expect((await owner.get('/api/price-book')).body.makingGoodItems).toEqual(items)
  })
})

describe('pricing by days and at a fixed price', () => {
  async function draftWith(change: Record<string, unknown>) {
    const { customer, visit } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id, visitId: visit.id })).body
    const q = (await owner.get(`/api/quotes/${id}`)).body
    const { lines, pricing: _p, estimatedDaysX100, fixedPricePence: _f, vat, cisRatePercent, validUntil, terms, notes, cautions } = q.current
    const body = { pricing: 'measure', estimatedDaysX100, fixedPricePence: null, vat, cisRatePercent, validUntil, terms, notes, cautions, lines: lines.map(({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation }: any) => ({ kind, description, quantityX1000, unit, unitPence, vatRatePercent, derivation })), ...change }
    return { id, res: await owner.put(`/api/quotes/${id}/draft`, body), q }
  }

  it('prices by days at the firm\'s day rate, keeping the materials and the working lines', async () => {
    // no day rate yet: a clear 400 on the day rate, nothing saved
    const none = await draftWith({ pricing: 'days', estimatedDaysX100: 150 })
    expect(none.res.status).toBe(400)
    expect(none.res.body.data.fields.dayRatePence).toMatch(/day rate/)
    expect((await owner.get(`/api/quotes/${none.id}`)).body.current.pricing).toBe('measure')

    const firm = (await owner.get('/api/firm')).body
    expect((await owner.patch('/api/firm', { ...pickFirm(firm), dayRatePence: 18_000 })).status).toBe(200)
    const { res, q } = await draftWith({ pricing: 'days', estimatedDaysX100: 150 })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const materialsNet = q.current.totals.materialsNetPence
    // 1.5 days x £180.00 = £270.00 labour; materials as drafted
    expect(res.body.current.totals).toMatchObject({ labourNetPence: 27_000, materialsNetPence: materialsNet, netPence: 27_000 + materialsNet })
    expect(res.body.current.dayRatePence).toBe(18_000)
    expect(res.body.current.lines.length).toBe(q.current.lines.length)
    expect(res.body.current.customerLines.filter((l: any) => l.kind === 'labour')).toEqual([expect.objectContaining({ description: 'Labour: 1.5 days at £180.00 a day', quantityX1000: 1500, unitPence: 18_000 })])
  })

  it('prices at a fixed price with the materials kept apart, and refuses one below the materials', async () => {
    const low = await draftWith({ pricing: 'fixed', fixedPricePence: 1 })
    expect(low.res.status).toBe(400)
    expect(low.res.body.data.fields.fixedPricePence).toMatch(/less than the materials/)
    const { id, res, q } = await draftWith({ pricing: 'fixed', fixedPricePence: 500_00 })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const materialsNet = q.current.totals.materialsNetPence
    expect(res.body.current.totals).toMatchObject({ netPence: 500_00, materialsNetPence: materialsNet, labourNetPence: 500_00 - materialsNet })
    // the customer's link and PDF show the priced lines, not the working
    await owner.post(`/api/quotes/${id}/send`)
    const mail = await app.waitForMail(q.customer.email, /Your quote [A-Z]+-Q[1-9]/)
    const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
    const view = (await new Client(app.url).get(`/api/public/quotes/${token}`)).body
    expect(view.lines.filter((l: any) => l.kind === 'labour')).toEqual([expect.objectContaining({ description: 'Labour, at the fixed price', unitPence: 500_00 - materialsNet })])
    expect(view.totals.netPence).toBe(500_00)
  })
})

describe('the customer\'s link', () => {
  async function sentQuote(name = 'Quinn Abara') {
    const { customer, enquiry, visit } = await customerWithVisit(uniqueEmail('cust'), name)
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id, enquiryId: enquiry.id, visitId: visit.id })).body
    await owner.post(`/api/quotes/${id}/send`)
    const mail = await app.waitForMail(customer.email, /Your quote [A-Z]+-Q[1-9]/)
    const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
    return { id, token, customer, enquiry }
  }

  it('shows only its own quote, and records one acceptance (409 after)', async () => {
    const { id, token, enquiry } = await sentQuote()
    const anon = new Client(app.url)
    const view = await anon.get(`/api/public/quotes/${token}`)
    expect(view.status).toBe(200)
    expect(view.body).toMatchObject({ status: 'sent', customer: { name: 'Quinn Abara' }, firm: { tradingName: 'Quote Firm' } })
    expect(JSON.stringify(view.body)).not.toMatch(/tokenHash|firmId|customerId/)
    expect((await anon.post(`/api/public/quotes/${token}/accept`, { name: '' })).status).toBe(400)
    const accepted = await anon.post(`/api/public/quotes/${token}/accept`, { name: 'Quinn Abara' })
    expect(accepted.status).toBe(200)
    expect(accepted.body).toMatchObject({ status: 'accepted', acceptedName: 'Quinn Abara' })
    expect((await anon.post(`/api/public/quotes/${token}/accept`, { name: 'Quinn Abara' })).status).toBe(409)
    expect((await anon.post(`/api/public/quotes/${token}/decline`, { reason: 'Changed my mind' })).status).toBe(409)
    expect((await owner.get(`/api/quotes/${id}`)).body.current.status).toBe('accepted')
    expect((await owner.get(`/api/enquiries/${enquiry.id}`)).body.status).toBe('won')
    await app.waitForMail('@test.example', /accepted by Quinn Abara/)
  })

  it('records a decline with its reason, the enquiry is lost, and the firm is e-mailed', async () => {
    const { id, token, enquiry } = await sentQuote('Rosa Delacroix')
    const anon = new Client(app.url)
    expect((await anon.post(`/api/public/quotes/${token}/decline`, { reason: 'Too dear for us this year' })).body.status).toBe('declined')
    const e = (await owner.get(`/api/enquiries/${enquiry.id}`)).body
    expect(e).toMatchObject({ status: 'lost', lostReason: 'Quote declined: Too dear for us this year' })
    const { reference } = (await owner.get(`/api/quotes/${id}`)).body
    const notice = await app.waitForMail(ownerEmail, new RegExp(`Quote ${reference} declined by Rosa Delacroix`))
    expect(notice.text).toContain('Too dear for us this year')
  })

  it('shows each link only its own quote: two sent quotes, two customers', async () => {
    const a = await sentQuote('Arun Mehta')
    const b = await sentQuote('Bridget Oyelaran')
    const refs = await Promise.all([a, b].map(async x => (await owner.get(`/api/quotes/${x.id}`)).body.reference as string))
    const anon = new Client(app.url)
    for (const [x, own, other, otherName] of [[a, refs[0], refs[1], 'Bridget Oyelaran'], [b, refs[1], refs[0], 'Arun Mehta']] as const) {
      const view = (await anon.get(`/api/public/quotes/${x.token}`)).body
      expect(view.reference).toBe(own)
      expect(view.customer).toEqual({ name: x.customer.name })
      expect(JSON.stringify(view)).not.toContain(otherName)
      // the customer's page shows the same, with the days, how it was measured, the terms and the notes
      const html = await (await fetch(`${app.url}/q/${x.token}`)).text()
      expect(html).toContain(own)
      expect(html).toContain(x.customer.name)
      expect(html).not.toContain(other)
      expect(html).not.toContain(otherName)
      expect(html).toContain('How we measured')
      expect(html).toContain('Every opening is deducted from the area.')
      expect(html).toContain('Payment within')
    }
  })

  it('the customer\'s page for a wrong link says it does not work and shows no quote', async () => {
    await sentQuote()
    const res = await fetch(`${app.url}/q/${'x'.repeat(43)}`)
    const html = await res.text()
    expect(html).toContain('This link does not work')
    expect(html).toContain('Ask the firm to send the quote again')
    expect(html).not.toContain('Quinn Abara')
    expect(html).not.toContain('Quote Firm')
  })

  it('gives a wrong or expired link a clear 404 and no data', async () => {
    const { token } = await sentQuote()
    const anon = new Client(app.url)
    const wrong = await anon.get(`/api/public/quotes/${'x'.repeat(43)}`)
    expect(wrong.status).toBe(404)
    expect(wrong.body.data.message).toMatch(/expired or is not right/)
    expect((await anon.get('/api/public/quotes/short')).status).toBe(404)
    // expire it
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      await db.query(`update quote_versions set token_expires_at = now() - interval '1 minute' where token_expires_at is not null`)
      await db.query('commit')
    }
    finally {
      await db.end()
    }
    const expired = await anon.get(`/api/public/quotes/${token}`)
    expect(expired.status).toBe(404)
    expect(Object.keys(expired.body.data)).toEqual(['message'])
    expect((await anon.post(`/api/public/quotes/${token}/accept`, { name: 'Quinn Abara' })).status).toBe(404)
  })
})

describe('quote roles and tenancy', () => {
  it('keeps quotes from crew, lets the accountant read them, and hides another firm\'s', async () => {
    const { customer } = await customerWithVisit()
    const { id } = (await owner.post('/api/quotes', { customerId: customer.id })).body
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')).client
    expect((await crew.get('/api/quotes')).status).toBe(403)
    expect((await crew.get(`/api/quotes/${id}`)).status).toBe(403)
    expect((await accountant.get(`/api/quotes/${id}`)).status).toBe(200)
    expect((await accountant.post(`/api/quotes/${id}/send`)).status).toBe(403)
    expect((await crew.get('/api/price-book')).status).toBe(403)
    const other = (await signUpFirm(app.url, 'Other Quote Firm')).client
    expect((await other.get(`/api/quotes/${id}`)).status).toBe(404)
    expect((await other.post(`/api/quotes/${id}/send`)).status).toBe(404)
    expect((await other.post('/api/quotes', { customerId: customer.id })).status).toBe(400)
  })
})

describe('sending when the mail server cannot be reached', () => {
  let down: TestApp
  let smtpPort: number
  beforeAll(async () => {
    // a port nothing listens on (yet): the server's mail goes nowhere
    smtpPort = await new Promise<number>((resolve, reject) => {
      const probe = createServer()
      probe.on('error', reject)
      probe.listen(0, '127.0.0.1', () => {
        const address = probe.address()
        probe.close(() => resolve(typeof address === 'object' && address ? address.port : 0))
      })
    })
    down = await startApp({ NUXT_SMTP_PORT: String(smtpPort) })
  })
  afterAll(async () => {
    await down?.stop()
  })

  it('answers 502, keeps the quote a draft with nothing sent, and sends it once the mail server is back', async () => {
    const { client } = await signUpFirmAt(down.url, app.url, 'Quiet Mail Firm')
    const c = (await client.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tomasz Wren', email: uniqueEmail('wren') }, site: { line1: '2 Weir Row', postcode: 'OX9 2WR' } })).body
    const e = (await client.post('/api/enquiries', { customerId: c.id, siteId: c.sites[0].id, source: 'phone', description: 'Skim the hall' })).body
    const { id } = (await client.post('/api/quotes', { customerId: c.id, enquiryId: e.id })).body
    const q = (await client.get(`/api/quotes/${id}`)).body
    const put = await client.put(`/api/quotes/${id}/draft`, { pricing: 'measure', estimatedDaysX100: 100, vat: 'not-registered', validUntil: q.current.validUntil, lines: [{ kind: 'labour', description: 'Skim hall walls', quantityX1000: 12_000, unit: 'm²', unitPence: 1800 }] })
    expect(put.status, JSON.stringify(put.body)).toBe(200)

    for (let attempt = 0; attempt < 2; attempt++) {
      const res = await client.post(`/api/quotes/${id}/send`)
      expect(res.status, JSON.stringify(res.body)).toBe(502)
      expect(res.body.data.message).toMatch(/could not be sent, so the quote is still a draft/)
      const after = (await client.get(`/api/quotes/${id}`)).body
      expect(after.current).toMatchObject({ status: 'draft', sentAt: null, version: 1 })
      expect((await client.get(`/api/enquiries/${e.id}`)).body.status).not.toBe('quoted')
    }

    // the mail server comes back on that port: the same quote sends, once
    const got: string[] = []
    const smtp = new SMTPServer({
      authOptional: true, disabledCommands: ['STARTTLS'], logger: false,
      onData(stream, _session, callback) {
        simpleParser(stream).then((mail) => {
          got.push(mail.text ?? '')
          callback()
        }, callback)
      },
    })
    await new Promise<void>(resolve => smtp.listen(smtpPort, '127.0.0.1', resolve))
    try {
      const sent = await client.post(`/api/quotes/${id}/send`)
      expect(sent.status, JSON.stringify(sent.body)).toBe(200)
      expect(sent.body.current.status).toBe('sent')
      expect(got).toHaveLength(1)
      const token = /\/q\/([\w-]+)/.exec(got[0]!)![1]!
      expect((await new Client(down.url).get(`/api/public/quotes/${token}`)).body.customer.name).toBe('Tomasz Wren')
      expect((await client.get(`/api/enquiries/${e.id}`)).body.status).toBe('quoted')
    }
    finally {
      await new Promise<void>(resolve => smtp.close(() => resolve()))
    }
  })
})
