import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { parse } from 'csv-parse/sync'
import { unzipSync, strFromU8 } from 'fflate'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

// The quarter (issue 7): the VAT boxes on both bases, CIS deducted against the contractor's
// statements, receipts kept as PDF or photo, and the accountant's CSV exports and ZIP pack, each
// read back with a second CSV parser (csv-parse) and checked against what the database holds.

let app: TestApp
let storageDir: string
let owner: Client
let firmId: string
let other: Client
let otherFirmId: string
let accountant: Client
let crew: Client
const d = new Date()
const today = `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`
const INJECTION = '=HYPERLINK("http://attacker.example","Click")'

const ids = {} as { homeowner: string, builder: string, standard: string, reverse: string, note: string, purchase: string, oldPurchase: string }

async function sql<T = any>(text: string, values: unknown[] = [], firm = firmId): Promise<T[]> {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firm])
    const { rows } = await db.query(text, values)
    await db.query('commit')
    return rows
  }
  finally {
    await db.end()
  }
}

async function vatRegister(client: Client, cash: boolean) {
  const firm = (await client.get('/api/firm')).body
  const res = await client.patch('/api/firm', {
    tradingName: firm.tradingName, addressLine1: '3 Lime Kiln Lane', addressLine2: '', town: 'Kettlebury', postcode: 'KB1 4QT', email: '', phone: '',
    vatRegistered: true, vatNumber: 'GB123456789', cisStatus: 'registered', utr: '1234567890', dayRatePence: 200_00, paymentTermsDays: 14, invoicePrefix: 'QT-',
    vatStagger: 1, vatCashAccounting: cash,
  })
  expect(res.status, JSON.stringify(res.body)).toBe(200)
}

async function issue(customerId: string, lines: { kind: 'labour' | 'materials', unitPence: number, description: string }[], vat: string, cisRatePercent: number | null = null) {
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId })).body
  expect(draft.vat).toBe(vat)
  const saved = await owner.put(`/api/invoices/${draft.id}/draft`, { vat, cisRatePercent, lines: lines.map(l => ({ ...l, quantityX1000: 1000, unit: 'item', vatRatePercent: 20 })) })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  const res = await owner.post(`/api/invoices/${draft.id}/issue`)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body
}

async function upload(who: Client | null, fields: Record<string, string>, file?: { data: Buffer, name: string, type: string }, headers: Record<string, string> = {}) {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  if (file) form.append('file', new Blob([new Uint8Array(file.data)], { type: file.type }), file.name)
  const res = await fetch(`${app.url}/api/documents/uploads`, { method: 'POST', body: form, headers: { ...(who ? { cookie: who.cookieHeader() } : {}), ...headers } })
  const text = await res.text()
  let body: any = text
  try {
    body = JSON.parse(text)
  }
  catch { /* not JSON */ }
  return { status: res.status, body }
}

async function download(who: Client, path: string) {
  const res = await fetch(app.url + path, { headers: { cookie: who.cookieHeader() } })
  return { status: res.status, headers: res.headers, data: Buffer.from(await res.arrayBuffer()) }
}

const csv = (data: Buffer | string) => parse(typeof data === 'string' ? data : data.toString('utf8'), { columns: true, bom: true, skip_empty_lines: true }) as Record<string, string>[]
const pounds = (pence: number) => (pence / 100).toFixed(2)

const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n')
// a 1x1 PNG
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64')

