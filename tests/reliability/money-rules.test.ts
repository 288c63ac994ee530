import { randomUUID } from 'node:crypto'
import { setTimeout as sleep } from 'node:timers/promises'
import Stripe from 'stripe'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'
import { statuses, together } from './race'

// Money rules that must hold whatever arrives at once (issue 13): each case releases many
// requests together behind one gate, then reads the database to see what was really written.
// - credit notes against an invoice never give back more than it charged;
// - a quote never has two accepted versions;
// - a job is never invoiced past its price (less credits) but for lines marked as extra work;
// - the same payment sent twice is recorded once, and a fully credited invoice takes none;
// - invoice and credit-note references never repeat within a firm;
// - a card refund never takes back more than the payment.

const AT_ONCE = 12
let app: TestApp
let owner: Client
let firmId: string
const stripe = new Stripe('sk_test_setwell_tests')

beforeAll(async () => {
  app = await startApp({ NUXT_JOBS_ENABLED: 'false' })
  ;({ client: owner, firmId } = await signUpFirm(app.url, 'Race Rules Plastering'))
})
afterAll(async () => {
  await app?.stop()
})

/** The next mail to this address, taken out of the mailbox so the one after it can be waited for. */
async function takeMail(to: string, subject: RegExp) {
  const mail = await app.waitForMail(to, subject)
  app.mails.splice(app.mails.indexOf(mail), 1)
  return mail
}

const db = <T = Record<string, any>>(text: string, values: unknown[] = []) => queryAsFirm<T>(requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL'), firmId, text, values)
const show = (r: { status: number, body: unknown }) => `${r.status} ${JSON.stringify(r.body)?.slice(0, 300)}`

async function customer() {
  const res = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: 'Odile Farrant', email: uniqueEmail('odile') }, site: { line1: '7 Quarry Steps', town: 'Kettlebury', postcode: 'KB4 7QS' } })
  expect(res.status, show(res)).toBe(201)
  return res.body as { id: string, email: string, sites: { id: string }[] }
}

/** A job made directly at a price (net): £1,000 of labour unless told. */
async function pricedJob(labourNetPence = 1000_00, materialsNetPence = 0) {
  const c = await customer()
  const res = await owner.post('/api/jobs', { customerId: c.id, siteId: c.sites[0]!.id, title: 'Skim the back bedroom', labourNetPence, materialsNetPence })
  expect(res.status, show(res)).toBe(201)
  return { job: res.body as { id: string }, customer: c }
}

/** A blank invoice with one labour line, issued. */
async function issuedInvoice(pence: number) {
  const c = await customer()
  const draft = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  const saved = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Patch and skim the landing', quantityX1000: 1000, unitPence: pence }] })
  expect(saved.status, show(saved)).toBe(200)
  const res = await owner.post(`/api/invoices/${draft.id}/issue`)
  expect(res.status, show(res)).toBe(200)
  return { invoice: res.body as { id: string, reference: string, totals: { grossPence: number } }, customer: c }
}

/** What the job's invoices (not credit notes), drafts included, claim of its price: the lines not marked as extra work. */
async function claimedOfPrice(jobId: string) {
  const [row] = await db<{ n: number }>(`
    select coalesce(sum((l.quantity_x_1000::bigint * l.unit_pence + 500) / 1000), 0)::int as n
      from invoice_lines l join invoices i on i.firm_id = l.firm_id and i.id = l.invoice_id
     where i.firm_id = $1 and i.job_id = $2 and i.kind <> 'credit-note' and not l.extra_work`, [firmId, jobId])
  return row!.n
}

