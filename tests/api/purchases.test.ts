import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

// Purchases (the start of issue 7): materials and other costs as they are bought, split across
// the jobs they were for; the office records them, the accountant reads them, crew never see them.

let app: TestApp
let owner: Client
let other: Client

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner } = await signUpFirm(app.url, 'Purchase Firm'))
  ;({ client: other } = await signUpFirm(app.url, 'Other Purchase Firm'))
})
afterAll(async () => {
  await app?.stop()
})

async function job(client: Client, title: string) {
  const c = (await client.post('/api/customers', { customer: { kind: 'homeowner', name: 'Bryn Maddern', email: uniqueEmail('bryn') } })).body
  return (await client.post('/api/jobs', { customerId: c.id, title })).body
}

describe('purchases', () => {
  it('records a receipt split across two jobs, lists it by job and date, changes and deletes it', async () => {
    const a = await job(owner, 'Skim the lounge')
    const b = await job(owner, 'Patch the hall')
    const made = await owner.post('/api/purchases', { supplier: 'Quayside builders\' yard', boughtOn: '2026-11-28', category: 'materials', netPence: 120_00, vatPence: 24_00, jobs: [{ jobId: a.id, netPence: 80_00 }, { jobId: b.id, netPence: 40_00 }] })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    expect(made.body.jobs.map((j: any) => j.netPence).sort()).toEqual([40_00, 80_00])
    expect((await owner.get(`/api/purchases?jobId=${a.id}`)).body.map((p: any) => p.id)).toEqual([made.body.id])
    expect((await owner.get('/api/purchases?from=2026-12-01')).body).toEqual([])
    const changed = await owner.put(`/api/purchases/${made.body.id}`, { supplier: 'Quayside builders\' yard', boughtOn: '2026-11-28', category: 'materials', netPence: 120_00, vatPence: 24_00, jobs: [{ jobId: a.id, netPence: 120_00 }] })
    expect(changed.status).toBe(200)
    expect(changed.body.jobs).toEqual([expect.objectContaining({ jobId: a.id, netPence: 120_00 })])
    expect((await owner.get(`/api/purchases?jobId=${b.id}`)).body).toEqual([])
    expect((await owner.delete(`/api/purchases/${made.body.id}`)).status).toBe(204)
    expect((await owner.get(`/api/purchases/${made.body.id}`)).status).toBe(404)
  })

  it('names each bad field, and refuses a split larger than the purchase or onto another firm\'s job', async () => {
    const bad = await owner.post('/api/purchases', { supplier: '', boughtOn: '28/11/2026', category: 'snacks', netPence: -1 })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['boughtOn', 'category', 'netPence', 'supplier'])
    const a = await job(owner, 'Skim the box room')
    const over = await owner.post('/api/purchases', { supplier: 'Yard', boughtOn: '2026-11-28', category: 'materials', netPence: 10_00, jobs: [{ jobId: a.id, netPence: 10_01 }] })
    expect(over.status).toBe(400)
    expect(over.body.data.fields.jobs).toMatch(/more than the purchase/)
    const theirs = await job(other, 'Their job')
    const foreign = await owner.post('/api/purchases', { supplier: 'Yard', boughtOn: '2026-11-28', category: 'materials', netPence: 10_00, jobs: [{ jobId: theirs.id, netPence: 5_00 }] })
    expect(foreign.status).toBe(400)
    expect(foreign.body.data.fields['jobs.0.jobId']).toBeTruthy()
  })

  it('lets the accountant read but not change, keeps crew and other firms out', async () => {
    const made = (await owner.post('/api/purchases', { supplier: 'Fuel stop', boughtOn: '2026-11-30', category: 'fuel', netPence: 50_00, vatPence: 10_00 })).body
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')
    expect((await accountant.get(`/api/purchases/${made.id}`)).status).toBe(200)
    expect((await accountant.post('/api/purchases', { supplier: 'x', boughtOn: '2026-11-30', category: 'fuel', netPence: 1 })).status).toBe(403)
    expect((await accountant.delete(`/api/purchases/${made.id}`)).status).toBe(403)
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')
    expect((await crew.get('/api/purchases')).status).toBe(403)
    expect((await other.get(`/api/purchases/${made.id}`)).status).toBe(404)
    expect((await other.delete(`/api/purchases/${made.id}`)).status).toBe(404)
    expect((await new Client(app.url).get('/api/purchases')).status).toBe(401)
  })
})
