import { randomUUID } from 'node:crypto'
import { spawn } from 'node:child_process'
import pg from 'pg'
import Stripe from 'stripe'
import { extractText, getDocumentProxy } from 'unpdf'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { queryAsFirm } from '../support/db'
import { Client, signUpFirm, signUpFirmAt, uniqueEmail } from '../support/client'
import { inviteAndJoin } from './support'

// Invoices: drafted from a job or blank, numbered when issued (no gaps, no duplicates, even 50 at
// once), frozen after; credit notes; payments by hand; card payments through the local Stripe fake
// and its signed webhooks, each event acted on once, whatever the order.

let app: TestApp
let owner: Client
let firmId: string
let other: Client
const stripe = new Stripe('sk_test_setwell_tests')

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Invoice Firm'))
  ;({ client: other } = await signUpFirm(app.url, 'Other Invoice Firm'))
})
afterAll(async () => {
  await app?.stop()
})

async function customer(extra: Record<string, unknown> = {}) {
  return (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Wynn Carrow', email: uniqueEmail('wynn'), ...extra }, site: { line1: '5 Brewer Row', postcode: 'KB8 2PL' } })).body
}

/** A blank invoice with one labour line, issued; returns its detail and the customer's link token. */
async function issued(amountPence = 120_00) {
  const c = await customer()
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  const saved = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Patch and skim the landing', quantityX1000: 1000, unitPence: amountPence }] })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  const res = await owner.post(`/api/invoices/${draft.id}/issue`)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  const mail = await app.waitForMail(c.email, /Invoice /)
  const token = /\/i\/([\w-]+)/.exec(mail.text!)![1]!
  return { invoice: res.body, token, customer: c }
}

/** Pay by card through the public link and the fake's pay page; resolves when the fake has delivered its events. */
async function payByCard(token: string) {
  const before = app.stripe.state.deliveries.length
  const checkout = await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)
  expect(checkout.status, JSON.stringify(checkout.body)).toBe(200)
  const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
  const paid = await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })
  expect(paid.status).toBe(303)
  await app.stripe.waitForDeliveries(d => d.length >= before + 2 && d.slice(before).every(x => x.ok !== undefined))
  await app.stripe.idle()
  return sessionId
}

/** The firm's highest issued invoice number (0 when none), read as the firm straight from the database. */
async function highestInvoiceNumber() {
  const [row] = await queryAsFirm<{ n: number }>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, `select coalesce(max(number), 0)::int as n from invoices where firm_id = $1 and series = 'invoice'`, [firmId])
  return row!.n
}

function signed(payload: object, timestamp?: number) {
  const body = JSON.stringify(payload)
  const header = stripe.webhooks.generateTestHeaderString({ payload: body, secret: app.stripe.webhookSecret, ...(timestamp ? { timestamp } : {}) })
  return fetch(`${app.url}/api/webhooks/stripe`, { method: 'POST', body, headers: { 'content-type': 'application/json', 'stripe-signature': header } })
}