describe('credit notes never give back more than the invoice charged', () => {
  it('issues at most what the invoice charged, whatever is issued at once, and says why it refuses', async () => {
    const { invoice } = await issuedInvoice(80_00)
    // a credit note edited far beyond the invoice is refused when it is issued
    const big = (await owner.post(`/api/invoices/${invoice.id}/credit-note`)).body
    const edited = await owner.put(`/api/invoices/${big.id}/draft`, { vat: big.vat, lines: [{ kind: 'labour', description: 'Credit', quantityX1000: 1000, unitPence: 50_000_00 }] })
    expect([200, 400], show(edited)).toContain(edited.status)
    const bigIssue = await owner.post(`/api/invoices/${big.id}/issue`)
    expect(bigIssue.status, show(bigIssue)).toBe(409)
    expect(bigIssue.body.data.message).toMatch(/£80\.00/)

    // full credit notes issued at once: one goes, the rest are refused
    const notes = await Promise.all(Array.from({ length: 5 }, async () => (await owner.post(`/api/invoices/${invoice.id}/credit-note`)).body.id as string))
    const answers = await together(notes.length, i => owner.post(`/api/invoices/${notes[i]}/issue`))
    expect(statuses(answers), answers.map(show).join('\n')).toEqual({ 200: 1, 409: 4 })
    const [sum] = await db<{ credited: number, n: number }>(`select coalesce(sum((totals->>'grossPence')::int), 0)::int as credited, count(*)::int as n
      from invoices where firm_id = $1 and credits_invoice_id = $2 and issued_on is not null`, [firmId, invoice.id])
    expect(sum).toEqual({ credited: 80_00, n: 1 })
  })

  it('lets part credits add up to the invoice, never past it', async () => {
    const { invoice } = await issuedInvoice(100_00)
    const notes = []
    for (let i = 0; i < 6; i++) {
      const note = (await owner.post(`/api/invoices/${invoice.id}/credit-note`)).body
      const saved = await owner.put(`/api/invoices/${note.id}/draft`, { vat: note.vat, lines: [{ kind: 'labour', description: 'Part credit', quantityX1000: 1000, unitPence: 30_00 }] })
      expect(saved.status, show(saved)).toBe(200)
      notes.push(note.id as string)
    }
    const answers = await together(notes.length, i => owner.post(`/api/invoices/${notes[i]}/issue`))
    // 3 x £30 fit under £100, a fourth does not
    expect(statuses(answers), answers.map(show).join('\n')).toEqual({ 200: 3, 409: 3 })
    const [sum] = await db<{ credited: number }>(`select coalesce(sum((totals->>'grossPence')::int), 0)::int as credited from invoices where firm_id = $1 and credits_invoice_id = $2 and issued_on is not null`, [firmId, invoice.id])
    expect(sum!.credited).toBe(90_00)
  })
})

