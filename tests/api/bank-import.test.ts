import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import type { Client } from '../support/client'
import { signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { inviteAndJoin } from './support'

// Importing a bank statement (issue 20): a file's lines once per account, an overlapping file
// adding only what is new, a bad line named with nothing written, the roles and the firm's walls.
// The statements are written for the test (invented payers).

let app: TestApp
let owner: Client
let firmId: string
const sql = <T = Record<string, unknown>>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Statement Yard Plastering'))
})
afterAll(async () => {
  await app?.stop()
})

async function upload(who: Client | null, accountId: string, text: string, fields: Record<string, string> = {}, name = 'statement.csv') {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  form.append('file', new Blob([text], { type: 'text/csv' }), name)
  const res = await fetch(`${app.url}/api/bank-accounts/${accountId}/statements/uploads`, { method: 'POST', body: form, headers: who ? { cookie: who.cookieHeader() } : {} })
  return { status: res.status, body: await res.json().catch(() => null) as any }
}
const NOVEMBER = `Date,Description,Amount,Balance
28/11/2026,FASTER PAYMENT BRP-0017 COLLEY,480.00,2480.00
30/11/2026,CARD PAYMENT TRADE PLASTER SUP,-64.20,2415.80
01/12/2026,CARD PAYMENT CAFE,-3.50,2412.30`
const OVERLAP = `Date,Description,Amount,Balance
30/11/2026,CARD PAYMENT TRADE PLASTER SUP,-64.20,2415.80
01/12/2026,CARD PAYMENT CAFE,-3.50,2412.30
02/12/2026,BANK TRANSFER PRIBBLEWORTH BRP 21,1764.00,4176.30`

