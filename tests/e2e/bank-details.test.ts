// On a phone (390 x 844): the owner of a firm that has not given its bank details tries to issue an
// invoice; the page says plainly why not, with the way to the settings; there a sort code and an
// account number typed wrong are named beside their fields and nothing typed is lost; put right,
// the invoice goes.
import { describe, expect, it } from 'vitest'
import { BANK_DETAILS_NEEDED } from '../../shared/utils/bank-details'
import { GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'
import { expectCleanRun, expectPath, expectText, expectVisible, screenshot, signInToDashboard, useE2E, visit } from './browser'

const e2e = useE2E()

describe('bank details before the first invoice', () => {
  it('refuses to issue without them, shows why with the way to the settings, and issues once they are in', async () => {
    const { client: api, email } = await signUpFirm(e2e.url, 'Ferneyhough Plastering', { bank: false })
    const c = (await api.post('/api/customers', { customer: { kind: 'homeowner', name: 'Tamsin Orrell', email: uniqueEmail('tamsin') } })).body
    const draft = (await api.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
    expect((await api.put(`/api/invoices/${draft.id}/draft`, { vat: draft.vat, lines: [{ kind: 'labour', description: 'Skim the hall ceiling', quantityX1000: 1000, unitPence: 240_00 }] })).status).toBe(200)

    const owner = await e2e.open()
    const page = owner.page
    await signInToDashboard(page, e2e.url, email, GOOD_PASSWORD)
    await visit(page, `${e2e.url}/invoices/${draft.id}`)
    await page.getByRole('button', { name: 'Issue and send' }).click()
    await page.getByTestId('confirm-yes').click()
    const needed = page.getByTestId('bank-details-needed')
    await expectText(needed, BANK_DETAILS_NEEDED)
    await screenshot(page, 'invoice-bank-details-needed')
    expect((await api.get(`/api/invoices/${draft.id}`)).body.issuedOn).toBeNull()

    await needed.getByRole('link', { name: 'Add the bank details' }).click()
    await expectPath(page, '/firm')
    const bank = page.getByTestId('firm-bank')
    await expectVisible(bank.getByTestId('firm-bank-missing'))
    await bank.getByLabel('Account name').fill('Ferneyhough Plastering')
    await bank.getByLabel('Sort code').fill('12-34-5')
    await bank.getByLabel('Account number').fill('1234567')
    await page.getByRole('button', { name: 'Save firm details' }).click()
    await expectText(bank, /A sort code is six digits/)
    await expectText(bank, /An account number is eight digits/)
    await screenshot(page, 'firm-bank-details-wrong')
    // what was typed is still there
    expect(await bank.getByLabel('Account name').inputValue()).toBe('Ferneyhough Plastering')
    expect(await bank.getByLabel('Sort code').inputValue()).toBe('12-34-5')
    expect(await bank.getByLabel('Account number').inputValue()).toBe('1234567')

    await bank.getByLabel('Sort code').fill('123456')
    await bank.getByLabel('Account number').fill('12345678')
    await page.getByRole('button', { name: 'Save firm details' }).click()
    await expectVisible(page.getByText('Saved.', { exact: true }))
    // kept as digits, shown as people write a sort code
    expect(await bank.getByLabel('Sort code').inputValue()).toBe('12-34-56')

    await visit(page, `${e2e.url}/invoices/${draft.id}`)
    await page.getByRole('button', { name: 'Issue and send' }).click()
    await page.getByTestId('confirm-yes').click()
    await expectText(page.getByTestId('invoice-status'), 'Issued')
    expect((await api.get(`/api/invoices/${draft.id}`)).body.issuedOn).not.toBeNull()
    expectCleanRun(owner)
  })
})
