import { addDays, londonToday } from '../../shared/utils/dates'
import type { ParsedMail } from 'mailparser'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { queryAsFirm } from '../support/db'

const OWNER_URL = () => requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL')

// Every e-mail to a customer comes from the firm: its trading name as the sender's name, Reply-To
// its own address, its phone in the text, the link the customer needs, and dates in words (never
// 2027-01-03 or a timestamp). The firm's own notices (a quote accepted or declined) reply to the
// customer and carry no timestamp either.

const ISO_DATE = /\d{4}-\d{2}-\d{2}/
const FIRM = 'Hollinsclough Plaster Works'
const FIRM_EMAIL = 'office@hollinsclough-plaster.invalid'
const FIRM_PHONE = '01632 960 418'

let app: TestApp
let owner: Client
let ownerEmail: string
let firmId: string

/** Set the firm's contact and bank details straight in the database (as the firm), whatever the settings screen takes. */
async function setFirm(id: string, fields: { email: string, phone: string }) {
  await queryAsFirm(OWNER_URL(), id, `update firms set email = $1, phone = $2, takes_transfer = true, bank_account_name = $3, bank_sort_code = '608371', bank_account_number = '31926819' where id = $4`, [fields.email, fields.phone, FIRM, id])
}

async function setDueOn(invoiceId: string, date: string) {
  await queryAsFirm(OWNER_URL(), firmId, 'update invoices set due_on = $1 where id = $2', [date, invoiceId])
}

beforeAll(async () => {
  app = await startApp()
  ;({ client: owner, firmId, email: ownerEmail } = await signUpFirm(app.url, FIRM))
  await setFirm(firmId, { email: FIRM_EMAIL, phone: FIRM_PHONE })
})
afterAll(async () => {
  await app?.stop()
})

async function customer(label: string, kind = 'homeowner') {
  const email = uniqueEmail(label)
  const c = await owner.post('/api/customers', { customer: { kind, name: 'Ottilie Marchbank', email }, site: { line1: '12 Wicken Row', postcode: 'KB3 7QT' } })
  expect(c.status, JSON.stringify(c.body)).toBe(201)
  return { id: c.body.id as string, siteId: c.body.sites?.[0]?.id as string | undefined, email }
}

async function issuedInvoice(label: string) {
  const c = await customer(label)
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Float and set the landing', quantityX1000: 1000, unitPence: 385_00 }] })
  const issued = await owner.post(`/api/invoices/${d.id}/issue`)
  expect(issued.status, JSON.stringify(issued.body)).toBe(200)
  const mail = await app.waitForMail(c.email, /^Invoice /)
  return { invoice: issued.body, email: c.email, mail }
}

/** What every e-mail to a customer must carry; `link` is the path the customer needs (/i/, /q/). */
function expectFromTheFirm(mail: ParsedMail, link?: RegExp) {
  const from = mail.from?.value[0]
  expect(from?.name, 'the sender\'s name is the firm\'s').toBe(FIRM)
  expect(mail.replyTo?.value.map(v => v.address), 'replies reach the firm').toEqual([FIRM_EMAIL])
  const text = mail.text ?? ''
  expect(text, 'the firm\'s phone is in the text').toContain(FIRM_PHONE)
  expect(text, 'no ISO date or timestamp').not.toMatch(ISO_DATE)
  expect(mail.subject ?? '').not.toMatch(ISO_DATE)
  if (link) expect(text).toMatch(link)
}

