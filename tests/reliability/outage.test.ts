import { randomUUID } from 'node:crypto'
// A mixed load for 60 seconds on loopback (reads, customers, quotes, invoices drafted and issued,
// payments recorded by hand and paid by card through the Stripe fake, sets logged on a job,
// exports), with the database stopped 20 seconds in and started again 10 seconds later. Outside
// the outage: no 5xx. During it: 503 with a message, never another 5xx. Afterwards the app
// answers again without a restart, every write it acknowledged is in the database, and no
// invoice, payment or set log is half-written. The database is a cluster of this file's own, so stopping
// it disturbs no other test.
import { rmSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { queryAsFirm } from '../support/db'
import type { Client } from '../support/client'
import { Client as PublicClient, signUpFirm, uniqueEmail } from '../support/client'

// plain ES modules of ours: the scripts that run PostgreSQL for npm start and npm test
const env = await import('../../scripts/lib/env.mjs')
const pgLib = await import('../../scripts/lib/pg.mjs')
const runLib = await import('../../scripts/lib/run.mjs')

const LOAD_SECONDS = 60
const OUTAGE_FROM_S = 20
const OUTAGE_SECONDS = 10
const WORKERS = 8
const profile = { name: `outage-${process.pid}`, dataDir: join(env.root, `.data/test-outage-${process.pid}`), pgPort: 0, fast: true }

let app: TestApp
let owner: Client
let firmId: string
let job: { id: string, surfaceIds: string[], finishId: string }
const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))

const sql = <T = Record<string, unknown>>(text: string, values: unknown[] = []) => queryAsFirm<T>(env.urls(profile).owner, firmId, text, values)

