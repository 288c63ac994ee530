// The partner at a firm with more customers owing than one page holds: What is owed shows the 50
// most owed, with the firm's totals over all of them, and the rest on asking. On a phone.
import { describe, expect, it } from 'vitest'
import type { Client } from '../support/client'
import { GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'
import { expectAbsent, expectCleanRun, expectText, signInToDashboard, useE2E, visit } from './browser'

const e2e = useE2E()

/** A customer owing one issued invoice of `pence`. */
async function owing(owner: Client, name: string, pence: number) {
  const c = (await owner.post('/api/customers', { customer: { kind: 'homeowner', name, email: uniqueEmail('owes') } })).body
  const d = (await owner.post('/api/invoices', { kind: 'blank', customerId: c.id })).body
  const saved = await owner.put(`/api/invoices/${d.id}/draft`, { vat: d.vat, lines: [{ kind: 'labour', description: 'Skim the landing', quantityX1000: 1000, unitPence: pence }] })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  expect((await owner.post(`/api/invoices/${d.id}/issue`)).status).toBe(200)
}

describe('what is owed, a page at a time', () => {
  it('shows the 50 most owed with the whole total, and the 51st on asking', async () => {
    const { client: owner, email } = await signUpFirm(e2e.url, 'Larkfield Plaster Co')
    // 51 customers owing £100.01 to £100.51: the least owed is the one left for the next page
    for (let k = 1; k <= 51; k++) await owing(owner, `Owing Customer ${String(k).padStart(2, '0')}`, 100_00 + k)
    const totalPence = Array.from({ length: 51 }, (_, k) => 100_00 + k + 1).reduce((a, b) => a + b, 0)

    const partner = await e2e.open()
    const page = partner.page
    await signInToDashboard(page, e2e.url, email, GOOD_PASSWORD)
    await visit(page, `${e2e.url}/owed`)
    await expectText(page.getByTestId('owed-total'), formatPounds(totalPence))
    const cards = page.getByTestId('owed-customers').locator(':scope > li')
    expect(await cards.count()).toBe(50)
    expect(await page.getByTestId('owed-customers').innerText()).not.toContain('Owing Customer 01')
    expect(await cards.first().innerText()).toContain('Owing Customer 51')

    const more = page.getByTestId('owed-more')
    await expectText(more, 'Show 1 more of 1 customers')
    await more.click()
    await expectText(cards.nth(50), /Owing Customer 01/)
    expect(await cards.count()).toBe(51)
    await expectAbsent(more)
    expectCleanRun(partner)
  })
})

/** £ with thousands and two decimals, as the page writes it. */
function formatPounds(pence: number) {
  return `£${(pence / 100).toLocaleString('en-GB', { minimumFractionDigits: 2, maximumFractionDigits: 2 })}`
}
