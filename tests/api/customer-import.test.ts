// POST /api/customers/import: one batch of an import. Bad rows are named by index and field and
// never block good ones; a second run of the same rows writes nothing; each firm gets its own rows.
// The rows written are read back with pg as the owner role (RLS is forced on it too, so the firm
// is set for the transaction first), since the customers list API is not this file's subject.
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp
let db: pg.Client

beforeAll(async () => {
  app = await startApp()
  db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
})
afterAll(async () => {
  await db?.end()
  await app?.stop()
})

/** The firm's customers, read as the database sees them. */
async function customersOf(firmId: string) {
  await db.query('begin')
  try {
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const { rows } = await db.query(`select name, kind, email, phone, billing_postcode, vat_registered, vat_number, pays_under_cis, cis_rate_percent, end_user_notified, import_key
      from customers order by name`)
    return rows
  }
  finally {
    await db.query('rollback')
  }
}

/** Invented customers: a homeowner without e-mail (keyed by name and postcode), a letting agent, a builder under CIS. */
const GOOD = [
  { kind: 'homeowner', name: 'Ada Thorne', phone: '07700 900123', billingLine1: '9 Wicket Lane', billingTown: 'Kettlebury', billingPostcode: 'kb2 9xd' },
  { kind: 'landlord', name: 'Quarrybank Lettings', contactName: 'Mo Hendry', email: 'Lettings@Quarrybank.example', vatRegistered: true, vatNumber: 'gb 123 4567 89' },
  { kind: 'builder', name: 'Harrowgate Build Ltd', email: 'office@harrowgate-build.example', paysUnderCis: true, cisRatePercent: 20, endUserNotified: false },
]
const BAD = [
  { kind: 'homeowner', name: 'Bea Lorrimer', email: 'bea.at.example' },
  { kind: 'homeowner', name: 'Cal Dunmore', paysUnderCis: true, cisRatePercent: 20 },
  { kind: 'builder', name: '', phone: '12' },
]
/** Good and bad interleaved: indexes 1, 3 and 5 are bad. */
const MIXED = [GOOD[0], BAD[0], GOOD[1], BAD[1], GOOD[2], BAD[2]]

describe('importing customers', () => {
  it('writes the good rows once and reports each bad row by index with its fields', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Import Check Plastering')
    const res = await owner.post('/api/customers/import', { rows: MIXED })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.created).toBe(3)
    expect(res.body.skipped).toBe(0)
    expect(res.body.rejected.map((r: any) => [r.index, Object.keys(r.errors).sort()])).toEqual([
      [1, ['email']],
      [3, ['paysUnderCis']],
      [5, ['name', 'phone']],
    ])
    expect(res.body.rejected[0].errors.email).toMatch(/e-mail address/)

    const rows = await customersOf(firmId)
    expect(rows).toEqual([
      { name: 'Ada Thorne', kind: 'homeowner', email: '', phone: '07700 900123', billing_postcode: 'KB2 9XD', vat_registered: false, vat_number: null, pays_under_cis: false, cis_rate_percent: null, end_user_notified: false, import_key: 'ada thorne|kb29xd' },
      { name: 'Harrowgate Build Ltd', kind: 'builder', email: 'office@harrowgate-build.example', phone: '', billing_postcode: '', vat_registered: false, vat_number: null, pays_under_cis: true, cis_rate_percent: 20, end_user_notified: false, import_key: 'office@harrowgate-build.example' },
      { name: 'Quarrybank Lettings', kind: 'landlord', email: 'lettings@quarrybank.example', phone: '', billing_postcode: '', vat_registered: true, vat_number: 'GB123456789', pays_under_cis: false, cis_rate_percent: null, end_user_notified: false, import_key: 'lettings@quarrybank.example' },
    ])

    // one audit entry for the batch
    const audit = (await owner.get('/api/audit')).body.filter((a: any) => a.action === 'customers.imported')
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({ entity: 'customer', entityId: null, detail: { created: 3, skipped: 0, rejected: 3 } })
  })

  it('writes nothing new when the same rows come again, however the e-mail and name are cased', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    expect((await owner.post('/api/customers/import', { rows: MIXED })).body.created).toBe(3)

    const again = await owner.post('/api/customers/import', { rows: MIXED })
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ created: 0, skipped: 3 })
    expect(again.body.rejected.map((r: any) => r.index)).toEqual([1, 3, 5])

    const recased = await owner.post('/api/customers/import', {
      rows: [{ ...GOOD[0], name: '  ADA   thorne ', billingPostcode: 'KB29XD' }, { ...GOOD[1], email: ' LETTINGS@quarrybank.EXAMPLE' }],
    })
    expect(recased.body).toMatchObject({ created: 0, skipped: 2, rejected: [] })
    expect(await customersOf(firmId)).toHaveLength(3)

    const audit = (await owner.get('/api/audit')).body.filter((a: any) => a.action === 'customers.imported')
    expect(audit.map((a: any) => a.detail)).toEqual(expect.arrayContaining([
      { created: 3, skipped: 0, rejected: 3 },
      { created: 0, skipped: 3, rejected: 3 },
      { created: 0, skipped: 2, rejected: 0 },
    ]))
  })

  it('writes a row repeated within one batch once', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const res = await owner.post('/api/customers/import', { rows: [GOOD[2], GOOD[0], { ...GOOD[2], name: 'Harrowgate Build (again)' }] })
    expect(res.body).toMatchObject({ created: 2, skipped: 1, rejected: [] })
    expect((await customersOf(firmId)).map(r => r.name)).toEqual(['Ada Thorne', 'Harrowgate Build Ltd'])
  })

  it('takes a full batch of 200 rows in one request', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const rows = Array.from({ length: 200 }, (_, i) => ({
      kind: 'homeowner', name: `Tester ${i}`, email: `tester-${i}@mail.example`, phone: '01632 960 000',
      billingLine1: `${i + 1} Sallow Street`, billingTown: 'Kettlebury', billingPostcode: 'KB4 7QZ', notes: 'Side gate; dog friendly.',
    }))
    const res = await owner.post('/api/customers/import', { rows })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ created: 200, skipped: 0, rejected: [] })
    expect(await customersOf(firmId)).toHaveLength(200)
  })

  it('gives another firm importing the same rows its own copies (tenancy)', async () => {
    const a = await signUpFirm(app.url, 'Firm A Plastering')
    const b = await signUpFirm(app.url, 'Firm B Render')
    expect((await a.client.post('/api/customers/import', { rows: GOOD })).body.created).toBe(3)
    const res = await b.client.post('/api/customers/import', { rows: GOOD })
    expect(res.body).toMatchObject({ created: 3, skipped: 0 })

    const aRows = await customersOf(a.firmId)
    const bRows = await customersOf(b.firmId)
    expect(aRows).toHaveLength(3)
    expect(bRows).toHaveLength(3)
    expect(bRows.map(r => r.import_key)).toEqual(aRows.map(r => r.import_key))
    // and B's audit holds B's import only
    const bAudit = (await b.client.get('/api/audit')).body.filter((e: any) => e.action === 'customers.imported')
    expect(bAudit).toHaveLength(1)
  })
})

