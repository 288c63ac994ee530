import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type Client } from '../support/client'

// Removing a customer or a site that work names (issue 13, item 9): a 409 that says what holds it,
// in words, never the 500 of the foreign key; a customer or site nothing names goes (204).

let app: TestApp
let owner: Client

beforeAll(async () => {
  app = await startApp()
  owner = (await signUpFirm(app.url, 'Removals Firm')).client
})
afterAll(async () => {
  await app?.stop()
})

async function customer(name = 'Tamsin Rook') {
  const res = await owner.post('/api/customers', {
    customer: { kind: 'homeowner', name, email: uniqueEmail('tamsin') },
    site: { line1: '7 Lantern Yard', town: 'Kettlebury', postcode: 'KB4 4LY' },
  })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body as { id: string, sites: { id: string }[] }
}

const ok = (res: { status: number, body: unknown }, status = [200, 201]) => {
  expect(status, JSON.stringify(res.body)).toContain(res.status)
  return res.body as any
}

describe('removing a customer', () => {
  it('keeps a customer with an invoice (409 naming it) and leaves them and the invoice in place', async () => {
    const c = await customer()
    const invoice = ok(await owner.post('/api/invoices', { kind: 'blank', customerId: c.id }))
    const res = await owner.delete(`/api/customers/${c.id}`)
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.message).toMatch(/1 invoice\b/)
    expect(res.body.data.holds).toMatchObject({ invoices: 1 })
    expect((await owner.get(`/api/customers/${c.id}`)).status).toBe(200)
    expect((await owner.get(`/api/invoices/${invoice.id}`)).status).toBe(200)
  })

  it('counts each kind of work that names the customer, in words', async () => {
    const c = await customer()
    for (let i = 0; i < 2; i++) ok(await owner.post('/api/invoices', { kind: 'blank', customerId: c.id }))
    ok(await owner.post('/api/jobs', { customerId: c.id, siteId: c.sites[0]!.id, title: 'Skim the landing' }))
    ok(await owner.post('/api/quotes', { customerId: c.id }))
    const res = await owner.delete(`/api/customers/${c.id}`)
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.message).toMatch(/2 invoices/)
    expect(res.body.data.message).toMatch(/1 job\b/)
    expect(res.body.data.message).toMatch(/1 quote\b/)
    expect(res.body.data.holds).toMatchObject({ invoices: 2, jobs: 1, quotes: 1 })
  })

  it('keeps a customer with an enquiry (409) and removes one nothing names (204), with their sites', async () => {
    const keep = await customer('Has An Enquiry')
    ok(await owner.post('/api/enquiries', { customerId: keep.id, source: 'phone', description: 'Skim the hall' }))
    const held = await owner.delete(`/api/customers/${keep.id}`)
    expect(held.status).toBe(409)
    expect(held.body.data.message).toMatch(/1 enquiry\b/)
    const drop = await customer('Typed In Twice')
    expect((await owner.delete(`/api/customers/${drop.id}`)).status).toBe(204)
    expect((await owner.get(`/api/customers/${drop.id}`)).status).toBe(404)
  })
})

describe('removing a site', () => {
  it('keeps a site a job names (409 naming it) and removes one nothing names (204)', async () => {
    const c = await customer()
    ok(await owner.post('/api/jobs', { customerId: c.id, siteId: c.sites[0]!.id, title: 'Overboard the kitchen ceiling' }))
    const res = await owner.delete(`/api/sites/${c.sites[0]!.id}`)
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.message).toMatch(/1 job\b/)
    expect(res.body.data.holds).toMatchObject({ jobs: 1 })

    const spare = ok(await owner.post(`/api/customers/${c.id}/sites`, { line1: '2 Spare Lane', town: 'Kettlebury', postcode: 'KB4 4SL' }))
    expect((await owner.delete(`/api/sites/${spare.id}`)).status).toBe(204)
  })

  it('keeps a site a quote names (409)', async () => {
    const c = await customer()
    ok(await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0]!.id }))
    const res = await owner.delete(`/api/sites/${c.sites[0]!.id}`)
    expect(res.status, JSON.stringify(res.body)).toBe(409)
    expect(res.body.data.message).toMatch(/1 quote\b/)
  })
})
