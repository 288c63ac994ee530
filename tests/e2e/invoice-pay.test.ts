// On phones (390 x 844): the owner turns a finished job into its final invoice and sends it; the
// customer opens the e-mail, pays on the (fake) card page and sees it paid; the firm sees it paid
// and the office partner's list of what is owed no longer has it.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import { expectAbsent, expectText, expectVisible, expectCleanRun, reload, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OFFICE, OWNER } from './demo'

const e2e = useE2E()

/** The office's part through the API: a measured room, a quote accepted, the job done and finished. */
async function finishedJob(api: Client) {
  const email = uniqueEmail('mirren')
  const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Mirren Okafor', email }, site: { line1: '14 Sallow Walk', town: 'Kettlebury', postcode: 'KB2 9NP' } })).body
  const v = (await api.post('/api/visits', { customerId: c.id, siteId: c.sites[0].id, startsAt: new Date(Date.now() - 5 * 86_400_000).toISOString() })).body
  const room = await api.put(`/api/visits/${v.id}/rooms/${crypto.randomUUID()}`, { revision: 0, name: 'Hall', surfaces: [{ id: crypto.randomUUID(), kind: 'wall', lengthMm: 3000, secondMm: 2400 }, { id: crypto.randomUUID(), kind: 'ceiling', lengthMm: 3000, secondMm: 1200 }] })
  expect(room.status).toBe(200)
  const q = (await api.post('/api/quotes', { customerId: c.id, siteId: c.sites[0].id, visitId: v.id })).body
  expect((await api.post(`/api/quotes/${q.id}/send`)).status).toBe(200)
  const mail = await e2e.app.waitForMail(email, /Your quote [A-Z]+-Q[1-9]/)
  const token = /\/q\/([\w-]+)/.exec(mail.text!)![1]!
  expect((await new Client(e2e.url).post(`/api/public/quotes/${token}/accept`, { name: 'Mirren Okafor' })).status).toBe(200)
  const job = (await api.post(`/api/quotes/${q.id}/job`)).body
  expect((await api.post(`/api/jobs/${job.id}/status`, { to: 'in-progress' })).status).toBe(200)
  expect((await api.post(`/api/jobs/${job.id}/status`, { to: 'finished' })).status).toBe(200)
  return { jobId: job.id as string, email }
}

