// The local Stripe fake (scripts/lib/stripe-fake.mjs), driven by the official SDK exactly as the
// app will drive Stripe, with a webhook receiver here that verifies every delivery with the SDK's
// own stripe.webhooks.constructEvent, as our webhook route will.
// Source of the shapes: Stripe's API reference and stripe 23.1.0's types.
import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import Stripe from 'stripe'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { formatAmount, parseForm, startStripeFake } from '../../scripts/lib/stripe-fake.mjs'

const SECRET = 'whsec_test_setwell_fake_secret'

interface Received {
  raw: string
  header: string
  event: Stripe.Event | null
  error: string | null
}

/** A webhook endpoint on loopback; `status` decides each answer (by how many came before). */
async function startReceiver(verifier: Stripe) {
  const received: Received[] = []
  let status = (_n: number) => 200
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = []
    req.on('data', c => chunks.push(c))
    req.on('end', () => {
      const raw = Buffer.concat(chunks).toString('utf8')
      const header = String(req.headers['stripe-signature'] ?? '')
      let event: Stripe.Event | null = null
      let error: string | null = null
      try {
        event = verifier.webhooks.constructEvent(raw, header, SECRET)
      }
      catch (err: any) {
        error = err.message
      }
      received.push({ raw, header, event, error })
      res.statusCode = status(received.length - 1)
      res.end()
    })
  })
  await new Promise<void>(resolve => server.listen(0, '127.0.0.1', resolve))
  const port = (server.address() as AddressInfo).port
  return {
    url: `http://127.0.0.1:${port}/api/stripe/webhook`,
    received,
    answerWith(fn: (n: number) => number) {
      status = fn
    },
    clear() {
      received.length = 0
      status = () => 200
    },
    close: () => new Promise<void>(resolve => server.close(() => resolve())),
  }
}

let fake: Awaited<ReturnType<typeof startStripeFake>>
let stripe: Stripe
let receiver: Awaited<ReturnType<typeof startReceiver>>

beforeAll(async () => {
  receiver = await startReceiver(new Stripe('sk_test_verifier_only'))
  fake = await startStripeFake({ port: 0, webhookUrl: receiver.url, webhookSecret: SECRET })
  stripe = new Stripe('sk_test_fake', { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 })
})

afterAll(async () => {
  await fake?.close()
  await receiver?.close()
})

beforeEach(() => {
  fake.reset()
  fake.switches.retryDelayMs = 20 // keep the retry tests quick
  receiver.clear()
})

function newSession(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) {
  return stripe.checkout.sessions.create({
    mode: 'payment',
    line_items: [
      { price_data: { currency: 'gbp', unit_amount: 12000, product_data: { name: 'Skim coat, front room' } }, quantity: 1 },
      { price_data: { currency: 'gbp', unit_amount: 1234, product_data: { name: 'Angle bead <2.4 m>' } }, quantity: 2 },
    ],
    success_url: 'http://127.0.0.1:3000/pay/done?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:3000/pay/cancelled',
    metadata: { invoice_id: 'inv_42', firm_id: 'firm_7' },
    client_reference_id: 'INV-0042',
    payment_intent_data: { metadata: { invoice_id: 'inv_42' } },
    ...extra,
  })
}

function post(path: string, init: RequestInit = {}) {
  return fetch(`${fake.url}${path}`, { method: 'POST', redirect: 'manual', ...init })
}

async function payAndWait(sessionId: string) {
  const res = await post(`/pay/${sessionId}/pay`, { headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: '' })
  await fake.idle()
  return res
}

async function apiError(p: Promise<unknown>): Promise<any> {
  try {
    await p
  }
  catch (err) {
    return err
  }
  throw new Error('expected the call to fail')
}

