// The public enquiry form on a customer's phone: a lead is never lost. Sent, it thanks; refused for
// the hourly limit, it says it was not sent, keeps everything typed and offers the firm's phone
// (issue 17, part 2). Invented customers and streets.
import { describe, expect, it } from 'vitest'
import { Client, uniqueEmail } from '../support/client'
import { expectCleanRun, expectVisible, screenshot, useE2E, visit } from './browser'
import { OWNER } from './demo'

// The limit is per address. Every test file's server shares one database and the API tests send
// from 127.0.0.1 too, so this file's server trusts X-Forwarded-For and its customer comes from an
// address of their own (a documentation range, RFC 5737), not counted by anything else.
const e2e = useE2E({ NUXT_TRUST_PROXY: 'true' })
const FROM = { 'x-forwarded-for': `198.51.100.${1 + Math.floor(Math.random() * 250)}` }

describe('the public enquiry form', () => {
  it('thanks for an enquiry it stored; at the limit it says it was not sent and keeps what was typed', async () => {
    const owner = new Client(e2e.url)
    expect((await owner.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })).status).toBe(200)
    const key = (await owner.get('/api/firm')).body.enquiryFormKey as string
    const customer = await e2e.open()
    const { page } = customer
    await page.setExtraHTTPHeaders(FROM)
    const fill = async (name: string, description: string) => {
      await page.getByLabel('Name').fill(name)
      await page.getByLabel('E-mail').fill(uniqueEmail('lead'))
      await page.getByLabel('Address of the work').fill('4 Pargeter Lane')
      await page.getByLabel('Postcode').fill('KB7 2WS')
      await page.getByLabel('What would you like done?').fill(description)
    }

    await visit(page, `${e2e.url}/enquire/${key}`)
    await fill('Wilma Sparrowhawk', 'Skim the back bedroom ceiling after a leak')
    await page.getByRole('button', { name: 'Send enquiry' }).click()
    await expectVisible(page.getByRole('heading', { name: 'Thank you' }))
    const stored = (await owner.get('/api/enquiries?status=new')).body.rows
    expect(stored.some((r: { customer: { name: string } }) => r.customer.name === 'Wilma Sparrowhawk')).toBe(true)

    // four more from the same address reach the hourly limit of five
    for (let i = 0; i < 4; i++) {
      const res = await new Client(e2e.url, FROM).post(`/api/public/enquiry-forms/${key}`, { name: `Neighbour ${i}`, email: uniqueEmail('n'), phone: '', addressLine1: '6 Pargeter Lane', town: '', postcode: 'KB7 2WS', description: 'Patch a wall where a radiator came off', preferredDates: '', website: '' })
      expect(res.status).toBe(201)
    }

    const before = (await owner.get('/api/enquiries')).body.total
    await visit(page, `${e2e.url}/enquire/${key}`)
    const words = 'Re-skim the hallway and stairs, about 30 m², after new wiring'
    await fill('Osric Fernhough', words)
    await page.getByRole('button', { name: 'Send enquiry' }).click()
    const refusal = page.getByText('This enquiry has not been sent')
    await expectVisible(refusal)
    // no thank-you for what was not stored; everything typed is still in the form; the phone is offered
    expect(await page.getByRole('heading', { name: 'Thank you' }).count()).toBe(0)
    expect(await page.getByLabel('What would you like done?').inputValue()).toBe(words)
    expect(await page.getByLabel('Name').inputValue()).toBe('Osric Fernhough')
    await expectVisible(page.getByRole('link', { name: /\d/ }))
    await screenshot(page, 'enquiry-form-limit-phone')
    expect((await owner.get('/api/enquiries')).body.total).toBe(before)
    expectCleanRun(customer)
  })
})
