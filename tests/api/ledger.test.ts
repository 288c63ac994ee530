import { randomUUID } from 'node:crypto'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp
let owner: Client
let other: Client

beforeAll(async () => {
  app = await startApp()
  owner = (await signUpFirm(app.url, 'Ledger Firm')).client
  other = (await signUpFirm(app.url, 'Other Firm')).client
})
afterAll(async () => {
  await app?.stop()
})

const homeowner = (name: string, extra: object = {}) => ({
  customer: { kind: 'homeowner', name, email: uniqueEmail('cust'), phone: '07700 900123', billingLine1: '9 Quarry Lane', billingTown: 'Oxwell', billingPostcode: 'OX9 1AB', ...extra },
  site: { line1: '9 Quarry Lane', town: 'Oxwell', postcode: 'OX9 1AB' },
})

async function newCustomer(client: Client, name = 'Ada Quill', extra: object = {}) {
  const res = await client.post('/api/customers', homeowner(name, extra))
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body as { id: string, sites: { id: string }[], email: string }
}

describe('customers', () => {
  it('creates a customer with a site, reads it back, and changes it', async () => {
    const c = await newCustomer(owner, 'Morwenna Pike')
    expect(c.sites).toHaveLength(1)
    const got = await owner.get(`/api/customers/${c.id}`)
    expect(got.status).toBe(200)
    expect(got.body).toMatchObject({ name: 'Morwenna Pike', kind: 'homeowner', sites: [{ line1: '9 Quarry Lane', postcode: 'OX9 1AB' }], enquiries: [], visits: [] })
    const changed = await owner.patch(`/api/customers/${c.id}`, { ...got.body, kind: 'landlord', name: 'Morwenna Pike Lettings', endUserNotified: true })
    expect(changed.status).toBe(200)
    expect(changed.body).toMatchObject({ kind: 'landlord', name: 'Morwenna Pike Lettings', endUserNotified: true })
  })

  it('refuses flag combinations that cannot be, naming the fields, and writes nothing', async () => {
    const res = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Wrong Flags', paysUnderCis: true, cisRatePercent: 25 }, site: null })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields).sort()).toEqual(['customer.cisRatePercent', 'customer.paysUnderCis'])
    expect((await owner.get('/api/customers?q=wrong flags')).body.total).toBe(0)
  })

  it('searches by name, postcode, phone and e-mail, and pages and sorts', async () => {
    const tag = randomUUID().slice(0, 6)
    const a = await newCustomer(owner, `Zebedee ${tag}`, { billingPostcode: 'ZZ1 4QT', phone: '01632 960 777' })
    const b = await newCustomer(owner, `Aldous ${tag}`)
    const byName = await owner.get(`/api/customers?q=${tag}&sort=name`)
    expect(byName.body.rows.map((r: any) => r.id)).toEqual([b.id, a.id])
    expect((await owner.get(`/api/customers?q=${tag}&sort=-name`)).body.rows.map((r: any) => r.id)).toEqual([a.id, b.id])
    expect((await owner.get('/api/customers?q=zz1 4qt')).body.rows.map((r: any) => r.id)).toEqual([a.id])
    expect((await owner.get('/api/customers?q=960777')).body.rows.map((r: any) => r.id)).toEqual([a.id])
    expect((await owner.get('/api/customers?q=01632 960 777')).body.rows.map((r: any) => r.id)).toEqual([a.id])
    expect((await owner.get(`/api/customers?q=${encodeURIComponent(a.email)}`)).body.rows.map((r: any) => r.id)).toEqual([a.id])
    const page2 = await owner.get(`/api/customers?q=${tag}&sort=name&pageSize=1&page=2`)
    expect(page2.body).toMatchObject({ total: 2, page: 2, pageSize: 1 })
    expect(page2.body.rows.map((r: any) => r.id)).toEqual([a.id])
    // LIKE wildcards typed into the search are text, not wildcards
    expect((await owner.get('/api/customers?q=%25')).body.total).toBe(0)
    expect((await owner.get('/api/customers?sort=sideways')).status).toBe(400)
    expect((await owner.get('/api/customers?pageSize=1000')).status).toBe(400)
  })

  it('keeps a customer who has work (409) and removes one who has none (204)', async () => {
    const keep = await newCustomer(owner, 'Has Work')
    await owner.post('/api/enquiries', { customerId: keep.id, source: 'phone', description: 'Skim the hall' })
    expect((await owner.delete(`/api/customers/${keep.id}`)).status).toBe(409)
    const drop = await newCustomer(owner, 'Typo Entry')
    expect((await owner.delete(`/api/customers/${drop.id}`)).status).toBe(204)
    expect((await owner.get(`/api/customers/${drop.id}`)).status).toBe(404)
  })

  it('adds and changes sites', async () => {
    const c = await newCustomer(owner)
    const added = await owner.post(`/api/customers/${c.id}/sites`, { line1: 'Flat 2, 4 Tanner Street', postcode: 'OX9 2CD', label: 'Rental' })
    expect(added.status).toBe(201)
    expect((await owner.patch(`/api/sites/${added.body.id}`, { line1: 'Flat 3, 4 Tanner Street', postcode: 'OX9 2CD' })).body.line1).toBe('Flat 3, 4 Tanner Street')
    expect((await owner.post(`/api/customers/${c.id}/sites`, { line1: '' })).status).toBe(400)
    expect((await owner.delete(`/api/sites/${added.body.id}`)).status).toBe(204)
  })
})

