// What a customer of the demo firm receives, read as the customer would on a phone (390 x 844):
// the quote e-mail and page, the invoice e-mail and page, a reminder, and (the office at 1366 x 900)
// the late-payment claim on a builder's overdue invoice and its letter. Each e-mail is from the
// firm's trading name with the firm's own reply address and phone; dates are in words; lines are
// grouped and merged; the invoice carries the bank account; the letter cites the Act and keeps the
// firm's caution off it.
import { mkdirSync, writeFileSync } from 'node:fs'
import { extractText, getDocumentProxy } from 'unpdf'
import type { ParsedMail } from 'mailparser'
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { FIRM_NAME, OFFICE, OWNER } from './demo'
import { DEMO_FIRM } from '../../seeds/demo'

const e2e = useE2E()
const ISO_DATE = /\b\d{4}-\d{2}-\d{2}\b/
/** A date in words, with or without its weekday: "Thursday 3 December 2026", "3 December 2026". */
const DATE_IN_WORDS = /\b\d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4}\b/

/** From the firm by name, replies to the firm, its phone in the text, no ISO date anywhere. */
function expectFromTheFirm(mail: ParsedMail) {
  expect(mail.from?.value[0]?.name).toBe(FIRM_NAME)
  expect(mail.replyTo?.value[0]?.address).toBe(DEMO_FIRM.email)
  expect(mail.text).toContain(DEMO_FIRM.phone)
  expect(mail.text).not.toMatch(ISO_DATE)
  expect(`${mail.subject}`).not.toMatch(ISO_DATE)
}

/** The PDF's text, the PDF kept in tests/artefacts to be looked at. */
async function pdfText(url: string, client: Client, keepAs: string) {
  const res = await fetch(url, { headers: { cookie: client.cookieHeader() } })
  expect(res.status).toBe(200)
  const bytes = new Uint8Array(await res.arrayBuffer())
  mkdirSync('tests/artefacts', { recursive: true })
  writeFileSync(`tests/artefacts/${keepAs}.pdf`, bytes)
  const doc = await getDocumentProxy(bytes.slice())
  return (await extractText(doc, { mergePages: true })).text.replace(/\s+/g, ' ')
}

const wall = (lengthMm: number) => ({ id: crypto.randomUUID(), kind: 'wall', lengthMm, secondMm: 2400 })