// Source: Stripe's form encoding (what stripe-node's stringifyRequestData sends), plus the usual
// application/x-www-form-urlencoded rules (common practice).
describe('parseForm', () => {
  it.each([
    ['mode=payment', { mode: 'payment' }],
    ['metadata[invoice_id]=inv_1&metadata[firm]=7', { metadata: { invoice_id: 'inv_1', firm: '7' } }],
    ['line_items[0][price_data][unit_amount]=500&line_items[0][quantity]=2&line_items[1][quantity]=1',
      { line_items: [{ price_data: { unit_amount: '500' }, quantity: '2' }, { quantity: '1' }] }],
    ['line_items[1][quantity]=3&line_items[0][quantity]=1', { line_items: [{ quantity: '1' }, { quantity: '3' }] }],
    ['expand[]=payment_intent&expand[]=customer', { expand: ['payment_intent', 'customer'] }],
    ['expand[0]=line_items', { expand: ['line_items'] }],
    ['name=Anne+O%27Neill&note=a%26b%3Dc', { name: 'Anne O\'Neill', note: 'a&b=c' }],
    ['metadata[0]=kept&metadata[1]=as+keys', { metadata: { 0: 'kept', 1: 'as keys' } }],
    ['empty=&flag', { empty: '', flag: '' }],
    ['a=1&a=2', { a: '2' }],
    ['', {}],
  ])('%s', (input, expected) => {
    expect(parseForm(input)).toEqual(expected)
  })

  it.each([
    'a=1&a[b]=2',
    'a[b]=2&a=1',
    '__proto__[polluted]=1',
    'metadata[constructor]=x',
    'a[]b=1',
    'a[][b]=1',
    '%E0%A4%A=1',
  ])('refuses %s', (input) => {
    expect(() => parseForm(input)).toThrow()
    expect(({} as any).polluted).toBeUndefined()
  })
})

// Source: Stripe's minor units (2 decimals for GBP, none for JPY); from memory.
describe('formatAmount', () => {
  it.each([
    [14468, 'gbp', '£144.68'],
    [5, 'gbp', '£0.05'],
    [123456789, 'eur', '€1,234,567.89'],
    [500, 'jpy', 'JP¥500'],
  ])('%i %s -> %s', (amount, currency, text) => {
    expect(formatAmount(amount, currency)).toBe(text)
  })
})

describe('authentication and routing', () => {
  it('answers 401 without a key, with a bad key and with a live key', async () => {
    const res = await fetch(`${fake.url}/v1/customers/cus_x`)
    expect(res.status).toBe(401)
    expect((await res.json()).error.type).toBe('invalid_request_error')

    for (const key of ['sk_test_', 'pk_test_abc', 'sk_live_abc123']) {
      const other = new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 })
      const err = await apiError(other.customers.retrieve('cus_x'))
      expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError)
      expect(err.statusCode).toBe(401)
    }
  })

  it('answers unknown routes with 404 in Stripe\'s error shape', async () => {
    for (const [method, path] of [['GET', '/v1/nothing_here'], ['DELETE', '/v1/customers/cus_1'], ['GET', '/'], ['GET', '/_fake/nope']]) {
      const res = await fetch(`${fake.url}${path}`, { method, headers: { authorization: 'Bearer sk_test_fake' } })
      expect(res.status).toBe(404)
      const body = await res.json()
      expect(body.error.type).toBe('invalid_request_error')
      expect(body.error.message).toContain('Unrecognized request URL')
    }
  })

  it('refuses to listen anywhere but loopback, and to send webhooks off the machine', async () => {
    await expect(startStripeFake({ host: '0.0.0.0' })).rejects.toThrow(/loopback/)
    await expect(startStripeFake({ webhookUrl: 'http://example.com/hook' })).rejects.toThrow(/loopback/)
    expect(() => {
      fake.switches.webhookUrl = 'http://10.0.0.5/hook'
    }).toThrow(/loopback/)
  })
})

