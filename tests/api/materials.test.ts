import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

// The materials catalogue: a new firm starts from the generic list, edits prices and coverage,
// adds its own and switches off what it does not use; estimates on new quotes follow it.

let app: TestApp
let owner: Client
let other: Client

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner } = await signUpFirm(app.url, 'Catalogue Firm'))
  ;({ client: other } = await signUpFirm(app.url, 'Other Catalogue Firm'))
})
afterAll(async () => {
  await app?.stop()
})

const bonding = { type: 'bonding-undercoat', name: 'Lightweight bonding', packLabel: '25 kg bag', coverageCm2PerPack: 27_000, atThicknessMm: 8, costPence: 1_395, supplier: 'Yard on Wharf Road' }

async function quoteEstimateFor(client: Client) {
  const c = (await client.post('/api/customers', { customer: { kind: 'homeowner', name: 'Rhoda Penhale', email: uniqueEmail('rhoda') }, site: { line1: '3 Saltings Row', postcode: 'TR9 2AB' } })).body
  const v = (await client.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-12-03T09:00:00Z' })).body
  // a 5.00 x 2.50 wall back to masonry: 12.50 m² of undercoat and skim
  const room = await client.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, { revision: 0, name: 'Kitchen', surfaces: [{ id: crypto.randomUUID(), kind: 'wall', lengthMm: 5000, secondMm: 2500, background: 'masonry' }] })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  const q = await client.post('/api/quotes', { customerId: c.id, visitId: v.id })
  expect(q.status, JSON.stringify(q.body)).toBe(201)
  return (await client.get(`/api/quotes/${q.body.id}`)).body.current.lines.filter((l: any) => l.kind === 'materials')
}

describe('materials catalogue', () => {
  it('starts a new firm from the generic list, marked with its sources', async () => {
    const list = await owner.get('/api/materials')
    expect(list.status).toBe(200)
    expect(list.body.map((m: any) => m.type)).toEqual(expect.arrayContaining(['finish', 'bonding-undercoat', 'bead', 'scrim']))
    expect(list.body.every((m: any) => m.source.length > 0 && m.active)).toBe(true)
  })

  it('adds a material, changes it, and checks the fields', async () => {
    const created = await owner.post('/api/materials', bonding)
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body).toMatchObject({ ...bonding, source: 'Entered by the firm.', active: true })
    const changed = await owner.patch(`/api/materials/${created.body.id}`, { ...bonding, costPence: 1_450 })
    expect(changed.status).toBe(200)
    expect(changed.body.costPence).toBe(1_450)

    // a finish plaster needs its coverage and thickness; a bead needs its length; each error is on its field
    const bad = await owner.post('/api/materials', { type: 'finish', name: '', packLabel: '25 kg bag', costPence: -5, coverageCm2PerPack: null })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['atThicknessMm', 'costPence', 'coverageCm2PerPack', 'name'])
    const bead = await owner.post('/api/materials', { type: 'bead', name: 'Stop bead', packLabel: '3 m length', costPence: 150 })
    expect(bead.status).toBe(400)
    expect(Object.keys(bead.body.data.fields)).toEqual(['coverageMmPerPack'])
    expect((await owner.patch(`/api/materials/${crypto.randomUUID()}`, bonding)).status).toBe(404)
    expect((await owner.patch('/api/materials/not-an-id', bonding)).status).toBe(404)
  })

  it('estimates new quotes from the switched-on materials', async () => {
    const list = (await owner.get('/api/materials')).body
    // switch off the generic bonding undercoat, so the firm's own is the one used
    for (const m of list.filter((x: any) => x.type === 'bonding-undercoat' && x.name !== bonding.name)) {
      const { id: _i, firmId: _f, key: _k, source: _s, createdAt: _c, updatedAt: _u, ...fields } = m
      expect((await owner.patch(`/api/materials/${m.id}`, { ...fields, active: false })).status).toBe(200)
    }
    const lines = await quoteEstimateFor(owner)
    const undercoat = lines.find((l: any) => l.description.startsWith(bonding.name))
    // 12.50 m² x 11 mm (the estimate's undercoat thickness) / 8 mm / 2.70 m² a bag x 1.10 waste = 7.002 -> 8 bags at £14.50 (no mark-up on a new firm)
    expect(undercoat).toMatchObject({ quantityX1000: 8000, unitPence: 1_450 })
  })

  it('keeps the catalogue to its firm and its roles', async () => {
    const mine = (await owner.get('/api/materials')).body[0]
    const { id: _i, firmId: _f, key: _k, source: _s, createdAt: _c, updatedAt: _u, ...fields } = mine
    // another firm cannot see or change it
    expect((await other.get('/api/materials')).body.some((m: any) => m.id === mine.id)).toBe(false)
    expect((await other.patch(`/api/materials/${mine.id}`, fields)).status).toBe(404)
    // crew see no prices; the accountant reads but does not change; nobody signed out gets in
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')
    expect((await crew.get('/api/materials')).status).toBe(403)
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')
    expect((await accountant.get('/api/materials')).status).toBe(200)
    expect((await accountant.post('/api/materials', bonding)).status).toBe(403)
    expect((await new Client(app.url).get('/api/materials')).status).toBe(401)
  })
})