describe('a quote never has two accepted versions', () => {
  async function sentQuote() {
    const c = await customer()
    const q = (await owner.post('/api/quotes', { customerId: c.id, siteId: c.sites[0]!.id })).body
    const detail = (await owner.get(`/api/quotes/${q.id}`)).body
    const validUntil = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10)
    const body = (unitPence: number) => ({ pricing: 'measure', estimatedDaysX100: 100, fixedPricePence: null, vat: detail.current.vat, cisRatePercent: null, validUntil, terms: '', notes: '', cautions: [], lines: [{ kind: 'labour', description: 'Skim walls', quantityX1000: 10_000, unit: 'm²', unitPence, vatRatePercent: 0, derivation: '' }] })
    const saved = await owner.put(`/api/quotes/${q.id}/draft`, body(9_00))
    expect(saved.status, show(saved)).toBe(200)
    const sent = await owner.post(`/api/quotes/${q.id}/send`)
    expect(sent.status, show(sent)).toBe(200)
    const mail = await takeMail(c.email, /Your quote/)
    return { id: q.id as string, token: /\/q\/([\w-]+)/.exec(mail.text!)![1]!, customer: c, body }
  }
  const accepted = async (quoteId: string) => (await db<{ n: number }>(`select count(*)::int as n from quote_versions where firm_id = $1 and quote_id = $2 and status = 'accepted'`, [firmId, quoteId]))[0]!.n

  it('withdraws the old link when a revision starts, and tells the customer the quote was revised', async () => {
    const q = await sentQuote()
    expect((await owner.post(`/api/quotes/${q.id}/revise`)).status).toBe(200)
    const anon = new Client(app.url)
    const old = await anon.post(`/api/public/quotes/${q.token}/accept`, { name: 'Odile Farrant' })
    expect(old.status, show(old)).toBe(409)
    expect(old.body.data.message).toMatch(/revised/i)
    const view = await anon.get(`/api/public/quotes/${q.token}`)
    expect(view.status).toBe(200)
    expect(view.body.status).toBe('superseded')

    expect((await owner.put(`/api/quotes/${q.id}/draft`, q.body(10_00))).status).toBe(200)
    expect((await owner.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
    const mail = await takeMail(q.customer.email, /Your quote/)
    const token2 = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
    expect((await anon.post(`/api/public/quotes/${token2}/accept`, { name: 'Odile Farrant' })).status).toBe(200)
    expect(await accepted(q.id)).toBe(1)
  })

  it('never accepts two versions when the customer accepts while the firm revises and sends', async () => {
    for (let round = 0; round < 6; round++) {
      const q = await sentQuote()
      const anon = new Client(app.url)
      // the customer's answer a little later each round, so both orders are tried (the answer, with
      // no session to check, otherwise always arrives first)
      const [accept, revise] = await together(2, i => i === 0
        ? sleep(round * 15).then(() => anon.post(`/api/public/quotes/${q.token}/accept`, { name: 'Odile Farrant' }))
        : owner.post(`/api/quotes/${q.id}/revise`))
      // exactly one of the two wins
      expect([accept!.status, revise!.status].sort(), `${show(accept!)}\n${show(revise!)}`).toEqual([200, 409])
      if (revise!.status === 200) {
        await owner.put(`/api/quotes/${q.id}/draft`, q.body(10_00))
        const send = await owner.post(`/api/quotes/${q.id}/send`)
        expect(send.status, show(send)).toBe(200)
      }
      else {
        // accepted: a revision, and so a second version to accept, is refused
        expect(revise!.body.data.message).toMatch(/accepted/)
      }
      expect(await accepted(q.id)).toBeLessThanOrEqual(1)
    }
  })
})

describe('a job is never invoiced past its price', () => {
  it('drafts one of four 80% deposits sent at once, and one of two 100% deposits', async () => {
    const { job } = await pricedJob(1000_00)
    const four = await together(4, () => owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 80 }))
    expect(statuses(four), four.map(show).join('\n')).toEqual({ 201: 1, 409: 3 })
    expect(four.find(r => r.status === 409)!.body.data.fields.percent).toMatch(/£200\.00/)
    expect(await claimedOfPrice(job.id)).toBe(800_00)

    const { job: other } = await pricedJob(1000_00)
    const two = await together(2, () => owner.post('/api/invoices', { kind: 'deposit', jobId: other.id, percent: 100 }))
    expect(statuses(two), two.map(show).join('\n')).toEqual({ 201: 1, 409: 1 })
    expect(await claimedOfPrice(other.id)).toBe(1000_00)
  })

  it('holds for amounts, stage payments and the final invoice sent at once', async () => {
    const { job } = await pricedJob(600_00, 150_00)
    const answers = await together(AT_ONCE, i => owner.post('/api/invoices', i % 3 === 0
      ? { kind: 'stage', jobId: job.id, amountPence: 300_00 }
      : i % 3 === 1 ? { kind: 'deposit', jobId: job.id, percent: 40 } : { kind: 'final', jobId: job.id }))
    expect(answers.filter(r => r.status >= 500), answers.map(show).join('\n')).toEqual([])
    expect(answers.some(r => r.status === 201)).toBe(true)
    expect(await claimedOfPrice(job.id)).toBeLessThanOrEqual(750_00)
  })

  it('refuses a draft edited past the price unless the extra lines are marked as extra work', async () => {
    const { job } = await pricedJob(500_00)
    const draft = (await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 50 })).body
    const line = { kind: 'labour', description: 'Skim the back bedroom', quantityX1000: 1000, unitPence: 600_00 }
    const over = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [line] })
    expect(over.status, show(over)).toBe(409)
    expect(over.body.data.message).toMatch(/extra work/i)
    const extra = await owner.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ ...line, unitPence: 500_00 }, { kind: 'labour', description: 'Make good the chimney breast', quantityX1000: 1000, unitPence: 100_00, extraWork: true }] })
    expect(extra.status, show(extra)).toBe(200)
    expect(extra.body.lines.map((l: any) => l.extraWork)).toEqual([false, true])
    expect(await claimedOfPrice(job.id)).toBe(500_00)
    // and the price cannot now be lowered under what is invoiced
    const lower = await owner.patch(`/api/jobs/${job.id}`, { title: 'Skim the back bedroom', labourNetPence: 400_00 })
    expect(lower.status, show(lower)).toBe(409)
  })

  it('gives back what an issued credit note credits, so the job can be invoiced again', async () => {
    const { job } = await pricedJob(400_00)
    const dep = (await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 100 })).body
    expect((await owner.post(`/api/invoices/${dep.id}/issue`)).status).toBe(200)
    expect((await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 10 })).status).toBe(409)
    const note = (await owner.post(`/api/invoices/${dep.id}/credit-note`)).body
    expect((await owner.post(`/api/invoices/${note.id}/issue`)).status).toBe(200)
    const again = await owner.post('/api/invoices', { kind: 'deposit', jobId: job.id, percent: 100 })
    expect(again.status, show(again)).toBe(201)
  })
})

