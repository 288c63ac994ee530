// The money rules of issue 13 as the people meet them, on their own screens:
// - the office partner (1366 x 900) asks for more of a job's price than is left and is told, beside
//   the figure, how much is left; on the draft invoice, a line beyond the price is saved only once
//   it is ticked as extra work;
// - the customer (390 x 844) opens the link of a quote the firm has since revised, and reads that
//   it was revised and the new one is coming, with nothing to accept;
// - the owner (1366 x 900) sets the credit-note prefix to the invoices' and is told why not.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OFFICE, OWNER } from './demo'

const e2e = useE2E()
const LAPTOP = { width: 1366, height: 900 }

async function signedIn(email: string, password: string) {
  const api = new Client(e2e.url)
  expect((await api.post('/api/auth/sign-in', { email, password })).status).toBe(200)
  return api
}

describe('money rules on screen', () => {
  it('the office is told how much of the price is left, and ticks a line beyond it as extra work', async () => {
    const api = await signedIn(OWNER.email, OWNER.password)
    const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Greaves', email: uniqueEmail('tamsin') }, site: { line1: '3 Osier Lane', town: 'Kettlebury', postcode: 'KB7 1OL' } })).body
    const job = (await api.post('/api/jobs', { customerId: c.id, siteId: c.sites[0].id, title: 'Skim the dining room', labourNetPence: 800_00, materialsNetPence: 0 })).body
    expect(job.id).toBeTruthy()

    const sam = await e2e.open({ desktop: true })
    const office = sam.page
    await office.setViewportSize(LAPTOP)
    await signInToDashboard(office, e2e.url, OFFICE.email, OFFICE.password)
    await visit(office, `${e2e.url}/jobs/${job.id}`)
    const invoicing = office.getByTestId('job-invoices')
    await invoicing.getByLabel('Invoice for').selectOption('deposit')
    await invoicing.getByLabel('Percentage').fill('80')
    await invoicing.getByRole('button', { name: 'Make the invoice' }).click()
    await office.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    const invoiceId = new URL(office.url()).pathname.split('/').pop()!

    // a second deposit of half the price: only £160.00 is left
    await visit(office, `${e2e.url}/jobs/${job.id}`)
    await invoicing.getByLabel('Invoice for').selectOption('deposit')
    await invoicing.getByLabel('Percentage').fill('50')
    await invoicing.getByRole('button', { name: 'Make the invoice' }).click()
    await expectText(invoicing, /£160\.00 of its £800\.00/)
    expect(await invoicing.getByLabel('Percentage').inputValue()).toBe('50')
    await screenshot(office, 'money-rules-office-price-left')

    // on the draft: a chimney breast made good, beyond the price
    await visit(office, `${e2e.url}/invoices/${invoiceId}`)
    await office.getByRole('button', { name: '+ Labour line' }).click()
    const extra = office.getByTestId('invoice-line').last()
    await extra.getByLabel(/description/).fill('Make good the chimney breast')
    // a price that is not pounds is marked on its field, with the error beside it, before anything is sent
    await extra.getByLabel('Price (£)').fill('two hundred')
    await office.getByRole('button', { name: 'Save draft' }).click()
    await expectText(extra.getByRole('alert'), /Enter a price in pounds/)
    expect(await extra.getByLabel('Price (£)').getAttribute('aria-invalid')).toBe('true')
    await extra.getByLabel('Price (£)').fill('200.00')
    await office.getByRole('button', { name: 'Save draft' }).click()
    await expectText(office.locator('body'), /more than its price of £800\.00/)
    await screenshot(office, 'money-rules-office-over-price')
    // nothing typed is lost; ticked as extra work, it saves
    expect(await extra.getByLabel(/description/).inputValue()).toBe('Make good the chimney breast')
    await extra.getByText('Extra work, beyond the job\'s agreed price').click()
    await office.getByRole('button', { name: 'Save draft' }).click()
    await expectText(office.getByTestId('invoice-totals'), /£840\.00/)
    const saved = (await api.get(`/api/invoices/${invoiceId}`)).body
    expect(saved.lines.map((l: any) => [l.description, l.extraWork])).toEqual([[expect.any(String), false], ['Make good the chimney breast', true]])
    await screenshot(office, 'money-rules-office-extra-work')
    // deleting the draft asks first; going back keeps it
    await office.getByRole('button', { name: 'Delete draft' }).click()
    const ask = office.getByTestId('confirm-dialog')
    await expectText(ask, /Delete this draft\?/)
    await ask.getByRole('button', { name: 'Go back' }).click()
    await expectAbsent(ask)
    expect((await api.get(`/api/invoices/${invoiceId}`)).status).toBe(200)
    expectCleanRun(sam)
  })

  it('the customer opening a quote the firm has revised reads that it was revised, with nothing to accept', async () => {
    const api = await signedIn(OWNER.email, OWNER.password)
    const email = uniqueEmail('bryony')
    const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Bryony Lathe', email }, site: { line1: '22 Tanyard Close', town: 'Kettlebury', postcode: 'KB3 8TC' } })).body
    const q = (await api.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id })).body
    const detail = (await api.get(`/api/quotes/${q.id}`)).body
    const validUntil = new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10)
    expect((await api.put(`/api/quotes/${q.id}/draft`, { pricing: 'measure', estimatedDaysX100: 100, fixedPricePence: null, vat: detail.current.vat, cisRatePercent: null, validUntil, terms: '', notes: '', cautions: [], lines: [{ kind: 'labour', description: 'Skim the hall walls', quantityX1000: 18_000, unit: 'm²', unitPence: 9_00, vatRatePercent: 0, derivation: '' }] })).status).toBe(200)
    expect((await api.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
    const mail = await e2e.app.waitForMail(email, /Your quote/)
    const link = /(http:\/\/\S+\/q\/[\w-]+)/.exec(mail.text!)![1]!
    expect((await api.post(`/api/quotes/${q.id}/revise`)).status).toBe(200)

    const bryony = await e2e.open()
    const customer = bryony.page
    await visit(customer, link)
    await expectVisible(customer.getByRole('heading', { name: 'This quote has been revised' }))
    await expectText(customer.locator('body'), /can no longer be accepted/)
    expect(await customer.getByRole('button', { name: 'Accept quote' }).count()).toBe(0)
    await screenshot(customer, 'money-rules-customer-quote-revised')
    expectCleanRun(bryony)
  })

  it('the owner cannot give credit notes the invoices\' prefix, and is told why beside the field', async () => {
    const jess = await e2e.open({ desktop: true })
    const owner = jess.page
    await owner.setViewportSize(LAPTOP)
    await signInToDashboard(owner, e2e.url, OWNER.email, OWNER.password)
    await visit(owner, `${e2e.url}/firm`)
    const invoicePrefix = await owner.getByLabel('Invoice number prefix').inputValue()
    await owner.getByLabel('Credit notes are numbered').selectOption('own')
    await owner.getByLabel('Credit note prefix').fill(invoicePrefix)
    await owner.getByRole('button', { name: 'Save firm details' }).click()
    // beside the field, announced with it (aria-describedby), and the field marked
    await expectVisible(owner.getByText(/need a prefix unlike the invoices/))
    expect(await owner.getByLabel('Credit note prefix').getAttribute('aria-invalid')).toBe('true')
    expect(await owner.getByLabel('Credit note prefix').inputValue()).toBe(invoicePrefix)
    await screenshot(owner, 'money-rules-owner-prefix')
    expectCleanRun(jess)
  })
})
