// The office books a site visit on a phone from an enquiry: find the customer, pick the day in
// the date picker, book, land on the visit, and see the enquiry moved to "visit booked".
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectPath, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

describe('booking a visit', () => {
  it('books a visit for a new enquiry with the date picker, and the enquiry moves on', async () => {
    // a fresh customer and enquiry through the API, so the journey does not depend on other tests
    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const name = `Ivo Brennan ${Date.now() % 100000}`
    const customer = (await api.post('/api/customers', { customer: { kind: 'homeowner', name, phone: '07700 900777' }, site: { line1: '5 Chandlers Yard', postcode: 'KB6 2PL' } })).body
    const enquiry = (await api.post('/api/enquiries', { customerId: customer.id, siteId: customer.sites[0].id, source: 'phone', description: 'Skim the landing' })).body

    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/enquiries/${enquiry.id}`)
    await page.getByRole('link', { name: 'Book a visit' }).click()
    await expectPath(page, '/visits')
    const form = page.getByTestId('visit-booking')
    await expectVisible(form)
    await expectText(form.getByText(name), name)

    // booking without a time says so beside the field, and keeps the customer
    await form.getByRole('button', { name: 'Book visit' }).click()
    await expectText(form.getByRole('alert').filter({ hasText: 'date and time' }), 'Pick the date and time of the visit.')
    await expectText(form.getByText(name), name)

    // the 20th of next month, at the 09:00 the picker starts from
    await form.getByLabel('When').click()
    await page.locator('.dp--arrow-btn-nav').last().click()
    await page.locator('.dp--calendar-item .dp--future', { hasText: /^20$/ }).first().click()
    // the choice is confirmed with the picker's own button (no longer taken on the first tap)
    await page.getByRole('button', { name: 'Use this time' }).click()
    await expect.poll(() => form.getByLabel('When').inputValue()).toMatch(/ 20 .*09:00/)
    await screenshot(page, 'visit-booking')
    await form.getByRole('button', { name: 'Book visit' }).click()

    await page.waitForURL(u => /^\/visits\/[0-9a-f-]{36}$/.test(u.pathname))
    await expectText(page.getByRole('heading', { level: 1 }), name)
    const visitId = new URL(page.url()).pathname.split('/').pop()!
    const booked = (await api.get(`/api/visits/${visitId}`)).body
    expect(new Date(booked.startsAt).getDate()).toBe(20)
    expect(booked.enquiryId).toBe(enquiry.id)
    expect((await api.get(`/api/enquiries/${enquiry.id}`)).body.status).toBe('visit-booked')

    // it is on Today's list of coming visits
    await visit(page, `${e2e.url}/`)
    await expectVisible(page.getByTestId('dashboard-visits').getByText(name))
    expectCleanRun(person)
  })
})