describe('customers', () => {
  it('creates and retrieves a customer', async () => {
    const created = await stripe.customers.create({ email: 'anne@example.com', name: 'Anne Oakes', metadata: { setwell_id: 'c_1' } })
    expect(created.id).toMatch(/^cus_[0-9A-Za-z]{14}$/)
    expect(created).toMatchObject({ object: 'customer', email: 'anne@example.com', name: 'Anne Oakes', livemode: false, metadata: { setwell_id: 'c_1' } })
    expect(await stripe.customers.retrieve(created.id)).toEqual(created)

    const firm = await stripe.customers.create({ name: 'Oakes Builders Ltd', tax_exempt: 'reverse', address: { line1: '1 Mill Lane', postal_code: 'LS1 4AB', country: 'GB' } })
    expect(firm).toMatchObject({ tax_exempt: 'reverse', address: { line1: '1 Mill Lane', line2: null, postal_code: 'LS1 4AB', country: 'GB' } })
    expect(await apiError(stripe.customers.create({ shipping: { name: 'x', address: { line1: 'y' } } }))).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'shipping' })
  })

  it('answers 404 resource_missing for an unknown id', async () => {
    const err = await apiError(stripe.customers.retrieve('cus_doesnotexist'))
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(err).toMatchObject({ statusCode: 404, code: 'resource_missing', message: 'No such customer: \'cus_doesnotexist\'' })
  })
})

