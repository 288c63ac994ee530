// The owner sets the firm's rates on a phone; a wrong figure is named beside its field and
// nothing else typed is lost.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

describe('the price book', () => {
  it('changes a rate, and refuses a bad one beside its field', async () => {
    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/settings`)
    await page.getByRole('main').getByRole('link', { name: 'Price book' }).click()
    await expectVisible(page.getByRole('heading', { name: 'Price book' }))

    await page.getByLabel('Skim ceilings, per m²').fill('twenty')
    await page.getByLabel('Skim walls, per m²').fill('19.50')
    await page.getByRole('button', { name: 'Save price book' }).click()
    await expectText(page.getByRole('alert').filter({ hasText: 'pounds' }), 'Enter a price in pounds, like 18.00.')
    expect(await page.getByLabel('Skim walls, per m²').inputValue()).toBe('19.50')

    await page.getByLabel('Skim ceilings, per m²').fill('22')
    await page.getByRole('button', { name: 'Save price book' }).click()
    await expectVisible(page.getByText('Saved. New quotes use these rates.'))
    await screenshot(page, 'price-book')

    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    expect((await api.get('/api/price-book')).body).toMatchObject({ skimWallsPerM2Pence: 1950, skimCeilingsPerM2Pence: 2200 })
    expectCleanRun(person)
  })
})
