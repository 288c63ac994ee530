import pg from 'pg'
import Stripe from 'stripe'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'

// The fake Stripe delivering every webhook three times, late and out of order: exactly one payment
// per checkout. Card payments go through the customer's link and the fake's pay page, some at once;
// then the same events are sent by us, all at once, which the fake (one delivery at a time) cannot
// do. What counts is what is in the database: one payment row per PaymentIntent for the amount
// paid, the invoice paid, one receipt per payment, and one refund row per refund event.

interface FakeEvent { id: string, type: string, data: { object: { id: string, payment_intent?: string | null, amount_refunded?: number } } }
interface FakeIntent { id: string, amount: number, metadata: { invoiceId?: string } }
interface FakeDelivery { eventId: string, type: string, attempt: number, copy: number, ok?: boolean, statusCode?: number | null }

let app: TestApp
let owner: Client
let firmId: string
let db: pg.Client
const stripe = new Stripe('sk_test_setwell_tests')
const events = () => app.stripe.state.events as unknown as FakeEvent[]
const deliveries = () => app.stripe.state.deliveries as FakeDelivery[]
const intents = () => [...(app.stripe.state.paymentIntents as Map<string, FakeIntent>).values()]

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Webhook Weather Plastering'))
  // the owner role under the firm's scope, as the server reads (FORCE ROW LEVEL SECURITY applies to it)
  db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  await db.query(`select set_config('app.firm_id', $1, false)`, [firmId])
})
afterAll(async () => {
  await db?.end()
  await app?.stop()
})
afterEach(() => {
  app.stripe.setSwitches({ duplicate: 1, reorder: false, delayMs: 0, webhookUrl: `${app.url}/api/webhooks/stripe` })
})

/** An issued invoice for a customer of its own (so each receipt is told apart), and its link token. */
async function issued(amountPence: number) {
  const email = uniqueEmail('payer')
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Rhiannon Teague', email }, site: { line1: '3 Lath Lane', postcode: 'KB4 6TR' } })).body
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Skim the hall ceiling', quantityX1000: 1000, unitPence: amountPence }] })
  const res = await owner.post(`/api/invoices/${draft.id}/issue`)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  const token = /\/i\/([\w-]+)/.exec((await app.waitForMail(email, /Invoice /)).text!)![1]!
  return { id: draft.id as string, amountDuePence: res.body.amountDuePence as number, token, email }
}

type Issued = Awaited<ReturnType<typeof issued>>

/** The customer opens the checkout from their link and presses Pay on the fake's page; nothing waits for the webhooks. */
async function pay(token: string) {
  const checkout = await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)
  expect(checkout.status, JSON.stringify(checkout.body)).toBe(200)
  const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
  const paid = await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })
  expect(paid.status).toBe(303)
  return sessionId
}

/** Wait until every event made since `from` has been answered `copies` times, then until the fake is idle. */
async function delivered(from: number, copies: number) {
  const ids = events().slice(from).map(e => e.id)
  await app.stripe.waitForDeliveries(d => ids.every(id => d.filter(x => x.eventId === id && x.ok !== undefined).length >= copies), { timeoutMs: 30_000 })
  await app.stripe.idle()
}

async function paymentRows(invoiceIds: string[]) {
  return (await db.query<{ invoice_id: string, method: string, amount_pence: number, stripe_payment_intent_id: string | null, reference: string, stripe_refund_id: string | null }>(
    'select invoice_id, method, amount_pence, stripe_payment_intent_id, reference, stripe_refund_id from payments where firm_id = $1 and invoice_id = any($2) order by created_at, amount_pence desc', [firmId, invoiceIds])).rows
}

async function outcomes(eventIds: string[]) {
  const { rows } = await db.query<{ event_id: string, outcome: string }>('select event_id, outcome from stripe_events where firm_id = $1 and event_id = any($2)', [firmId, eventIds])
  return new Map(rows.map(r => [r.event_id, r.outcome]))
}

const receiptsTo = (email: string) => app.mails.filter(m => /^Receipt/.test(m.subject ?? '') && JSON.stringify(m.to).includes(email))