describe('drafting and issuing', () => {
  it('drafts a blank invoice, refuses bad ones by field, and deletes only drafts', async () => {
    const bad = await owner.post('/api/invoices', { kind: 'blank' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.customerId).toBeTruthy()
    expect((await owner.post('/api/invoices', { kind: 'deposit' })).status).toBe(400)
    const c = await customer()
    const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    expect(draft).toMatchObject({ number: null, reference: null, status: 'draft' })
    const badLines = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: '', quantityX1000: 0, unitPence: 1.5 }] })
    expect(badLines.status).toBe(400)
    expect(Object.keys(badLines.body.data.fields).sort()).toEqual(['lines.0.description', 'lines.0.quantityX1000', 'lines.0.unitPence'])
    // a negative price takes off what was invoiced before: never more than the invoice charges
    const takingOff = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Less invoiced before', quantityX1000: 1000, unitPence: -1 }] })
    expect(takingOff.status).toBe(400)
    expect(Object.keys(takingOff.body.data.fields)).toEqual(['lines.0.unitPence'])
    // 22 x £1,000,000 would not fit the amount column: a 400 on the line, not a 500 (our own limit, £20,000,000)
    const huge = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'A very large skim', quantityX1000: 22_000, unitPence: 1_000_000_00 }] })
    expect(huge.status, JSON.stringify(huge.body)).toBe(400)
    expect(huge.body.data.fields['lines.0.unitPence']).toMatch(/£20,000,000\.00/)
    const hugeTotal = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: Array.from({ length: 3 }, () => ({ kind: 'labour', description: 'A large skim', quantityX1000: 7_000, unitPence: 1_000_000_00, vatRatePercent: 0 })) })
    expect(hugeTotal.status, JSON.stringify(hugeTotal.body)).toBe(400)
    expect(hugeTotal.body.data.fields.lines).toMatch(/£21,000,000\.00/)
    // changing the VAT treatment needs a reason, kept with the invoice
    expect((await owner.put(`/api/invoices/${draft.id}/draft`, { vat: 'standard', lines: [] })).body.data?.fields?.vatReason).toBeTruthy()
    // the reason is needed whenever the treatment is not the suggested one, not only when it changes
    expect(draft.suggestedVat).toBe('not-registered')
    const withReason = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: 'standard', vatReason: 'Registered from 1 December', lines: [] })
    expect(withReason.status, JSON.stringify(withReason.body)).toBe(200)
    expect(withReason.body.vat).toBe('standard')
    const again = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: 'standard', vatReason: '  ', lines: [] })
    expect(again.status).toBe(400)
    expect(Object.keys(again.body.data.fields)).toEqual(['vatReason'])
    expect((await owner.put(`/api/invoices/${draft.id}/draft`, { vat: 'not-registered', lines: [] })).status).toBe(200)
    expect((await owner.post(`/api/invoices/${draft.id}/issue`)).status).toBe(400)
    expect((await owner.delete(`/api/invoices/${draft.id}`)).status).toBe(204)
    expect((await owner.get(`/api/invoices/${draft.id}`)).status).toBe(404)
  })

  it('numbers 50 invoices issued at once 1 to 50, with no gap and no duplicate', async () => {
    const c = await customer()
    const drafts: string[] = []
    for (let i = 0; i < 50; i++) {
      const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
      await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: `Job ${i}`, quantityX1000: 1000, unitPence: 1000 + i }] })
      drafts.push(d.id)
    }
    // the firm's highest invoice number so far, read straight from the database
    const before = await highestInvoiceNumber()
    const results = await Promise.all(drafts.map(id => owner.post(`/api/invoices/${id}/issue`)))
    expect(results.map(r => r.status)).toEqual(drafts.map(() => 200))
    const numbers = results.map(r => r.body.number).sort((a, b) => a - b)
    expect(numbers).toEqual(Array.from({ length: 50 }, (_, i) => before + i + 1))
    expect(new Set(results.map(r => r.body.reference)).size).toBe(50)
    // the firm's letters (Invoice Firm: IF) and a dash, the number unpadded
    expect(results[0]!.body.reference).toMatch(/^IF-[1-9]\d*$/)
  })

  it('never changes or deletes an issued invoice; a credit note corrects it, numbered on its own', async () => {
    const { invoice } = await issued()
    expect(invoice.status).toBe('issued')
    expect(invoice.dueOn > invoice.issuedOn).toBe(true)
    expect((await owner.put(`/api/invoices/${invoice.id}/draft`, { vat: invoice.vat, lines: [] })).status).toBe(409)
    expect((await owner.delete(`/api/invoices/${invoice.id}`)).status).toBe(409)
    expect((await owner.post(`/api/invoices/${invoice.id}/issue`)).status).toBe(409)
    const note = await owner.post(`/api/invoices/${invoice.id}/credit-note`)
    expect(note.status).toBe(201)
    expect(note.body).toMatchObject({ kind: 'credit-note', creditsInvoiceId: invoice.id, amountDuePence: invoice.amountDuePence })
    const issuedNote = await owner.post(`/api/invoices/${note.body.id}/issue`)
    expect(issuedNote.status).toBe(200)
    expect(issuedNote.body.reference).toMatch(/^IF-C[1-9]\d*$/)
    expect((await owner.get(`/api/invoices/${invoice.id}`)).body.status).toBe('credited')
    expect((await owner.post(`/api/invoices/${note.body.id}/credit-note`)).status).toBe(409)
  })
})

