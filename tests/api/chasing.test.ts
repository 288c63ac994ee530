import { randomUUID } from 'node:crypto'
import pg from 'pg'
import PgBoss from 'pg-boss'
import { extractText, getDocumentProxy } from 'unpdf'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, fullDate, londonToday } from '../../shared/utils/dates'
import { formatPence } from '../../shared/utils/money'
import { latePaymentClaim } from '../../shared/utils/late-payment'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'

// Chasing what is owed: the reminder schedule sends each step at most once (however often it
// runs, and two runs at once), stops when paid; "send one now"; the chase log; and the statutory
// claim on a business customer's overdue invoice, never a homeowner's.

let app: TestApp
let owner: Client
let firmId: string

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Chasing Firm'))
})
afterAll(async () => {
  await app?.stop()
})

/** Move an invoice's due date into the past, as time would (straight in the database, as the firm). */
async function dueOn(invoiceId: string, date: string, firm = firmId) {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firm])
    await db.query('update invoices set due_on = $1 where id = $2', [date, invoiceId])
    await db.query('commit')
  }
  finally {
    await db.end()
  }
}

async function issuedTo(kind: 'homeowner' | 'business', amountPence = 500_00) {
  const email = uniqueEmail(kind)
  const c = (await owner.post('/api/customers', { customer: { kind, name: kind === 'business' ? 'Greywether Lettings Ltd' : 'Ada Penrose', email, billingLine1: '3 Tithe Court', billingPostcode: 'KB4 6RS' } })).body
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the stairwell', quantityX1000: 1000, unitPence: amountPence }] })
  const inv = (await owner.post(`/api/invoices/${d.id}/issue`)).body
  await app.waitForMail(email, /Invoice /)
  return { invoice: inv, email }
}

const remindersTo = (email: string) => app.mails.filter(m => JSON.stringify(m.to).includes(email) && !/^Invoice .* from /.test(m.subject ?? ''))

