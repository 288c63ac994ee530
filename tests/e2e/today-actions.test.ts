// Today as next actions, on a phone (390x844): the owner of a new firm sees a new enquiry at the
// top of Today, with what they asked and how long it has waited, and answers it in one tap (the
// enquiry, with "Call" and "Book a visit"); once a visit is booked it is gone from Today.
import { describe, expect, it } from 'vitest'
import { GOOD_PASSWORD, signUpFirm } from '../support/client'
import { expectCleanRun, expectPath, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'

const e2e = useE2E()

describe('Today as next actions', () => {
  it('the owner on a phone sees a new enquiry on Today and answers it in one tap', async () => {
    // a firm of its own, so its list is exactly this test's
    const { client: api, email } = await signUpFirm(e2e.url, 'Tremayne Plastering')
    const customer = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Quillane', phone: '01632 960123' }, site: { line1: '12 Rosevear Terrace', postcode: 'KB7 3TT' } })).body
    const enquiry = (await api.post('/api/enquiries', { customerId: customer.id, siteId: customer.sites[0].id, source: 'phone', description: 'Ceiling came down in the back bedroom: skim or board?' })).body
    expect(enquiry.id).toBeTruthy()

    const owner = await e2e.open()
    const { page } = owner
    await signInToDashboard(page, e2e.url, email, GOOD_PASSWORD)
    const list = page.getByTestId('dashboard-actions')
    const first = list.locator('li').first()
    // the most urgent first: the enquiry before the owner's set-up prompts
    await expectText(first, /Answer Tamsin Quillane's enquiry/)
    await expectText(first, /Ceiling came down in the back bedroom/)
    await expectText(first, /since today/)
    const answer = first.getByRole('link', { name: /^Answer/ })
    await expectVisible(answer)
    // on the first screen, no scrolling needed
    const box = (await answer.boundingBox())!
    expect(box.y + box.height).toBeLessThanOrEqual(844)
    expect(box.height).toBeGreaterThanOrEqual(44)
    // the page fits the phone's width
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    await screenshot(page, 'today-owner-new-enquiry')

    // one tap: the enquiry, with the ways to answer it
    await answer.click()
    await expectPath(page, `/enquiries/${enquiry.id}`)
    await expectVisible(page.getByRole('link', { name: 'Call 01632 960123' }))
    await expectVisible(page.getByRole('link', { name: 'Book a visit' }))
    await screenshot(page, 'today-owner-enquiry-answered')

    // answered (a visit booked): off Today at once
    expect((await api.post(`/api/enquiries/${enquiry.id}/status`, { to: 'visit-booked' })).status).toBe(200)
    await visit(page, `${e2e.url}/`)
    await expectVisible(page.getByTestId('dashboard-actions'))
    expect(await page.getByTestId('dashboard-actions').getByText('Answer Tamsin Quillane\'s enquiry').count()).toBe(0)
    expectCleanRun(owner)
  })

  it('another firm\'s owner never sees it', async () => {
    const { client } = await signUpFirm(e2e.url, 'Elsewhere Walls')
    const t = (await client.get('/api/today')).body
    expect(JSON.stringify(t)).not.toContain('Tamsin Quillane')
  })
})
