// The owner sets the firm's rates on a phone; a wrong figure is named beside its field and
// nothing else typed is lost.
import { describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { expectCleanRun, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'
import { OWNER } from './demo'

const e2e = useE2E()

describe('rates and rules (the price book inside)', () => {
  it('changes a rate, and refuses a bad one beside its field', async () => {
    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/settings`)
    await page.getByRole('main').getByRole('link', { name: 'Rates and rules' }).click()
    await expectVisible(page.getByRole('heading', { name: 'Rates and rules' }))

    await page.getByLabel('Skim ceilings, per m²').fill('twenty')
    await page.getByLabel('Skim walls, per m²').fill('19.50')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectText(page.getByRole('alert').filter({ hasText: 'pounds' }), 'Enter a price in pounds, like 18.00.')
    expect(await page.getByLabel('Skim walls, per m²').inputValue()).toBe('19.50')

    await page.getByLabel('Skim ceilings, per m²').fill('22')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectVisible(page.getByText('Saved. New quotes use these rates.'))
    await screenshot(page, 'price-book')

    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    expect((await api.get('/api/price-book')).body).toMatchObject({ skimWallsPerM2Pence: 1950, skimCeilingsPerM2Pence: 2200 })
    expectCleanRun(person)
  })

  it('sets the rate for packing out a bead and the working day, refusing a day that ends before it starts', async () => {
    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/rates`)
    await expectVisible(page.getByRole('heading', { name: 'Rates and rules' }))
    // the demo firm's figures (seeds/demo.ts; the day is the columns' default, 08:00 to 16:30)
    expect(await page.getByLabel('Packing out a bead, per metre').inputValue()).toBe('4.50')
    expect(await page.getByLabel('Working day starts').inputValue()).toBe('08:00')
    expect(await page.getByLabel('Ceilings before walls').isChecked()).toBe(true)
    await expectVisible(page.getByText(/About 90 to 120 minutes is common/))

    await page.getByLabel('Packing out a bead, per metre').fill('5.25')
    await page.getByLabel('Working day ends').fill('07:00')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectText(page.getByTestId('price-book-timeline').getByRole('alert'), 'The working day must end after it starts.')
    expect(await page.getByLabel('Packing out a bead, per metre').inputValue()).toBe('5.25')
    await screenshot(page, 'price-book-timeline-error')

    await page.getByLabel('Working day ends').fill('17:00')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectVisible(page.getByText('Saved. New quotes use these rates.'))
    expect(await page.getByLabel('Working day ends').inputValue()).toBe('17:00')

    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const book = (await api.get('/api/price-book')).body
    // 17 x 60 = 1020 minutes after midnight
    expect(book).toMatchObject({ packedBeadPerLmPence: 525, dayStartMinutes: 480, dayEndMinutes: 1020, ceilingsFirst: true })
    // put the demo's figures back for the other journeys (the quote and the day's timeline read them)
    const { firmId: _f, createdAt: _c, updatedAt: _u, ...rest } = book
    expect((await api.put('/api/price-book', { ...rest, packedBeadPerLmPence: 450, dayEndMinutes: 990 })).status).toBe(200)
    expectCleanRun(person)
  })

  it('sets the bead lengths and a making-good item, with a clear message for a bad length', async () => {
    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/rates`)
    await expectVisible(page.getByRole('heading', { name: 'Rates and rules' }))
    // the seeded lengths read back in metres
    expect(await page.getByLabel('Bead lengths you buy (m)').inputValue()).toBe('2.5, 3.0')
    await page.getByLabel('Bead lengths you buy (m)').fill('2.5, 30')
    await page.getByRole('button', { name: '+ Making-good item' }).click()
    const item = page.getByTestId('making-good-item').last()
    await item.getByLabel(/^Item \d+$/).fill('Make good round a new boiler flue')
    await item.getByLabel('Price (£)').fill('45')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectText(page.getByRole('alert').filter({ hasText: 'bead length' }), '30.0 m? A bead length is from 0.5 m to 6 m.')
    expect(await item.getByLabel(/^Item \d+$/).inputValue()).toBe('Make good round a new boiler flue')
    await page.getByLabel('Bead lengths you buy (m)').fill('3, 2.4')
    await page.getByRole('button', { name: 'Save rates and rules' }).click()
    await expectVisible(page.getByText('Saved. New quotes use these rates.'))
    expect(await page.getByLabel('Bead lengths you buy (m)').inputValue()).toBe('2.4, 3.0')
    await screenshot(page, 'price-book-making-good')

    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const book = (await api.get('/api/price-book')).body
    expect(book.beadStockLengthsMm).toEqual([2400, 3000])
    expect(book.makingGoodItems).toContainEqual({ name: 'Make good round a new boiler flue', unit: 'item', pricePence: 4500 })
    // put the seeded lengths back for the other journeys
    const { firmId: _f, createdAt: _c, updatedAt: _u, ...rest } = book
    expect((await api.put('/api/price-book', { ...rest, beadStockLengthsMm: [2500, 3000] })).status).toBe(200)
    expectCleanRun(person)
  })

  it('changes what a pack of finish plaster costs, keeping what was typed when a figure is wrong', async () => {
    const person = await e2e.open()
    const { page } = person
    await signInToDashboard(page, e2e.url, OWNER.email, OWNER.password)
    await visit(page, `${e2e.url}/settings`)
    await page.getByRole('main').getByRole('link', { name: 'Materials' }).click()
    await expectVisible(page.getByRole('heading', { name: 'Materials' }))
    await page.getByRole('button', { name: 'Change Gypsum finish plaster' }).click()
    const form = page.getByTestId('material-form')
    await form.getByLabel('Supplier (optional)').fill('Quayside builders\' yard')
    await form.getByLabel('Price of one pack (£)').fill('a lot')
    await form.getByRole('button', { name: 'Save material' }).click()
    await expectText(form.getByRole('alert').filter({ hasText: 'pounds' }), 'Enter the price of one pack in pounds, like 12.40.')
    expect(await form.getByLabel('Supplier (optional)').inputValue()).toBe('Quayside builders\' yard')
    await form.getByLabel('Price of one pack (£)').fill('13.25')
    await form.getByRole('button', { name: 'Save material' }).click()
    await expectVisible(page.getByText('Saved Gypsum finish plaster. New estimates use it.'))
    await expectVisible(page.getByTestId('material').filter({ hasText: 'Gypsum finish plaster' }).getByText('£13.25'))
    await screenshot(page, 'materials')

    const api = new Client(e2e.url)
    await api.post('/api/auth/sign-in', { email: OWNER.email, password: OWNER.password })
    const finish = (await api.get('/api/materials')).body.find((m: any) => m.name === 'Gypsum finish plaster')
    expect(finish).toMatchObject({ costPence: 1325, supplier: 'Quayside builders\' yard' })
    expectCleanRun(person)
  })
})