describe('checkout sessions', () => {
  it('creates a session in Stripe\'s shape, with a hosted page URL', async () => {
    const s = await newSession()
    expect(s.id).toMatch(/^cs_test_[0-9A-Za-z]{58}$/)
    expect(s).toMatchObject({
      object: 'checkout.session',
      mode: 'payment',
      amount_subtotal: 14468,
      amount_total: 14468,
      currency: 'gbp',
      status: 'open',
      payment_status: 'unpaid',
      payment_intent: null,
      metadata: { invoice_id: 'inv_42', firm_id: 'firm_7' },
      client_reference_id: 'INV-0042',
      success_url: 'http://127.0.0.1:3000/pay/done?session={CHECKOUT_SESSION_ID}',
      livemode: false,
      url: `${fake.url}/pay/${s.id}`,
    })
    expect(s.expires_at - s.created).toBe(24 * 3600)
    expect(await stripe.checkout.sessions.retrieve(s.id)).toEqual(s)

    const items = await stripe.checkout.sessions.listLineItems(s.id)
    expect(items.data.map(i => [i.description, i.quantity, i.amount_total])).toEqual([['Skim coat, front room', 1, 12000], ['Angle bead <2.4 m>', 2, 2468]])
    const expanded = await stripe.checkout.sessions.retrieve(s.id, { expand: ['line_items'] })
    expect(expanded.line_items?.data).toHaveLength(2)
  })

  it('takes a customer or a customer e-mail, and an expiry between 30 minutes and 24 hours', async () => {
    const customer = await stripe.customers.create({ email: 'bob@example.com' })
    const withCustomer = await newSession({ customer: customer.id })
    expect(withCustomer.customer).toBe(customer.id)
    expect((await stripe.checkout.sessions.retrieve(withCustomer.id, { expand: ['customer'] })).customer).toMatchObject({ id: customer.id, email: 'bob@example.com' })

    const expiresAt = Math.floor(Date.now() / 1000) + 3600
    const withEmail = await newSession({ customer_email: 'carol@example.com', expires_at: expiresAt })
    expect(withEmail).toMatchObject({ customer: null, customer_email: 'carol@example.com', expires_at: expiresAt })

    expect(await apiError(newSession({ expires_at: Math.floor(Date.now() / 1000) + 60 }))).toMatchObject({ statusCode: 400, param: 'expires_at' })
    expect(await apiError(newSession({ customer: customer.id, customer_email: 'x@example.com' }))).toMatchObject({ statusCode: 400 })
    expect(await apiError(newSession({ customer: 'cus_nobody' }))).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'customer' })
  })

  it.each([
    ['no mode', { mode: undefined }, 'parameter_missing', 'mode'],
    ['no line items', { line_items: undefined }, 'parameter_missing', 'line_items'],
    ['no unit amount', { line_items: [{ price_data: { currency: 'gbp', product_data: { name: 'Skim' } }, quantity: 1 }] }, 'parameter_missing', 'line_items[0][price_data][unit_amount]'],
    ['no product name', { line_items: [{ price_data: { currency: 'gbp', unit_amount: 100, product_data: { description: 'Two coats' } }, quantity: 1 }] }, 'parameter_missing', 'line_items[0][price_data][product_data][name]'],
    ['no quantity', { line_items: [{ price_data: { currency: 'gbp', unit_amount: 100, product_data: { name: 'Skim' } } }] }, 'parameter_missing', 'line_items[0][quantity]'],
    ['a fractional amount', { line_items: [{ price_data: { currency: 'gbp', unit_amount: 1.5, product_data: { name: 'Skim' } }, quantity: 1 }] }, 'parameter_invalid_integer', 'line_items[0][price_data][unit_amount]'],
    ['a total under 30p', { line_items: [{ price_data: { currency: 'gbp', unit_amount: 29, product_data: { name: 'Skim' } }, quantity: 1 }] }, 'amount_too_small', 'line_items'],
    ['a bad success URL', { success_url: 'not a url' }, 'url_invalid', 'success_url'],
    ['an unknown parameter', { colour: 'blue' }, 'parameter_unknown', 'colour'],
    ['a Stripe parameter the fake does not model', { mode: 'subscription' }, 'parameter_unknown', 'mode'],
    ['too long a metadata key', { metadata: { ['k'.repeat(41)]: 'v' } }, undefined, `metadata[${'k'.repeat(41)}]`],
  ])('answers 400 invalid_request_error for %s', async (_name, extra, code, param) => {
    const err = await apiError(newSession(extra as any))
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(err.statusCode).toBe(400)
    expect(err.rawType).toBe('invalid_request_error')
    expect(err.code).toBe(code)
    expect(err.param).toBe(param)
    expect(err.message).toBeTruthy()
  })

  it('lists newest first with limit, has_more, starting_after and a payment_intent filter', async () => {
    const made = []
    for (let i = 0; i < 5; i++) made.push(await newSession({ client_reference_id: `INV-${i}` }))
    const first = await stripe.checkout.sessions.list({ limit: 2 })
    expect(first).toMatchObject({ object: 'list', has_more: true, url: '/v1/checkout/sessions' })
    expect(first.data.map(s => s.client_reference_id)).toEqual(['INV-4', 'INV-3'])
    const all = await stripe.checkout.sessions.list({ limit: 2 }).autoPagingToArray({ limit: 100 })
    expect(all.map(s => s.client_reference_id)).toEqual(['INV-4', 'INV-3', 'INV-2', 'INV-1', 'INV-0'])

    await payAndWait(made[1]!.id)
    const paid = await stripe.checkout.sessions.retrieve(made[1]!.id)
    const filtered = await stripe.checkout.sessions.list({ payment_intent: paid.payment_intent as string })
    expect(filtered.data.map(s => s.id)).toEqual([made[1]!.id])
    expect(filtered.has_more).toBe(false)
    expect((await stripe.checkout.sessions.list({ status: 'complete' })).data).toHaveLength(1)

    expect(await apiError(stripe.checkout.sessions.list({ limit: 101 }))).toMatchObject({ statusCode: 400, param: 'limit' })
  })

  it('expires an open session once, and sends checkout.session.expired', async () => {
    const s = await newSession()
    const expired = await stripe.checkout.sessions.expire(s.id)
    expect(expired).toMatchObject({ id: s.id, status: 'expired', payment_status: 'unpaid', url: null })
    const again = await apiError(stripe.checkout.sessions.expire(s.id))
    expect(again).toMatchObject({ statusCode: 400 })
    expect(again.message).toContain('"expired"')
    await fake.idle()
    expect(receiver.received.map(r => r.event?.type)).toEqual(['checkout.session.expired'])
    expect(await apiError(stripe.checkout.sessions.expire('cs_test_nope'))).toMatchObject({ statusCode: 404, code: 'resource_missing' })
  })

  it('expires a session on its own once expires_at has passed', async () => {
    const s = await newSession()
    fake.state.sessions.get(s.id).expires_at = Math.floor(Date.now() / 1000) - 1
    expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe('expired')
  })
})