/** One payment row per PaymentIntent, for its amount, on its invoice; the invoice paid; one receipt each. */
async function expectPaidOnce(invoices: Issued[]) {
  const rows = await paymentRows(invoices.map(i => i.id))
  for (const inv of invoices) {
    const mine = intents().filter(pi => pi.metadata.invoiceId === inv.id)
    expect(mine, 'one checkout paid per invoice').toHaveLength(1)
    const pi = mine[0]!
    expect(pi.amount).toBe(inv.amountDuePence)
    expect(rows.filter(r => r.invoice_id === inv.id && r.amount_pence > 0)).toEqual([
      { invoice_id: inv.id, method: 'card', amount_pence: inv.amountDuePence, stripe_payment_intent_id: pi.id, reference: pi.id, stripe_refund_id: null },
    ])
    const detail = (await owner.get(`/api/invoices/${inv.id}`)).body
    expect(detail).toMatchObject({ status: 'paid', paidPence: inv.amountDuePence, outstandingPence: 0, overpaidPence: 0 })
    await app.waitForMail(inv.email, /^Receipt/)
  }
  // a duplicate that sent a second receipt would have sent it by now: the fake is idle and every delivery answered
  await new Promise(r => setTimeout(r, 300))
  for (const inv of invoices) expect(receiptsTo(inv.email), `receipts to ${inv.email}`).toHaveLength(1)
}

describe('every webhook three times, late and last first', () => {
  it('records one payment per checkout, some paid at once, with one receipt each', async () => {
    const invoices: Issued[] = []
    for (const amount of [48_00, 135_50, 72_25, 310_00, 99_99, 61_40]) invoices.push(await issued(amount))
    const fromEvent = events().length
    const fromDelivery = deliveries().length
    app.stripe.setSwitches({ duplicate: 3, reorder: true, delayMs: 400 })

    // two pressed one after the other, four at the same moment
    await pay(invoices[0]!.token)
    await pay(invoices[1]!.token)
    // the same customer pressing Pay twice in two tabs gets the one checkout, not two
    const [a, b] = await Promise.all([2, 2].map(i => new Client(app.url).post(`/api/public/invoices/${invoices[i]!.token}/checkout`)))
    expect(a!.body.url).toBe(b!.body.url)
    await Promise.all(invoices.slice(2).map(inv => pay(inv.token)))
    await delivered(fromEvent, 3)

    const sent = events().slice(fromEvent)
    expect(sent.map(e => e.type).sort()).toEqual([...Array(6).fill('checkout.session.completed'), ...Array(6).fill('payment_intent.succeeded')])
    const tries = deliveries().slice(fromDelivery)
    // the switches did what they say: three copies of each, every one answered 2xx first time...
    for (const e of sent) expect(tries.filter(d => d.eventId === e.id).map(d => [d.copy, d.attempt, d.ok])).toEqual([[1, 1, true], [2, 1, true], [3, 1, true]])
    // ...and each payment's second event arrived before its first
    for (let i = 0; i < sent.length; i += 2) {
      const [first, second] = [sent[i]!, sent[i + 1]!]
      expect([first.type, second.type]).toEqual(['checkout.session.completed', 'payment_intent.succeeded'])
      expect(tries.findIndex(d => d.eventId === second.id)).toBeLessThan(tries.findIndex(d => d.eventId === first.id))
    }

    await expectPaidOnce(invoices)
    // each event acted on once: per payment, the event that came first recorded it, the other found it recorded
    const outcome = await outcomes(sent.map(e => e.id))
    expect(outcome.size).toBe(sent.length)
    for (let i = 0; i < sent.length; i += 2) {
      expect([outcome.get(sent[i + 1]!.id), outcome.get(sent[i]!.id)]).toEqual(['payment recorded', 'payment already recorded'])
    }
  })

  it('records one refund row for each charge.refunded, however many times it comes', async () => {
    const inv = await issued(200_00)
    await pay(inv.token)
    await delivered(events().length - 2, 1)
    await expectPaidOnce([inv])
    const [card] = await paymentRows([inv.id])
    const paymentId = (await owner.get(`/api/invoices/${inv.id}`)).body.payments[0].id

    app.stripe.setSwitches({ duplicate: 3, reorder: true, delayMs: 300 })
    const from = events().length
    const first = await owner.post(`/api/invoices/${inv.id}/refunds`, { paymentId, amountPence: 30_00 })
    expect(first.status, JSON.stringify(first.body)).toBe(202)
    const second = await owner.post(`/api/invoices/${inv.id}/refunds`, { paymentId, amountPence: 45_00, reference: 'Second visit not needed' })
    expect(second.status, JSON.stringify(second.body)).toBe(202)
    await delivered(from, 3)

    const refundEvents = events().slice(from)
    expect(refundEvents.map(e => [e.type, e.data.object.amount_refunded])).toEqual([['charge.refunded', 30_00], ['charge.refunded', 75_00]])
    const refunds = (await paymentRows([inv.id])).filter(r => r.amount_pence < 0)
    expect(refunds).toEqual([
      { invoice_id: inv.id, method: 'card', amount_pence: -30_00, stripe_payment_intent_id: null, reference: card!.stripe_payment_intent_id, stripe_refund_id: refundEvents[0]!.id },
      { invoice_id: inv.id, method: 'card', amount_pence: -45_00, stripe_payment_intent_id: null, reference: card!.stripe_payment_intent_id, stripe_refund_id: refundEvents[1]!.id },
    ])
    expect([...(await outcomes(refundEvents.map(e => e.id))).values()]).toEqual(['refund recorded', 'refund recorded'])
    expect((await owner.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'part-paid', paidPence: 125_00, outstandingPence: 75_00 })
    expect(receiptsTo(inv.email)).toHaveLength(1)
  })
})