describe('reminders', () => {
  it('sends the step an invoice has reached once, however often the schedule runs, and stops when it is paid', async () => {
    const { invoice, email } = await issuedTo('homeowner')
    // 40 days late: only the 30-day reminder goes, not all five (our own rule)
    await dueOn(invoice.id, '2026-10-22')
    const [a, b] = await Promise.all([owner.post('/api/reminders/run'), owner.post('/api/reminders/run')])
    expect(a.status).toBe(200)
    expect(b.status).toBe(200)
    await app.waitForMail(email, /please pay now/)
    expect((await owner.post('/api/reminders/run')).body.results.filter((r: any) => r.invoiceId === invoice.id)).toEqual([])
    await new Promise(r => setTimeout(r, 300))
    expect(remindersTo(email).map(m => m.subject)).toEqual([`Invoice ${invoice.reference}: please pay now`])
    const detail = (await owner.get(`/api/invoices/${invoice.id}`)).body
    expect(detail.chase.filter((c: any) => c.kind === 'reminder')).toHaveLength(1)
    expect(detail.status).toBe('overdue')

    // paid: nothing more is sent, by the schedule or by hand
    await owner.post(`/api/invoices/${invoice.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: invoice.amountDuePence, receivedOn: '2026-12-01' })
    await dueOn(invoice.id, '2026-07-01')
    expect((await owner.post('/api/reminders/run')).body.results.filter((r: any) => r.invoiceId === invoice.id)).toEqual([])
    expect((await owner.post(`/api/invoices/${invoice.id}/reminders`)).status).toBe(409)
  })

  it('sends one now in one click, keeps a chase log, and checks the schedule it is given', async () => {
    const { invoice, email } = await issuedTo('homeowner')
    const now = await owner.post(`/api/invoices/${invoice.id}/reminders`)
    expect(now.status).toBe(200)
    await app.waitForMail(email, new RegExp(invoice.reference))
    expect(now.body.chase).toEqual([expect.objectContaining({ kind: 'reminder', note: 'Reminder sent by hand' })])
    expect((await owner.post(`/api/invoices/${invoice.id}/chase-notes`, { kind: 'call', outcome: 'promised' })).body.data.fields.promisedOn).toBeTruthy()
    const promised = await owner.post(`/api/invoices/${invoice.id}/chase-notes`, { kind: 'call', outcome: 'promised', note: 'Will pay Friday', promisedPence: 200_00, promisedOn: addDays(londonToday(), 3) })
    expect(promised.status).toBe(201)
    expect(promised.body.chase.map((c: any) => [c.kind, c.outcome, c.promisedPence])).toEqual([['reminder', null, null], ['call', 'promised', 200_00]])

    const rules = (await owner.get('/api/reminders')).body
    expect(rules.map((r: any) => r.offsetDays)).toEqual([-3, 0, 7, 14, 30])
    const bad = await owner.put('/api/reminders', { rules: [{ offsetDays: 7, subject: 'a', body: 'b' }, { offsetDays: 7, subject: '', body: 'c' }] })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['rules.1.offsetDays', 'rules.1.subject'])
    const changed = await owner.put('/api/reminders', { rules: [{ offsetDays: 5, subject: 'Gentle nudge: {reference}', body: 'Hello {customer}, {amount} is owed.' }] })
    expect(changed.status).toBe(200)
    const later = await issuedTo('homeowner', 12_34)
    await dueOn(later.invoice.id, '2026-11-20')
    await owner.post('/api/reminders/run')
    const mail = await app.waitForMail(later.email, /Gentle nudge/)
    expect(mail.subject).toBe(`Gentle nudge: ${later.invoice.reference}`)
    expect(mail.text).toContain('Hello Ada Penrose, £12.34 is owed.')
    // back to the starting schedule for the other tests
    await owner.put('/api/reminders', { rules })
  })
})

describe('an empty schedule', () => {
  it('stops reminders: saved empty, it stays empty and nothing is sent', async () => {
    const rules = (await owner.get('/api/reminders')).body
    expect(rules.length).toBeGreaterThan(0)
    const emptied = await owner.put('/api/reminders', { rules: [] })
    expect(emptied.status).toBe(200)
    try {
      expect((await owner.get('/api/reminders')).body).toEqual([])
      const { invoice, email } = await issuedTo('homeowner')
      await dueOn(invoice.id, new Date(Date.now() - 8 * 86_400_000).toISOString().slice(0, 10))
      const run = await owner.post('/api/reminders/run')
      expect(run.status).toBe(200)
      expect(run.body.results.filter((r: any) => r.invoiceId === invoice.id)).toEqual([])
      await new Promise(r => setTimeout(r, 500))
      expect(remindersTo(email)).toEqual([])
      expect((await owner.get('/api/reminders')).body).toEqual([])
      // one by hand still goes, in the default words for where the invoice stands (8 days late)
      expect((await owner.post(`/api/invoices/${invoice.id}/reminders`)).status).toBe(200)
      const mail = await app.waitForMail(email, new RegExp(`${invoice.reference} is overdue`))
      expect(mail.text).toContain('8 days overdue')
    }
    finally {
      await owner.put('/api/reminders', { rules: rules.map(({ offsetDays, subject, body }: any) => ({ offsetDays, subject, body })) })
    }
  })
})

describe('what is owed', () => {
  it('ages each customer\'s debts and the firm\'s total', async () => {
    const { client: partner, firmId: ownFirm } = await signUpFirm(app.url, 'Owed Ledger Plastering')
    const isoDaysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10)
    const customer = async (name: string) => (await partner.post('/api/customers', { customer: { kind: 'homeowner', name, email: uniqueEmail('owed') } })).body
    const a = await customer('Bryony Hale')
    const b = await customer('Osric Vane')
    // [customer, amount, days late (negative: not yet due), paid by transfer so far]
    const plan: [typeof a, number, number, number][] = [
      [a, 100_00, -5, 0], [a, 200_00, 0, 50_00], [a, 300_00, 1, 0], [a, 400_00, 30, 0], [a, 500_00, 31, 0],
      [b, 600_00, 60, 0], [b, 700_00, 61, 100_00], [b, 800_00, 90, 0], [b, 900_00, 91, 0], [b, 1_000_00, 400, 0],
      [b, 55_00, 10, 55_00], // paid in full: not owed
    ]
    const made: { customerId: string, outstanding: number, late: number }[] = []
    for (const [c, amount, late, paid] of plan) {
      const d = (await partner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
      await partner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim', quantityX1000: 1000, unitPence: amount }] })
      const inv = (await partner.post(`/api/invoices/${d.id}/issue`)).body
      if (paid) await partner.post(`/api/invoices/${d.id}/payments`, { requestId: randomUUID(), method: 'transfer', amountPence: paid, receivedOn: isoDaysAgo(0) })
      await dueOn(d.id, isoDaysAgo(late), ownFirm)
      made.push({ customerId: c.id, outstanding: inv.amountDuePence - paid, late })
    }
    // the buckets by days past the due date (our own bands: not yet due, 1-30, 31-60, 61-90, over 90)
    const band = (late: number) => late <= 0 ? 'not-due' : late <= 30 ? '1-30' : late <= 60 ? '31-60' : late <= 90 ? '61-90' : 'over-90'
    const expected = (rows: typeof made) => {
      const out: Record<string, number> = { 'not-due': 0, '1-30': 0, '31-60': 0, '61-90': 0, 'over-90': 0 }
      for (const r of rows) if (r.outstanding > 0) out[band(r.late)]! += r.outstanding
      return out
    }
    const owed = await partner.get('/api/owed')
    expect(owed.status).toBe(200)
    expect(owed.body.totals).toEqual(expected(made))
    expect(owed.body.totalPence).toBe(made.reduce((s, r) => s + Math.max(0, r.outstanding), 0))
    expect(owed.body.customers.map((c: any) => c.customerId).sort()).toEqual([a.id, b.id].sort())
    for (const c of [a, b]) {
      const mine = made.filter(r => r.customerId === c.id)
      const row = owed.body.customers.find((x: any) => x.customerId === c.id)
      expect(row.buckets, c.name).toEqual(expected(mine))
      expect(row.totalPence).toBe(mine.reduce((s, r) => s + Math.max(0, r.outstanding), 0))
      expect(row.invoices).toHaveLength(mine.filter(r => r.outstanding > 0).length)
    }
    // another firm sees none of it
    expect((await owner.get('/api/owed')).body.customers.map((c: any) => c.customerId)).not.toContain(a.id)
  })
})

describe('the background jobs', () => {
  it('the server\'s pg-boss worker sends a reminder job once, even when the job is sent again (a retry)', async () => {
    const { invoice, email } = await issuedTo('homeowner')
    await dueOn(invoice.id, '2026-11-24')
    const boss = new PgBoss({ connectionString: requiredEnv('SETWELL_TEST_DATABASE_URL'), schema: 'pgboss', migrate: false, supervise: false, schedule: false, max: 1 })
    boss.on('error', () => {})
    await boss.start()
    try {
      // the same job twice, as a retry after a lost answer would be
      for (let i = 0; i < 2; i++) await boss.send('reminder-send', { firmId, invoiceId: invoice.id, offsetDays: 7 })
      await app.waitForMail(email, /is overdue/, 20_000)
      const sent = async () => (await owner.get(`/api/invoices/${invoice.id}`)).body.chase.filter((c: any) => c.kind === 'reminder' && c.sentAt)
      await expect.poll(async () => (await boss.getQueueSize('reminder-send')), { timeout: 20_000, interval: 500 }).toBe(0)
      await new Promise(r => setTimeout(r, 2500))
      expect(await sent()).toHaveLength(1)
      expect(remindersTo(email)).toHaveLength(1)
    }
    finally {
      await boss.stop({ graceful: false, wait: true })
    }
  })
})

describe('the statutory claim', () => {
  it('is never offered against a homeowner', async () => {
    const { invoice } = await issuedTo('homeowner')
    await dueOn(invoice.id, '2026-10-01')
    const res = await owner.get(`/api/invoices/${invoice.id}/claim`)
    expect(res.status).toBe(409)
    expect(res.body.data.message).toMatch(/business customers only/)
  })

  it('works out interest and the fixed sum on a business customer\'s overdue invoice, with a letter', async () => {
    const { invoice } = await issuedTo('business', 2_400_00)
    expect((await owner.get(`/api/invoices/${invoice.id}/claim`)).status).toBe(409) // not yet overdue
    await dueOn(invoice.id, '2026-10-01')
    const res = await owner.get(`/api/invoices/${invoice.id}/claim`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const rates = (await owner.get('/api/bank-rates')).body.map((r: any) => ({ from: r.fromDate, ratePercent: r.rateBp / 100 }))
    const today = londonToday() // the server's today (the claim is worked out to it)
    expect(res.body).toMatchObject(latePaymentClaim({ debtPence: 2_400_00, dueDate: '2026-10-01', asOf: today, bankRates: rates }))
    // £2,400 is under £10,000: a fixed sum of £70 (Act s.5A); interest starts the day after the due date
    expect(res.body).toMatchObject({ interestStart: '2026-10-02', fixedSumPence: 70_00 })
    expect(res.body.caution).toMatch(/not legal advice.*accountant or solicitor/)
    // the bank account from the firm's three fields
    const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
    await db.connect()
    try {
      await db.query('begin')
      await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
      await db.query(`update firms set takes_transfer = true, bank_account_name = 'Chasing Firm', bank_sort_code = '608371', bank_account_number = '31926819' where id = $1`, [firmId])
      await db.query('commit')
    }
    finally {
      await db.end()
    }
    const pdf = await fetch(`${app.url}/invoices/${invoice.id}/claim/pdf`, { headers: { cookie: owner.cookieHeader() } })
    expect(pdf.status).toBe(200)
    const text = (await extractText(await getDocumentProxy(new Uint8Array(await pdf.arrayBuffer())), { mergePages: true })).text.replace(/\s+/g, ' ')
    for (const s of ['Late Payment of Commercial Debts (Interest) Act 1998', 'Greywether Lettings Ltd', invoice.reference, '£70.00', '£2,400.00', `${res.body.days} days`, `${res.body.ratePercent}% a year`, formatPence(res.body.interestPence), formatPence(res.body.totalPence), 'Thursday 1 October 2026', 'Friday 2 October 2026', fullDate(today), 'Sort code: 60-83-71', 'Account number: 31926819']) expect(text).toContain(s)
    // the firm's caution stays on its own screen: the letter is to the customer
    expect(text).not.toMatch(/legal advice|solicitor|rule of thumb/i)
    expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/)

    // the owner keeps the Bank Rate table; bad tables are refused by field
    const bad = await owner.put('/api/bank-rates', { rates: [{ fromDate: '2026-01-01', rateBp: -1 }, { fromDate: '2026-01-01', rateBp: 400 }] })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['rates.0.rateBp', 'rates.1.fromDate'])
    expect((await new Client(app.url).get(`/api/invoices/${invoice.id}/claim`)).status).toBe(401)
  })
})