describe('the hosted pay page', () => {
  it('shows a plain page with the amount, the items, and Pay and Cancel forms', async () => {
    const s = await newSession()
    const res = await fetch(s.url!)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/html')
    expect(res.headers.get('content-security-policy')).toContain('default-src \'none\'')
    const html = await res.text()
    expect(html).toContain('<html lang="en-GB">')
    expect(html).toContain('Test payment — no money moves')
    expect(html).toContain('£144.68')
    expect(html).toContain('Skim coat, front room')
    expect(html).toContain('Angle bead &lt;2.4 m&gt;') // escaped, never markup
    expect(html).toContain(`<form method="post" action="/pay/${s.id}/pay"><button type="submit" class="pay">Pay £144.68</button></form>`)
    expect(html).toContain(`<form method="post" action="/pay/${s.id}/cancel">`)
    expect(html).not.toMatch(/<script|<link|src=/)
  })

  it('pays: the session completes, a PaymentIntent and a Charge exist, and the browser goes to success_url', async () => {
    const s = await newSession()
    const res = await payAndWait(s.id)
    expect(res.status).toBe(303)
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:3000/pay/done?session=${s.id}`)

    const done = await stripe.checkout.sessions.retrieve(s.id, { expand: ['payment_intent.latest_charge'] })
    expect(done).toMatchObject({ status: 'complete', payment_status: 'paid', url: null })
    const pi = done.payment_intent as Stripe.PaymentIntent
    expect(pi.id).toMatch(/^pi_[0-9A-Za-z]{24}$/)
    expect(pi).toMatchObject({ object: 'payment_intent', status: 'succeeded', amount: 14468, amount_received: 14468, currency: 'gbp', metadata: { invoice_id: 'inv_42' } })
    expect((pi.latest_charge as Stripe.Charge).id).toMatch(/^ch_/)

    const retrieved = await stripe.paymentIntents.retrieve(pi.id)
    expect(retrieved.latest_charge).toBe((pi.latest_charge as Stripe.Charge).id)
    const charge = await stripe.charges.retrieve(retrieved.latest_charge as string)
    expect(charge).toMatchObject({ amount: 14468, amount_refunded: 0, refunded: false, paid: true, status: 'succeeded', payment_intent: pi.id })
    expect(await apiError(stripe.paymentIntents.retrieve('pi_nope'))).toMatchObject({ statusCode: 404, code: 'resource_missing' })
  })

  it('shows a clear page, and takes nothing, when the session is already paid or expired', async () => {
    const s = await newSession()
    await payAndWait(s.id)
    const second = await post(`/pay/${s.id}/pay`)
    expect(second.status).toBe(409)
    expect(await second.text()).toContain('already complete')
    expect((await fetch(`${fake.url}/pay/${s.id}`)).status).toBe(200)
    expect(fake.state.paymentIntents.size).toBe(1)

    const e = await newSession()
    await stripe.checkout.sessions.expire(e.id)
    const late = await post(`/pay/${e.id}/pay`)
    expect(late.status).toBe(410)
    expect(await late.text()).toContain('expired')
    expect(fake.state.paymentIntents.size).toBe(1)
    await fake.idle()
    expect(receiver.received.map(r => r.event?.type)).toEqual(['checkout.session.completed', 'payment_intent.succeeded', 'checkout.session.expired'])

    expect((await fetch(`${fake.url}/pay/cs_test_unknown`)).status).toBe(404)
  })

  it('cancels back to cancel_url and leaves the session open', async () => {
    const s = await newSession()
    const res = await post(`/pay/${s.id}/cancel`)
    expect(res.status).toBe(303)
    expect(res.headers.get('location')).toBe('http://127.0.0.1:3000/pay/cancelled')
    expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe('open')
  })
})

describe('webhooks', () => {
  it('sends events in Stripe\'s shape, signed so constructEvent accepts them', async () => {
    const s = await newSession()
    await payAndWait(s.id)
    expect(receiver.received).toHaveLength(2)
    expect(receiver.received.map(r => r.error)).toEqual([null, null])
    const [completed, succeeded] = receiver.received.map(r => r.event!)
    expect(completed).toMatchObject({ object: 'event', type: 'checkout.session.completed', livemode: false, pending_webhooks: 1, request: { id: null, idempotency_key: null } })
    expect(completed!.id).toMatch(/^evt_/)
    expect(completed!.api_version).toBeTruthy()
    expect(typeof completed!.created).toBe('number')
    const session = completed!.data.object as Stripe.Checkout.Session
    expect(session).toMatchObject({ id: s.id, status: 'complete', payment_status: 'paid', metadata: { invoice_id: 'inv_42', firm_id: 'firm_7' } })
    expect(succeeded).toMatchObject({ type: 'payment_intent.succeeded', data: { object: { id: session.payment_intent, status: 'succeeded', metadata: { invoice_id: 'inv_42' } } } })
    expect(receiver.received[0]!.header).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/)

    expect(fake.state.deliveries.map(d => [d.type, d.attempt, d.statusCode, d.ok])).toEqual([
      ['checkout.session.completed', 1, 200, true],
      ['payment_intent.succeeded', 1, 200, true],
    ])
    const events = await stripe.events.list({ type: 'checkout.session.*' })
    expect(events.data.map(e => e.id)).toEqual([completed!.id])
    expect((await stripe.events.retrieve(succeeded!.id)).type).toBe('payment_intent.succeeded')
  })

  it('is verified only with the right secret and the untouched body', async () => {
    await payAndWait((await newSession()).id)
    const { raw, header } = receiver.received[0]!
    const verifier = new Stripe('sk_test_verifier_only')
    expect(() => verifier.webhooks.constructEvent(raw, header, SECRET)).not.toThrow()
    expect(() => verifier.webhooks.constructEvent(raw.replace('"paid"', '"unpaid"'), header, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError)
    expect(() => verifier.webhooks.constructEvent(raw, header, 'whsec_another')).toThrow(Stripe.errors.StripeSignatureVerificationError)
  })

  it.each([
    [0, null],
    [200, null],
    [400, 'Timestamp outside the tolerance zone'],
  ])('signWithTimestampOffsetSec %i: constructEvent (300 s tolerance) says %s', async (offset, error) => {
    fake.switches.signWithTimestampOffsetSec = offset
    fake.switches.retries = 0 // our receiver answers 200 either way
    await payAndWait((await newSession()).id)
    expect(receiver.received.map(r => r.error)).toEqual([error, error])
  })

  it('duplicate: n delivers each event n times, with the same event id', async () => {
    fake.switches.duplicate = 3
    await payAndWait((await newSession()).id)
    const ids = receiver.received.map(r => r.event!.id)
    expect(ids).toHaveLength(6)
    expect(new Set(ids).size).toBe(2)
    expect(fake.state.deliveries.map(d => d.copy)).toEqual([1, 2, 3, 1, 2, 3])
  })

  it('reorder: true delivers the events of one action last first', async () => {
    fake.switches.reorder = true
    await payAndWait((await newSession()).id)
    expect(receiver.received.map(r => r.event!.type)).toEqual(['payment_intent.succeeded', 'checkout.session.completed'])
  })

  it('delayMs waits before delivering', async () => {
    fake.switches.delayMs = 300
    const started = Date.now()
    await post(`/pay/${(await newSession()).id}/pay`)
    expect(receiver.received).toHaveLength(0)
    await fake.waitForDeliveries(2)
    expect(Date.now() - started).toBeGreaterThanOrEqual(290)
  })

  it('retries a refused delivery with a back-off, and logs every attempt', async () => {
    receiver.answerWith(n => (n < 2 ? 500 : 200)) // the first two tries fail
    await payAndWait((await newSession()).id)
    expect(fake.state.deliveries.map(d => [d.type, d.attempt, d.statusCode])).toEqual([
      ['checkout.session.completed', 1, 500],
      ['checkout.session.completed', 2, 500],
      ['checkout.session.completed', 3, 200],
      ['payment_intent.succeeded', 1, 200],
    ])
    const log = await (await fetch(`${fake.url}/_fake/deliveries`)).json()
    expect(log.data[2]).toMatchObject({ eventId: receiver.received[2]!.event!.id, type: 'checkout.session.completed', statusCode: 200, attempt: 3, ok: true })
  })

  it('retries when nothing listens, then gives up', async () => {
    const gone = await startReceiver(new Stripe('sk_test_verifier_only'))
    await gone.close()
    fake.switches.webhookUrl = gone.url
    fake.switches.retries = 2
    await payAndWait((await newSession()).id)
    expect(fake.state.deliveries.map(d => [d.attempt, d.statusCode, d.error])).toEqual([
      [1, null, 'ECONNREFUSED'], [2, null, 'ECONNREFUSED'], [3, null, 'ECONNREFUSED'],
      [1, null, 'ECONNREFUSED'], [2, null, 'ECONNREFUSED'], [3, null, 'ECONNREFUSED'],
    ])
  })

  it('follows webhookUrl changed at run time', async () => {
    const second = await startReceiver(new Stripe('sk_test_verifier_only'))
    try {
      fake.switches.webhookUrl = second.url
      await payAndWait((await newSession()).id)
      expect(receiver.received).toHaveLength(0)
      expect(second.received.map(r => [r.event?.type, r.error])).toEqual([['checkout.session.completed', null], ['payment_intent.succeeded', null]])
    }
    finally {
      await second.close()
    }
  })

  it('sets switches over HTTP, refuses bad ones, and resets', async () => {
    const set = await post('/_fake/switches', { headers: { 'content-type': 'application/json' }, body: JSON.stringify({ duplicate: 2, reorder: true }) })
    expect(set.status).toBe(200)
    expect(await set.json()).toMatchObject({ duplicate: 2, reorder: true, delayMs: 0, webhookUrl: receiver.url })
    expect(fake.switches.duplicate).toBe(2)

    const bad = await post('/_fake/switches', { headers: { 'content-type': 'application/json' }, body: JSON.stringify({ duplicate: 0 }) })
    expect(bad.status).toBe(400)
    expect((await bad.json()).error.message).toContain('duplicate')
    const unknown = await post('/_fake/switches', { headers: { 'content-type': 'application/json' }, body: JSON.stringify({ sparkle: true }) })
    expect(unknown.status).toBe(400)
    expect((await post('/_fake/switches', { body: 'duplicate=3' })).status).toBe(415)
    expect(fake.switches.duplicate).toBe(2)

    await payAndWait((await newSession()).id)
    const events = await (await fetch(`${fake.url}/_fake/events`)).json()
    expect(events.data.map((e: any) => e.type)).toEqual(['checkout.session.completed', 'payment_intent.succeeded'])
    expect(receiver.received.map(r => r.event!.type)).toEqual(['payment_intent.succeeded', 'payment_intent.succeeded', 'checkout.session.completed', 'checkout.session.completed'])

    expect((await post('/_fake/reset')).status).toBe(200)
    expect((await (await fetch(`${fake.url}/_fake/events`)).json()).data).toEqual([])
    expect((await (await fetch(`${fake.url}/_fake/deliveries`)).json()).data).toEqual([])
    expect(await (await fetch(`${fake.url}/_fake/switches`)).json()).toMatchObject({ duplicate: 1, reorder: false })
    expect(fake.state.sessions.size).toBe(0)
  })
})

describe('refunds', () => {
  async function paidIntent() {
    const s = await newSession()
    await payAndWait(s.id)
    receiver.clear()
    return (await stripe.checkout.sessions.retrieve(s.id)).payment_intent as string
  }

  it('refunds part, then the rest by default, and sends charge.refunded each time', async () => {
    const pi = await paidIntent()
    const part = await stripe.refunds.create({ payment_intent: pi, amount: 4468, metadata: { credit_note: 'CN-1' } })
    expect(part.id).toMatch(/^re_/)
    expect(part).toMatchObject({ object: 'refund', amount: 4468, currency: 'gbp', payment_intent: pi, status: 'succeeded', metadata: { credit_note: 'CN-1' } })
    const chargeId = (await stripe.paymentIntents.retrieve(pi)).latest_charge as string
    expect(await stripe.charges.retrieve(chargeId)).toMatchObject({ amount_refunded: 4468, refunded: false })

    const rest = await stripe.refunds.create({ payment_intent: pi })
    expect(rest.amount).toBe(10000)
    expect(await stripe.charges.retrieve(chargeId)).toMatchObject({ amount_refunded: 14468, refunded: true })
    expect(await stripe.refunds.retrieve(rest.id)).toEqual(rest)

    await fake.idle()
    const events = receiver.received.map(r => r.event!)
    expect(events.map(e => e.type)).toEqual(['charge.refunded', 'charge.refunded'])
    expect(events.map(e => (e.data.object as Stripe.Charge).amount_refunded)).toEqual([4468, 14468])
    expect(events[0]!.request?.id).toMatch(/^req_/)
  })

  it('refuses more than remains, in Stripe\'s words', async () => {
    const pi = await paidIntent()
    const tooMuch = await apiError(stripe.refunds.create({ payment_intent: pi, amount: 14469 }))
    expect(tooMuch).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(tooMuch).toMatchObject({ statusCode: 400, param: 'amount', message: 'Refund amount (£144.69) is greater than unrefunded amount on charge (£144.68)' })

    await stripe.refunds.create({ payment_intent: pi })
    expect(await apiError(stripe.refunds.create({ payment_intent: pi, amount: 1 }))).toMatchObject({ statusCode: 400, code: 'charge_already_refunded' })
    expect(await apiError(stripe.refunds.create({ payment_intent: 'pi_missing' }))).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'payment_intent' })
    expect(await apiError(stripe.refunds.create({}))).toMatchObject({ statusCode: 400, code: 'parameter_missing' })
    expect(await apiError(stripe.refunds.create({ payment_intent: pi, amount: 0 }))).toMatchObject({ statusCode: 400, param: 'amount' })
  })
})

describe('idempotency', () => {
  it('replays the same key and body, and refuses the same key with another body', async () => {
    const params = { email: 'dan@example.com', name: 'Dan' }
    const first = await stripe.customers.create(params, { idempotencyKey: 'setwell-key-1' })
    const again = await stripe.customers.create(params, { idempotencyKey: 'setwell-key-1' })
    expect(again.id).toBe(first.id)
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true')
    expect(fake.state.customers.size).toBe(1)

    const err = await apiError(stripe.customers.create({ ...params, name: 'Daniel' }, { idempotencyKey: 'setwell-key-1' }))
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError)
    expect(err).toMatchObject({ statusCode: 400, rawType: 'idempotency_error' })

    const other = await apiError(stripe.refunds.create({ payment_intent: 'pi_x' }, { idempotencyKey: 'setwell-key-1' }))
    expect(other).toBeInstanceOf(Stripe.errors.StripeIdempotencyError)
  })

  it('replays an error the endpoint gave, so a retried refund cannot refund twice', async () => {
    const s = await newSession()
    await payAndWait(s.id)
    const pi = (await stripe.checkout.sessions.retrieve(s.id)).payment_intent as string
    const refund = await stripe.refunds.create({ payment_intent: pi, amount: 100 }, { idempotencyKey: 'refund-inv-42' })
    const retried = await stripe.refunds.create({ payment_intent: pi, amount: 100 }, { idempotencyKey: 'refund-inv-42' })
    expect(retried.id).toBe(refund.id)
    expect(fake.state.refunds.size).toBe(1)
    expect((await stripe.charges.retrieve((await stripe.paymentIntents.retrieve(pi)).latest_charge as string)).amount_refunded).toBe(100)
  })

  it('parses the same body sent in another key order as the same request', async () => {
    const headers = { 'authorization': 'Bearer sk_test_fake', 'content-type': 'application/x-www-form-urlencoded', 'idempotency-key': 'order-1' }
    const a = await post('/v1/customers', { headers, body: 'email=e%40example.com&metadata[a]=1&metadata[b]=2' })
    const b = await post('/v1/customers', { headers, body: 'metadata[b]=2&metadata[a]=1&email=e%40example.com' })
    expect(b.headers.get('idempotent-replayed')).toBe('true')
    expect((await b.json()).id).toBe((await a.json()).id)
  })
})