describe('enquiries and visits', () => {
  it('records an enquiry, books a visit that moves it on, and keeps who moved it', async () => {
    const c = await newCustomer(owner, 'Enquiring Person')
    const e = await owner.post('/api/enquiries', { customerId: c.id, siteId: c.sites[0]!.id, source: 'referral', description: 'Ceiling came down in the back bedroom', followUpOn: '2026-12-08' })
    expect(e.status).toBe(201)
    expect(e.body.status).toBe('new')

    const v = await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0]!.id, enquiryId: e.body.id, startsAt: '2026-12-03T09:30:00Z', durationMinutes: 45 })
    expect(v.status, JSON.stringify(v.body)).toBe(201)
    const after = await owner.get(`/api/enquiries/${e.body.id}`)
    expect(after.body.status).toBe('visit-booked')
    expect(after.body.history.map((h: any) => [h.to, h.by])).toEqual([['new', 'Test Owner'], ['visit-booked', 'Test Owner']])
    expect(after.body.visits.map((x: any) => x.id)).toEqual([v.body.id])

    const visit = await owner.get(`/api/visits/${v.body.id}`)
    expect(visit.body).toMatchObject({ id: v.body.id, durationMinutes: 45, customer: { name: 'Enquiring Person' }, site: { line1: '9 Quarry Lane' } })
    const list = await owner.get('/api/visits?from=2026-12-03T00:00:00Z&to=2026-12-04T00:00:00Z')
    expect(list.body.map((x: any) => x.id)).toContain(v.body.id)

    expect((await owner.post(`/api/enquiries/${e.body.id}/status`, { to: 'won' })).status).toBe(409)
    const lostNoReason = await owner.post(`/api/enquiries/${e.body.id}/status`, { to: 'lost' })
    expect(lostNoReason.status).toBe(400)
    expect(Object.keys(lostNoReason.body.data.fields)).toEqual(['reason'])
    expect((await owner.post(`/api/enquiries/${e.body.id}/status`, { to: 'quoted' })).body.status).toBe('quoted')
    const lost = await owner.post(`/api/enquiries/${e.body.id}/status`, { to: 'lost', reason: 'Went with a cheaper price' })
    expect(lost.body).toMatchObject({ status: 'lost', lostReason: 'Went with a cheaper price' })
    expect((await owner.get('/api/enquiries?status=lost')).body.rows.map((r: any) => r.id)).toContain(e.body.id)
  })

  it('refuses a site of another customer, or a visitor from outside the firm, naming the field', async () => {
    const a = await newCustomer(owner, 'Customer A')
    const b = await newCustomer(owner, 'Customer B')
    const res = await owner.post('/api/visits', { customerId: a.id, siteId: b.sites[0]!.id, startsAt: '2026-12-04T10:00:00Z' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields)).toEqual(['siteId'])
    const stranger = await owner.post('/api/visits', { customerId: a.id, siteId: a.sites[0]!.id, startsAt: '2026-12-04T10:00:00Z', visitorUserId: randomUUID() })
    expect(Object.keys(stranger.body.data.fields)).toEqual(['visitorUserId'])
    expect((await owner.post('/api/visits', { customerId: a.id, siteId: a.sites[0]!.id, startsAt: 'tomorrow' })).status).toBe(400)
  })
})

