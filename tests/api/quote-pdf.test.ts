import { extractText, getDocumentProxy, getMeta } from 'unpdf'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { customerDescription } from '../../shared/utils/line-groups'
import { formatPence } from '../../shared/utils/money'
import { startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

let app: TestApp
let owner: Client

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner } = await signUpFirm(app.url, 'Lath and Lime Plastering'))
  // an invented, VAT-registered firm (999 9999 73 is a made-up number that passes the check)
  const firm = await owner.patch('/api/firm', {
    tradingName: 'Lath and Lime Plastering', addressLine1: '14 Kiln Row', addressLine2: '', town: 'Oxwell', postcode: 'OX9 3LL',
    email: 'office@lathlime.example', phone: '01632 960 123', vatRegistered: true, vatNumber: 'GB 999 9999 73', cisStatus: 'not-registered',
    utr: '', dayRatePence: 18_000, paymentTermsDays: 30, invoicePrefix: 'INV-',
  })
  expect(firm.status, JSON.stringify(firm.body)).toBe(200)
  // invented test rates, not trade figures
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

async function measuredQuote(customer: Record<string, unknown>) {
  const email = uniqueEmail('pdf')
  const c = (await owner.post('/api/customers', { customer: { ...customer, email }, site: { line1: '3 Tanners Yard', postcode: 'OX9 5TY' } })).body
  const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-12-02T09:00:00Z' })).body
  const room = await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, {
    revision: 0,
    name: 'Front room',
    surfaces: [
      { id: crypto.randomUUID(), kind: 'wall', lengthMm: 4000, secondMm: 2400, openings: [{ id: crypto.randomUUID(), kind: 'window', widthMm: 1200, heightMm: 1000 }] },
      { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 4000, secondMm: 3000 },
    ],
  })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  const made = await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })
  expect(made.status, JSON.stringify(made.body)).toBe(201)
  return { id: made.body.id as string, email }
}

async function send(id: string, email: string) {
  const sent = await owner.post(`/api/quotes/${id}/send`)
  expect(sent.status, JSON.stringify(sent.body)).toBe(200)
  const mail = await app.waitForMail(email, /Your quote [A-Z]+-Q[1-9]/)
  return /\/q\/([\w-]+)/.exec(mail.text!)![1]!
}

/** GET a path as raw bytes (the test client reads text). */
async function getBytes(path: string, client?: Client) {
  const res = await fetch(app.url + path, { headers: client ? { cookie: client.cookieHeader() } : {}, redirect: 'manual' })
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) }
}

async function pdfText(bytes: Uint8Array) {
  const doc = await getDocumentProxy(new Uint8Array(bytes))
  const { text } = await extractText(doc, { mergePages: true })
  const meta = await getMeta(doc)
  // extraction may break a long line anywhere: compare with runs of white space made one
  return { text: text.replace(/\s+/g, ' '), meta }
}