beforeAll(async () => {
  profile.pgPort = await runLib.freePort()
  await pgLib.startCluster(profile)
  await pgLib.recreateDatabase(profile)
  await pgLib.bootstrap(profile)
  await pgLib.migrate(profile)
  app = await startApp({ NUXT_DATABASE_URL: env.urls(profile).app, NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Outage Firm'))
  job = await jobUnderWay()
})

/** A job from a measured visit, through a quote the customer accepted: its set 1 is logged under the load. */
async function jobUnderWay() {
  const email = uniqueEmail('site')
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Orrell', email }, site: { line1: '9 Kiln Yard', postcode: 'KB2 5TW' } })).body
  const v = (await owner.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: '2026-12-02T09:00:00Z' })).body
  const room = await owner.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, {
    revision: 0,
    name: 'Front room',
    surfaces: [
      { id: crypto.randomUUID(), kind: 'wall', lengthMm: 4000, secondMm: 2400 },
      { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 4000, secondMm: 3500 },
    ],
  })
  expect(room.status, JSON.stringify(room.body)).toBe(200)
  const q = (await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })).body
  expect((await owner.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
  const mail = await app.waitForMail(email, /Your quote [A-Z]+-Q[1-9]/)
  const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
  expect((await new PublicClient(app.url).post(`/api/public/quotes/${token}/accept`, { name: 'Tamsin Orrell' })).status).toBe(200)
  const made = await owner.post(`/api/quotes/${q.id}/job`)
  expect(made.status, JSON.stringify(made.body)).toBe(201)
  const detail = (await owner.get(`/api/jobs/${made.body.id}`)).body
  const finish = (await owner.get('/api/materials')).body.find((m: { type: string }) => m.type === 'finish')
  return { id: made.body.id as string, surfaceIds: detail.plan.plan.sets[0].tasks.map((t: { surfaceId: string }) => t.surfaceId) as string[], finishId: finish.id as string }
}
afterAll(async () => {
  await app?.stop()
  pgLib.stopCluster(profile)
  rmSync(profile.dataDir, { recursive: true, force: true })
})

interface Outcome { at: number, what: string, status: number, body: any }

describe('the database stopped in the middle of a mixed load', () => {
  it('answers 503 while it is down, recovers by itself, loses no acknowledged write and half-writes nothing', async () => {
    const started = Date.now()
    const elapsed = () => (Date.now() - started) / 1000
    const outcomes: Outcome[] = []
    const acknowledged = { customers: [] as string[], invoices: [] as string[], payments: [] as string[], issued: [] as string[], quotes: [] as string[], cards: [] as { invoiceId: string, amountPence: number }[], setLogs: [] as { id: string, packsX1000: number }[] }
    const emails = new Map<string, string>()
    // Stripe keeps sending an event for days until it is taken; the fake, a few times quickly. For
    // the outage, long enough to outlast it (0.5 s doubling eight times: over two minutes)
    app.stripe.setSwitches({ retries: 8, retryDelayMs: 500 })
    let outage: [number, number] = [Number.POSITIVE_INFINITY, Number.POSITIVE_INFINITY]
    const day = new Date().toISOString().slice(0, 10)
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10)

    const call = async (what: string, method: string, path: string, body?: unknown, as: Client = owner) => {
      let res: { status: number, body: any }
      try {
        res = await as.request(method, path, body)
      }
      catch (err) {
        res = { status: 0, body: String(err) }
      }
      outcomes.push({ at: elapsed(), what, status: res.status, body: res.body })
      return res
    }

    async function worker(n: number) {
      let i = 0
      while (elapsed() < LOAD_SECONDS) {
        i++
        const step = (n + i) % 8
        if (step === 0) {
          const email = uniqueEmail('load')
          const r = await call('new customer', 'POST', '/api/customers', { customer: { kind: 'homeowner', name: `Load ${n}-${i}`, email } })
          if (r.status === 201) {
            acknowledged.customers.push(r.body.id)
            emails.set(r.body.id, email)
          }
        }
        else if (step === 1 && acknowledged.customers.length) {
          const customerId = acknowledged.customers[(n * 7 + i) % acknowledged.customers.length]
          const draft = await call('draft invoice', 'POST', '/api/invoices', { kind: 'blank', customerId })
          if (draft.status !== 201) continue
          acknowledged.invoices.push(draft.body.id)
          const saved = await call('save draft', 'PUT', `/api/invoices/${draft.body.id}/draft`, { vat: draft.body.vat, lines: [{ kind: 'labour', description: 'Skim the hall', quantityX1000: 1000, unit: 'item', unitPence: 150_00 + i }] })
          if (saved.status !== 200) continue
          const issued = await call('issue invoice', 'POST', `/api/invoices/${draft.body.id}/issue`)
          if (issued.status !== 200) continue
          acknowledged.issued.push(draft.body.id)
          if (i % 2) {
            const paid = await call('record payment', 'POST', `/api/invoices/${draft.body.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: 50_00, receivedOn: day, reference: `load ${n}-${i}` })
            if (paid.status === 201) acknowledged.payments.push(`${draft.body.id}:load ${n}-${i}`)
            continue
          }
          // the customer pays by card from the link in the invoice's e-mail, on the fake's pay page
          const mail = await app.waitForMail(emails.get(customerId!)!, new RegExp(`Invoice ${issued.body.reference} `), 15_000).catch(() => null)
          const token = mail ? /\/i\/([\w-]+)/.exec(mail.text ?? '')?.[1] : undefined
          if (!token) continue
          const checkout = await call('card checkout', 'POST', `/api/public/invoices/${token}/checkout`, undefined, new PublicClient(app.url))
          if (checkout.status !== 200) continue
          const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
          const pay = await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })
          // Stripe has the money: from here the payment must reach the invoice, once
          if (pay.status === 303) acknowledged.cards.push({ invoiceId: draft.body.id, amountPence: issued.body.amountDuePence })
        }
        else if (step === 5 && acknowledged.customers.length) {
          const customerId = acknowledged.customers[(n * 5 + i) % acknowledged.customers.length]
          const quote = await call('new quote', 'POST', '/api/quotes', { customerId })
          if (quote.status === 201) acknowledged.quotes.push(quote.body.id)
        }
        else if (step === 6) {
          // a set logged on the job, with the bags mixed
          const packsX1000 = 1000 + n * 100 + (i % 100)
          const logged = await call('log a set', 'POST', `/api/jobs/${job.id}/logs`, {
            // yesterday's times: a set's times may not be still to come (a run at 07:00 would be)
            kind: 'set', setNumber: 1, coat: 'first', surfaceIds: job.surfaceIds, startedAt: `${yesterday}T08:00:00Z`, endedAt: `${yesterday}T09:30:00Z`,
            materials: [{ materialId: job.finishId, packsX1000 }], notes: `load ${n}-${i}`,
          })
          const mine = logged.status === 201 ? logged.body.logs.find((l: { notes: string }) => l.notes === `load ${n}-${i}`) : undefined
          if (mine) acknowledged.setLogs.push({ id: mine.id, packsX1000 })
        }
        else if (step === 2) await call('customers list', 'GET', '/api/customers?pageSize=25')
        else if (step === 3) await call('invoices list', 'GET', '/api/invoices')
        else if (step === 4) await call('what is owed', 'GET', '/api/owed')
        else await call('export', 'GET', `/exports/payments.csv?quarterOf=${day}`)
      }
    }

    const outageDone = (async () => {
      await sleep(OUTAGE_FROM_S * 1000)
      outage = [elapsed(), Number.POSITIVE_INFINITY]
      pgLib.stopCluster(profile)
      await sleep(OUTAGE_SECONDS * 1000)
      await pgLib.startCluster(profile)
      outage = [outage[0], elapsed()]
    })()
    await Promise.all([...Array.from({ length: WORKERS }, (_, n) => worker(n)), outageDone])
    // the card payments' events, some refused during the outage and sent again
    await app.stripe.idle()

    // the app came back by itself: the last seconds of the load were answered normally
    const after = outcomes.filter(o => o.at > outage[1] + 5)
    expect(after.length, 'requests after the database came back').toBeGreaterThan(20)
    expect(after.filter(o => o.status >= 200 && o.status < 300).length / after.length).toBeGreaterThan(0.95)

    // during the outage: 503 with a message, nothing else from the 5xx range; before and after it: no 5xx
    const during = outcomes.filter(o => o.at >= outage[0] && o.at <= outage[1] + 3)
    expect(during.filter(o => o.status === 503).length, 'some requests met the outage').toBeGreaterThan(0)
    for (const o of during.filter(o => o.status >= 500)) {
      expect(o.status, `${o.what} at ${o.at.toFixed(1)} s`).toBe(503)
      expect(o.body?.data?.message ?? '', o.what).toMatch(/cannot reach its database/)
    }
    const outside = outcomes.filter(o => o.at < outage[0] || o.at > outage[1] + 3)
    expect(outside.filter(o => o.status >= 500 || o.status === 0).map(o => `${o.what} ${o.status} at ${o.at.toFixed(1)} s`)).toEqual([])

    // every acknowledged write is there
    const customers = new Set((await sql<{ id: string }>('select id from customers')).map(r => r.id))
    expect(acknowledged.customers.filter(id => !customers.has(id))).toEqual([])
    const invoices = await sql<{ id: string, issued_on: string | null, number: number | null, reference: string | null, amount_due_pence: number, totals: Record<string, number>, lines: number }>(
      'select i.id, i.issued_on, i.number, i.reference, i.amount_due_pence, i.totals, (select count(*)::int from invoice_lines l where l.firm_id = i.firm_id and l.invoice_id = i.id) as lines from invoices i')
    const byId = new Map(invoices.map(i => [i.id, i]))
    expect(acknowledged.invoices.filter(id => !byId.has(id))).toEqual([])
    expect(acknowledged.issued.filter(id => !byId.get(id)?.issued_on)).toEqual([])
    const payments = new Set((await sql<{ key: string }>('select invoice_id || \':\' || reference as key from payments')).map(r => r.key))
    expect(acknowledged.payments.filter(k => !payments.has(k))).toEqual([])
    // every card payment Stripe took is on its invoice exactly once, for the amount due
    const cards = await sql<{ invoice_id: string, n: number, total: number }>('select invoice_id, count(*)::int as n, sum(amount_pence)::int as total from payments where method = \'card\' group by invoice_id')
    const cardsBy = new Map(cards.map(c => [c.invoice_id, c]))
    expect(acknowledged.cards.filter(c => cardsBy.get(c.invoiceId)?.n !== 1 || cardsBy.get(c.invoiceId)?.total !== c.amountPence)).toEqual([])
    expect(acknowledged.cards.length, 'card payments under load').toBeGreaterThan(3)
    // every quote acknowledged is there with its first version
    const quotes = new Set((await sql<{ id: string }>('select q.id from quotes q join quote_versions v on v.firm_id = q.firm_id and v.quote_id = q.id and v.version = 1')).map(r => r.id))
    expect(acknowledged.quotes.filter(id => !quotes.has(id))).toEqual([])
    expect(acknowledged.quotes.length, 'quotes made under load').toBeGreaterThan(10)
    // every set log acknowledged is there, and no set log is without the materials it was sent with
    const logs = await sql<{ id: string, notes: string, packs: number | null, uses: number }>(
      'select l.id, l.notes, (select sum(u.packs_x_1000)::int from material_uses u where u.firm_id = l.firm_id and u.log_id = l.id) as packs, (select count(*)::int from material_uses u where u.firm_id = l.firm_id and u.log_id = l.id) as uses from set_logs l where l.job_id = $1', [job.id])
    const logsBy = new Map(logs.map(l => [l.id, l]))
    expect(acknowledged.setLogs.filter(l => logsBy.get(l.id)?.packs !== l.packsX1000)).toEqual([])
    expect(logs.filter(l => l.notes.startsWith('load ') && l.uses !== 1).map(l => l.notes)).toEqual([])
    expect(acknowledged.setLogs.length, 'sets logged under load').toBeGreaterThan(10)

    // nothing half-written: an issued invoice has its number, reference, lines and totals together;
    // numbers run without gaps or repeats
    for (const i of invoices.filter(i => i.issued_on)) {
      expect(i.number, i.id).not.toBeNull()
      expect(i.reference, i.id).toBeTruthy()
      expect(i.lines, i.id).toBeGreaterThan(0)
      expect(i.totals.amountDuePence, i.id).toBe(i.amount_due_pence)
    }
    const numbers = invoices.filter(i => i.issued_on).map(i => i.number!).sort((a, b) => a - b)
    expect(numbers).toEqual(numbers.map((_, k) => k + 1))
    expect(acknowledged.issued.length, 'invoices issued under load').toBeGreaterThan(10)
  })
})