describe('sending an invoice again', () => {
  const mailsTo = (email: string) => app.mails.filter(m => JSON.stringify(m.to).includes(email) && /^Invoice /.test(m.subject ?? ''))

  it('sends an issued invoice again with a new link, and the old link stops working', async () => {
    const { invoice, token, customer: c } = await issued(70_00)
    const again = await owner.post(`/api/invoices/${invoice.id}/resend`)
    expect(again.status, JSON.stringify(again.body)).toBe(200)
    await expect.poll(() => mailsTo(c.email).length).toBe(2)
    const text = mailsTo(c.email)[1]!.text!
    expect(text).toContain('sent you again')
    const fresh = /\/i\/([\w-]+)/.exec(text)![1]!
    expect(fresh).not.toBe(token)
    expect((await new Client(app.url).get(`/api/public/invoices/${fresh}`)).status).toBe(200)
    expect((await new Client(app.url).get(`/api/public/invoices/${token}`)).status).toBe(404)
    expect(JSON.stringify(again.body)).not.toMatch(/tokenHash/)

    // a draft and a credit note have no link to send; another firm's invoice is not there
    const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    expect((await owner.post(`/api/invoices/${draft.id}/resend`)).status).toBe(409)
    const note = (await owner.post(`/api/invoices/${invoice.id}/credit-note`)).body
    expect((await owner.post(`/api/invoices/${note.id}/issue`)).status).toBe(200)
    expect((await owner.post(`/api/invoices/${note.id}/resend`)).status).toBe(409)
    expect((await other.post(`/api/invoices/${invoice.id}/resend`)).status).toBe(404)
    expect((await new Client(app.url).post(`/api/invoices/${invoice.id}/resend`)).status).toBe(401)
  })

  it('issues even when the mail server is down, says the e-mail did not go, and sending again changes nothing until it goes', async () => {
    // a server of its own whose mail server is not there (nothing listens on port 1)
    const down = await startApp({ NUXT_SMTP_PORT: '1' })
    try {
      const { client } = await signUpFirmAt(down.url, app.url, 'No Post Plastering')
      const c = (await client.post('/api/customers', { customer: { kind: 'homeowner', name: 'Ivo Marsh', email: uniqueEmail('ivo') } })).body
      const d = (await client.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
      await client.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the box room', quantityX1000: 1000, unitPence: 150_00 }] })
      const res = await client.post(`/api/invoices/${d.id}/issue`)
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      expect(res.body).toMatchObject({ status: 'issued', reference: expect.stringMatching(/^NPP-[1-9]\d*$/) })
      expect(res.body.warning).toMatch(/issued, but the e-mail did not go/i)
      expect((await client.get(`/api/invoices/${d.id}`)).body.issuedOn).toBeTruthy()
      const again = await client.post(`/api/invoices/${d.id}/resend`)
      expect(again.status).toBe(502)
      expect(again.body.data.message).toMatch(/did not go/)
    }
    finally {
      await down.stop()
    }
  })
})

describe('a live key with the local webhook secret', () => {
  it('stops the server at startup with a clear error', async () => {
    const child = spawn('node', [`${process.env.SETWELL_OUTPUT_DIR ?? '.output'}/server/index.mjs`], {
      env: { ...process.env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: '0', NITRO_PORT: '0', NUXT_DATABASE_URL: requiredEnv('SETWELL_TEST_DATABASE_URL'), NUXT_SESSION_PASSWORD: requiredEnv('SETWELL_TEST_SESSION_PASSWORD'), NUXT_JOBS_ENABLED: 'false', NUXT_STRIPE_SECRET_KEY: 'sk_live_not_a_real_key', NUXT_STRIPE_WEBHOOK_SECRET: 'whsec_setwell_local' },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    let out = ''
    child.stdout!.on('data', (b) => {
      out += b
    })
    child.stderr!.on('data', (b) => {
      out += b
    })
    const code = await new Promise<number | null>((resolve) => {
      const timer = setTimeout(() => {
        child.kill('SIGTERM')
        resolve(null)
      }, 20_000)
      child.once('exit', (c) => {
        clearTimeout(timer)
        resolve(c)
      })
    })
    expect(code, out).not.toBe(0)
    expect(code, out).not.toBeNull()
    expect(out).toMatch(/live key but NUXT_STRIPE_WEBHOOK_SECRET is the local default/)
  })
})

describe('invoices from a job', () => {
  it('takes a deposit as a share of the price, and the final is the rest: less a credited deposit, the whole price', async () => {
    const email = uniqueEmail('job')
    const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tam Rowley', email }, site: { line1: '8 Quarry Steps', postcode: 'KB1 7YU' } })).body
    const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-11-20T09:00:00Z' })).body
    await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, { revision: 0, name: 'Porch', surfaces: [{ id: crypto.randomUUID(), kind: 'wall', lengthMm: 2000, secondMm: 2400 }] })
    await owner.put('/api/price-book', { ...(await priceBookFields()), skimWallsPerM2Pence: 20_00 })
    const q = (await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })).body
    expect((await owner.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
    const token = /\/q\/([\w-]+)/.exec((await app.waitForMail(email, /Your quote/)).text!)![1]!
    await new Client(app.url).post(`/api/public/quotes/${token}/accept`, { name: 'Tam Rowley' })
    const job = (await owner.post(`/api/quotes/${q.id}/job`)).body
    const price = (await owner.get(`/api/jobs/${job.id}`)).body.money

    expect((await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 150 })).status).toBe(400)
    const deposit = (await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 50 })).body
    // 50% of the net price, labour and materials in the job's own proportion (our own rule), adding up exactly
    expect(deposit.totals.netPence).toBe(Math.floor((price.netPence + 1) / 2))
    expect((await owner.post(`/api/invoices/${deposit.id}/issue`)).status).toBe(200)
    const tooMuch = await owner.post('/api/invoices', { kind: 'stage', jobId: job.id, amountPence: price.netPence })
    // more than is left of the price: a 409 (it depends on what is invoiced, not on the figure alone)
    expect(tooMuch.status).toBe(409)
    expect(tooMuch.body.data.fields.amountPence).toMatch(/left to invoice/)

    const final = (await owner.post('/api/invoices', { kind: 'final', jobId: job.id })).body
    expect(final.totals).toMatchObject({ labourNetPence: price.labourNetPence - deposit.totals.labourNetPence, materialsNetPence: price.materialsNetPence - deposit.totals.materialsNetPence })
    await owner.delete(`/api/invoices/${final.id}`)
    // the deposit credited in full: the final is the whole price again
    const note = (await owner.post(`/api/invoices/${deposit.id}/credit-note`)).body
    expect((await owner.post(`/api/invoices/${note.id}/issue`)).status).toBe(200)
    const again = (await owner.post('/api/invoices', { kind: 'final', jobId: job.id })).body
    expect(again.totals).toMatchObject({ labourNetPence: price.labourNetPence, materialsNetPence: price.materialsNetPence })
  })
})