beforeAll(async () => {
  storageDir = mkdtempSync(join(tmpdir(), 'setwell-quarter-'))
  app = await startApp({ NUXT_STORAGE_DIR: storageDir, NUXT_UPLOAD_MAX_BYTES: String(64 * 1024) })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Quarter Firm'))
  ;({ client: other, firmId: otherFirmId } = await signUpFirm(app.url, 'Other Quarter Firm'))
  await vatRegister(owner, false)
  await vatRegister(other, false)
  ;({ client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant'))
  ;({ client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew'))

  // a homeowner whose name would run as a formula in a spreadsheet, and a builder paying under CIS
  ids.homeowner = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: INJECTION, email: uniqueEmail('home') } })).body.id
  ids.builder = (await owner.post('/api/customers', { customer: { kind: 'builder', name: 'Stonecrop Builders Ltd', email: uniqueEmail('stonecrop'), vatRegistered: true, vatNumber: 'GB987654321', paysUnderCis: true, cisRatePercent: 20 } })).body.id
  // standard: labour 500.00 + materials 120.00 = net 620.00, VAT 20% = 124.00, gross 744.00
  ids.standard = (await issue(ids.homeowner, [{ kind: 'labour', unitPence: 500_00, description: 'Skim the back bedroom' }, { kind: 'materials', unitPence: 120_00, description: 'Finish plaster and beads' }], 'standard')).id
  // reverse charge with CIS at 20%: labour 1000.00 + materials 200.00 = net 1200.00, no VAT charged
  // (240.00 for the customer to account for), CIS 20% of the labour only = 200.00, due 1000.00
  ids.reverse = (await issue(ids.builder, [{ kind: 'labour', unitPence: 1000_00, description: 'Undercoat and skim, plot 4' }, { kind: 'materials', unitPence: 200_00, description: 'Bonding and finish' }], 'reverse-charge', 20)).id
  // a credit note for the standard invoice's materials line: net 120.00, VAT 24.00
  const note = (await owner.post(`/api/invoices/${ids.standard}/credit-note`)).body
  expect((await owner.put(`/api/invoices/${note.id}/draft`, { vat: 'standard', lines: [{ kind: 'materials', description: 'Materials not used', quantityX1000: 1000, unit: 'item', unitPence: 120_00, vatRatePercent: 20 }] })).status).toBe(200)
  expect((await owner.post(`/api/invoices/${note.id}/issue`)).status).toBe(200)
  ids.note = note.id
  // the builder pays what is due, less CIS: 1000.00; the homeowner pays 300.00 of 744.00
  expect((await owner.post(`/api/invoices/${ids.reverse}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 1000_00, receivedOn: today, reference: 'BACS STONECROP' })).status).toBe(201)
  expect((await owner.post(`/api/invoices/${ids.standard}/payments`, { requestId: randomUUID(), method: 'cash', amountPence: 300_00, receivedOn: today })).status).toBe(201)
  // purchases: one in the quarter (net 300.00, VAT 60.00), one years before it
  ids.purchase = (await owner.post('/api/purchases', { supplier: '@Merchant "Yard", Unit 2', boughtOn: today, category: 'materials', netPence: 300_00, vatPence: 60_00, reference: '+INV-77' })).body.id
  ids.oldPurchase = (await owner.post('/api/purchases', { supplier: 'Old yard', boughtOn: '2020-01-15', category: 'tools', netPence: 50_00, vatPence: 10_00 })).body.id
})
afterAll(async () => {
  await app?.stop()
  if (storageDir) rmSync(storageDir, { recursive: true, force: true })
})

describe('the VAT return', () => {
  it('works out boxes 1 to 9 on the invoice basis, reverse charge in box 6 only, with what makes up each box', async () => {
    const res = await accountant.get(`/api/vat-return?quarterOf=${today}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const v = res.body
    expect(v.basis).toBe('invoice')
    expect(v.period.start <= today && today <= v.period.end).toBe(true)
    // box 1: 124.00 on the standard invoice less 24.00 on the credit note; nothing for the reverse charge
    // box 4: 60.00 on the quarter's purchase (not the 2020 one); box 5 = 100.00 - 60.00, to pay
    // box 6: 620.00 + 1200.00 (reverse charge, net only) - 120.00 = 1700.00; box 7: 300.00
    expect(v.boxes).toEqual({ 1: 100_00, 2: 0, 3: 100_00, 4: 60_00, 5: 40_00, 6: 1700_00, 7: 300_00, 8: 0, 9: 0 })
    expect(v.wholePounds).toEqual({ 6: 1700, 7: 300, 8: 0, 9: 0 })
    expect(v.toPay).toBe(true)
    for (const box of [1, 4, 6, 7]) {
      const entries = v.entries.filter((e: any) => e.box === box)
      const sum = entries.reduce((s: number, e: any) => s + (box === 1 || box === 4 ? e.vatPence : e.netPence), 0)
      expect(sum, `box ${box}`).toBe(v.boxes[box])
    }
    expect(v.entries.filter((e: any) => e.box === 1).map((e: any) => e.id).sort()).toEqual([ids.standard, ids.note].sort())
    expect(v.entries.some((e: any) => e.id === ids.oldPurchase)).toBe(false)
    expect(v.caution).toMatch(/accountant/)
  })

  it('on the cash accounting scheme counts what was paid: 300.00 of 744.00 carries 250.00 net and 50.00 VAT', async () => {
    const { client: cashOwner, firmId: cashFirm } = await signUpFirm(app.url, 'Cash Basis Firm')
    await vatRegister(cashOwner, true)
    const c = (await cashOwner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Ottilie Fenwick', email: uniqueEmail('ottilie') } })).body
    const draft = (await cashOwner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    await cashOwner.put(`/api/invoices/${draft.id}/draft`, { vat: 'standard', lines: [{ kind: 'labour', description: 'Skim', quantityX1000: 1000, unit: 'item', unitPence: 500_00, vatRatePercent: 20 }, { kind: 'materials', description: 'Plaster', quantityX1000: 1000, unit: 'item', unitPence: 120_00, vatRatePercent: 20 }] })
    await cashOwner.post(`/api/invoices/${draft.id}/issue`)
    await cashOwner.post(`/api/invoices/${draft.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 300_00, receivedOn: today })
    await cashOwner.post('/api/purchases', { supplier: 'Yard', boughtOn: today, category: 'materials', netPence: 300_00, vatPence: 60_00 })
    const v = (await cashOwner.get(`/api/vat-return?quarterOf=${today}`)).body
    expect(v.basis).toBe('cash')
    // 300/744 of net 620.00 = 250.00 and of VAT 124.00 = 50.00 (VAT Notice 731: VAT due when paid)
    // box 5 = |50.00 - 60.00| = 10.00 to reclaim
    expect(v.boxes).toEqual({ 1: 50_00, 2: 0, 3: 50_00, 4: 60_00, 5: 10_00, 6: 250_00, 7: 300_00, 8: 0, 9: 0 })
    expect(v.toPay).toBe(false)
    const rows = await sql('select count(*)::int as n from invoices', [], cashFirm)
    expect(rows[0].n).toBe(1)
  })

  it('names a bad period beside its field and never answers 500', async () => {
    for (const q of ['', '?quarterOf=2026-02-30', '?from=2026-10-01', `?from=2026-10-01&to=2026-09-30`, '?from=2020-01-01&to=2026-01-01', `?quarterOf=${today}&from=2026-10-01&to=2026-10-02`]) {
      const res = await owner.get(`/api/vat-return${q}`)
      expect(res.status, q).toBe(400)
      expect(Object.keys(res.body.data.fields).length, q).toBeGreaterThan(0)
    }
  })

  it('is read by the owner and the accountant, not by crew or the signed-out; another firm sees only its own', async () => {
    expect((await owner.get(`/api/vat-return?quarterOf=${today}`)).status).toBe(200)
    expect((await crew.get(`/api/vat-return?quarterOf=${today}`)).status).toBe(403)
    expect((await new Client(app.url).get(`/api/vat-return?quarterOf=${today}`)).status).toBe(401)
    const theirs = (await other.get(`/api/vat-return?quarterOf=${today}`)).body
    expect(theirs.boxes[6]).toBe(0)
    expect(theirs.entries).toEqual([])
  })
})

describe('CIS deducted and the contractor\'s statements', () => {
  it('shows the builder\'s deduction in its tax month, and reconciles it against the statement recorded', async () => {
    const before = (await accountant.get(`/api/cis-deductions?quarterOf=${today}`)).body
    const row = before.rows.find((r: any) => r.customerId === ids.builder)
    // paid 1000.00 of 1000.00 due: gross 1200.00 excluding VAT, materials 200.00, deducted 200.00 (DOMAIN.md: CIS on labour only)
    expect(row).toMatchObject({ grossPence: 1200_00, materialsPence: 200_00, deductionPence: 200_00, status: 'no-statement' })
    const month = row.taxMonthStart
    expect(month.endsWith('-06')).toBe(true)

    const made = await owner.post('/api/cis-statements', { customerId: ids.builder, taxMonthStart: month, grossPence: 1200_00, materialsPence: 200_00, deductionPence: 200_00, reference: 'ST-1104' })
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    expect((await accountant.get(`/api/cis-deductions?quarterOf=${today}`)).body.rows.find((r: any) => r.customerId === ids.builder).status).toBe('matches')

    // the same contractor and month again: 409; corrected to what the contractor really sent: differs by 10.00
    expect((await owner.post('/api/cis-statements', { customerId: ids.builder, taxMonthStart: month, grossPence: 1, deductionPence: 0 })).status).toBe(409)
    const changed = await owner.put(`/api/cis-statements/${made.body.id}`, { customerId: ids.builder, taxMonthStart: month, grossPence: 1200_00, materialsPence: 200_00, deductionPence: 210_00, reference: 'ST-1104' })
    expect(changed.status).toBe(200)
    const after = (await accountant.get(`/api/cis-deductions?quarterOf=${today}`)).body.rows.find((r: any) => r.customerId === ids.builder)
    expect(after).toMatchObject({ status: 'differs', differencePence: 10_00 })
    expect((await accountant.get('/api/cis-statements')).body.map((s: any) => s.id)).toContain(made.body.id)
  })

  it('refuses a month not starting on the 6th, a homeowner, a deduction over the gross, and another firm\'s customer', async () => {
    const bad = await owner.post('/api/cis-statements', { customerId: ids.builder, taxMonthStart: '2026-11-01', grossPence: 100_00, deductionPence: 200_00 })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['deductionPence', 'taxMonthStart'])
    const home = await owner.post('/api/cis-statements', { customerId: ids.homeowner, taxMonthStart: '2026-11-06', grossPence: 100_00, deductionPence: 20_00 })
    expect(home.status).toBe(400)
    expect(home.body.data.fields.customerId).toMatch(/not set up as paying under CIS/)
    const theirs = (await other.post('/api/customers', { customer: { kind: 'builder', name: 'Their Builder', paysUnderCis: true, cisRatePercent: 20 } })).body
    expect((await owner.post('/api/cis-statements', { customerId: theirs.id, taxMonthStart: '2026-11-06', grossPence: 100_00, deductionPence: 20_00 })).status).toBe(400)
    expect((await owner.post('/api/cis-statements', 'not json', { 'content-type': 'text/plain' })).status).toBe(415)
  })

  it('lets the accountant read statements but not record them; crew and other firms are kept out', async () => {
    const [s] = (await owner.get('/api/cis-statements')).body
    expect((await accountant.post('/api/cis-statements', { customerId: ids.builder, taxMonthStart: '2026-05-06', grossPence: 1, deductionPence: 0 })).status).toBe(403)
    expect((await accountant.delete(`/api/cis-statements/${s.id}`)).status).toBe(403)
    expect((await crew.get('/api/cis-statements')).status).toBe(403)
    expect((await crew.get(`/api/cis-deductions?quarterOf=${today}`)).status).toBe(403)
    expect((await other.get(`/api/cis-statements/${s.id}`)).status).toBe(404)
    expect((await other.put(`/api/cis-statements/${s.id}`, { customerId: ids.builder, taxMonthStart: '2026-05-06', grossPence: 1, deductionPence: 0 })).status).toBe(404)
    expect((await other.delete(`/api/cis-statements/${s.id}`)).status).toBe(404)
    expect((await other.get('/api/cis-statements')).body).toEqual([])
  })
})

describe('receipts and statements as files', () => {
  it('keeps a PDF receipt as sent and a photo re-encoded; the accountant downloads them as attachments', async () => {
    const pdf = await upload(owner, { purchaseId: ids.purchase }, { data: PDF, name: 'receipt 77.pdf', type: 'application/pdf' })
    expect(pdf.status, JSON.stringify(pdf.body)).toBe(201)
    expect(pdf.body).toMatchObject({ contentType: 'application/pdf', bytes: PDF.length, originalName: 'receipt 77.pdf', purchaseId: ids.purchase })
    const got = await download(accountant, pdf.body.url)
    expect(got.status).toBe(200)
    expect(got.data.equals(PDF)).toBe(true)
    expect(got.headers.get('content-disposition')).toMatch(/^attachment; filename="receipt-[0-9a-f-]+\.pdf"$/)
    expect(got.headers.get('content-security-policy')).toContain('sandbox')

    const photo = await upload(owner, { purchaseId: ids.purchase }, { data: PNG, name: 'till-roll.png', type: 'image/png' })
    expect(photo.status, JSON.stringify(photo.body)).toBe(201)
    expect(photo.body.contentType).toBe('image/jpeg')
    const detail = (await accountant.get(`/api/purchases/${ids.purchase}`)).body
    expect(detail.documents.map((x: any) => x.id)).toEqual([pdf.body.id, photo.body.id])

    const [statement] = (await owner.get('/api/cis-statements')).body
    const st = await upload(owner, { cisStatementId: statement.id }, { data: PDF, name: 'stonecrop-statement.pdf', type: 'application/pdf' })
    expect(st.status).toBe(201)
    expect((await owner.get(`/api/cis-statements/${statement.id}`)).body.documents).toHaveLength(1)

    expect((await owner.delete(`/api/documents/${photo.body.id}`)).status).toBe(204)
    expect((await download(accountant, photo.body.url)).status).toBe(404)
  })

  it('refuses what is not a PDF or a photo (415), too large (413), no target or two (400), no file (400)', async () => {
    const html = await upload(owner, { purchaseId: ids.purchase }, { data: Buffer.from('<html><script>alert(1)</script></html>'), name: 'receipt.pdf', type: 'application/pdf' })
    expect(html.status).toBe(415)
    expect(html.body.data.fields.file).toMatch(/PDF or a photo/)
    expect((await upload(owner, { purchaseId: ids.purchase }, { data: Buffer.from('just some text'), name: 'r.txt', type: 'text/plain' })).status).toBe(415)
    const big = Buffer.concat([PDF, Buffer.alloc(70 * 1024, 32)])
    const tooBig = await upload(owner, { purchaseId: ids.purchase }, { data: big, name: 'big.pdf', type: 'application/pdf' })
    expect(tooBig.status).toBe(413)
    expect((await upload(owner, {}, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(400)
    const [statement] = (await owner.get('/api/cis-statements')).body
    expect((await upload(owner, { purchaseId: ids.purchase, cisStatementId: statement.id }, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(400)
    expect((await upload(owner, { purchaseId: ids.purchase })).status).toBe(400)
    const notMultipart = await fetch(`${app.url}/api/documents/uploads`, { method: 'POST', body: JSON.stringify({ purchaseId: ids.purchase }), headers: { 'cookie': owner.cookieHeader(), 'content-type': 'application/json' } })
    expect(notMultipart.status).toBe(415)
  })

  it('answers 401 signed out, 403 to the accountant and crew, 404 for another firm\'s purchase or file', async () => {
    expect((await upload(null, { purchaseId: ids.purchase }, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(401)
    expect((await upload(accountant, { purchaseId: ids.purchase }, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(403)
    expect((await upload(crew, { purchaseId: ids.purchase }, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(403)
    expect((await upload(other, { purchaseId: ids.purchase }, { data: PDF, name: 'r.pdf', type: 'application/pdf' })).status).toBe(404)
    const [doc] = (await owner.get(`/api/purchases/${ids.purchase}`)).body.documents
    expect((await download(other, doc.url)).status).toBe(404)
    expect((await download(crew, doc.url)).status).toBe(403)
    expect((await other.delete(`/api/documents/${doc.id}`)).status).toBe(404)
    const rows = await sql('select count(*)::int as n from documents where purchase_id = $1', [ids.purchase])
    expect(rows[0].n).toBe(1)
  })
})

describe('the accountant\'s exports', () => {
  it('invoices.csv holds every issued invoice and credit note of the quarter, as the database does, credit notes negative', async () => {
    const res = await download(accountant, `/exports/invoices.csv?quarterOf=${today}`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8')
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="setwell-invoices-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}\.csv"$/)
    expect(res.data.subarray(0, 3).equals(Buffer.from([0xEF, 0xBB, 0xBF]))).toBe(true)
    const rows = csv(res.data)
    const db = await sql(`select reference, kind, issued_on::text as issued_on, (totals->>'netPence')::int as net, (totals->>'vatPence')::int as vat, amount_due_pence as due from invoices where issued_on is not null order by issued_on, series, number`)
    expect(rows.map(r => r.Number)).toEqual(db.map(r => r.reference))
    for (const [i, r] of rows.entries()) {
      const sign = db[i].kind === 'credit-note' ? -1 : 1
      expect(r['Net (pounds)']).toBe(pounds(sign * db[i].net))
      expect(r['VAT (pounds)']).toBe(pounds(sign * db[i].vat))
      expect(r['Amount due (pounds)']).toBe(pounds(sign * db[i].due))
      expect(r['Issued on']).toBe(db[i].issued_on)
    }
    const reverse = rows.find(r => r['VAT treatment'] === 'Reverse charge')!
    expect(reverse).toMatchObject({ 'Customer': 'Stonecrop Builders Ltd', 'Reverse charge VAT for the customer (pounds)': '240.00', 'CIS deduction (pounds)': '200.00', 'Paid to date (pounds)': '1000.00' })
    // the homeowner's name cannot run as a formula: it starts with an apostrophe
    const homeowner = rows.find(r => r['Customer kind'] === 'Homeowner')!
    expect(homeowner.Customer).toBe(`'${INJECTION}`)
    expect(Object.keys(rows[0]!)).toContain('Gross (pounds)')
  })

  it('invoice lines, payments and purchases read back equal to the database', async () => {
    const lines = csv((await download(accountant, `/exports/invoice-lines.csv?quarterOf=${today}`)).data)
    const dbLines = await sql(`select i.reference, l.description, l.unit_pence, l.quantity_x_1000 as quantity_x1000 from invoice_lines l join invoices i on i.firm_id = l.firm_id and i.id = l.invoice_id where i.issued_on is not null order by i.issued_on, i.series, i.number, l.position`)
    expect(lines.map(l => [l['Invoice number'], l.Description, l['Unit price (pounds)'], l.Quantity])).toEqual(dbLines.map(l => [l.reference, l.description, pounds(l.unit_pence), String(l.quantity_x1000 / 1000)]))
    expect(lines.find(l => l.Description === 'Materials not used')!['Line net (pounds)']).toBe('-120.00')

    const paid = csv((await download(accountant, `/exports/payments.csv?quarterOf=${today}`)).data)
    const dbPaid = await sql(`select p.amount_pence, i.reference from payments p join invoices i on i.firm_id = p.firm_id and i.id = p.invoice_id order by p.received_on, p.id`)
    expect(paid.map(p => [p['Invoice number'], p['Amount (pounds)']])).toEqual(dbPaid.map(p => [p.reference, pounds(p.amount_pence)]))

    const bought = csv((await download(accountant, `/exports/purchases.csv?quarterOf=${today}`)).data)
    expect(bought).toHaveLength(1)
    // a supplier and a reference that start like formulas are neutralised; quotes and commas survive
    expect(bought[0]).toMatchObject({ 'Supplier': '\'@Merchant "Yard", Unit 2', 'Reference': '\'+INV-77', 'Net (pounds)': '300.00', 'VAT (pounds)': '60.00', 'Gross (pounds)': '360.00', 'Receipt kept': 'Yes' })
    const all = csv((await download(accountant, '/exports/purchases.csv?from=2020-01-01&to=2020-12-31')).data)
    expect(all.map(p => p.Supplier)).toEqual(['Old yard'])
  })

  it('the VAT summary, its breakdown and the CIS file match the summaries on screen', async () => {
    const v = (await accountant.get(`/api/vat-return?quarterOf=${today}`)).body
    const boxes = csv((await download(accountant, `/exports/vat-summary.csv?quarterOf=${today}`)).data)
    expect(boxes.map(b => Number(b.Box))).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9])
    for (const b of boxes) expect(b['Amount (pounds)']).toBe(pounds(v.boxes[b.Box!]))
    expect(boxes.find(b => b.Box === '6')!['Whole pounds for the return']).toBe('1700')
    const breakdown = csv((await download(accountant, `/exports/vat-breakdown.csv?quarterOf=${today}`)).data)
    expect(breakdown).toHaveLength(v.entries.length)
    const cis = csv((await download(accountant, `/exports/cis-deductions.csv?quarterOf=${today}`)).data)
    expect(cis).toEqual([expect.objectContaining({ 'Contractor': 'Stonecrop Builders Ltd', 'CIS deducted (pounds)': '200.00', 'Statement deduction (pounds)': '210.00', 'Deduction difference (pounds)': '10.00' })])
  })

  it('the quarter-end pack is one ZIP of every file, each the same as its own download', async () => {
    const res = await download(accountant, `/exports/quarter.zip?quarterOf=${today}`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/zip')
    const files = unzipSync(new Uint8Array(res.data))
    const names = Object.keys(files).sort()
    expect(names).toHaveLength(8)
    expect(names).toContain('about-this-pack.txt')
    for (const kind of ['invoices', 'invoice-lines', 'payments', 'purchases', 'cis-deductions', 'vat-summary', 'vat-breakdown']) {
      const name = names.find(n => n.startsWith(`setwell-${kind}-`))!
      expect(name, kind).toBeTruthy()
      const single = await download(accountant, `/exports/${kind}.csv?quarterOf=${today}`)
      expect(csv(Buffer.from(files[name]!)), kind).toEqual(csv(single.data))
    }
    expect(strFromU8(files['about-this-pack.txt']!)).toMatch(/accountant/)
  })

  it('another firm\'s export holds none of this firm\'s rows; crew get 403; signed out 401; bad periods 400; unknown files 404', async () => {
    const theirs = csv((await download(other, `/exports/invoices.csv?quarterOf=${today}`)).data)
    expect(theirs).toEqual([])
    const theirPurchases = (await download(other, `/exports/purchases.csv?from=2020-01-01&to=2020-12-31`)).data.toString('utf8')
    expect(theirPurchases).not.toContain('Old yard')
    const pack = unzipSync(new Uint8Array((await download(other, `/exports/quarter.zip?quarterOf=${today}`)).data))
    for (const [name, bytes] of Object.entries(pack)) expect(strFromU8(bytes), name).not.toMatch(/Stonecrop|HYPERLINK|Merchant/)
    expect((await download(crew, `/exports/invoices.csv?quarterOf=${today}`)).status).toBe(403)
    expect((await download(crew, `/exports/quarter.zip?quarterOf=${today}`)).status).toBe(403)
    expect((await fetch(`${app.url}/exports/invoices.csv?quarterOf=${today}`)).status).toBe(401)
    expect((await accountant.get('/exports/invoices.csv?from=2026-10-01&to=2026-09-01')).status).toBe(400)
    expect((await accountant.get('/exports/quarter.zip')).status).toBe(400)
    expect((await accountant.get(`/exports/customers.csv?quarterOf=${today}`)).status).toBe(404)
    expect(otherFirmId).not.toBe(firmId)
  })

  it('the accountant can export and read everything, and change nothing', async () => {
    const purchase = { supplier: 'x', boughtOn: today, category: 'fuel', netPence: 1 }
    for (const [method, path, body] of [
      ['POST', '/api/purchases', purchase], ['PUT', `/api/purchases/${ids.purchase}`, purchase], ['DELETE', `/api/purchases/${ids.purchase}`],
      ['POST', `/api/invoices/${ids.standard}/payments`, { requestId: randomUUID(), method: 'cash', amountPence: 1, receivedOn: today }], ['POST', '/api/invoices', { kind: 'blank', customerId: ids.homeowner }],
      ['PATCH', '/api/firm', {}], ['POST', '/api/cis-statements', {}],
    ] as const) {
      const res = await accountant.request(method, path, body)
      expect(res.status, `${method} ${path}`).toBe(403)
    }
    const counts = await sql('select (select count(*) from purchases)::int as p, (select count(*) from payments)::int as pay, (select count(*) from invoices)::int as inv')
    expect(counts[0]).toEqual({ p: 2, pay: 2, inv: 3 })
  })
})