describe('what the customer receives', () => {
  it('a quote, an invoice and a reminder on the phone, then the claim letter from the office', async () => {
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const email = uniqueEmail('quillane')
    const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Quillane', email, billingLine1: '9 Weasel Row', billingTown: 'Kettlebury', billingPostcode: 'KB3 7QT' }, site: { line1: '9 Weasel Row', town: 'Kettlebury', postcode: 'KB3 7QT' } })).body
    const v = (await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: new Date(Date.now() - 3 * 86_400_000).toISOString() })).body
    const room = await api.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, { revision: 0, name: 'Front room', surfaces: [wall(3600), wall(2907), wall(3600), wall(2907)] })
    expect(room.status).toBe(200)
    const q = (await api.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })).body
    expect((await api.post(`/api/quotes/${q.id}/send`)).status).toBe(200)

    // the quote's e-mail and page
    const quoteMail = await e2e.app.waitForMail(email, /quote/i)
    expectFromTheFirm(quoteMail)
    expect(quoteMail.text).toMatch(DATE_IN_WORDS)
    const quotePath = /\/q\/[\w-]+/.exec(quoteMail.text!)![0]
    const tamsin = await e2e.open()
    const phone = tamsin.page
    await visit(phone, `${e2e.url}${quotePath}`)
    const quoteText = await phone.locator('main').innerText()
    expect(quoteText).toMatch(/Skim walls, front room/i)
    expect(quoteText).toMatch(/4 walls, \d+\.\d{2} m²/)
    expect(quoteText).toMatch(DATE_IN_WORDS)
    expect(quoteText).not.toMatch(ISO_DATE)
    await screenshot(phone, 'customer-quote-page')
    expect((await new Client(e2e.url).post(`/api/public/quotes/${quotePath.split('/').pop()}/accept`, { name: 'Tamsin Quillane' })).status).toBe(200)

    // the job done, its final invoice issued by the owner
    const job = (await api.post(`/api/quotes/${q.id}/job`)).body
    expect((await api.post(`/api/jobs/${job.id}/status`, { to: 'in-progress' })).status).toBe(200)
    expect((await api.post(`/api/jobs/${job.id}/status`, { to: 'finished' })).status).toBe(200)
    const jess = await e2e.open()
    await signInToDashboard(jess.page, e2e.url, OWNER.email, OWNER.password)
    await visit(jess.page, `${e2e.url}/jobs/${job.id}`)
    await jess.page.getByTestId('job-invoices').getByRole('button', { name: 'Make the invoice' }).click()
    await jess.page.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    const invoiceId = new URL(jess.page.url()).pathname.split('/').pop()!
    await jess.page.getByRole('button', { name: 'Issue and send' }).click()
    await jess.page.getByTestId('confirm-yes').click()
    await expectText(jess.page.getByTestId('invoice-status'), 'Issued')
    const invoice = (await api.get(`/api/invoices/${invoiceId}`)).body
    // the final invoice carries the quote's wording and equals its total
    expect(invoice.lines.map((l: { description: string }) => l.description).join(' ')).not.toMatch(/Labour for/)
    expect(invoice.totals.amountDuePence).toBe((await api.get(`/api/quotes/${q.id}`)).body.current.totals.amountDuePence)

    const invoiceMail = await e2e.app.waitForMail(email, new RegExp(`Invoice ${invoice.reference}`))
    expectFromTheFirm(invoiceMail)
    expect(invoiceMail.text).toMatch(DATE_IN_WORDS)
    expect(invoiceMail.text).toContain('12-34-56')
    const invoicePath = /\/i\/[\w-]+/.exec(invoiceMail.text!)![0]
    await visit(phone, `${e2e.url}${invoicePath}`)
    const invoiceText = await phone.locator('main').innerText()
    expect(invoiceText).toMatch(/Skim walls, front room/i)
    expect(invoiceText).toContain('Sort code: 12-34-56')
    expect(invoiceText).toContain('Account number: 12345678')
    expect(invoiceText).toMatch(DATE_IN_WORDS)
    expect(invoiceText).not.toMatch(ISO_DATE)
    await expectText(phone.getByTestId('invoice-status'), 'To pay')
    await screenshot(phone, 'customer-invoice-page')
    const invoicePdf = await pdfText(`${e2e.url}${invoicePath}/pdf`, new Client(e2e.url), 'customer-invoice')
    expect(invoicePdf).toMatch(/Skim walls, front room/i)
    expect(invoicePdf).toContain('Invoice to')
    expect(invoicePdf).toContain('12-34-56')
    expect(invoicePdf).toMatch(DATE_IN_WORDS)
    expect(invoicePdf).not.toMatch(ISO_DATE)
    expect(invoicePdf).not.toMatch(/Status:/)

    // a reminder sent now, before the due date, says when it is due and carries the pay link
    // (found as the next mail to the customer: another test may have changed the firm's words for the subject)
    const mailsBefore = e2e.app.mails.length
    expect((await api.post(`/api/invoices/${invoiceId}/reminders`)).status).toBe(200)
    const reminder = await e2e.app.waitForMail(email, /./, 10_000, mailsBefore)
    expectFromTheFirm(reminder)
    expect(reminder.text).toMatch(DATE_IN_WORDS)
    expect(reminder.text).not.toMatch(/due today|overdue/)
    expect(reminder.text).toMatch(/\/i\/[\w-]+/)

    // the office's claim on the demo builder's overdue invoice: the caution on the screen, not in the letter
    const sam = await e2e.open({ desktop: true })
    await sam.page.setViewportSize({ width: 1366, height: 900 })
    await signInToDashboard(sam.page, e2e.url, OFFICE.email, OFFICE.password)
    await visit(sam.page, `${e2e.url}/owed`)
    await sam.page.getByTestId('owed-customers').locator('li.card', { hasText: 'Pribbleworth Scarnholme Builds Ltd' }).getByRole('link', { name: /BP-\d+/ }).first().click()
    await sam.page.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    const claim = sam.page.getByTestId('late-claim')
    await claim.getByRole('button', { name: 'Work out the claim' }).click()
    await expectVisible(claim.getByText(/not legal advice/))
    await screenshot(sam.page, 'office-claim')
    const office = new Client(e2e.url)
    await office.post('/api/auth/sign-in', { email: OFFICE.email, password: OFFICE.password })
    const overdueId = new URL(sam.page.url()).pathname.split('/').pop()!
    const letter = await pdfText(`${e2e.url}/invoices/${overdueId}/claim/pdf`, office, 'claim-letter')
    expect(letter).toContain('Late Payment of Commercial Debts (Interest) Act 1998')
    expect(letter).toMatch(DATE_IN_WORDS)
    expect(letter).not.toMatch(ISO_DATE)
    expect(letter).not.toMatch(/legal advice|solicitor/i)
    expect(letter).toContain('12-34-56')
    for (const p of [tamsin, jess, sam]) expectCleanRun(p)
  })
})