async function priceBookFields() {
  const { firmId: _f, createdAt: _c, updatedAt: _u, ...fields } = (await owner.get('/api/price-book')).body
  return fields
}

describe('payments by hand', () => {
  it('adds part payments up, flags an overpayment, and checks the fields', async () => {
    const { invoice } = await issued(100_00)
    const bad = await owner.post(`/api/invoices/${invoice.id}/payments`, { requestId: randomUUID(), method: 'card', amountPence: 0, receivedOn: 'yesterday' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['amountPence', 'method', 'receivedOn'])
    const part = await owner.post(`/api/invoices/${invoice.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 40_00, receivedOn: '2026-12-01', reference: 'FPS WYNN' })
    expect(part.status).toBe(201)
    expect(part.body).toMatchObject({ status: 'part-paid', paidPence: 40_00, outstandingPence: invoice.amountDuePence - 40_00 })
    const rest = await owner.post(`/api/invoices/${invoice.id}/payments`, { requestId: randomUUID(), method: 'cash', amountPence: invoice.amountDuePence - 40_00 + 5_00, receivedOn: '2026-12-01' })
    expect(rest.body).toMatchObject({ status: 'paid', outstandingPence: 0, overpaidPence: 5_00 })
  })
})

describe('card payments through the Stripe fake', () => {
  it('pays by card from the customer\'s link, once, with one receipt, even when every event comes five times', async () => {
    const { invoice, token, customer: c } = await issued(85_50)
    app.stripe.setSwitches({ duplicate: 5 })
    try {
      await payByCard(token)
    }
    finally {
      app.stripe.setSwitches({ duplicate: 1 })
    }
    const after = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(after.status).toBe('paid')
    expect(after.payments).toHaveLength(1)
    expect(after.payments[0]).toMatchObject({ method: 'card', amountPence: invoice.amountDuePence })
    await app.waitForMail(c.email, /Receipt/)
    await new Promise(r => setTimeout(r, 300))
    expect(app.mails.filter(m => /Receipt/.test(m.subject ?? '') && m.to && JSON.stringify(m.to).includes(c.email))).toHaveLength(1)
    // the public view says paid, and there is nothing left to pay
    const view = (await new Client(app.url).get(`/api/public/invoices/${token}`)).body
    expect(view).toMatchObject({ status: 'paid', outstandingPence: 0, customer: { name: 'Wynn Carrow' } })
    expect(JSON.stringify(view)).not.toMatch(/tokenHash|firmId/)
    expect((await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)).status).toBe(409)
  })

  it('refunds a card payment through Stripe, counted once when its event arrives, and a transfer by hand', async () => {
    const { invoice, token } = await issued(90_00)
    await payByCard(token)
    const paid = (await owner.get(`/api/invoices/${invoice.id}`)).body
    const card = paid.payments[0]
    expect((await owner.post(`/api/invoices/${invoice.id}/refunds`, { paymentId: card.id, amountPence: card.amountPence + 1 })).status).toBe(400)
    const before = app.stripe.state.deliveries.length
    const refund = await owner.post(`/api/invoices/${invoice.id}/refunds`, { paymentId: card.id, amountPence: 30_00 })
    expect(refund.status).toBe(202)
    await app.stripe.waitForDeliveries(d => d.length > before && d.slice(before).some(x => x.type === 'charge.refunded' && x.ok !== undefined))
    await app.stripe.idle()
    const after = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(after.payments.map((p: any) => p.amountPence)).toEqual([card.amountPence, -30_00])
    expect(after).toMatchObject({ status: 'part-paid', outstandingPence: 30_00 })

    const { invoice: other2 } = await issued(40_00)
    const cash = (await owner.post(`/api/invoices/${other2.id}/payments`, { requestId: randomUUID(), method: 'cash', amountPence: other2.amountDuePence, receivedOn: '2026-12-01' })).body.payments[0]
    const back = await owner.post(`/api/invoices/${other2.id}/refunds`, { paymentId: cash.id, amountPence: 10_00 })
    expect(back.status).toBe(201)
    expect(back.body).toMatchObject({ status: 'part-paid', paidPence: other2.amountDuePence - 10_00 })
    expect((await owner.post(`/api/invoices/${other2.id}/refunds`, { paymentId: cash.id, amountPence: other2.amountDuePence })).status).toBe(400)
  })

  it('keeps a refund that arrives before its payment: refused until the payment is in, then recorded by the retry', async () => {
    const { invoice, token } = await issued(75_00)
    const fakeEvents = () => app.stripe.state.events as { id: string, type: string, data: { object: { id: string } } }[]
    // the payment's events are kept by the fake but not sent (as if they were late)
    app.stripe.setSwitches({ webhookUrl: null })
    const from = fakeEvents().length
    const checkout = await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)
    const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
    expect((await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303)
    const succeeded = fakeEvents().slice(from).find(e => e.type === 'payment_intent.succeeded')!
    try {
      // a refund made straight at the (fake) Stripe, delivered at once: it gets there first
      app.stripe.setSwitches({ webhookUrl: `${app.url}/api/webhooks/stripe`, retryDelayMs: 400, retries: 4 })
      const fake = new URL(app.stripe.url)
      const direct = new Stripe('sk_test_setwell_tests', { host: fake.hostname, port: Number(fake.port), protocol: 'http' })
      const deliveredFrom = app.stripe.state.deliveries.length
      await direct.refunds.create({ payment_intent: succeeded.data.object.id, amount: 25_00 })
      const refundTries = () => app.stripe.state.deliveries.slice(deliveredFrom).filter(d => d.type === 'charge.refunded')
      await app.stripe.waitForDeliveries(() => refundTries().length >= 1)
      expect(refundTries()[0]).toMatchObject({ statusCode: 409, ok: false })
      expect((await owner.get(`/api/invoices/${invoice.id}`)).body.payments).toEqual([])
      // then the payment arrives; the refund's next try finds it
      const late = await signed(succeeded)
      expect((await late.json()).outcome).toBe('payment recorded')
      await app.stripe.waitForDeliveries(() => refundTries().some(d => d.ok))
      await app.stripe.idle()
    }
    finally {
      app.stripe.setSwitches({ webhookUrl: `${app.url}/api/webhooks/stripe`, retryDelayMs: 50, retries: 3 })
    }
    const after = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(after.payments.map((p: any) => [p.method, p.amountPence])).toEqual([['card', invoice.amountDuePence], ['card', -25_00]])
    expect(after).toMatchObject({ paidPence: invoice.amountDuePence - 25_00, outstandingPence: 25_00 })
  })

  it('answers 400 with Stripe\'s reason when Stripe refuses a refund, and 409 for a card payment under 30p', async () => {
    const { invoice, token } = await issued(60_00)
    await payByCard(token)
    const card = (await owner.get(`/api/invoices/${invoice.id}`)).body.payments[0]
    // refunded in full straight at the (fake) Stripe, its event not sent: our refund is then refused by Stripe
    app.stripe.setSwitches({ webhookUrl: null })
    try {
      const fake = new URL(app.stripe.url)
      await new Stripe('sk_test_setwell_tests', { host: fake.hostname, port: Number(fake.port), protocol: 'http' }).refunds.create({ payment_intent: card.stripePaymentIntentId })
      const refused = await owner.post(`/api/invoices/${invoice.id}/refunds`, { paymentId: card.id, amountPence: 10_00 })
      expect(refused.status, JSON.stringify(refused.body)).toBe(400)
      expect(refused.body.data.message).toMatch(/refused the refund: .*already been refunded/)
    }
    finally {
      app.stripe.setSwitches({ webhookUrl: `${app.url}/api/webhooks/stripe` })
    }
    expect((await owner.get(`/api/invoices/${invoice.id}`)).body.payments).toHaveLength(1)

    // 10p left after a transfer: too little for a card (Stripe's minimum is 30p, from memory)
    const { invoice: small, token: smallToken } = await issued(50_00)
    await owner.post(`/api/invoices/${small.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: small.amountDuePence - 10, receivedOn: '2026-12-01' })
    const tiny = await new Client(app.url).post(`/api/public/invoices/${smallToken}/checkout`)
    expect(tiny.status, JSON.stringify(tiny.body)).toBe(409)
    expect(tiny.body.data.message).toMatch(/£0\.10 is left to pay, less than the £0\.30/)
  })

  it('ends paid when the events arrive last first', async () => {
    const { invoice, token } = await issued(64_00)
    app.stripe.setSwitches({ reorder: true })
    try {
      await payByCard(token)
    }
    finally {
      app.stripe.setSwitches({ reorder: false })
    }
    const after = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(after.status).toBe('paid')
    expect(after.payments).toHaveLength(1)
  })

  it('refuses a bad signature or an old timestamp and changes nothing; an amount that does not match leaves it unpaid', async () => {
    const { invoice } = await issued(50_00)
    const evt = (id: string, amount: number, currency = 'gbp') => ({
      id, object: 'event', type: 'payment_intent.succeeded', created: Math.floor(Date.now() / 1000), livemode: false, api_version: '2025-01-27.acacia',
      data: { object: { id: `pi_${id}`, object: 'payment_intent', amount, amount_received: amount, currency, status: 'succeeded', metadata: { firmId, invoiceId: invoice.id } } },
    })
    const tampered = await fetch(`${app.url}/api/webhooks/stripe`, { method: 'POST', body: JSON.stringify(evt('evt_bad1', invoice.amountDuePence)), headers: { 'content-type': 'application/json', 'stripe-signature': 't=1,v1=deadbeef' } })
    expect(tampered.status).toBe(400)
    const old = await signed(evt('evt_old1', invoice.amountDuePence), Math.floor(Date.now() / 1000) - 600)
    expect(old.status).toBe(400)
    expect((await fetch(`${app.url}/api/webhooks/stripe`, { method: 'POST', body: '{}', headers: { 'content-type': 'application/json' } })).status).toBe(400)
    expect((await owner.get(`/api/invoices/${invoice.id}`)).body.payments).toHaveLength(0)

    const wrongAmount = await signed(evt('evt_amt1', invoice.amountDuePence + 1))
    expect(wrongAmount.status).toBe(200)
    expect((await wrongAmount.json()).outcome).toMatch(/does not match/)
    const wrongCurrency = await signed(evt('evt_cur1', invoice.amountDuePence, 'eur'))
    expect((await wrongCurrency.json()).outcome).toMatch(/does not match/)
    const still = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(still).toMatchObject({ status: 'issued', paidPence: 0 })

    // the right amount, signed: paid; the same event again: nothing more
    const right = await signed(evt('evt_ok1', invoice.amountDuePence))
    expect((await right.json()).outcome).toBe('payment recorded')
    expect((await (await signed(evt('evt_ok1', invoice.amountDuePence))).json()).outcome).toBe('duplicate')
    expect((await owner.get(`/api/invoices/${invoice.id}`)).body).toMatchObject({ status: 'paid', payments: [expect.objectContaining({ amountPence: invoice.amountDuePence })] })
  })
})

describe('money routes, roles and firms', () => {
  it('gives crew 403 on every money route, hides another firm\'s invoices, and keeps the link to its own invoice', async () => {
    const { invoice, token } = await issued()
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew')
    const body = { requestId: randomUUID(), method: 'cash', amountPence: 100, receivedOn: '2026-12-01' }
    for (const [method, path] of [['GET', '/api/invoices'], ['POST', '/api/invoices'], ['GET', `/api/invoices/${invoice.id}`], ['PUT', `/api/invoices/${invoice.id}/draft`], ['POST', `/api/invoices/${invoice.id}/issue`], ['POST', `/api/invoices/${invoice.id}/payments`], ['POST', `/api/invoices/${invoice.id}/credit-note`], ['DELETE', `/api/invoices/${invoice.id}`],
      ['POST', `/api/invoices/${invoice.id}/refunds`], ['POST', `/api/invoices/${invoice.id}/resend`], ['POST', `/api/invoices/${invoice.id}/reminders`], ['POST', `/api/invoices/${invoice.id}/chase-notes`], ['GET', `/api/invoices/${invoice.id}/claim`],
      ['GET', '/api/owed'], ['GET', '/api/reminders'], ['PUT', '/api/reminders'], ['POST', '/api/reminders/run'], ['GET', '/api/bank-rates'], ['PUT', '/api/bank-rates']] as const) {
      expect((await crew.request(method, path, method === 'GET' || method === 'DELETE' ? undefined : body)).status, `${method} ${path}`).toBe(403)
    }
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('acct'), 'accountant')
    expect((await accountant.get(`/api/invoices/${invoice.id}`)).status).toBe(200)
    expect((await accountant.post(`/api/invoices/${invoice.id}/payments`, body)).status).toBe(403)
    expect((await other.get(`/api/invoices/${invoice.id}`)).status).toBe(404)
    expect((await other.post(`/api/invoices/${invoice.id}/payments`, body)).status).toBe(404)
    expect((await new Client(app.url).get('/api/invoices')).status).toBe(401)
    expect((await new Client(app.url).get(`/api/public/invoices/${token}x`)).status).toBe(404)
    expect((await new Client(app.url).get(`/api/public/invoices/${'a'.repeat(43)}`)).status).toBe(404)
  })
})

