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

describe('confirming and undoing', () => {
  let accountId: string
  let colley: { id: string }
  const lines = async (state = 'open') => (await owner.get(`/api/bank-accounts/${accountId}/lines?state=${state}`)).body
  const byDesc = (body: { lines: { description: string }[] }, d: string) => body.lines.find(l => l.description === d) as any
  const invoice = async (number: number, pence: number, customerId = colley.id) => (await sql<{ id: string }>(`insert into invoices (firm_id, kind, series, number, reference, customer_id, vat, issued_on, due_on, amount_due_pence) values ($1, 'final', 'invoice', $2, $3, $4, 'standard', '2026-11-20', '2026-12-04', $5) returning id`, [firmId, number, `SY-0${number}`, customerId, pence]))[0]!.id
  const paidOn = async (id: string) => (await sql<{ n: number, owing: boolean }>('select (select coalesce(sum(amount_pence), 0)::int from payments p where p.firm_id = i.firm_id and p.invoice_id = i.id) as n, owing from invoices i where firm_id = $1 and id = $2', [firmId, id]))[0]!

  beforeAll(async () => {
    ;[colley] = await sql<{ id: string }>(`insert into customers (firm_id, kind, name, email, billing_line1, billing_postcode) values ($1, 'homeowner', 'Odile Farrant', 'odile@example.invalid', '7 Quarry Steps', 'KB4 7QS') returning id`, [firmId]) as [{ id: string }]
    accountId = (await owner.post('/api/bank-accounts', { name: 'Matching account' })).body.id
  })

  it('records a confirmed line as a transfer on the invoice, the owed view drops it, and undo takes it off again', async () => {
    const inv = await invoice(931, 36000)
    expect((await upload(owner, accountId, `Date,Description,Amount\n11/12/2026,FP FARRANT SY-931,360.00`)).body).toMatchObject({ linesNew: 1 })
    const line = byDesc(await lines(), 'FP FARRANT SY-931')
    expect(line.proposal).toMatchObject({ certainty: 'sure', parts: [{ invoiceId: inv, amountPence: 36000 }] })
    const owedBefore = (await owner.get('/api/owed')).body
    expect(JSON.stringify(owedBefore)).toContain('SY-0931')
    const ok = await owner.post(`/api/bank-lines/${line.id}/match`, { kind: 'payment', parts: [{ invoiceId: inv, amountPence: 36000 }] })
    expect(ok.status, JSON.stringify(ok.body)).toBe(201)
    expect(await paidOn(inv)).toEqual({ n: 36000, owing: false })
    const [pay] = await sql<{ method: string, received_on: string, reference: string }>('select method, received_on::text, reference from payments where firm_id = $1 and invoice_id = $2', [firmId, inv])
    expect(pay).toEqual({ method: 'transfer', received_on: '2026-12-11', reference: 'FP FARRANT SY-931' })
    expect(JSON.stringify((await owner.get('/api/owed')).body)).not.toContain('SY-0931')
    // twice is a 409, and the line shows what it was matched to
    expect((await owner.post(`/api/bank-lines/${line.id}/match`, { kind: 'payment', parts: [{ invoiceId: inv, amountPence: 36000 }] })).status).toBe(409)
    expect(byDesc(await lines('matched'), 'FP FARRANT SY-931').matches).toMatchObject([{ kind: 'payment', invoiceId: inv, reference: 'SY-0931', customerName: 'Odile Farrant', amountPence: 36000 }])
    const undone = await owner.delete(`/api/bank-lines/${line.id}/match`)
    expect(undone.status, JSON.stringify(undone.body)).toBe(200)
    expect(await paidOn(inv)).toEqual({ n: 0, owing: true })
    expect(byDesc(await lines(), 'FP FARRANT SY-931').proposal).toMatchObject({ certainty: 'sure' })
    expect((await owner.delete(`/api/bank-lines/${line.id}/match`)).status).toBe(409)
  })

  it('confirms the sure lines together, leaving the ambiguous one; pays two invoices from one transfer and a part payment', async () => {
    const a = await invoice(941, 25000)
    const b = await invoice(942, 25000)
    const c = await invoice(943, 57600)
    const d = await invoice(944, 31200)
    const e = await invoice(945, 120000)
    await upload(owner, accountId, [
      'Date,Description,Amount',
      '12/12/2026,TRANSFER FROM A FRIEND,250.00',
      '12/12/2026,FP SY 943 SY 944,888.00',
      '12/12/2026,FP SY945 PART,500.00',
    ].join('\n'))
    const body = await lines()
    const ambiguous = byDesc(body, 'TRANSFER FROM A FRIEND')
    expect(ambiguous.proposal.certainty).toBe('possible')
    expect([ambiguous.proposal.parts[0].invoiceId, ...ambiguous.proposal.alternatives].sort()).toEqual([a, b].sort())
    expect(body.invoices[a]).toMatchObject({ reference: 'SY-0941', customerName: 'Odile Farrant', outstandingPence: 25000 })
    const sure = body.lines.filter((l: any) => l.proposal?.certainty === 'sure').map((l: any) => l.id)
    const all = await owner.post(`/api/bank-accounts/${accountId}/confirmations`, { lineIds: [...sure, ambiguous.id] })
    expect(all.status, JSON.stringify(all.body)).toBe(200)
    expect(all.body.left).toBeGreaterThanOrEqual(1)
    expect(await paidOn(c)).toEqual({ n: 57600, owing: false })
    expect(await paidOn(d)).toEqual({ n: 31200, owing: false })
    expect(await paidOn(e)).toEqual({ n: 50000, owing: true })
    expect([await paidOn(a), await paidOn(b)]).toEqual([{ n: 0, owing: true }, { n: 0, owing: true }])
    expect(byDesc(await lines(), 'TRANSFER FROM A FRIEND')).toBeTruthy()
    // the partner chooses for the ambiguous one
    expect((await owner.post(`/api/bank-lines/${ambiguous.id}/match`, { kind: 'payment', parts: [{ invoiceId: b, amountPence: 25000 }] })).status).toBe(201)
    expect(await paidOn(b)).toEqual({ n: 25000, owing: false })
  })

  it('matches money out to a purchase, makes a purchase from a card payment (undo removes it), and recognises a Stripe payout', async () => {
    const [p] = await sql<{ id: string }>(`insert into purchases (firm_id, supplier, bought_on, category, net_pence, vat_pence) values ($1, 'Quarry Lane Timber', '2026-12-13', 'materials', 10000, 2000) returning id`, [firmId])
    await upload(owner, accountId, 'Date,Description,Amount\n14/12/2026,CARD PAYMENT QUARRY LANE TIMB,-120.00\n14/12/2026,CARD PAYMENT BRINEWELL FUELS,-61.30\n14/12/2026,STRIPE PAYMENTS UK PAYOUT,360.00')
    const body = await lines()
    const timber = byDesc(body, 'CARD PAYMENT QUARRY LANE TIMB')
    expect(timber.proposal).toMatchObject({ certainty: 'sure', match: { kind: 'purchase', purchaseId: p!.id } })
    expect(body.purchases[p!.id]).toMatchObject({ supplier: 'Quarry Lane Timber', grossPence: 12000 })
    const fuel = byDesc(body, 'CARD PAYMENT BRINEWELL FUELS')
    expect(fuel.proposal).toMatchObject({ certainty: 'possible', match: { kind: 'new-purchase', supplier: 'BRINEWELL FUELS', grossPence: 6130 } })
    const payout = byDesc(body, 'STRIPE PAYMENTS UK PAYOUT')
    expect(payout.proposal).toMatchObject({ certainty: 'sure', payout: true, parts: [] })
    // a payout is not invoices, and money out is not a payment
    expect((await owner.post(`/api/bank-lines/${fuel.id}/match`, { kind: 'payment', parts: [{ invoiceId: p!.id, amountPence: 100 }] })).status).toBe(400)
    expect((await owner.post(`/api/bank-lines/${timber.id}/match`, { kind: 'purchase', purchaseId: p!.id })).status).toBe(201)
    expect((await owner.post(`/api/bank-lines/${payout.id}/match`, { kind: 'payout' })).status).toBe(201)
    const paymentsBefore = (await sql<{ n: number }>('select count(*)::int as n from payments where firm_id = $1', [firmId]))[0]!.n
    const made = await owner.post(`/api/bank-lines/${fuel.id}/match`, { kind: 'new-purchase', supplier: 'Brinewell Fuels', category: 'fuel' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    const [bought] = await sql<{ id: string, net_pence: number, vat_pence: number, bought_on: string }>(`select id, net_pence, vat_pence, bought_on::text from purchases where firm_id = $1 and supplier = 'Brinewell Fuels'`, [firmId])
    expect(bought).toMatchObject({ net_pence: 6130, vat_pence: 0, bought_on: '2026-12-14' })
    expect((await sql<{ n: number }>('select count(*)::int as n from payments where firm_id = $1', [firmId]))[0]!.n).toBe(paymentsBefore)
    expect((await owner.delete(`/api/bank-lines/${fuel.id}/match`)).status).toBe(200)
    expect(await sql(`select id from purchases where firm_id = $1 and supplier = 'Brinewell Fuels'`, [firmId])).toEqual([])
    // the recorded purchase stays when its match is undone
    expect((await owner.delete(`/api/bank-lines/${timber.id}/match`)).status).toBe(200)
    expect(await sql('select id from purchases where firm_id = $1 and id = $2', [firmId, p!.id])).toHaveLength(1)
  })

  it('takes a transfer already typed in by hand as that payment, recording nothing more, and undo leaves it', async () => {
    const inv = await invoice(951, 27363)
    const typed = await owner.post(`/api/invoices/${inv}/payments`, { method: 'transfer', amountPence: 27363, receivedOn: '2026-12-16', reference: 'FARRANT KITCHEN', requestId: crypto.randomUUID() })
    expect([201, 409], JSON.stringify(typed.body)).toContain(typed.status)
    await sql(`insert into payments (firm_id, invoice_id, method, amount_pence, received_on, reference) select $1, $2, 'transfer', 27363, '2026-12-16', 'FARRANT KITCHEN' where not exists (select 1 from payments where firm_id = $1 and invoice_id = $2)`, [firmId, inv])
    await upload(owner, accountId, 'Date,Description,Amount\n17/12/2026,FP FARRANT KITCHEN,273.63')
    const line = byDesc(await lines(), 'FP FARRANT KITCHEN')
    expect(line.proposal).toMatchObject({ certainty: 'sure', parts: [] })
    const paymentId = line.proposal.recordedPaymentId
    expect((await owner.post(`/api/bank-accounts/${accountId}/confirmations`, { lineIds: [line.id] })).body).toMatchObject({ confirmed: 1 })
    expect(await paidOn(inv)).toEqual({ n: 27363, owing: false })
    expect(byDesc(await lines('matched'), 'FP FARRANT KITCHEN').matches).toMatchObject([{ kind: 'payment', made: false, reference: 'SY-0951' }])
    expect((await owner.delete(`/api/bank-lines/${line.id}/match`)).status).toBe(200)
    expect(await sql('select id from payments where firm_id = $1 and id = $2', [firmId, paymentId])).toHaveLength(1)
  })

  it('keeps a note on a line left for later, sets one aside, and keeps the accountant, crew and other firms out of every change', async () => {
    await upload(owner, accountId, 'Date,Description,Amount\n15/12/2026,TFR FROM SAVINGS,2000.00')
    const line = byDesc(await lines(), 'TFR FROM SAVINGS')
    expect((await owner.patch(`/api/bank-lines/${line.id}`, { note: 'Ask Jess what this is' })).status).toBe(200)
    expect(byDesc(await lines(), 'TFR FROM SAVINGS').note).toBe('Ask Jess what this is')
    expect((await owner.patch(`/api/bank-lines/${line.id}`, {})).status).toBe(400)
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct3'), 'accountant')
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew3'), 'crew')
    const { client: other } = await signUpFirm(app.url, 'Over The Hill Plastering')
    for (const [who, want] of [[accountant, 403], [crew, 403], [other, 404]] as const) {
      expect((await who.patch(`/api/bank-lines/${line.id}`, { state: 'ignored' })).status).toBe(want)
      expect((await who.post(`/api/bank-lines/${line.id}/match`, { kind: 'payout' })).status).toBe(want)
      expect((await who.delete(`/api/bank-lines/${line.id}/match`)).status).toBe(want)
      expect((await who.post(`/api/bank-accounts/${accountId}/confirmations`, { lineIds: [line.id] })).status).toBe(want)
    }
    expect((await accountant.get('/api/bank-accounts')).body.accounts.map((a: { name: string }) => a.name)).toContain('Matching account')
    expect((await other.get('/api/bank-accounts')).body.accounts).toEqual([])
    expect((await owner.patch(`/api/bank-lines/${line.id}`, { state: 'ignored' })).status).toBe(200)
    expect(byDesc(await lines('ignored'), 'TFR FROM SAVINGS')).toBeTruthy()
    expect(byDesc(await lines(), 'TFR FROM SAVINGS')).toBeUndefined()
    expect((await owner.post(`/api/bank-lines/${line.id}/match`, { kind: 'payout' })).status).toBe(409)
  })
})