describe('the PDF of a quote', () => {
  it('draws names in any Latin script with the shipped latin-ext font', async () => {
    const { id } = await measuredQuote({ kind: 'homeowner', name: 'Łucja Dvořák-Wójcik' })
    const res = await getBytes(`/quotes/${id}/pdf`, owner)
    expect(res.status).toBe(200)
    const { text } = await pdfText(res.bytes)
    expect(text).toContain('Łucja Dvořák-Wójcik')
    // both subsets are embedded, and nothing was drawn as a placeholder
    const raw = Buffer.from(res.bytes).toString('latin1')
    expect(raw.match(/\/FontFile2|\/FontFile3|\/FontFile\b/g)?.length ?? 0).toBeGreaterThanOrEqual(3)
    expect(text).not.toContain('?ucja')
  })

  it('carries the firm, the customer, every line and the totals of the JSON quote, with £ signs', async () => {
    const { id } = await measuredQuote({ kind: 'homeowner', name: 'Ffion Maddox' })
    const q = (await owner.get(`/api/quotes/${id}`)).body
    expect(q.current.vat).toBe('standard')
    const res = await getBytes(`/quotes/${id}/pdf`, owner)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${q.reference}.pdf"`)
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('cache-control')).toBe('private, no-store')
    expect(Buffer.from(res.bytes.subarray(0, 5)).toString()).toBe('%PDF-')

    const { text, meta } = await pdfText(res.bytes)
    expect(text).toContain('Lath and Lime Plastering')
    expect(text).toContain('14 Kiln Row')
    expect(text).toContain('01632 960 123')
    expect(text).toContain('office@lathlime.example')
    expect(text).toContain('GB999999973')
    expect(text).toContain(`Quote ${q.reference}, version 1`)
    expect(text).toContain('Ffion Maddox')
    expect(text).toContain('3 Tanners Yard')
    expect(text).toContain('Draft: not yet sent')
    // every line, as the customer reads it (grouped, merged: shared/utils/line-groups.ts)
    for (const line of q.current.lines) expect(text).toContain(customerDescription(line.description))
    // 4.00 x 2.40 - 1.20 x 1.00 = 8.40 m² at £18.00 = £151.20
    expect(text).toContain('8.40 m²')
    expect(text).toContain('£151.20')
    expect(text).toContain('12.00 m²')
    const t = q.current.totals
    expect(t.vatPence).toBeGreaterThan(0)
    for (const pence of [t.labourNetPence, t.materialsNetPence, t.netPence, t.vatPence, t.grossPence]) expect(text).toContain(formatPence(pence))
    expect(text).toMatch(/£\d/)
    expect(text).toContain('Quantities are rules of thumb from the site measurements')
    expect(text).toContain('Every opening is deducted')
    // "How we'll do the work": the measured room drawn with its sets, each surface's set number written on it
    const work = text.slice(text.indexOf('How we\'ll do the work'))
    expect(work.length).toBeLessThan(text.length)
    expect(work).toContain('Front room')
    expect(work).toMatch(/\bWall\b/)
    expect(work).toContain('Ceiling')
    for (const caution of q.current.cautions) expect(text).toContain(caution.replace(/\s+/g, ' '))
    expect(text).not.toMatch(/reverse charge/i)
    // no producer or author but ours; no link to fetch anything
    expect(meta.info).toMatchObject({ Creator: 'Setwell', Producer: 'Setwell', Author: 'Setwell' })
    expect(Buffer.from(res.bytes).toString('latin1')).not.toMatch(/https?:\/\/|\/URI\b|\/Launch\b|\/JavaScript\b/)
  })

  it('leaves out "How we\'ll do the work" when the firm has turned it off, and shows it again when turned on', async () => {
    const { id } = await measuredQuote({ kind: 'homeowner', name: 'Odile Penhallow' })
    const book = (await owner.get('/api/price-book')).body
    const { updatedAt: _u, firmId: _f, createdAt: _c, ...figures } = book
    try {
      expect((await owner.put('/api/price-book', { ...figures, quoteWorkPage: false })).status).toBe(200)
      const off = await pdfText((await getBytes(`/quotes/${id}/pdf`, owner)).bytes)
      expect(off.text).toContain('Odile Penhallow')
      expect(off.text).not.toContain('How we\'ll do the work')
    }
    finally {
      expect((await owner.put('/api/price-book', { ...figures, quoteWorkPage: true })).status).toBe(200)
    }
    const on = await pdfText((await getBytes(`/quotes/${id}/pdf`, owner)).bytes)
    expect(on.text).toContain('How we\'ll do the work')
  })

  it('gives the customer the same PDF by their link, with the reverse charge and CIS spelt out', async () => {
    const { id, email } = await measuredQuote({ kind: 'builder', name: 'Corbel Build Ltd', vatRegistered: true, vatNumber: 'GB 999 9999 73', paysUnderCis: true, cisRatePercent: 20 })
    const q = (await owner.get(`/api/quotes/${id}`)).body
    const body = {
      pricing: 'measure', estimatedDaysX100: 150, vat: 'reverse-charge', cisRatePercent: 20, validUntil: q.current.validUntil,
      terms: 'Half on the first day, the rest on completion.', notes: 'Access by the side gate.', cautions: q.current.cautions,
      lines: q.current.lines.map(({ position: _p, ...l }: any) => l),
    }
    const put = await owner.put(`/api/quotes/${id}/draft`, body)
    expect(put.status, JSON.stringify(put.body)).toBe(200)
    const t = put.body.current.totals
    expect(t.vatPence).toBe(0)
    expect(t.reverseChargeVatPence).toBeGreaterThan(0)
    expect(t.cisDeductionPence).toBeGreaterThan(0)
    const token = await send(id, email)

    const res = await getBytes(`/q/${token}/pdf`)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${q.reference}.pdf"`)
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('cache-control')).toBe('private, no-store')
    const { text } = await pdfText(res.bytes)
    expect(text).toContain('Corbel Build Ltd')
    expect(text).toContain(q.reference)
    expect(text).toContain('Reverse charge: customer to pay the VAT to HMRC')
    expect(text).toContain(formatPence(t.reverseChargeVatPence))
    expect(text).toContain('deducts 20% from the labour')
    expect(text).toContain(formatPence(t.cisDeductionPence))
    expect(text).toContain(formatPence(t.amountDuePence))
    expect(text).toContain(formatPence(t.grossPence))
    expect(text).toContain('About 1.5 days')
    expect(text).toContain('Half on the first day')
    expect(text).toContain('Access by the side gate.')
    expect(text).not.toContain('Draft: not yet sent')

    // once accepted, the PDF says by whom
    const anon = new Client(app.url)
    expect((await anon.post(`/api/public/quotes/${token}/accept`, { name: 'Rhys Corbel' })).status).toBe(200)
    const after = await pdfText((await getBytes(`/q/${token}/pdf`)).bytes)
    expect(after.text).toMatch(/Accepted by Rhys Corbel on [A-Z][a-z]+day \d{1,2} [A-Z][a-z]+ \d{4}/)
    // the customer's page at /q/<token> is still the page, not the PDF
    const page = await fetch(`${app.url}/q/${token}`)
    expect(page.headers.get('content-type')).toMatch(/text\/html/)
  })

  it('refuses a wrong link, another firm, crew and the signed-out', async () => {
    const { id, email } = await measuredQuote({ kind: 'homeowner', name: 'Ola Brennan' })
    await send(id, email)
    const wrong = await getBytes(`/q/${'x'.repeat(43)}/pdf`)
    expect(wrong.status).toBe(404)
    expect(JSON.parse(Buffer.from(wrong.bytes).toString()).data.message).toMatch(/expired or is not right/)
    expect((await getBytes('/q/short/pdf')).status).toBe(404)

    const other = (await signUpFirm(app.url, 'Other PDF Firm')).client
    expect((await getBytes(`/quotes/${id}/pdf`, other)).status).toBe(404)
    expect((await getBytes(`/quotes/${crypto.randomUUID()}/pdf`, owner)).status).toBe(404)
    expect((await getBytes('/quotes/not-a-uuid/pdf', owner)).status).toBe(404)
    const crew = (await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')).client
    expect((await getBytes(`/quotes/${id}/pdf`, crew)).status).toBe(403)
    expect((await getBytes(`/quotes/${id}/pdf`)).status).toBe(401)
    const accountant = (await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')).client
    expect((await getBytes(`/quotes/${id}/pdf`, accountant)).status).toBe(200)
  })
})