describe('the PDF of an invoice', () => {
  it('carries the VAT invoice fields, the reverse-charge wording and the CIS figures', async () => {
    const firm = (await owner.get('/api/firm')).body
    const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, ...fields } = firm
    const patched = await owner.patch('/api/firm', { ...fields, vatRegistered: true, vatNumber: 'GB 999 9999 73', addressLine1: '2 Lime Walk', town: 'Kettlebury', postcode: 'KB9 1AA', bankAccountName: 'Invoice Firm', bankSortCode: '00-00-00', bankAccountNumber: '00000000' })
    expect(patched.status, JSON.stringify(patched.body)).toBe(200)
    // the firm's bank account (invented), in its three parts, printed when the firm takes transfers
    await queryAsFirm(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, `update firms set takes_transfer = true, bank_account_name = 'Invoice Firm', bank_sort_code = '000000', bank_account_number = '00000000' where id = $1`, [firmId])
    const c = (await owner.post('/api/customers', { customer: { kind: 'builder', name: 'Łukasz Quarry Builds Ltd', email: uniqueEmail('lqb'), billingLine1: '9 Kiln Lane', billingTown: 'Kettlebury', billingPostcode: 'KB3 4CD', vatRegistered: true, vatNumber: 'GB999999973', paysUnderCis: true, cisRatePercent: 20 } })).body
    const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    // a VAT- and CIS-registered builder who is not the end user: the reverse charge (DOMAIN.md), CIS at 20% on labour
    expect(draft).toMatchObject({ vat: 'reverse-charge', cisRatePercent: 20 })
    const saved = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: 'reverse-charge', cisRatePercent: 20, lines: [
      { kind: 'labour', description: 'Skim the first-floor flats', quantityX1000: 1000, unitPence: 1_000_00, vatRatePercent: 20 },
      { kind: 'materials', description: 'Finish plaster', quantityX1000: 10_000, unitPence: 12_40, vatRatePercent: 20 },
    ] })
    expect(saved.status, JSON.stringify(saved.body)).toBe(200)
    // labour £1,000.00 + materials £124.00; VAT not charged; CIS 20% of labour only = £200.00; payable £924.00 (DOMAIN.md, CIS on labour only)
    expect(saved.body.totals).toMatchObject({ labourNetPence: 1_000_00, materialsNetPence: 124_00, vatPence: 0, reverseChargeVatPence: 224_80, grossPence: 1_124_00, cisDeductionPence: 200_00, amountDuePence: 924_00 })
    const issuedRes = await owner.post(`/api/invoices/${draft.id}/issue`)
    expect(issuedRes.status).toBe(200)
    const res = await fetch(`${app.url}/invoices/${draft.id}/pdf`, { headers: { cookie: owner.cookieHeader() } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    const pdf = await getDocumentProxy(new Uint8Array(await res.arrayBuffer()))
    const text = (await extractText(pdf, { mergePages: true })).text.replace(/\s+/g, ' ')
    for (const expected of [
      `Invoice ${issuedRes.body.reference}`, 'Invoice Firm', '2 Lime Walk', 'GB999999973', 'Date and tax point', 'Łukasz Quarry Builds Ltd', '9 Kiln Lane',
      'Skim the first-floor flats', 'Finish plaster', '20%', '£1,000.00', '£124.00', '£1,124.00',
      'Reverse charge: customer to pay the VAT to HMRC', '£224.80', 'deducts 20% from the labour', '£200.00', '£924.00', 'Account name: Invoice Firm', 'Sort code: 00-00-00', 'Account number: 00000000',
    ]) expect(text, expected).toContain(expected)

    // issued means frozen: renaming the firm and moving the customer change neither the PDF nor the customer's view
    const custFields = { kind: 'builder', name: 'Łukasz Quarry Builds Ltd', email: c.email, billingLine1: '9 Kiln Lane', billingTown: 'Kettlebury', billingPostcode: 'KB3 4CD', vatRegistered: true, vatNumber: 'GB999999973', paysUnderCis: true, cisRatePercent: 20 }
    expect((await owner.patch(`/api/customers/${c.id}`, { ...custFields, billingLine1: '77 New Road', billingPostcode: 'KB7 7ZZ' })).status).toBe(200)
    const renamed = await owner.patch('/api/firm', { ...fields, vatRegistered: true, vatNumber: 'GB 999 9999 73', addressLine1: '2 Lime Walk', town: 'Kettlebury', postcode: 'KB9 1AA', bankAccountName: 'Invoice Firm', bankSortCode: '00-00-00', bankAccountNumber: '00000000', tradingName: 'Renamed Plastering Co' })
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200)
    const pdfText = async () => {
      const r = await fetch(`${app.url}/invoices/${draft.id}/pdf`, { headers: { cookie: owner.cookieHeader() } })
      return (await extractText(await getDocumentProxy(new Uint8Array(await r.arrayBuffer())), { mergePages: true })).text.replace(/\s+/g, ' ')
    }
    const later = await pdfText()
    for (const kept of ['Invoice Firm', '9 Kiln Lane', 'KB3 4CD']) expect(later, kept).toContain(kept)
    for (const changed of ['Renamed Plastering Co', '77 New Road', 'KB7 7ZZ']) expect(later, changed).not.toContain(changed)
    const token = /\/i\/([\w-]+)/.exec((await app.waitForMail(c.email, /Invoice /)).text!)![1]!
    const view = (await new Client(app.url).get(`/api/public/invoices/${token}`)).body
    expect(view.firm).toMatchObject({ tradingName: 'Invoice Firm', addressLine1: '2 Lime Walk', vatNumber: 'GB999999973' })
    expect(view.customer).toMatchObject({ name: 'Łukasz Quarry Builds Ltd', billingLine1: '9 Kiln Lane', billingPostcode: 'KB3 4CD' })
    // an invoice issued before the details were kept shows them as they are now
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      await db.query('update invoices set parties = null where id = $1', [draft.id])
      await db.query('commit')
    }
    finally {
      await db.end()
    }
    const live = (await new Client(app.url).get(`/api/public/invoices/${token}`)).body
    expect(live.firm.tradingName).toBe('Renamed Plastering Co')
    expect(live.customer.billingLine1).toBe('77 New Road')
    expect(await pdfText()).toContain('Renamed Plastering Co')

    // crew, another firm and the signed-out get nothing
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew-pdf'), 'crew')
    expect((await fetch(`${app.url}/invoices/${draft.id}/pdf`, { headers: { cookie: crew.cookieHeader() } })).status).toBe(403)
    expect((await fetch(`${app.url}/invoices/${draft.id}/pdf`, { headers: { cookie: other.cookieHeader() } })).status).toBe(404)
    expect((await fetch(`${app.url}/invoices/${draft.id}/pdf`)).status).toBe(401)
  })
})