describe('importing a statement', () => {
  let accountId: string
  it('adds an account, imports a file, and an overlapping one adds only its new line', async () => {
    const made = await owner.post('/api/bank-accounts', { name: 'Business current account' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    accountId = made.body.id
    expect((await owner.post('/api/bank-accounts', { name: 'Business current account' })).status).toBe(409)
    const first = await upload(owner, accountId, NOVEMBER)
    expect(first.status, JSON.stringify(first.body)).toBe(200)
    expect(first.body).toMatchObject({ linesNew: 3, linesAlready: 0, format: 'csv' })
    expect((await upload(owner, accountId, NOVEMBER)).body).toMatchObject({ linesNew: 0, linesAlready: 3 })
    expect((await upload(owner, accountId, OVERLAP)).body).toMatchObject({ linesNew: 1, linesAlready: 2 })
    const lines = await sql<{ posted_on: string, amount_pence: number }>('select posted_on::text, amount_pence from bank_lines where firm_id = $1 order by posted_on', [firmId])
    expect(lines.map(l => [l.posted_on, l.amount_pence])).toEqual([['2026-11-28', 48000], ['2026-11-30', -6420], ['2026-12-01', -350], ['2026-12-02', 176400]])
  })

  it('refuses a file with a bad line, naming it, and writes nothing', async () => {
    const before = (await sql<{ n: number }>('select count(*)::int as n from bank_lines where firm_id = $1', [firmId]))[0]!.n
    const bad = await upload(owner, accountId, `Date,Description,Amount\n03/12/2026,FP DUNMORE,250.00\n31/11/2026,FP X,1.00\n04/12/2026,FP Y,2.00`)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.file).toBe('Line 3: the date "31/11/2026" is not a date (day, month, year).')
    expect((await sql<{ n: number }>('select count(*)::int as n from bank_lines where firm_id = $1', [firmId]))[0]!.n).toBe(before)
    expect((await sql<{ n: number }>('select count(*)::int as n from bank_statements where firm_id = $1 and lines_new = 0 and lines_already = 0', [firmId]))[0]!.n).toBe(0)
  })

  it('asks for the columns when the header does not name them, then remembers them for the account', async () => {
    const made = await owner.post('/api/bank-accounts', { name: 'Card account' })
    const bare = '05/12/2026,FP FERNHILL HOMES,576.00\n06/12/2026,CARD SKIP HIRE,-180.00'
    expect((await upload(owner, made.body.id, bare)).status).toBe(400)
    const layout = JSON.stringify({ headerRow: -1, mapping: { date: 0, description: [1], amount: 2 } })
    expect((await upload(owner, made.body.id, bare, { layout })).body).toMatchObject({ linesNew: 2 })
    // the next file of that bank, with no layout sent
    expect((await upload(owner, made.body.id, '07/12/2026,FP COLLEY,10.00')).body).toMatchObject({ linesNew: 1 })
  })

  it('keeps the accountant to reading, crew and other firms out, and refuses what is not an upload', async () => {
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')
    expect((await upload(accountant, accountId, NOVEMBER)).status).toBe(403)
    expect((await upload(crew, accountId, NOVEMBER)).status).toBe(403)
    expect((await upload(null, accountId, NOVEMBER)).status).toBe(401)
    const { client: other } = await signUpFirm(app.url, 'Elsewhere Plastering')
    expect((await upload(other, accountId, NOVEMBER)).status).toBe(404)
    const json = await fetch(`${app.url}/api/bank-accounts/${accountId}/statements/uploads`, { method: 'POST', body: '{}', headers: { 'content-type': 'application/json', 'cookie': owner.cookieHeader() } })
    expect(json.status).toBe(415)
  })

  it('reads OFX the same way', async () => {
    const ofx = `OFXHEADER:100\nDATA:OFXSGML\nVERSION:102\n\n<OFX><BANKMSGSRSV1><STMTTRNRS><TRNUID>1<STMTRS><CURDEF>GBP<BANKTRANLIST><DTSTART>20261208<DTEND>20261208
<STMTTRN><TRNTYPE>CREDIT<DTPOSTED>20261208<TRNAMT>311.00<FITID>Z9<NAME>FP ORCHARD ROW</STMTTRN></BANKTRANLIST></STMTRS></STMTTRNRS></BANKMSGSRSV1></OFX>`
    const r = await upload(owner, accountId, ofx, {}, 'statement.ofx')
    expect(r.body).toMatchObject({ linesNew: 1, format: 'ofx' })
    expect((await upload(owner, accountId, ofx, {}, 'statement.ofx')).body).toMatchObject({ linesNew: 0, linesAlready: 1 })
  })
})

describe('the lines of an account, with what each could be', () => {
  it('proposes an owing invoice for money in by its reference, and a purchase for money out; the accountant reads them, crew do not', async () => {
    const [c] = await sql<{ id: string }>(`insert into customers (firm_id, kind, name, email, billing_line1, billing_postcode) values ($1, 'homeowner', 'Harriet Colley', 'harriet@example.invalid', '3 Wren Close', 'KB2 3LP') returning id`, [firmId])
    const [inv] = await sql<{ id: string }>(`insert into invoices (firm_id, kind, series, number, reference, customer_id, vat, issued_on, due_on, amount_due_pence) values ($1, 'final', 'invoice', 917, 'SY-0917', $2, 'standard', '2026-11-20', '2026-12-04', 48000) returning id`, [firmId, c!.id])
    const [p] = await sql<{ id: string }>(`insert into purchases (firm_id, supplier, bought_on, category, net_pence, vat_pence) values ($1, 'Trade Plaster Supplies', '2026-12-09', 'materials', 5350, 1070) returning id`, [firmId])
    const made = await owner.post('/api/bank-accounts', { name: 'Lines account' })
    const imported = await upload(owner, made.body.id, `Date,Description,Amount\n10/12/2026,FASTER PAYMENT sy 917 COLLEY,480.00\n10/12/2026,CARD PAYMENT TRADE PLASTER SUP,-64.20\n10/12/2026,INTEREST,0.12`)
    expect(imported.body).toMatchObject({ linesNew: 3 })
    const res = await owner.get(`/api/bank-accounts/${made.body.id}/lines`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const by = (d: string) => res.body.lines.find((l: { description: string }) => l.description === d)
    expect(by('FASTER PAYMENT sy 917 COLLEY').proposal).toMatchObject({ certainty: 'sure', parts: [{ invoiceId: inv!.id, amountPence: 48000 }] })
    expect(by('CARD PAYMENT TRADE PLASTER SUP').proposal).toMatchObject({ certainty: 'sure', match: { kind: 'purchase', purchaseId: p!.id } })
    expect(by('INTEREST').proposal).toBeNull()
    // the newest `limit` lines (200 unless asked; a busy firm's year, 5,000, at most)
    expect((await owner.get(`/api/bank-accounts/${made.body.id}/lines?limit=2`)).body.lines).toHaveLength(2)
    for (const limit of ['0', '5001', 'all']) expect((await owner.get(`/api/bank-accounts/${made.body.id}/lines?limit=${limit}`)).status).toBe(400)
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct2'), 'accountant')
    expect((await accountant.get(`/api/bank-accounts/${made.body.id}/lines`)).status).toBe(200)
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew2'), 'crew')
    expect((await crew.get(`/api/bank-accounts/${made.body.id}/lines`)).status).toBe(403)
    const { client: other } = await signUpFirm(app.url, 'Far Away Plastering')
    expect((await other.get(`/api/bank-accounts/${made.body.id}/lines`)).status).toBe(404)
  })
})