describe('the same events sent all at once', () => {
  /** Send one event as the fake would, signed with its secret. */
  function send(event: FakeEvent) {
    const body = JSON.stringify(event)
    const header = stripe.webhooks.generateTestHeaderString({ payload: body, secret: app.stripe.webhookSecret })
    return fetch(`${app.url}/api/webhooks/stripe`, { method: 'POST', body, headers: { 'content-type': 'application/json', 'stripe-signature': header } })
  }
  /** Every event three times, shuffled, all in flight together. */
  async function burst(list: FakeEvent[]) {
    const copies = list.flatMap(e => [e, e, e]).map(e => ({ e, k: Math.random() })).sort((x, y) => x.k - y.k).map(x => x.e)
    const answers = await Promise.all(copies.map(send))
    expect(answers.map(r => r.status)).toEqual(copies.map(() => 200))
  }

  it('records one payment per PaymentIntent and one receipt each when the copies race', async () => {
    const invoices: Issued[] = []
    for (const amount of [56_00, 87_30, 240_00]) invoices.push(await issued(amount))
    // the fake keeps its events but sends none: we deliver them
    app.stripe.setSwitches({ webhookUrl: null })
    const from = events().length
    await Promise.all(invoices.map(inv => pay(inv.token)))
    const made = events().slice(from)
    expect(made).toHaveLength(6)
    await burst(made)
    await expectPaidOnce(invoices)
    const outcome = [...(await outcomes(made.map(e => e.id))).values()].sort()
    expect(outcome).toEqual([...Array(3).fill('payment already recorded'), ...Array(3).fill('payment recorded')])
  })

  it('refunds the right total when two refunds\' events race, each event counted once', async () => {
    const inv = await issued(180_00)
    await pay(inv.token)
    await delivered(events().length - 2, 1)
    const paymentId = (await owner.get(`/api/invoices/${inv.id}`)).body.payments[0].id
    app.stripe.setSwitches({ webhookUrl: null })
    const from = events().length
    expect((await owner.post(`/api/invoices/${inv.id}/refunds`, { paymentId, amountPence: 20_00 })).status).toBe(202)
    expect((await owner.post(`/api/invoices/${inv.id}/refunds`, { paymentId, amountPence: 35_00, reference: 'Snagging credit' })).status).toBe(202)
    const made = events().slice(from)
    expect(made.map(e => e.data.object.amount_refunded)).toEqual([20_00, 55_00])
    await burst(made)
    // whichever comes first: refunded £55.00 in all, in one row per event that found more refunded
    const refunds = (await paymentRows([inv.id])).filter(r => r.amount_pence < 0)
    expect(refunds.reduce((s, r) => s + r.amount_pence, 0)).toBe(-55_00)
    expect(new Set(refunds.map(r => r.stripe_refund_id)).size).toBe(refunds.length)
    const outcome = await outcomes(made.map(e => e.id))
    expect(outcome.size).toBe(2)
    expect([...outcome.values()].filter(o => o === 'refund recorded')).toHaveLength(refunds.length)
    expect((await owner.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'part-paid', paidPence: 125_00, outstandingPence: 55_00 })
  })
})