describe('tenancy and roles', () => {
  it('answers another firm\'s ids with 404, like missing ones', async () => {
    const c = await newCustomer(owner, 'Private Customer')
    const e = await owner.post('/api/enquiries', { customerId: c.id, source: 'phone', description: 'Private job' })
    const v = await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0]!.id, startsAt: '2026-12-05T10:00:00Z' })
    const calls = [
      () => other.get(`/api/customers/${c.id}`),
      () => other.patch(`/api/customers/${c.id}`, { kind: 'homeowner', name: 'Hijacked' }),
      () => other.delete(`/api/customers/${c.id}`),
      () => other.post(`/api/customers/${c.id}/sites`, { line1: 'x' }),
      () => other.patch(`/api/sites/${c.sites[0]!.id}`, { line1: 'x' }),
      () => other.get(`/api/enquiries/${e.body.id}`),
      () => other.post(`/api/enquiries/${e.body.id}/status`, { to: 'lost', reason: 'x' }),
      () => other.get(`/api/visits/${v.body.id}`),
      () => other.patch(`/api/visits/${v.body.id}`, { notes: 'x' }),
    ]
    for (const call of calls) expect((await call()).status).toBe(404)
    // and referring to them from the other firm is a field error, not a way in
    const cross = await other.post('/api/enquiries', { customerId: c.id, source: 'phone', description: 'Sneaky' })
    expect(cross.status).toBe(400)
    expect((await other.get('/api/customers?q=private customer')).body.total).toBe(0)
    expect((await owner.get(`/api/customers/${c.id}`)).body.name).toBe('Private Customer')
  })

  it('lets the accountant read customers only, and keeps billing details from crew', async () => {
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')).client
    const crewEmail = uniqueEmail('crew')
    const crew = (await inviteAndJoin(app, owner, crewEmail, 'crew', 'Crew Member')).client
    const c = await newCustomer(owner, 'Billing Secret')
    expect((await accountant.get(`/api/customers/${c.id}`)).status).toBe(200)
    expect((await accountant.post('/api/customers', homeowner('Nope'))).status).toBe(403)
    expect((await accountant.post('/api/enquiries', { customerId: c.id, source: 'phone', description: 'x' })).status).toBe(403)
    expect((await crew.get('/api/customers')).status).toBe(403)
    expect((await crew.get(`/api/customers/${c.id}`)).status).toBe(403)
    expect((await crew.get('/api/enquiries')).status).toBe(403)

    // a visit the crew member is down to do: they see where, not the billing details
    const me = (await crew.get('/api/me')).body.user.id
    const mine = await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0]!.id, startsAt: '2026-12-06T08:00:00Z', visitorUserId: me })
    const notMine = await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0]!.id, startsAt: '2026-12-06T11:00:00Z' })
    const seen = await crew.get(`/api/visits/${mine.body.id}`)
    expect(seen.status).toBe(200)
    expect(seen.body.customer).toEqual({ id: c.id, name: 'Billing Secret' })
    expect(seen.body.site.line1).toBe('9 Quarry Lane')
    expect((await crew.get(`/api/visits/${notMine.body.id}`)).status).toBe(404)
    const list = (await crew.get('/api/visits?from=2026-12-06T00:00:00Z')).body.map((x: any) => x.id)
    expect(list).toContain(mine.body.id)
    expect(list).not.toContain(notMine.body.id)
    expect((await crew.patch(`/api/visits/${mine.body.id}`, { notes: 'x' })).status).toBe(403)
  })
})

