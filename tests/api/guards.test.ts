import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'

let app: TestApp

beforeAll(async () => {
  app = await startApp()
})
afterAll(async () => {
  await app?.stop()
})

describe('cross-site requests', () => {
  it('refuses a POST whose Origin is another site, or whose Sec-Fetch-Site says cross-site, with 403', async () => {
    const { email } = await signUpFirm(app.url)
    const body = { email, password: GOOD_PASSWORD }
    const c = new Client(app.url)
    expect((await c.post('/api/auth/sign-in', body, { origin: 'https://evil.example' })).status).toBe(403)
    expect((await c.post('/api/auth/sign-in', body, { 'sec-fetch-site': 'cross-site' })).status).toBe(403)
    expect((await c.post('/api/auth/sign-in', body, { origin: 'null' })).status).toBe(403)
    // the same origin, as a browser on our own page sends it, is fine
    expect((await c.post('/api/auth/sign-in', body, { 'origin': app.url, 'sec-fetch-site': 'same-origin' })).status).toBe(200)
  })

  it('refuses a cross-site write by a signed-in person, and the write does not happen', async () => {
    const { client } = await signUpFirm(app.url)
    const email = uniqueEmail('csrf')
    const res = await client.post('/api/team/invitations', { email, role: 'owner' }, { origin: 'https://evil.example' })
    expect(res.status).toBe(403)
    expect((await client.get('/api/team')).body.invitations).toEqual([])
  })

  it('lets cross-site GETs through to the normal checks (no session, 401)', async () => {
    expect((await new Client(app.url).get('/api/me', { 'sec-fetch-site': 'cross-site' })).status).toBe(401)
  })
})

describe('bodies', () => {
  it('answers 415 for a body that is not JSON', async () => {
    const res = await new Client(app.url).request('POST', '/api/auth/sign-in', 'email=a@b.example&password=x', { 'content-type': 'application/x-www-form-urlencoded' })
    expect(res.status).toBe(415)
  })

  it('answers 413 for a body over 256 KiB', async () => {
    const res = await new Client(app.url).post('/api/auth/sign-in', { email: 'a@b.example', password: 'x'.repeat(300 * 1024) })
    expect(res.status).toBe(413)
  })

  it('answers 400, not 500, for broken JSON and for the wrong types', async () => {
    const c = new Client(app.url)
    expect((await c.request('POST', '/api/auth/sign-in', '{"email": ', { 'content-type': 'application/json' })).status).toBe(400)
    const wrongTypes = await c.post('/api/auth/sign-in', { email: 42, password: ['x'] })
    expect(wrongTypes.status).toBe(400)
    expect(Object.keys(wrongTypes.body.data.fields).sort()).toEqual(['email', 'password'])
    expect((await c.request('POST', '/api/auth/sign-in', '[]', { 'content-type': 'application/json' })).status).toBe(400)
  })

  it('names each bad field of the firm settings, and keeps the firm as it was', async () => {
    const { client } = await signUpFirm(app.url, 'Settings Test')
    const before = (await client.get('/api/firm')).body
    const base = { tradingName: 'Renamed', addressLine1: '', addressLine2: '', town: '', postcode: '', email: '', phone: '', vatRegistered: false, vatNumber: '', cisStatus: 'not-registered', utr: '', dayRatePence: 15000, paymentTermsDays: 30, invoicePrefix: 'INV-' }
    // fields that depend on each other are named together with the others
    const linked = await client.patch('/api/firm', { ...base, email: 'nope', vatRegistered: true, cisStatus: 'registered' })
    expect(linked.status).toBe(400)
    expect(Object.keys(linked.body.data.fields).sort()).toEqual(['email', 'utr', 'vatNumber'])
    const formats = await client.patch('/api/firm', { ...base, vatNumber: 'GB12', utr: '12', dayRatePence: 150.5, paymentTermsDays: -1, invoicePrefix: 'INV 1' })
    expect(formats.status).toBe(400)
    expect(Object.keys(formats.body.data.fields).sort()).toEqual(['dayRatePence', 'invoicePrefix', 'paymentTermsDays', 'utr', 'vatNumber'])
    expect((await client.get('/api/firm')).body.tradingName).toBe(before.tradingName)
  })

  it('saves good firm settings, normalising the VAT number and UTR', async () => {
    const { client } = await signUpFirm(app.url)
    const res = await client.patch('/api/firm', {
      tradingName: 'Quarry Lane Plastering', addressLine1: '2 Quarry Lane', addressLine2: '', town: 'Oxwell', postcode: 'OX9 9ZZ',
      email: 'Office@Quarry.example', phone: '01632 960 000', vatRegistered: true, vatNumber: 'gb 999 9999 73', cisStatus: 'gross',
      utr: '12345 67890', dayRatePence: 19_500, paymentTermsDays: 30, invoicePrefix: 'QLP-',
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ vatNumber: 'GB999999973', utr: '1234567890', email: 'office@quarry.example', dayRatePence: 19_500 })
  })

  it('answers 404 for a malformed id in the path', async () => {
    const { client } = await signUpFirm(app.url)
    expect((await client.patch('/api/team/not-a-uuid', { role: 'crew' })).status).toBe(404)
    expect((await client.delete('/api/team/1')).status).toBe(404)
  })

  it('answers 404 for an unknown API path', async () => {
    expect((await new Client(app.url).get('/api/no-such-thing')).status).toBe(404)
  })
})