describe('payments', () => {
  it('records the same payment sent many times at once just once', async () => {
    const { invoice } = await issuedInvoice(300_00)
    const requestId = randomUUID()
    const body = { method: 'transfer', amountPence: 120_00, receivedOn: new Date().toISOString().slice(0, 10), reference: 'BACS ODILE', requestId }
    const answers = await together(AT_ONCE, () => owner.post(`/api/invoices/${invoice.id}/payments`, body))
    expect(answers.filter(r => r.status !== 201 && r.status !== 200), answers.map(show).join('\n')).toEqual([])
    const rows = await db(`select amount_pence from payments where firm_id = $1 and invoice_id = $2`, [firmId, invoice.id])
    expect(rows).toEqual([{ amount_pence: 120_00 }])
    // a second, real payment of the same amount has its own key
    expect((await owner.post(`/api/invoices/${invoice.id}/payments`, { ...body, requestId: randomUUID() })).status).toBe(201)
    expect((await db(`select 1 from payments where firm_id = $1 and invoice_id = $2`, [firmId, invoice.id])).length).toBe(2)
    // a key is needed: without one the form could not be told apart from a second payment
    const none = await owner.post(`/api/invoices/${invoice.id}/payments`, { ...body, requestId: undefined })
    expect(none.status).toBe(400)
  })

  it('takes no payment on an invoice that credit notes have cancelled', async () => {
    const { invoice } = await issuedInvoice(90_00)
    const note = (await owner.post(`/api/invoices/${invoice.id}/credit-note`)).body
    expect((await owner.post(`/api/invoices/${note.id}/issue`)).status).toBe(200)
    const res = await owner.post(`/api/invoices/${invoice.id}/payments`, { method: 'cash', amountPence: 90_00, receivedOn: new Date().toISOString().slice(0, 10), reference: '', requestId: randomUUID() })
    expect(res.status, show(res)).toBe(409)
    expect(res.body.data.message).toMatch(/credit/i)
    expect(await db(`select 1 from payments where firm_id = $1 and invoice_id = $2`, [firmId, invoice.id])).toEqual([])
  })

  it('never records a card refund larger than the payment it refunds', async () => {
    const { invoice } = await issuedInvoice(150_00)
    const token = await linkToken(invoice.reference)
    const checkout = await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)
    expect(checkout.status, show(checkout)).toBe(200)
    const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
    expect((await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303)
    await app.stripe.idle()
    const [paid] = await db<{ pi: string, amount: number }>(`select stripe_payment_intent_id as pi, amount_pence as amount from payments where firm_id = $1 and invoice_id = $2 and amount_pence > 0`, [firmId, invoice.id])
    expect(paid!.amount).toBe(150_00)
    // a refund event claiming more than was paid (Stripe would never send it; a mistake or a forgery that got signed)
    const evt = { id: `evt_${randomUUID().replace(/-/g, '')}`, object: 'event', type: 'charge.refunded', data: { object: { id: 'ch_test_over', object: 'charge', payment_intent: paid!.pi, amount: 150_00, amount_refunded: 9_999_00, currency: 'gbp', metadata: { firmId, invoiceId: invoice.id } } } }
    const payload = JSON.stringify(evt)
    const res = await fetch(`${app.url}/api/webhooks/stripe`, { method: 'POST', body: payload, headers: { 'content-type': 'application/json', 'stripe-signature': stripe.webhooks.generateTestHeaderString({ payload, secret: app.stripe.webhookSecret }) } })
    expect(res.status).toBe(200)
    const [{ refunded }] = await db<{ refunded: number }>(`select coalesce(-sum(amount_pence), 0)::int as refunded from payments where firm_id = $1 and invoice_id = $2 and amount_pence < 0`, [firmId, invoice.id]) as [{ refunded: number }]
    expect(refunded).toBe(150_00)
  })
})