describe('the public enquiry form', () => {
  let key: string
  beforeAll(async () => {
    key = (await owner.get('/api/firm')).body.enquiryFormKey
  })
  const form = (extra: object = {}) => ({ name: 'Rowan Ashby', email: uniqueEmail('web'), phone: '07700 900456', addressLine1: '22 Kiln Road', town: 'Oxwell', postcode: 'OX9 3EF', description: 'Skim two bedrooms after new windows', ...extra })

  it('shows the firm, creates the customer, site and enquiry, and e-mails the firm', async () => {
    const anon = new Client(app.url)
    expect((await anon.get(`/api/public/enquiry-forms/${key}`)).body.firmName).toBe('Ledger Firm')
    const body = form()
    const res = await anon.post(`/api/public/enquiry-forms/${key}`, body)
    expect(res.status).toBe(201)
    const list = (await owner.get('/api/enquiries?status=new')).body.rows
    const mine = list.find((r: any) => r.customer.name === 'Rowan Ashby')
    expect(mine).toMatchObject({ source: 'web-form', description: body.description, site: { line1: '22 Kiln Road', postcode: 'OX9 3EF' } })
    const history = (await owner.get(`/api/enquiries/${mine.id}`)).body.history
    expect(history).toEqual([expect.objectContaining({ to: 'new', by: null })])
    const mail = await app.waitForMail('@test.example', /New enquiry from Rowan Ashby/)
    expect(mail.text).toContain('Skim two bedrooms after new windows')
    expect(mail.replyTo?.text).toContain(body.email)
  })

  it('answers 400 naming the fields for bad input, and 404 for an unknown link', async () => {
    const anon = new Client(app.url)
    const res = await anon.post(`/api/public/enquiry-forms/${key}`, form({ email: 'nope', postcode: '', description: 'short' }))
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields).sort()).toEqual(['description', 'email', 'postcode'])
    expect((await anon.get(`/api/public/enquiry-forms/${'0'.repeat(32)}`)).status).toBe(404)
    expect((await anon.post(`/api/public/enquiry-forms/${'0'.repeat(32)}`, form())).status).toBe(404)
    expect((await anon.get('/api/public/enquiry-forms/not-a-key')).status).toBe(404)
  })

  it('thanks a bot that fills the honeypot and writes nothing', async () => {
    const before = (await owner.get('/api/enquiries')).body.total
    const res = await new Client(app.url).post(`/api/public/enquiry-forms/${key}`, form({ name: 'Honey Bot', website: 'http://spam.example' }))
    expect(res.status).toBe(201)
    expect((await owner.get('/api/enquiries')).body.total).toBe(before)
    expect((await owner.get('/api/customers?q=honey bot')).body.total).toBe(0)
  })

  it('limits one address to 5 an hour with a 429 that says it was not sent (never a thank-you); failed checks do not count', async () => {
    // two sends so far from this address in this file (the enquiry and the honeypot); the bad
    // bodies of the 400 test did not count, nor do these
    const anon = new Client(app.url)
    for (let i = 0; i < 4; i++) expect((await anon.post(`/api/public/enquiry-forms/${key}`, form({ postcode: '' }))).status).toBe(400)
    for (let i = 0; i < 3; i++) expect((await anon.post(`/api/public/enquiry-forms/${key}`, form())).status).toBe(201)
    const before = (await owner.get('/api/enquiries')).body.total
    const limited = await anon.post(`/api/public/enquiry-forms/${key}`, form({ name: 'Tamsin Over-Limit' }))
    expect(limited.status).toBe(429)
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(59 * 60)
    // a refusal in words: not sent, nothing lost, try later or ring; no thanks for what was not stored
    expect(limited.body.data.message).toMatch(/has not been sent/)
    expect(limited.body.data.message).toMatch(/again in (an hour|\d+ minutes?), or give us a ring/)
    expect(limited.body.data.message).not.toMatch(/thank/i)
    expect((await owner.get('/api/enquiries')).body.total).toBe(before)
    expect((await owner.get('/api/customers?q=Tamsin Over-Limit')).body.total).toBe(0)
  })

  it('stops the old link when the owner makes a new one', async () => {
    const reset = await owner.post('/api/firm/enquiry-form-key')
    // the firm's part (22 characters), then the key (32 hex): the link finds its firm
    expect(reset.body.enquiryFormKey).toMatch(/^[\w-]{22}[0-9a-f]{32}$/)
    expect(reset.body.enquiryFormKey.slice(0, 22)).toBe(key.slice(0, 22))
    expect(reset.body.enquiryFormKey).not.toBe(key)
    expect((await new Client(app.url).get(`/api/public/enquiry-forms/${key}`)).status).toBe(404)
    // the old key in the form sent before links carried their firm is dead too
    expect((await new Client(app.url).get(`/api/public/enquiry-forms/${key.slice(22)}`)).status).toBe(404)
    expect((await new Client(app.url).get(`/api/public/enquiry-forms/${reset.body.enquiryFormKey}`)).status).toBe(200)
  })

  it('keeps the form link from crew', async () => {
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew2'), 'crew')).client
    expect((await crew.get('/api/firm')).body).not.toHaveProperty('enquiryFormKey')
  })
})

describe('search at scale', () => {
  it('finds one customer among 20,000 of a firm by name, phone and postcode, on a trigram index', async () => {
    const { client: big, firmId } = await signUpFirm(app.url, 'Big Firm')
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      await db.query(`insert into customers (firm_id, kind, name, email, phone, billing_postcode)
        select $1, 'homeowner', 'Customer ' || g, 'c' || g || '@example.invalid', '0161 496 ' || lpad(g::text, 5, '0'), 'KB' || g
        from generate_series(1, 20000) g`, [firmId])
      await db.query('commit')
      const index = await db.query(`select indexdef from pg_indexes where indexname = 'customers_search_idx'`)
      expect(index.rows[0]?.indexdef).toMatch(/USING gin \(search_text gin_trgm_ops\)/)
    }
    finally {
      await db.end()
    }
    // speed is measured by npm run bench; here, that the right row comes back among many
    expect((await big.get('/api/customers?q=customer 12345')).body).toMatchObject({ total: 1, rows: [{ name: 'Customer 12345' }] })
    expect((await big.get('/api/customers?q=0161 496 12345')).body.rows.map((r: any) => r.name)).toEqual(['Customer 12345'])
    expect((await big.get('/api/customers?q=kb12345')).body.rows.map((r: any) => r.name)).toEqual(['Customer 12345'])
    expect((await big.get('/api/customers?pageSize=100&page=200')).body.rows).toHaveLength(100)
    // and none of them leak into another firm's search
    expect((await owner.get('/api/customers?q=customer 12345')).body.total).toBe(0)
  })
})
