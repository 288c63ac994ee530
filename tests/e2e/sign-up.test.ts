// A plasterer sets up their firm on a phone: the form says to check their e-mail (the same for
// every address, so it tells no one who has an account), the link in the e-mail opens a page
// with one button, and that lands them on Today as the owner. The link works once.
import { describe, expect, it } from 'vitest'
import { uniqueEmail, GOOD_PASSWORD } from '../support/client'
import { expectCleanRun, expectPath, expectText, screenshot, useE2E, visit } from './browser'

const e2e = useE2E()

describe('sign up', () => {
  it('sets up a firm through the e-mailed link and lands on Today as the owner', async () => {
    const person = await e2e.open()
    const { page } = person
    const email = uniqueEmail('newfirm')

    await visit(page, `${e2e.url}/sign-up`)
    await page.getByLabel('Trading name').fill('Fennel Lane Plastering')
    await page.getByLabel('Your name').fill('Tamsin Reed')
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Password').fill(GOOD_PASSWORD)
    await page.getByRole('button', { name: 'Set up firm' }).click()

    await expectText(page.getByRole('heading', { level: 1 }), 'Check your e-mail')
    await expectText(page.getByRole('status'), email)
    await screenshot(page, 'sign-up-check-email')

    const mail = await e2e.app.waitForMail(email, /Confirm your e-mail/)
    const link = /(http\S+\/sign-up\/[\w-]+)/.exec(mail.text ?? '')![1]!
    expect(new URL(link).origin).toBe(e2e.url)
    await visit(page, link)
    await expectText(page.getByRole('heading', { level: 1 }), 'Finish setting up your firm')
    await page.getByRole('button', { name: 'Open Setwell' }).click()
    await expectPath(page, '/')
    await expectText(page.getByTestId('dashboard-heading'), 'Hello, Tamsin')
    await expectText(page.getByText('Fennel Lane Plastering · Owner'), 'Fennel Lane Plastering')

    // the link was used: opening it again says so, and nothing is made twice
    const again = await e2e.open()
    await visit(again.page, link)
    await again.page.getByRole('button', { name: 'Open Setwell' }).click()
    await expectText(again.page.getByRole('alert'), /expired or was already used/)
    await expectPath(again.page, new URL(link).pathname)
    expectCleanRun(person)
  })
})