describe('who may import', () => {
  it('answers 401 to someone signed out', async () => {
    const res = await new Client(app.url).post('/api/customers/import', { rows: GOOD })
    expect(res.status).toBe(401)
  })

  it('answers 403 to crew and the accountant, even with a bad body, and lets the office import', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')).client
    const office = (await inviteAndJoin(app, owner, uniqueEmail('office'), 'office')).client

    expect((await crew.post('/api/customers/import', { rows: GOOD })).status).toBe(403)
    expect((await accountant.post('/api/customers/import', { rows: GOOD })).status).toBe(403)
    expect((await crew.post('/api/customers/import', { rows: 'nonsense' })).status).toBe(403)
    expect(await customersOf(firmId)).toHaveLength(0)

    const res = await office.post('/api/customers/import', { rows: GOOD })
    expect(res.status).toBe(200)
    expect(res.body.created).toBe(3)
  })
})

describe('what a batch may be', () => {
  it.each<[string, unknown]>([
    ['501 rows', { rows: Array.from({ length: 501 }, (_, i) => ({ kind: 'homeowner', name: `Row ${i}` })) }],
    ['rows that are not a list', { rows: 'Name,E-mail\nAda Thorne,ada@mail.example' }],
    ['an object for rows', { rows: { 0: GOOD[0] } }],
    ['no rows at all', {}],
    ['an empty list', { rows: [] }],
  ])('answers 400 naming rows for %s, and writes nothing', async (_what, body) => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const res = await owner.post('/api/customers/import', body)
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.data.fields)).toEqual(['rows'])
    expect(await customersOf(firmId)).toHaveLength(0)
  })

  it('takes exactly 500 rows', async () => {
    const { client: owner } = await signUpFirm(app.url)
    const rows = Array.from({ length: 500 }, (_, i) => ({ kind: 'homeowner', name: `Row ${i}`, billingPostcode: 'KB4 7QZ' }))
    const res = await owner.post('/api/customers/import', { rows })
    expect(res.status).toBe(200)
    expect(res.body.created).toBe(500)
  })

  it('answers 413 for a body over 256 KiB, and writes nothing', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const rows = Array.from({ length: 100 }, (_, i) => ({ kind: 'homeowner', name: `Long Notes ${i}`, notes: 'n'.repeat(3000) }))
    const body = JSON.stringify({ rows })
    expect(Buffer.byteLength(body)).toBeGreaterThan(256 * 1024)
    const res = await owner.post('/api/customers/import', body)
    expect(res.status).toBe(413)
    expect(await customersOf(firmId)).toHaveLength(0)
  })
})
