// A new enquiry for someone not yet a customer, taken on the phone: adding the customer comes
// back to the enquiry with the customer chosen and everything typed still there (issue 17, part 2).
// Invented customer and street.
import { describe, expect, it } from 'vitest'
import { uniqueEmail } from '../support/client'
import { expectCleanRun, expectPath, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

describe('a new enquiry for a new customer', () => {
  it('adding the customer comes back to the enquiry with them chosen and the description intact', async () => {
    const jess = await e2e.open()
    const { page } = jess
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/enquiries/new`)
    const words = 'Kitchen ceiling came down after a leak: overboard and skim, about 12 m²'
    await page.getByLabel('What they want done').fill(words)
    await page.getByLabel('When they would like it done').fill('Before Christmas')
    await page.getByRole('link', { name: 'Not there? Add the customer first' }).click()
    await expectPath(page, '/customers/new')

    await page.getByLabel('Name (required)', { exact: true }).fill('Perpetua Gillow')
    await page.getByLabel('E-mail').fill(uniqueEmail('perpetua'))
    await page.getByLabel('Billing address', { exact: true }).fill('11 Lathe Street')
    await page.getByLabel('Postcode').first().fill('KB4 8QN')
    await page.getByRole('button', { name: 'Save and go back' }).click()

    await expectPath(page, '/enquiries/new')
    await expectVisible(page.getByText('Perpetua Gillow').first())
    expect(await page.getByLabel('What they want done').inputValue()).toBe(words)
    expect(await page.getByLabel('When they would like it done').inputValue()).toBe('Before Christmas')
    await screenshot(page, 'enquiry-new-customer-back-phone')

    await page.getByRole('button', { name: 'Save enquiry' }).click()
    await page.waitForURL(/\/enquiries\/[0-9a-f-]{36}$/)
    await expectVisible(page.getByText(words))
    // saved: the next new enquiry starts empty
    await visit(page, `${e2e.url}/enquiries/new`)
    expect(await page.getByLabel('What they want done').inputValue()).toBe('')
    expectCleanRun(jess)
  })
})