describe('e-mails to a customer come from the firm', () => {
  it('the invoice, issued and sent again', async () => {
    const { invoice, email, mail } = await issuedInvoice('issued')
    expectFromTheFirm(mail, /\/i\/[\w-]+/)
    // the due date in words, e.g. "Monday 4 January 2027"
    expect(mail.text).toMatch(/due by \w+day \d{1,2} \w+ \d{4}/)
    expect(mail.text).toContain('sort code 60-83-71, account 31926819')

    const again = await owner.post(`/api/invoices/${invoice.id}/resend`)
    expect(again.status, JSON.stringify(again.body)).toBe(200)
    await expect.poll(() => app.mails.filter(m => JSON.stringify(m.to).includes(email) && /^Invoice /.test(m.subject ?? '')).length).toBe(2)
    const resent = app.mails.filter(m => JSON.stringify(m.to).includes(email) && /^Invoice /.test(m.subject ?? ''))[1]!
    expectFromTheFirm(resent, /\/i\/[\w-]+/)
  })

  it('the quote', async () => {
    const c = await customer('quote')
    const q = (await owner.post('/api/quotes', { customerId: c.id })).body
    const detail = (await owner.get(`/api/quotes/${q.id}`)).body
    const put = await owner.put(`/api/quotes/${q.id}/draft`, {
      pricing: 'measure', estimatedDaysX100: 100, fixedPricePence: null, vat: detail.current.vat, cisRatePercent: null, validUntil: addDays(londonToday(), 30),
      terms: '', notes: '', cautions: [], lines: [{ kind: 'labour', description: 'Skim walls', quantityX1000: 9600, unit: 'm²', unitPence: 9_00, vatRatePercent: 0, derivation: '4.00 x 2.40' }],
    })
    expect(put.status, JSON.stringify(put.body)).toBe(200)
    const sent = await owner.post(`/api/quotes/${q.id}/send`)
    expect(sent.status, JSON.stringify(sent.body)).toBe(200)
    const mail = await app.waitForMail(c.email, /Your quote/)
    expectFromTheFirm(mail, /\/q\/[\w-]+/)
    expect(mail.text).toMatch(/good until \w+day \d{1,2} \w+ \d{4}/)

    // the firm hears of the acceptance: a reply reaches the customer, the time in words
    const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
    const accepted = await new Client(app.url).post(`/api/public/quotes/${token}/accept`, { name: 'Ottilie Marchbank' })
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
    const notice = await app.waitForMail(ownerEmail, /accepted by/)
    expect(notice.replyTo?.value.map(v => v.address)).toEqual([c.email])
    expect(notice.text).not.toMatch(ISO_DATE)
    expect(notice.text).toMatch(/on \w+day \d{1,2} \w+ \d{4} at \d{2}:\d{2}/)
  })

  it('a reminder, with the amount outstanding and a link that opens the invoice', async () => {
    const { invoice, email } = await issuedInvoice('reminder')
    await setDueOn(invoice.id, addDays(londonToday(), -9))
    const now = await owner.post(`/api/invoices/${invoice.id}/reminders`)
    expect(now.status, JSON.stringify(now.body)).toBe(200)
    await expect.poll(() => app.mails.filter(m => JSON.stringify(m.to).includes(email) && !/^Invoice .* from /.test(m.subject ?? '')).length).toBe(1)
    const mail = app.mails.find(m => JSON.stringify(m.to).includes(email) && !/^Invoice .* from /.test(m.subject ?? ''))!
    expectFromTheFirm(mail, /\/i\/[\w-]+/)
    expect(mail.text).toContain('£385.00')
    expect(mail.text).toContain('sort code 60-83-71, account 31926819')
    const token = /\/i\/([\w-]+)/.exec(mail.text!)![1]!
    const page = await new Client(app.url).get(`/api/public/invoices/${token}`)
    expect(page.status, 'the reminder\'s link opens the invoice').toBe(200)
    expect(page.body.reference).toBe(invoice.reference)
  })

  it('the receipt for a card payment', async () => {
    const { email, mail } = await issuedInvoice('receipt')
    const token = /\/i\/([\w-]+)/.exec(mail.text!)![1]!
    const checkout = await new Client(app.url).post(`/api/public/invoices/${token}/checkout`)
    expect(checkout.status, JSON.stringify(checkout.body)).toBe(200)
    const sessionId = new URL(checkout.body.url).pathname.split('/').pop()!
    expect((await fetch(`${app.stripe.url}/pay/${sessionId}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303)
    const receipt = await app.waitForMail(email, /^Receipt/, 20_000)
    expectFromTheFirm(receipt)
  })

  it('a firm with no e-mail of its own: replies reach its owner', async () => {
    const other = await signUpFirm(app.url, 'Tarnbeck Coving')
    await setFirm(other.firmId, { email: '', phone: '07700 900 512' })
    const email = uniqueEmail('noreply')
    const c = (await other.client.post('/api/customers', { customer: { kind: 'homeowner', name: 'Wystan Pell', email } })).body
    const d = (await other.client.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    await other.client.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Patch the chimney breast', quantityX1000: 1000, unitPence: 120_00 }] })
    expect((await other.client.post(`/api/invoices/${d.id}/issue`)).status).toBe(200)
    const mail = await app.waitForMail(email, /^Invoice /)
    expect(mail.from?.value[0]?.name).toBe('Tarnbeck Coving')
    expect(mail.replyTo?.value.map(v => v.address)).toEqual([other.email])
    expect(mail.text).toContain('07700 900 512')
  })
})