describe('invoicing and being paid', () => {
  it('invoices a finished job, the customer pays by card from the e-mail, and it leaves the list of what is owed', async () => {
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const { jobId, email } = await finishedJob(api)

    const jess = await e2e.open()
    const owner = jess.page
    await signInToDashboard(owner, e2e.url, OWNER.email, OWNER.password)
    await visit(owner, `${e2e.url}/jobs/${jobId}`)
    const invoicing = owner.getByTestId('job-invoices')
    expect(await invoicing.getByLabel('Invoice for').inputValue()).toBe('final')
    await invoicing.getByRole('button', { name: 'Make the invoice' }).click()
    await owner.waitForURL(u => /^\/invoices\/[0-9a-f-]{36}$/.test(u.pathname))
    const invoiceId = new URL(owner.url()).pathname.split('/').pop()!
    await expectVisible(owner.getByTestId('invoice-line').first())
    await owner.getByRole('button', { name: 'Issue and send' }).click()
    await expectText(owner.getByTestId('confirm-dialog'), /takes the next number/)
    await screenshot(owner, 'invoice-issue-confirm')
    await owner.getByTestId('confirm-yes').click()
    await expectText(owner.getByTestId('invoice-status'), 'Issued')
    const issued = (await api.get(`/api/invoices/${invoiceId}`)).body
    expect(issued.reference).toMatch(/^[A-Z]+-[1-9]\d*$/)
    await screenshot(owner, 'invoice-issued')

    // before it is paid, the office partner sees it on the list of what is owed, with its customer's ages
    const sam = await e2e.open()
    await signInToDashboard(sam.page, e2e.url, OFFICE.email, OFFICE.password)
    await visit(sam.page, `${e2e.url}/owed`)
    await expectVisible(sam.page.getByRole('link', { name: 'Mirren Okafor' }))
    await expectVisible(sam.page.getByRole('link', { name: new RegExp(issued.reference) }))
    await expectVisible(sam.page.getByLabel('Mirren Okafor: owed by age'))
    await screenshot(sam.page, 'owed-office-before')

    // the customer, on their own phone, from the e-mail
    const mail = await e2e.app.waitForMail(email, new RegExp(`Invoice ${issued.reference}`))
    const link = /(http:\/\/\S+\/i\/[\w-]+)/.exec(mail.text ?? '')![1]!
    const mirren = await e2e.open()
    const customer = mirren.page
    await visit(customer, link)
    await expectText(customer.getByTestId('public-invoice-outstanding'), issued.amountDuePence > 0 ? /£[\d,]+\.\d\d/ : /£0\.00/)
    await customer.getByRole('button', { name: /^Pay £[\d,.]+ by card$/ }).click()
    await customer.waitForURL(u => u.pathname.startsWith('/pay/'))
    await screenshot(customer, 'fake-card-page')
    await customer.getByRole('button', { name: /^Pay / }).click()
    await customer.waitForURL(u => u.pathname.startsWith('/i/') && u.searchParams.has('paid'))
    await expectVisible(customer.getByTestId('invoice-paid'))
    await screenshot(customer, 'invoice-paid-by-customer')

    // the firm sees it paid; the office partner no longer sees it owed
    await reload(owner)
    await expectText(owner.getByTestId('invoice-status'), 'Paid')
    expect((await api.get(`/api/invoices/${invoiceId}`)).body).toMatchObject({ status: 'paid', outstandingPence: 0, payments: [expect.objectContaining({ method: 'card', amountPence: issued.amountDuePence })] })
    expect((await api.get(`/api/jobs/${jobId}`)).body.status).toBe('paid')
    await reload(sam.page)
    await expectVisible(sam.page.getByRole('heading', { name: 'What is owed' }))
    await expectAbsent(sam.page.getByText(issued.reference))
    await expectAbsent(sam.page.getByText('Mirren Okafor'))
    await screenshot(sam.page, 'owed-office')

    // the owner refunds part of the card payment, its amount typed in a dialog
    const before = e2e.app.stripe.state.deliveries.length
    await owner.getByRole('button', { name: /^Refund the payment of/ }).click()
    const refund = owner.getByTestId('form-dialog')
    const amount = refund.getByLabel('Refund (£)')
    expect(await amount.inputValue()).toBe((issued.amountDuePence / 100).toFixed(2))
    await amount.fill('ten pounds')
    await refund.getByRole('button', { name: 'Refund', exact: true }).click()
    await expectText(refund, /Enter the refund in pounds, like 25\.00\./)
    expect(await amount.getAttribute('aria-invalid')).toBe('true')
    await amount.fill(((issued.amountDuePence + 100) / 100).toFixed(2))
    await refund.getByRole('button', { name: /^Refund £/ }).click()
    await expectText(refund, /more than the payment of/)
    await amount.fill('10.00')
    await screenshot(owner, 'invoice-refund-dialog')
    await refund.getByRole('button', { name: 'Refund £10.00' }).click()
    await expectAbsent(refund)
    await expectVisible(owner.getByText(/card refund of £10\.00 is asked of the card company/))
    // once the card company confirms it, the invoice shows it
    await e2e.app.stripe.waitForDeliveries(d => d.slice(before).some(x => x.type === 'charge.refunded' && x.ok === true))
    await reload(owner)
    await expectText(owner.getByTestId('invoice-outstanding'), '£10.00')
    expect((await api.get(`/api/invoices/${invoiceId}`)).body.payments.map((p: any) => p.amountPence).sort((a: number, b: number) => a - b)).toEqual([-10_00, issued.amountDuePence])
    expectCleanRun(jess)
    expectCleanRun(mirren)
    expectCleanRun(sam)
  })
})