/** The customer's link token of an invoice, from the e-mail sent when it was issued. */
async function linkToken(reference: string) {
  const mail = await app.waitForMail('@test.example', new RegExp(`Invoice ${reference}`))
  return /\/i\/([\w-]+)/.exec(mail.text!)![1]!
}

describe('invoice and credit-note references', () => {
  async function firmSettings() {
    const firm = (await owner.get('/api/firm')).body
    const { tradingName, addressLine1, addressLine2, town, postcode, email, phone, vatRegistered, vatNumber, cisStatus, utr, dayRatePence, paymentTermsDays, invoicePrefix } = firm
    return { tradingName, addressLine1, addressLine2, town, postcode, email, phone, vatRegistered, vatNumber, cisStatus, utr, dayRatePence, paymentTermsDays, invoicePrefix }
  }

  it('refuses prefixes that would give an invoice and a credit note the same reference', async () => {
    const base = await firmSettings()
    // the same prefix (in any case), or one that is the other followed by digits ("A" at 10001 is "A10001", as "A1" is at 1)
    for (const [invoicePrefix, creditNotePrefix] of [['CN-', 'CN-'], ['cn-', 'CN-'], ['A', 'A1']]) {
      const res = await owner.patch('/api/firm', { ...base, invoicePrefix, creditNoteNumbering: 'own', creditNotePrefix })
      expect(res.status, `${invoicePrefix} / ${creditNotePrefix}: ${show(res)}`).toBe(400)
      expect(res.body.data.fields.creditNotePrefix).toMatch(/invoice/)
    }
    // shared numbering: one series, no collision whatever the prefixes
    expect((await owner.patch('/api/firm', { ...base, creditNoteNumbering: 'shared', creditNotePrefix: base.invoicePrefix })).status).toBe(200)
    // both blank: the firm's letters then - for invoices and -C for credit notes (BP-12, BP-C3), unlike each other
    for (const [invoicePrefix, creditNotePrefix] of [['INV/', 'INV-X'], ['', 'X'], ['A', 'A0'], ['INV-', 'CR-'], ['', '']]) {
      const res = await owner.patch('/api/firm', { ...base, invoicePrefix, creditNoteNumbering: 'own', creditNotePrefix })
      expect(res.status, `${invoicePrefix} / ${creditNotePrefix}: ${show(res)}`).toBe(200)
    }
  })

  it('keeps references unique in the database, and answers 409 rather than repeating one', async () => {
    const [idx] = await db<{ def: string }>(`select indexdef as def from pg_indexes where tablename = 'invoices' and indexdef ilike '%unique%' and indexdef ilike '%reference%'`)
    expect(idx?.def).toMatch(/firm_id.*reference/)
    // prefixes set alike behind the settings' back (as an old firm might have them), own numbering
    await db(`update firms set invoice_prefix = 'DUP-', credit_note_prefix = 'DUP-', credit_note_numbering = 'own' where id = $1`, [firmId])
    try {
      const issued = []
      for (let i = 0; i < 2; i++) issued.push((await issuedInvoice(20_00)).invoice)
      const notes = await Promise.all(issued.map(async inv => (await owner.post(`/api/invoices/${inv.id}/credit-note`)).body.id as string))
      const answers = await together(notes.length, i => owner.post(`/api/invoices/${notes[i]}/issue`))
      expect(answers.filter(r => r.status >= 500), answers.map(show).join('\n')).toEqual([])
      expect(answers.some(r => r.status === 409)).toBe(true)
      const dupes = await db(`select reference from invoices where firm_id = $1 and reference is not null group by reference having count(*) > 1`, [firmId])
      expect(dupes).toEqual([])
    }
    finally {
      await db(`update firms set invoice_prefix = 'INV-', credit_note_prefix = 'CR-', credit_note_numbering = 'own' where id = $1`, [firmId])
    }
  })
})
